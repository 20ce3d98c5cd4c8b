import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { VaporPressureChart } from "@/components/charts/vapor-pressure-chart";
import { TraceView } from "@/components/trace-view";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { SeverityBadge } from "@/components/ui/severity";
import { getFinding } from "@/db/queries/findings";
import { activeUserOptions } from "@/db/queries/options";
import { getSubstance } from "@/db/queries/substances";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime, formatNumber, formatTempC } from "@/lib/format/numbers";
import { STANDARD_ATMOSPHERE_KPA } from "@/lib/hazard";
import { idParam } from "@/lib/http/paging";
import { humaniseRule, SCENARIO_LABELS, STATUS_LABELS } from "@/lib/register/labels";
import { RULE_LABELS } from "@/lib/register/rule-labels";
import { FINDING_EVENT_INPUT_KINDS } from "@/lib/register/schemas";
import { ACTION_FOR_STEP, ALLOWED_FROM } from "@/lib/register/workflow";
import { vaporPressureCurve } from "@/lib/substances/vapor";
import { FindingSteps } from "./finding-steps";

export const metadata: Metadata = { title: "Finding" };

const EVENT_LABEL: Record<string, string> = {
  raised: "Raised",
  updated: "Re-assessed",
  acknowledged: "Acknowledged",
  mitigation_started: "Mitigation started",
  resolved: "Resolved",
  auto_resolved: "Resolved by re-assessment",
  reopened: "Re-opened",
  risk_accepted: "Risk accepted",
  comment: "Comment",
  assigned: "Assigned",
};

export default async function FindingPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, scope } = await requirePagePermission("findings.read");
  const id = idParam((await params).id);
  const found = id ? getFinding(user, scope, id) : null;
  if (!found) notFound();
  const { finding, events } = found;
  const substance = finding.substanceId ? getSubstance(finding.substanceId) : null;
  const curve = substance ? vaporPressureCurve(substance) : [];
  const steps = FINDING_EVENT_INPUT_KINDS.filter((step) => can(user.role, ACTION_FOR_STEP[step]) && (!ALLOWED_FROM[step] || ALLOWED_FROM[step]!.includes(finding.status)));
  const people = activeUserOptions().filter((p) => p.role !== "auditor").map((p) => ({ id: p.id, name: p.name }));
  const assignee = finding.assigneeId ? people.find((p) => p.id === finding.assigneeId) : null;
  const location = finding.storageUnitId ? `/locations/units/${finding.storageUnitId}` : finding.roomId ? `/locations/rooms/${finding.roomId}` : null;
  const facts: [string, React.ReactNode][] = [
    ["Status", STATUS_LABELS[finding.status]],
    ["Rule", RULE_LABELS[finding.rule] ?? humaniseRule(finding.rule)],
    ["Scenario", SCENARIO_LABELS[finding.scenario]],
    ["Computed value", finding.value == null ? "—" : `${formatNumber(finding.value, 4)} ${finding.unit ?? ""}`],
    ["Limit", finding.limitValue == null ? "—" : `${formatNumber(finding.limitValue, 4)} ${finding.unit ?? ""}`],
    ["Ratio to the limit", finding.ratio == null ? "—" : `${formatNumber(finding.ratio * 100)} %`],
    ["Worst-case temperature", finding.worstCaseSource ?? formatTempC(finding.worstCaseTempC)],
    ["Location", location ? <Link href={location} className="text-accent-700 hover:underline">Open the location</Link> : "—"],
    ["Substance", substance ? <Link href={`/substances/${substance.id}`} className="text-accent-700 hover:underline">{substance.name}</Link> : "—"],
    ["First raised", formatDateTime(finding.firstRaisedAt)],
    ["Last assessed", formatDateTime(finding.lastEvaluatedAt)],
    ["Assigned to", assignee?.name ?? "—"],
    ...(finding.mitigationPlan ? [["Mitigation plan", finding.mitigationPlan] as [string, React.ReactNode]] : []),
    ...(finding.riskAcceptedUntil ? [["Risk accepted until", finding.riskAcceptedUntil.toISOString().slice(0, 10)] as [string, React.ReactNode]] : []),
  ];
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/register" className="text-accent-700 hover:underline">
          ← Register
        </Link>
      </p>
      <PageHeader title={finding.title} description={<SeverityBadge severity={finding.severity} />} />
      <Caution />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="space-y-6">
          <Card title="What was found">
            <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_minmax(0,1fr)]">
              {facts.map(([label, value]) => (
                <div key={label} className="contents">
                  <dt className="text-ink-600">{label}</dt>
                  <dd className="tabular text-ink-900">{value}</dd>
                </div>
              ))}
            </dl>
          </Card>
          {substance && curve.length ? (
            <Card title={`Vapor pressure of ${substance.name} and the worst-case temperature`}>
              <VaporPressureChart
                points={curve}
                lflPressureKPa={substance.lflVolPercent != null ? (substance.lflVolPercent / 100) * STANDARD_ATMOSPHERE_KPA : null}
                lflVolPercent={substance.lflVolPercent}
                lowerFlammableTemperatureC={null}
                ambientPressureKPa={STANDARD_ATMOSPHERE_KPA}
                markTempC={finding.worstCaseTempC != null ? { tempC: finding.worstCaseTempC, label: `Worst case ${formatTempC(finding.worstCaseTempC)}` } : null}
              />
            </Card>
          ) : null}
          <Card title="Calculation trace">
            <p className="mb-4 text-xs text-ink-600">Every input with its source, every formula with the numbers put in: redo it by hand.</p>
            <TraceView trace={finding.trace} />
          </Card>
        </div>
        <div className="space-y-6">
          <Card title="Work on it">
            <FindingSteps findingId={finding.id} steps={steps} people={people} />
          </Card>
          <Card title="History">
            <ol className="space-y-3">
              {[...events].reverse().map((e) => (
                <li key={e.id} className="text-sm">
                  <p className="font-medium text-ink-900">
                    {EVENT_LABEL[e.kind] ?? e.kind}
                    {e.fromStatus && e.toStatus && e.fromStatus !== e.toStatus ? (
                      <span className="font-normal text-ink-600">
                        {" "}
                        ({STATUS_LABELS[e.fromStatus]} → {STATUS_LABELS[e.toStatus]})
                      </span>
                    ) : null}
                  </p>
                  {e.note ? <p className="whitespace-pre-line text-ink-800">{e.note}</p> : null}
                  <p className="tabular text-xs text-ink-500">
                    {formatDateTime(e.at)} · {e.actorName ?? "Headroom assessment"}
                  </p>
                </li>
              ))}
            </ol>
          </Card>
        </div>
      </div>
    </div>
  );
}
