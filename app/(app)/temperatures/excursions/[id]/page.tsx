import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { TemperatureTraceChart, type TraceOverlay } from "@/components/charts/temperature-trace-chart";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { SeverityBadge } from "@/components/ui/severity";
import { getDb } from "@/db/client";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime, formatDurationMin, formatTempC } from "@/lib/format/numbers";
import { idParam } from "@/lib/http/paging";
import { projectOpenExcursion, crossingText } from "@/lib/temperatures/projection";
import { listExcursions } from "@/lib/temperatures/queries";
import { readingSeries } from "@/lib/temperatures/series";
import { ExcursionList } from "../../excursion-list";

export const metadata: Metadata = { title: "Excursion" };

const HOUR_MS = 3_600_000;

/**
 * One excursion: what happened, and while it is open where the unit's warm-up is heading — the
 * projected curve dashed on the chart and the clock times at which its contents cross their
 * thresholds, earliest first.
 */
export default async function ExcursionPage({ params }: { params: Promise<{ id: string }> }) {
  const { user } = await requirePagePermission("temperatures.read");
  const id = idParam((await params).id);
  const row = id ? listExcursions({ id, limit: 1 })[0] : undefined;
  if (!row) notFound();
  // eslint-disable-next-line react-hooks/purity -- a server component renders once per request
  const nowMs = Date.now();
  const projection = projectOpenExcursion(getDb(), { id: row.id, sensorId: row.sensorId, storageUnitId: row.storageUnitId, endAt: row.endAt }, nowMs);
  const startMs = row.startAt.getTime();
  const endMs = projection ? projection.curve.at(-1)!.atMs : (row.endAt?.getTime() ?? nowMs);
  const series = readingSeries(row.sensorId, { fromMs: startMs - 6 * HOUR_MS, toMs: endMs + HOUR_MS }, nowMs);
  const overlays: TraceOverlay[] = projection
    ? [{ label: `Projected warm-up from the latest reading (τ = ${formatDurationMin(projection.tauMin)}, towards ${formatTempC(projection.roomTempC)})`, points: projection.curve }]
    : [];
  const news = projection ? projection.crossings.filter((c) => !c.inControl) : [];
  const known = projection ? projection.crossings.filter((c) => c.inControl) : [];
  const where = row.unitCode ? `${row.unitCode}${row.roomCode ? ` in ${row.roomCode}` : ""}` : (row.roomCode ?? "—");
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/temperatures" className="text-accent-700 hover:underline">
          ← Temperatures
        </Link>
      </p>
      <PageHeader
        title={`Excursion at ${where}`}
        description={`Sensor ${row.sensorExternalId} · above ${formatTempC(row.thresholdC)} since ${formatDateTime(row.startAt)}${row.endAt ? ` until ${formatDateTime(row.endAt)}` : ", still open"}`}
      />
      <Card title="The excursion">
        <ExcursionList rows={[row]} mayAcknowledge={can(user.role, "excursions.acknowledge")} showSensor showLocation />
      </Card>
      {projection ? (
        <Card title="If it keeps warming">
          <p className="mb-3 text-sm text-ink-700">
            Latest reading {formatTempC(projection.latest.tempC)} at {formatDateTime(projection.latest.at)}. Projected with Newton&apos;s law of heating
            towards the room&apos;s worst case of {formatTempC(projection.roomTempC)}: {projection.tauReason.replace(/\.$/, "")}. Times are UTC,
            rounded down to five minutes.
          </p>
          {news.length === 0 ? (
            <p className="text-sm text-ink-700">Nothing in it crosses a threshold before it reaches the room&apos;s temperature.</p>
          ) : (
            <ol className="space-y-1.5 text-sm">
              {news.map((c) => (
                <li key={c.key} className="flex flex-wrap items-center gap-2">
                  <SeverityBadge severity={c.severity} />
                  <span className={c.reached ? "font-semibold text-ink-950" : "text-ink-900"}>{crossingText(c, projection.latest.at)}</span>
                  <span className="text-xs text-ink-600">({formatTempC(c.tempC)})</span>
                </li>
              ))}
            </ol>
          )}
          {known.length > 0 ? (
            <p className="mt-3 text-xs text-ink-600">
              Already at these levels in control (findings of their own): {[...new Set(known.map((c) => `${c.name} ${c.threshold}`))].join("; ")}.
            </p>
          ) : null}
        </Card>
      ) : null}
      <Card title={`Sensor ${row.sensorExternalId}`}>
        <TemperatureTraceChart sensorId={row.sensorId} initial={series} overlays={overlays} />
      </Card>
      <Caution />
    </div>
  );
}
