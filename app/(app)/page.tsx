import { Thermometer } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { SEVERITY_STYLE } from "@/components/ui/severity";
import { openFindingsContributedElsewhere } from "@/db/queries/location-findings";
import { locationsClosestToLimits, overviewCounts, recentAuditEvents, recentFindingEvents, sitesWithRoomCounts } from "@/db/queries/overview";
import { SEVERITIES } from "@/db/schema";
import { requirePagePermission } from "@/lib/auth/page";
import { can, scopeFor } from "@/lib/auth/permissions";

import { SeverityBadge } from "@/components/ui/severity";
import { formatCount, formatDateTime, formatNumber, formatQuantity } from "@/lib/format/numbers";
import { overviewAudience, overviewHeadline, SCOPE_WORDS } from "@/lib/overview/scope-text";

export const metadata: Metadata = { title: "Overview" };

function Stat({ label, value, href, note }: { label: string; value: number; href?: string; note?: string }) {
  const body = (
    <>
      <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">{label}</dt>
      <dd className="tabular mt-1 text-2xl font-semibold text-ink-950">{formatCount(value)}</dd>
      {note ? <dd className="mt-0.5 text-xs text-ink-600">{note}</dd> : null}
    </>
  );
  return (
    <div className="rounded-lg border border-ink-200 bg-white px-4 py-3">
      {href ? (
        <Link href={href} className="block hover:opacity-80">
          {body}
        </Link>
      ) : (
        body
      )}
    </div>
  );
}

export default async function OverviewPage() {
  const { user } = await requirePagePermission("overview.read");
  const findingScope = scopeFor(user.role, "findings.read");
  const counts = await overviewCounts(user, findingScope);
  const closest = findingScope ? locationsClosestToLimits(user, findingScope) : [];
  const findingEventsList = findingScope ? recentFindingEvents(user, findingScope) : [];
  const totalOpen = SEVERITIES.reduce((sum, s) => sum + counts.openFindings[s], 0);
  const urgent = counts.openFindings.critical + counts.openFindings.high;
  const showAudit = can(user.role, "audit.read");
  const events = showAudit ? recentAuditEvents() : [];
  const siteRows = sitesWithRoomCounts();

  const audience = overviewAudience(user.role, findingScope);
  const words = SCOPE_WORDS[audience];
  const ownScope = audience === "researcher" || audience === "facilities";
  const showExcursions = can(user.role, "temperatures.read");
  const elsewhere = audience === "researcher" ? openFindingsContributedElsewhere(user) : null;
  const headline = overviewHeadline(audience, {
    urgent,
    totalOpen,
    openExcursions: counts.openExcursions,
    responsibleFor: audience === "researcher" ? counts.myContainers + counts.myUnits : counts.myRooms + counts.myUnits,
    contributedElsewhere: elsewhere?.count ?? 0,
  });

  return (
    <div className="space-y-6">
      <PageHeader title={`Good to see you, ${user.name.split(" ")[0]}`} description={headline} />

      <section aria-labelledby="attention-heading">
        <h2 id="attention-heading" className="mb-1 text-sm font-semibold text-ink-800">
          {words.heading}
        </h2>
        <p className="mb-3 text-xs text-ink-600">
          {words.place
            ? `Counted here: the open findings of ${words.place}. The register lists the same; a safety officer sees every finding.`
            : audience === "auditor"
              ? "Figures for every location, read-only."
              : "Every open finding in the register, for every location."}
        </p>
        {elsewhere && elsewhere.count > 0 && elsewhere.worst ? (
          <p className="mb-3 rounded-md border border-sev-high/40 bg-white px-3 py-2 text-sm text-ink-800">
            Your containers also add to {formatCount(elsewhere.count)} open finding{elsewhere.count === 1 ? "" : "s"} (the worst{" "}
            {SEVERITY_STYLE[elsewhere.worst].label.toLowerCase()}) that the register records on another person&apos;s container in the same unit or room. Each
            container&apos;s page shows how many concern it; your safety officer follows them.
          </p>
        ) : null}
        <div className={`grid gap-3 sm:grid-cols-2 ${showExcursions ? "xl:grid-cols-5" : "xl:grid-cols-4"}`}>
          {SEVERITIES.map((severity) => {
            const style = SEVERITY_STYLE[severity];
            const Icon = style.icon;
            const n = counts.openFindings[severity];
            return (
              <Link
                key={severity}
                href={`/register?severity=${severity}`}
                className={`rounded-lg border bg-white px-4 py-3 hover:shadow-sm ${n > 0 ? style.border : "border-ink-200"}`}
              >
                <span className={`flex items-center gap-1.5 text-xs font-semibold uppercase tracking-wide ${style.text}`}>
                  <Icon aria-hidden="true" className="size-4" strokeWidth={2.25} />
                  {style.label}
                </span>
                <span className="tabular mt-1 block text-2xl font-semibold text-ink-950">{formatCount(n)}</span>
                <span className="block text-xs text-ink-600">
                  open finding{n === 1 ? "" : "s"}
                  {words.findings}
                </span>
              </Link>
            );
          })}
          {showExcursions ? (
            <Link
              href="/temperatures#awaiting-acknowledgement"
              className={`rounded-lg border bg-white px-4 py-3 hover:shadow-sm ${counts.openExcursions > 0 || counts.unacknowledgedExcursions > 0 ? "border-sev-high/40" : "border-ink-200"}`}
            >
              <span className="flex items-center gap-1.5 text-xs font-semibold uppercase tracking-wide text-ink-700">
                <Thermometer aria-hidden="true" className="size-4" />
                Excursions
              </span>
              <span className="tabular mt-1 block text-2xl font-semibold text-ink-950">{formatCount(counts.openExcursions)}</span>
              <span className="block text-xs text-ink-600">
                open{audience === "facilities" ? " in your rooms and units" : ""} · {formatCount(counts.unacknowledgedExcursions)} awaiting acknowledgement
              </span>
              {audience === "facilities" && counts.allOpenExcursions !== counts.openExcursions ? (
                <span className="block text-xs text-ink-600">{formatCount(counts.allOpenExcursions)} open across every location</span>
              ) : null}
            </Link>
          ) : null}
        </div>
      </section>

      <div className="grid gap-6 lg:grid-cols-3">
        <div className="space-y-6 lg:col-span-2">
          {findingScope ? (
            <Card title="Closest to their limits">
              {closest.length === 0 ? (
                <p className="text-sm text-ink-600">
                  {ownScope ? `None of the open findings of ${words.place} has a computed value against a limit.` : "No open finding has a computed value against a limit."}
                </p>
              ) : (
                <table className="w-full text-sm">
                  <thead>
                    <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                      <th scope="col" className="py-2 font-medium">Location</th>
                      <th scope="col" className="py-2 text-right font-medium">Highest ratio to a limit</th>
                      <th scope="col" className="py-2 text-right font-medium">Open findings</th>
                    </tr>
                  </thead>
                  <tbody className="tabular">
                    {closest.map((row) => (
                      <tr key={`${row.roomId}-${row.storageUnitId}`} className="border-b border-ink-100 last:border-0">
                        <td className="py-2">
                          <Link
                            href={row.storageUnitId ? `/register?storageUnitId=${row.storageUnitId}&status=open,acknowledged,mitigating` : `/register?roomId=${row.roomId}&status=open,acknowledged,mitigating`}
                            className="text-accent-700 hover:underline"
                          >
                            {[row.roomCode, row.unitCode].filter(Boolean).join(" › ")}
                          </Link>
                        </td>
                        <td className="py-2 text-right font-medium">{row.ratio == null ? "—" : row.ratio === Infinity ? <span title="The value is 0: no oxygen would be left">∞</span> : `${formatNumber(row.ratio * 100)} %`}</td>
                        <td className="py-2 text-right">{formatCount(row.findings)}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              )}
            </Card>
          ) : null}
          <Card title="What Headroom keeps">
            <dl className="grid grid-cols-2 gap-3 sm:grid-cols-3">
              <Stat label="Sites" value={counts.sites} href="/locations" />
              <Stat label="Rooms" value={counts.rooms} href="/locations" />
              <Stat label="Storage units" value={counts.storageUnits} href="/locations" />
              <Stat
                label="Containers"
                value={counts.containers}
                href="/inventory"
                note={user.role === "researcher" ? `${formatCount(counts.myContainers)} of them yours` : "not counting disposed"}
              />
              <Stat label="Substances" value={counts.substances} href="/substances" />
              <Stat label="Sensors" value={counts.sensors} href={can(user.role, "temperatures.read") ? "/temperatures" : undefined} />
            </dl>
          </Card>

          <Card title="Sites">
            <table className="w-full text-sm">
              <thead>
                <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                  <th scope="col" className="py-2 font-medium">Site</th>
                  <th scope="col" className="py-2 text-right font-medium">Rooms</th>
                  <th scope="col" className="py-2 text-right font-medium">Atmospheric pressure</th>
                </tr>
              </thead>
              <tbody className="tabular">
                {siteRows.map((site) => (
                  <tr key={site.id} className="border-b border-ink-100 last:border-0">
                    <td className="py-2 font-medium text-ink-900">{site.name}</td>
                    <td className="py-2 text-right">{formatCount(site.rooms)}</td>
                    <td className="py-2 text-right">{formatQuantity(site.atmosphericPressureKPa, "kPa", 4)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </Card>
        </div>

        <div className="space-y-6">
          {findingScope ? (
            <Card title="Register events">
              {findingEventsList.length === 0 ? (
                <p className="text-sm text-ink-600">{ownScope ? `Nothing has happened yet to the findings of ${words.place}.` : "Nothing has happened in the register yet."}</p>
              ) : (
                <ol className="space-y-3">
                  {findingEventsList.map((event) => (
                    <li key={event.id} className="text-sm">
                      <p className="flex items-start gap-2">
                        <SeverityBadge severity={event.severity} />
                        <Link href={`/register/${event.findingId}`} className="text-ink-900 hover:underline">
                          {event.title}
                        </Link>
                      </p>
                      <p className="tabular text-xs text-ink-500">
                        {event.kind.replace("_", " ")} · {formatDateTime(event.at)}
                      </p>
                    </li>
                  ))}
                </ol>
              )}
            </Card>
          ) : null}
          {showAudit ? (
            <Card
              title="Recent activity"
              action={
                <Link href="/exports/audit" className="text-xs font-medium text-accent-700 hover:underline">
                  Audit log
                </Link>
              }
            >
              {events.length === 0 ? (
                <p className="text-sm text-ink-600">No activity recorded yet.</p>
              ) : (
                <ol className="space-y-3">
                  {events.map((event) => (
                    <li key={event.id} className="text-sm">
                      <p className="text-ink-900">{event.summary}</p>
                      <p className="tabular text-xs text-ink-500">
                        {formatDateTime(event.at)} · {event.actorLabel}
                      </p>
                    </li>
                  ))}
                </ol>
              )}
            </Card>
          ) : null}
          {can(user.role, "mail.view") && counts.queuedEmails > 0 ? (
            <Card title="E-mail">
              <p className="text-sm text-ink-700">
                {formatCount(counts.queuedEmails)} message{counts.queuedEmails === 1 ? " is" : "s are"} waiting to be sent.{" "}
                <Link href="/admin/mail" className="text-accent-700 hover:underline">
                  See the outbox
                </Link>
              </p>
            </Card>
          ) : null}
          <Caution />
        </div>
      </div>
    </div>
  );
}
