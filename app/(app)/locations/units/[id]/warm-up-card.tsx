import type { ReactNode } from "react";
import { TemperatureTraceChart, type TraceOverlay } from "@/components/charts/temperature-trace-chart";
import { Card } from "@/components/ui/card";
import type { SessionUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { NotFoundError } from "@/lib/errors";
import { warmUpMinutesToReach } from "@/lib/hazard";
import { formatCount, formatDateTime, formatNumber, formatTempC } from "@/lib/format/numbers";
import { readingSeries } from "@/lib/temperatures/series";
import { formatTauMin } from "@/lib/temperatures/warm-up-defaults";
import { unitWarmUpSummary, type fittedCurves } from "@/lib/temperatures/warm-up-store";

type FittedCurves = ReturnType<typeof fittedCurves>;

/** The fitted warm-up as dashed curves over each sensor's readings, for the unit's temperature charts. */
export function warmUpOverlays(curves: FittedCurves): Record<number, TraceOverlay[]> {
  const bySensor: Record<number, TraceOverlay[]> = {};
  if (!curves) return bySensor;
  for (const curve of curves.curves) {
    const list = (bySensor[curve.sensorId] ??= []);
    list.push({
      label: list.length === 0 ? `Fitted warm-up, τ = ${formatTauMin(curves.fit.tauMin)} (dashed)` : `Fitted warm-up, failure ${list.length + 1}`,
      points: curve.points.map((p) => ({ atMs: p.atMs, tempC: p.fittedC })),
    });
  }
  return bySensor;
}

const HOUR_MS = 3_600_000;

const SOURCE_TEXT = {
  set: "Set by a person",
  fitted: "Fitted to this unit's recorded failures",
  default: "Default for its kind",
} as const;

function Block({ label, value, detail }: { label: ReactNode; value: string; detail: string }) {
  return (
    <div className="rounded-md border border-ink-200 bg-ink-50 px-4 py-3">
      <p className="text-xs font-medium uppercase tracking-wide text-ink-600">{label}</p>
      <p className="tabular mt-1 text-2xl font-semibold text-ink-950">{value}</p>
      <p className="text-sm text-ink-800">{detail}</p>
    </div>
  );
}

/**
 * The unit's warm-up after a failure: τ with where it comes from, the fit's quality and history,
 * and (for those who may read sensors) the fitted curve dashed over the failure it was fitted to.
 */
export function WarmUpCard({ user, unit, curves }: { user: SessionUser; unit: { id: number; setMaxC: number | null }; curves: FittedCurves }) {
  let summary;
  try {
    summary = unitWarmUpSummary(unit.id);
  } catch (error) {
    if (error instanceof NotFoundError) return null; // not temperature-controlled: no warm-up to show
    throw error;
  }
  const mayReadSensors = can(user.role, "temperatures.read");
  const latestCurve = curves?.curves.at(-1) ?? null;
  let chart = null;
  if (mayReadSensors && latestCurve) {
    const fromMs = latestCurve.points[0].atMs - 3 * HOUR_MS;
    const toMs = Math.max(latestCurve.endAtMs ?? latestCurve.points.at(-1)!.atMs, latestCurve.points.at(-1)!.atMs) + 3 * HOUR_MS;
    chart = {
      sensorId: latestCurve.sensorId,
      initial: readingSeries(latestCurve.sensorId, { fromMs, toMs }),
      overlays: warmUpOverlays(curves)[latestCurve.sensorId] ?? [],
    };
  }
  const roomTempC = summary.roomTempC;
  const startTempC = unit.setMaxC;
  const halfway =
    roomTempC != null && startTempC != null && roomTempC > startTempC
      ? warmUpMinutesToReach({ roomTempC, startTempC, tauMin: summary.tauMinutes }, (roomTempC + startTempC) / 2)
      : null;

  return (
    <Card title="Warm-up after a failure">
      <div className="space-y-5">
        <div className="grid gap-3 md:grid-cols-3">
          <Block
            label={
              <>
                Time constant <span className="normal-case">τ</span>
              </>
            }
            value={formatTauMin(summary.tauMinutes)}
            detail={SOURCE_TEXT[summary.source]}
          />
          <Block
            label="Warms towards"
            value={formatTempC(roomTempC)}
            detail={roomTempC != null ? "Its room's worst case, as the control-lost assessment uses it" : "Not known: the room has no design maximum or readings"}
          />
          <Block
            label="Fit's RMS error"
            value={summary.fit ? `${formatNumber(summary.fit.rmsErrorC, 2)} °C` : "No fit yet"}
            detail={
              summary.fit
                ? `Over ${summary.fit.excursions === 1 ? "1 recorded failure" : `${summary.fit.excursions} recorded failures`}, ${formatCount(summary.fit.readings)} readings`
                : "No usable recorded failure of this unit so far"
            }
          />
        </div>
        <p className="text-sm text-ink-800">{summary.reason}</p>
        {halfway != null && startTempC != null && roomTempC != null ? (
          <p className="tabular text-sm text-ink-700">
            Newton&apos;s law of heating, T(t) = T<sub>room</sub> − (T<sub>room</sub> − T<sub>start</sub>)·e<sup>−t/τ</sup>: from the upper end of its set range (
            {formatTempC(startTempC)}) the unit would be half-way to {formatTempC(roomTempC)} after {formatTauMin(halfway)} (τ·ln 2), and 95 % of the way after{" "}
            {formatTauMin(3 * summary.tauMinutes)} (3τ).
          </p>
        ) : null}

        {chart ? (
          <section aria-labelledby="warm-up-chart-heading" className="space-y-2">
            <h3 id="warm-up-chart-heading" className="text-sm font-semibold text-ink-900">
              The latest failure it was fitted to
            </h3>
            <p className="text-xs text-ink-600">
              The model starts from the last reading within limits before the excursion and runs to its peak, against the room&apos;s own readings at the time (or its
              design maximum when it has no logger).
            </p>
            <TemperatureTraceChart sensorId={chart.sensorId} initial={chart.initial} overlays={chart.overlays} />
          </section>
        ) : null}

        {mayReadSensors && curves && curves.rejected.length > 0 ? (
          <section aria-labelledby="warm-up-unused-heading">
            <h3 id="warm-up-unused-heading" className="text-sm font-semibold text-ink-900">
              Excursions not used for the fit ({curves.rejected.length})
            </h3>
            <ul className="mt-1 list-disc space-y-0.5 pl-5 text-sm text-ink-700">
              {curves.rejected.map((r) => (
                <li key={r.excursionId}>
                  Excursion {r.excursionId}: {r.reason}
                </li>
              ))}
            </ul>
          </section>
        ) : null}

        {summary.fitHistory.length > 0 ? (
          <section aria-labelledby="warm-up-history-heading">
            <h3 id="warm-up-history-heading" className="text-sm font-semibold text-ink-900">
              Fit history
            </h3>
            <div className="mt-2 overflow-x-auto">
              <table className="tabular w-full min-w-[36rem] border-collapse text-sm">
                <caption className="sr-only">Every fit of this unit&apos;s warm-up, newest first</caption>
                <thead className="bg-ink-50 text-left text-xs font-semibold text-ink-700">
                  <tr>
                    <th scope="col" className="px-2 py-2">
                      Fitted
                    </th>
                    <th scope="col" className="px-2 py-2 text-right">
                      τ
                    </th>
                    <th scope="col" className="px-2 py-2 text-right">
                      RMS error
                    </th>
                    <th scope="col" className="px-2 py-2 text-right">
                      Failures
                    </th>
                    <th scope="col" className="px-2 py-2 text-right">
                      Readings
                    </th>
                    <th scope="col" className="px-2 py-2">
                      Room temperature
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {summary.fitHistory.map((f, index) => (
                    <tr key={f.fittedAt + index} className="border-t border-ink-200">
                      <td className="px-2 py-1.5 whitespace-nowrap">
                        {formatDateTime(Date.parse(f.fittedAt))}
                        {index === 0 ? <span className="ml-2 text-xs font-semibold text-accent-800">latest</span> : null}
                      </td>
                      <td className="px-2 py-1.5 text-right whitespace-nowrap">{formatTauMin(f.tauMinutes)}</td>
                      <td className="px-2 py-1.5 text-right whitespace-nowrap">{formatNumber(f.rmsErrorC, 2)} °C</td>
                      <td className="px-2 py-1.5 text-right">{formatCount(f.excursions)}</td>
                      <td className="px-2 py-1.5 text-right">{formatCount(f.readings)}</td>
                      <td className="px-2 py-1.5">
                        {formatTempC(f.roomTempC)} mean, {f.roomTempSource === "sensor" ? "from the room's logger" : "the room's design maximum"}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </section>
        ) : null}

        <p className="text-xs text-ink-600">
          A screening estimate from Newton&apos;s law of heating, not a measurement: the unit&apos;s own logger shows what actually happens after a failure.
          {can(user.role, "locations.write") ? " Set τ, or clear it back to the fitted or default value, under Edit storage unit below." : ""}
        </p>
      </div>
    </Card>
  );
}
