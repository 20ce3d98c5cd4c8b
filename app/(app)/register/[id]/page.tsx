import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { VaporPressureChart } from "@/components/charts/vapor-pressure-chart";
import { ContributingContainersList } from "@/components/register/contributing-containers";
import { TraceWorking } from "@/components/register/trace/trace-working";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { SeverityBadge } from "@/components/ui/severity";
import { getFinding } from "@/db/queries/findings";
import { activeUserOptions } from "@/db/queries/options";
import { getSubstance } from "@/db/queries/substances";
import { moveSuggestionsForFinding } from "@/lib/assessment/move-suggestions";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime, formatTempC } from "@/lib/format/numbers";
import { formatMinutes } from "@/lib/assessment/rules/time-to-danger";
import { STANDARD_ATMOSPHERE_KPA } from "@/lib/hazard";
import { idParam } from "@/lib/http/paging";
import { contributingContainers } from "@/lib/register/finding-containers";
import { humaniseRule, SCENARIO_LABELS, STATUS_LABELS } from "@/lib/register/labels";
import { RULE_LABELS } from "@/lib/register/rule-labels";
import { FINDING_EVENT_INPUT_KINDS } from "@/lib/register/schemas";
import { formatTraceValue, traceModel, vaporPressurePoints } from "@/lib/register/trace-steps";
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

/** A figure of the key-figures panel: a label over a large value, with an optional note. */
function Figure({ label, value, note }: { label: string; value: React.ReactNode; note?: React.ReactNode }) {
  return (
    <div className="min-w-0">
      <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">{label}</dt>
      <dd className="tabular mt-0.5 text-lg font-semibold text-ink-950">{value}</dd>
      {note ? <dd className="text-xs text-ink-600">{note}</dd> : null}
    </div>
  );
}

export default async function FindingPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, scope } = await requirePagePermission("findings.read");
  const id = idParam((await params).id);
  const found = id ? getFinding(user, scope, id) : null;
  if (!found) notFound();
  const { finding, events } = found;
  const crossings = ((finding.trace as { crossings?: { severity: string; threshold: string; tempC: number; minutes: number | null }[] } | null)?.crossings ?? []).filter(
    (c) => typeof c.tempC === "number",
  );
  const substance = finding.substanceId ? getSubstance(finding.substanceId) : null;
  const curve = substance ? vaporPressureCurve(substance) : [];
  const model = traceModel(finding.trace);
  const contributors = contributingContainers(finding);
  // The mitigation at hand for a finding about a unit: its largest containers there, each with a safer place.
  const moves = finding.status !== "resolved" ? moveSuggestionsForFinding(user, finding, contributors.rows.map((r) => r.id)) : [];
  // The (T, Psat) of this finding's substance as the trace used it.
  const points = vaporPressurePoints(model);
  const used = substance ? (points.find((p) => p.title.toLowerCase().includes(substance.name.toLowerCase())) ?? (points.length === 1 ? points[0] : null)) : null;
  const steps = FINDING_EVENT_INPUT_KINDS.filter((step) => can(user.role, ACTION_FOR_STEP[step]) && (!ALLOWED_FROM[step] || ALLOWED_FROM[step]!.includes(finding.status)));
  const people = activeUserOptions().filter((p) => p.role !== "auditor").map((p) => ({ id: p.id, name: p.name }));
  const assignee = finding.assigneeId ? people.find((p) => p.id === finding.assigneeId) : null;
  const location = finding.storageUnitId ? `/locations/units/${finding.storageUnitId}` : finding.roomId ? `/locations/rooms/${finding.roomId}` : null;
  const unit = finding.unit ?? "";
  const ratioText = finding.ratio == null ? "—" : `${formatTraceValue(finding.ratio * 100, "%")} of the limit`;
  const facts: [string, React.ReactNode][] = [
    ["Rule", RULE_LABELS[finding.rule] ?? humaniseRule(finding.rule)],
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
      <PageHeader
        title={finding.title}
        description={
          <span className="flex flex-wrap items-center gap-2">
            <SeverityBadge severity={finding.severity} />
            <span>{STATUS_LABELS[finding.status]}</span>
          </span>
        }
      />
      {/* Below lg the two columns dissolve (contents) and `order` puts the key figures, the steps
          and the history (where a saved step shows) before the working; from lg the figures and the
          working sit left, the steps and the history right. */}
      <div className="flex flex-col gap-6 lg:grid lg:grid-cols-[minmax(0,1fr)_24rem] lg:items-start">
        <div className="contents lg:block lg:space-y-6">
          <section aria-labelledby="key-figures" className="order-1 rounded-lg border border-ink-200 bg-white p-4">
            <h2 id="key-figures" className="sr-only">
              Key figures
            </h2>
            <dl className="grid grid-cols-2 gap-x-6 gap-y-4 sm:grid-cols-3">
              <Figure label="Computed value" value={finding.value == null ? "—" : formatTraceValue(finding.value, unit)} />
              <Figure label="Limit" value={finding.limitValue == null ? "—" : formatTraceValue(finding.limitValue, unit)} />
              <Figure label="Ratio" value={ratioText} note={finding.ratio != null && finding.ratio > 1 ? "The limit is crossed." : undefined} />
              <Figure label="Worst-case temperature" value={formatTempC(finding.worstCaseTempC)} note={finding.worstCaseSource ?? undefined} />
              <Figure label="Scenario" value={<span className="text-base">{SCENARIO_LABELS[finding.scenario]}</span>} />
              {finding.scenario === "control_lost" ? (
                <Figure
                  label="Time to danger"
                  value={finding.timeToDanger == null ? "—" : finding.timeToDanger.minutes === 0 ? "Now" : formatMinutes(finding.timeToDanger.minutes)}
                  note={
                    finding.timeToDanger == null
                      ? "Not reached by warming to the room's worst case."
                      : finding.timeToDanger.minutes === 0
                        ? `At the ${finding.timeToDanger.threshold} already at the in-control worst case.`
                        : `Reaches the ${finding.timeToDanger.threshold} (${formatTempC(finding.timeToDanger.tempC)}) this long after a failure.`
                  }
                />
              ) : null}
              <Figure label="Containers" value={contributors.rows.length} note={contributors.rows.length === 1 ? "contributes" : "contribute"} />
            </dl>
            {crossings.length > 0 ? (
              <div className="mt-4 border-t border-ink-100 pt-3">
                <h3 className="text-xs font-medium uppercase tracking-wide text-ink-600">After a failure, each threshold</h3>
                <ul className="mt-1 space-y-0.5 text-sm text-ink-900">
                  {crossings.map((c) => (
                    <li key={`${c.severity}-${c.threshold}`} className="tabular">
                      <span className="font-medium">{c.threshold}</span> ({c.severity}) at {formatTempC(c.tempC)}:{" "}
                      {c.minutes === 0 ? "already in control" : c.minutes == null ? "not reached by warming to the room" : `after ${formatMinutes(c.minutes)}`}
                    </li>
                  ))}
                </ul>
              </div>
            ) : null}
          </section>
          <div className="order-4 space-y-6">
            <Caution />
            <Card title={`Contributing containers (${contributors.rows.length})`}>
              <ContributingContainersList list={contributors} />
            </Card>
            {substance && curve.length ? (
              <Card title={`Vapor pressure of ${substance.name} and the point used`}>
                <VaporPressureChart
                  points={curve}
                  lflPressureKPa={substance.lflVolPercent != null ? (substance.lflVolPercent / 100) * STANDARD_ATMOSPHERE_KPA : null}
                  lflVolPercent={substance.lflVolPercent}
                  lowerFlammableTemperatureC={null}
                  ambientPressureKPa={STANDARD_ATMOSPHERE_KPA}
                  markTempC={!used && finding.worstCaseTempC != null ? { tempC: finding.worstCaseTempC, label: `Worst case ${formatTempC(finding.worstCaseTempC)}` } : null}
                  markPoint={used ? { tempC: used.tempC, pressureKPa: used.pressureKPa, label: `${formatTempC(used.tempC)}, ${formatTraceValue(used.pressureKPa, "kPa")}` } : null}
                />
              </Card>
            ) : null}
            <Card title="The whole working">
              <p className="mb-4 text-xs text-ink-600">Every input with its source, every formula with the numbers put in, every intermediate result: redo it by hand.</p>
              <TraceWorking model={model} />
            </Card>
            <Card title="About this finding">
              <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[12rem_minmax(0,1fr)]">
                {facts.map(([label, value]) => (
                  <div key={label} className="contents">
                    <dt className="text-ink-600">{label}</dt>
                    <dd className="tabular text-ink-900">{value}</dd>
                  </div>
                ))}
              </dl>
            </Card>
          </div>
        </div>
        <div className="contents lg:sticky lg:top-4 lg:block lg:space-y-6">
          <Card title="Work on it" className="order-2">
            {moves.length > 0 ? (
              <section aria-labelledby="safer-places" className="mb-4 space-y-2 border-b border-ink-200 pb-4">
                <h3 id="safer-places" className="text-sm font-semibold text-ink-900">
                  Safer places for its containers
                </h3>
                <ul className="space-y-2 text-sm">
                  {moves.map((move) => (
                    <li key={move.containerId}>
                      <Link href={move.href} className="font-medium text-accent-700 hover:underline">
                        Move {move.label} to {move.place.code}: {move.summary}
                      </Link>
                      <p className="text-xs text-ink-600">
                        Room {move.place.roomCode}, {move.place.siteName}. {move.place.reason} Opens the move for you to confirm.
                      </p>
                    </li>
                  ))}
                </ul>
              </section>
            ) : null}
            <FindingSteps findingId={finding.id} steps={steps} people={people} />
          </Card>
          <Card title="History" className="order-3">
            <ol className="space-y-3">
              {[...events].reverse().map((e) => (
                <li key={e.id} className="text-sm">
                  <p className="font-medium text-ink-900">
                    {e.kind === "comment" && e.data?.resolveRefused ? "Not resolved: the condition still holds" : (EVENT_LABEL[e.kind] ?? e.kind)}
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
