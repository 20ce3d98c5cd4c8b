"use client";
import { RotateCcw } from "lucide-react";
import { useEffect, useId, useMemo, useState, type ReactNode } from "react";
import { Area, CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { Button } from "@/components/ui/button";
import { formatCount, formatDateTime, formatTempC } from "@/lib/format/numbers";
import type { ReadingSeries } from "@/lib/temperatures/series";
import { bucketText, formatTick, setRangeText, temperatureAxis, timeTicks, traceDescription, traceRows, type TraceRow } from "./temperature-trace-data";

/*
 * Colours from the Okabe–Ito palette, which stays distinguishable with the common colour-vision
 * deficiencies (Okabe & Ito, "Color Universal Design", 2002). Every element also differs in
 * shape: solid trace, shaded envelope, dotted-edged band, dashed line, diagonal hatching, and
 * each carries a text label.
 */
const TRACE = "#0072B2"; // blue
const ENVELOPE = "#56B4E9"; // sky blue
const SET_RANGE = "#009E73"; // bluish green
const EXCURSION = "#D55E00"; // vermillion
const OVERLAY = "#000000"; // black: a model curve drawn over the readings
// Darker shades of the same hues for text, for contrast on white.
const SET_RANGE_TEXT = "#00664a";
const EXCURSION_TEXT = "#9c3d00";
const INK = "#56687a";

const MINUTE_MS = 60_000;
const DAY_MS = 24 * 60 * MINUTE_MS;

const PRESETS = [
  { key: "year", label: "Year", spanMs: 365 * DAY_MS },
  { key: "30d", label: "30 days", spanMs: 30 * DAY_MS },
  { key: "7d", label: "7 days", spanMs: 7 * DAY_MS },
  { key: "day", label: "Day", spanMs: DAY_MS },
] as const;

type View = { fromMs: number; toMs: number } | null;

/** A model curve drawn dashed over the readings (e.g. a fitted warm-up), with its legend text. */
export type TraceOverlay = { label: string; points: { atMs: number; tempC: number }[] };

const viewKey = (view: View) => (view ? `${view.fromMs}-${view.toMs}` : "default");

function seriesUrl(sensorId: number, view: View): string {
  if (!view) return `/api/v1/sensors/${sensorId}/readings`;
  const params = new URLSearchParams({ from: new Date(view.fromMs).toISOString(), to: new Date(view.toMs).toISOString() });
  return `/api/v1/sensors/${sensorId}/readings?${params}`;
}

/**
 * The series for a view. Windows already seen come from memory (the page's first window too), so
 * Reset and going back need no request; a newer view aborts an older request, and the last series
 * stays on screen while the next one loads.
 */
function useSeries(sensorId: number, initial: ReadingSeries | null | undefined, view: View) {
  const [attempt, setAttempt] = useState(0);
  const [cache, setCache] = useState<Record<string, ReadingSeries>>(() => (initial ? { [viewKey({ fromMs: initial.fromMs, toMs: initial.toMs })]: initial } : {}));
  const [latest, setLatest] = useState<ReadingSeries | null>(initial ?? null);
  const [failure, setFailure] = useState<{ key: string; message: string } | null>(null);
  const key = viewKey(view);
  const cached = cache[key];
  useEffect(() => {
    if (cached) return;
    const controller = new AbortController();
    fetch(seriesUrl(sensorId, view), { signal: controller.signal, headers: { accept: "application/json" }, credentials: "same-origin" })
      .then(async (response) => {
        const body = (await response.json().catch(() => null)) as { data?: ReadingSeries; error?: { message?: string } } | null;
        if (!response.ok || !body?.data) throw new Error(body?.error?.message ?? `The server answered ${response.status}.`);
        const series = body.data;
        setCache((previous) => ({ ...previous, [key]: series }));
        setLatest(series);
        setFailure(null);
      })
      .catch((error: unknown) => {
        if (controller.signal.aborted) return;
        setFailure({ key, message: error instanceof Error && error.message !== "Failed to fetch" ? error.message : "The server could not be reached." });
      });
    return () => controller.abort();
    // `view` is encoded in `key`; `attempt` asks again after a failure.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [sensorId, key, attempt, cached]);
  const failed = failure?.key === key ? failure.message : null;
  const retry = () => {
    setFailure(null);
    setAttempt((n) => n + 1);
  };
  return { series: cached ?? latest, error: cached ? null : failed, loading: !cached && !failed, retry };
}

/** Near an edge the peak's label goes to the side facing into the chart, so it is never cut off. */
function peakLabelSide(peakAtMs: number, fromMs: number, spanMs: number): "left" | "right" | "top" {
  const at = (peakAtMs - fromMs) / spanMs;
  return at > 0.88 ? "left" : at < 0.12 ? "right" : "top";
}

function Swatch({ children }: { children: ReactNode }) {
  return (
    <svg aria-hidden="true" width="28" height="14" viewBox="0 0 28 14" className="shrink-0">
      {children}
    </svg>
  );
}

function TraceTooltip({ active, payload, bucketMs }: { active?: boolean; payload?: ReadonlyArray<{ payload?: unknown }>; bucketMs: number | null }) {
  const row = payload?.[0]?.payload as TraceRow | undefined;
  if (!active || !row || row.tempC == null) return null;
  return (
    <div className="tabular rounded-md border border-ink-200 bg-white px-3 py-2 text-xs text-ink-800 shadow-md">
      {bucketMs ? (
        <>
          <p className="font-medium">
            {formatDateTime(row.atMs)} + {bucketText(bucketMs)}
          </p>
          <p>Mean {formatTempC(row.tempC)}</p>
          <p>
            Lowest {formatTempC(row.minC)} · highest {formatTempC(row.maxC)}
          </p>
          <p className="text-ink-600">{formatCount(row.count)} readings</p>
        </>
      ) : (
        <>
          <p className="font-medium">{formatDateTime(row.atMs)}</p>
          <p>{formatTempC(row.tempC)}</p>
        </>
      )}
    </div>
  );
}

/**
 * A sensor's temperature trace: the readings (or, zoomed out, bucket means with their lowest–
 * highest envelope), the location's set range as a band, the excursion threshold as a dashed line
 * and excursions hatched. Range buttons, panning and drag-to-zoom fetch the window again, so a
 * day shows every reading. Times are UTC.
 */
export function TemperatureTraceChart({
  sensorId,
  initial,
  overlays = [],
  className = "",
}: {
  sensorId: number;
  initial?: ReadingSeries | null;
  /** Curves drawn dashed in black over the readings; each takes a line in the legend. */
  overlays?: TraceOverlay[];
  className?: string;
}) {
  const uid = useId().replace(/:/g, "");
  const [view, setView] = useState<View>(initial ? { fromMs: initial.fromMs, toMs: initial.toMs } : null);
  const [drag, setDrag] = useState<{ startMs: number; endMs: number } | null>(null);
  const { series, error, loading, retry } = useSeries(sensorId, initial, view);
  const [home] = useState<View>(view);

  const rows = useMemo(() => (series ? traceRows(series) : []), [series]);
  if (!series) {
    return (
      <div className={`rounded-md border border-dashed border-ink-300 px-4 py-10 text-center text-sm text-ink-600 ${className}`} role="status">
        {error ? (
          <>
            <p className="text-sev-critical">{error}</p>
            <Button size="sm" variant="secondary" className="mt-2" onClick={retry}>
              Try again
            </Button>
          </>
        ) : (
          "Loading the temperature trace…"
        )}
      </div>
    );
  }
  if (!series.extent) {
    return (
      <div className={`rounded-md border border-dashed border-ink-300 px-4 py-10 text-center ${className}`}>
        <p className="font-medium text-ink-800">No readings yet</p>
        <p className="mt-1 text-sm text-ink-600">
          Sensor {series.sensor.externalId} has not sent any readings. They arrive through the ingest API or a logger file upload.
        </p>
      </div>
    );
  }

  const { fromMs, toMs } = series;
  const spanMs = toMs - fromMs;
  const anchorMs = series.extent.lastAtMs;
  // Overlays in the window (a fitted or projected warm-up) widen the axis so that they stay in view.
  const overlayTemps = overlays.flatMap((overlay) => overlay.points.filter((p) => p.atMs >= series.fromMs && p.atMs <= series.toMs).map((p) => p.tempC));
  const { domain, ticks: temperatureTicks } = temperatureAxis(series, 10, overlayTemps);
  const { ticks, unit } = timeTicks(fromMs, toMs);
  const { setMinC, setMaxC, thresholdC } = series.location;
  const rangeLabel = setRangeText(setMinC, setMaxC);
  const bucketed = series.resolution === "bucket" && series.bucketMs != null;
  const fewPoints = !bucketed && series.points.length <= 200;
  const bands = series.excursions.map((e) => {
    const x1 = Math.max(e.startAtMs, fromMs);
    const endMs = e.endAtMs ?? Math.max(anchorMs, e.startAtMs);
    // Keep a short excursion visible in a long window.
    const x2 = Math.min(Math.max(endMs, x1 + spanMs * 0.004), toMs);
    return { ...e, x1, x2, wide: (x2 - x1) / spanMs > 0.09 };
  });
  // One peak label per cluster: the highest peak speaks for excursions within a tenth of the window.
  const labelledPeaks = new Set<number>();
  for (const band of [...bands].sort((a, b) => b.peakTempC - a.peakTempC)) {
    const near = [...labelledPeaks].some((id) => Math.abs(bands.find((b) => b.id === id)!.peakAtMs - band.peakAtMs) < spanMs * 0.1);
    if (!near) labelledPeaks.add(band.id);
  }
  const activePreset = PRESETS.find((p) => p.spanMs === spanMs && toMs === anchorMs)?.key;
  const go = (next: View) => {
    setDrag(null);
    setView(next);
  };
  const description = [traceDescription(series), ...overlays.map((overlay) => `${overlay.label}.`)].join(" ");
  const open = series.excursions.filter((e) => e.endAtMs == null).length;

  return (
    <figure className={`space-y-3 ${className}`}>
      <div className="flex flex-wrap items-center justify-between gap-2 no-print">
        <div role="group" aria-label="Time range" className="inline-flex flex-wrap gap-1">
          {PRESETS.map((preset) => (
            <Button
              key={preset.key}
              size="sm"
              variant={activePreset === preset.key ? "primary" : "secondary"}
              aria-pressed={activePreset === preset.key}
              onClick={() => go({ fromMs: anchorMs - preset.spanMs, toMs: anchorMs })}
            >
              {preset.label}
            </Button>
          ))}
        </div>
        <div className="inline-flex flex-wrap gap-1">
          <Button size="sm" variant="ghost" onClick={() => go({ fromMs: fromMs - spanMs, toMs: fromMs })}>
            ← Earlier
          </Button>
          <Button size="sm" variant="ghost" disabled={toMs >= anchorMs} onClick={() => go({ fromMs: Math.min(toMs, anchorMs - spanMs), toMs: Math.min(toMs + spanMs, anchorMs) })}>
            Later →
          </Button>
          <Button size="sm" variant="secondary" disabled={viewKey(view) === viewKey(home)} onClick={() => go(home)}>
            <RotateCcw aria-hidden="true" className="size-3.5" />
            Reset
          </Button>
        </div>
      </div>

      <p className="tabular text-xs text-ink-600" aria-live="polite">
        {formatDateTime(fromMs)} – {formatDateTime(toMs)} ·{" "}
        {bucketed ? `${bucketText(series.bucketMs!)} means with their lowest–highest range` : "every reading"} ·{" "}
        <span className="no-print">drag across the chart to zoom in</span>
        {loading ? " · loading…" : ""}
      </p>
      {error ? (
        <p role="alert" className="text-sm text-sev-critical">
          {error}{" "}
          <button type="button" className="font-medium underline" onClick={retry}>
            Try again
          </button>
        </p>
      ) : null}

      <div className={`relative h-80 w-full select-none transition-opacity ${loading ? "opacity-60" : ""}`} role="img" aria-label={description}>
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart
            data={rows}
            margin={{ top: 22, right: 16, bottom: 26, left: 4 }}
            onMouseDown={(state) => {
              const atMs = Number(state.activeLabel);
              if (Number.isFinite(atMs)) setDrag({ startMs: atMs, endMs: atMs });
            }}
            onMouseMove={(state) => {
              const atMs = Number(state.activeLabel);
              if (drag && Number.isFinite(atMs)) setDrag({ ...drag, endMs: atMs });
            }}
            onMouseUp={() => {
              if (drag && Math.abs(drag.endMs - drag.startMs) >= MINUTE_MS) go({ fromMs: Math.min(drag.startMs, drag.endMs), toMs: Math.max(drag.startMs, drag.endMs) });
              else setDrag(null);
            }}
            onMouseLeave={() => setDrag(null)}
          >
            <defs>
              <pattern id={`${uid}-hatch`} patternUnits="userSpaceOnUse" width="7" height="7" patternTransform="rotate(45)">
                <rect width="7" height="7" fill={EXCURSION} fillOpacity="0.08" />
                <line x1="0" y1="0" x2="0" y2="7" stroke={EXCURSION} strokeWidth="2.2" strokeOpacity="0.5" />
              </pattern>
            </defs>
            <CartesianGrid stroke="#dde3e9" strokeDasharray="3 3" />
            <XAxis
              dataKey="atMs"
              type="number"
              scale="time"
              domain={[fromMs, toMs]}
              allowDataOverflow
              ticks={ticks}
              tickFormatter={(t: number) => formatTick(t, unit)}
              tick={{ fontSize: 12, fill: INK }}
              label={{ value: "Time (UTC)", position: "insideBottom", offset: -16, fill: INK, fontSize: 12 }}
            />
            <YAxis
              type="number"
              domain={domain}
              ticks={temperatureTicks}
              allowDataOverflow
              tickFormatter={(t: number) => `${t}`.replace("-", "−")}
              tick={{ fontSize: 12, fill: INK }}
              width={52}
              label={{ value: "Temperature (°C)", angle: -90, position: "insideLeft", offset: 8, fill: INK, fontSize: 12, style: { textAnchor: "middle" } }}
            />
            {rangeLabel ? (
              <ReferenceArea
                y1={setMinC ?? domain[0]}
                y2={setMaxC!}
                fill={SET_RANGE}
                fillOpacity={0.1}
                stroke={SET_RANGE}
                strokeOpacity={0.8}
                strokeDasharray="2 3"
                ifOverflow="hidden"
                label={{ value: rangeLabel, position: "insideBottomLeft", fill: SET_RANGE_TEXT, fontSize: 11 }}
              />
            ) : null}
            {bands.map((band) => (
              <ReferenceArea
                key={band.id}
                x1={band.x1}
                x2={band.x2}
                fill={`url(#${uid}-hatch)`}
                stroke={EXCURSION}
                strokeOpacity={0.7}
                ifOverflow="hidden"
                label={band.wide ? { value: band.endAtMs == null ? "Excursion (open)" : "Excursion", position: "insideBottom", fill: EXCURSION_TEXT, fontSize: 11 } : undefined}
              />
            ))}
            {thresholdC != null ? (
              <ReferenceLine
                y={thresholdC}
                stroke={EXCURSION}
                strokeWidth={1.5}
                strokeDasharray="8 4"
                ifOverflow="extendDomain"
                label={{ value: `Excursion threshold ${formatTempC(thresholdC)}`, position: "insideTopLeft", fill: EXCURSION_TEXT, fontSize: 11 }}
              />
            ) : null}
            {bucketed ? <Area dataKey="range" stroke="none" fill={ENVELOPE} fillOpacity={0.45} isAnimationActive={false} connectNulls={false} activeDot={false} name="Lowest–highest" /> : null}
            <Line
              dataKey="tempC"
              stroke={TRACE}
              strokeWidth={1.75}
              dot={fewPoints ? { r: 2.5, fill: TRACE, strokeWidth: 0 } : false}
              activeDot={{ r: 4, fill: "#fff", stroke: TRACE, strokeWidth: 2 }}
              isAnimationActive={false}
              connectNulls={false}
              name={bucketed ? "Mean" : "Reading"}
            />
            {overlays.map((overlay, index) => (
              <Line
                key={`overlay-${index}`}
                data={overlay.points}
                dataKey="tempC"
                stroke={OVERLAY}
                strokeWidth={2}
                strokeDasharray="6 4"
                dot={false}
                activeDot={false}
                isAnimationActive={false}
                tooltipType="none"
                name={overlay.label}
              />
            ))}
            {bands
              .filter((band) => band.peakAtMs >= fromMs && band.peakAtMs <= toMs)
              .map((band) => (
                <ReferenceDot
                  key={`peak-${band.id}`}
                  x={band.peakAtMs}
                  y={band.peakTempC}
                  r={4}
                  fill="#fff"
                  stroke={EXCURSION}
                  strokeWidth={2}
                  ifOverflow="hidden"
                  label={labelledPeaks.has(band.id) ? { value: `Peak ${formatTempC(band.peakTempC)}`, position: peakLabelSide(band.peakAtMs, fromMs, spanMs), fill: EXCURSION_TEXT, fontSize: 11 } : undefined}
                />
              ))}
            {drag && drag.endMs !== drag.startMs ? <ReferenceArea x1={Math.min(drag.startMs, drag.endMs)} x2={Math.max(drag.startMs, drag.endMs)} fill={INK} fillOpacity={0.12} stroke={INK} strokeDasharray="4 2" /> : null}
            <Tooltip content={(props) => <TraceTooltip active={props.active} payload={props.payload} bucketMs={bucketed ? series.bucketMs : null} />} isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
        {series.summary.count === 0 ? (
          <p className="absolute inset-0 flex items-center justify-center text-sm font-medium text-ink-700">No readings in this window.</p>
        ) : null}
      </div>

      <figcaption>
        <ul className="flex flex-wrap gap-x-5 gap-y-1.5 text-xs text-ink-700">
          <li className="flex items-center gap-1.5">
            <Swatch>
              <line x1="1" y1="7" x2="27" y2="7" stroke={TRACE} strokeWidth="2" />
            </Swatch>
            {bucketed ? `Mean per ${bucketText(series.bucketMs!)}` : "Readings"}
          </li>
          {bucketed ? (
            <li className="flex items-center gap-1.5">
              <Swatch>
                <rect x="1" y="2" width="26" height="10" fill={ENVELOPE} fillOpacity="0.45" />
              </Swatch>
              Lowest to highest reading in each {bucketText(series.bucketMs!)}
            </li>
          ) : null}
          {overlays.map((overlay, index) => (
            <li key={`overlay-${index}`} className="flex items-center gap-1.5">
              <Swatch>
                <line x1="1" y1="7" x2="27" y2="7" stroke={OVERLAY} strokeWidth="2" strokeDasharray="6 4" />
              </Swatch>
              {overlay.label}
            </li>
          ))}
          {rangeLabel ? (
            <li className="flex items-center gap-1.5">
              <Swatch>
                <rect x="1" y="2" width="26" height="10" fill={SET_RANGE} fillOpacity="0.1" stroke={SET_RANGE} strokeDasharray="2 3" />
              </Swatch>
              {rangeLabel} (band)
            </li>
          ) : null}
          {thresholdC != null ? (
            <li className="flex items-center gap-1.5">
              <Swatch>
                <line x1="1" y1="7" x2="27" y2="7" stroke={EXCURSION} strokeWidth="1.5" strokeDasharray="8 4" />
              </Swatch>
              Excursion threshold {formatTempC(thresholdC)} (dashed)
            </li>
          ) : (
            <li>No excursion threshold is set for this location.</li>
          )}
          <li className="flex items-center gap-1.5">
            <Swatch>
              <defs>
                <pattern id={`${uid}-legend-hatch`} patternUnits="userSpaceOnUse" width="5" height="5" patternTransform="rotate(45)">
                  <line x1="0" y1="0" x2="0" y2="5" stroke={EXCURSION} strokeWidth="2" strokeOpacity="0.6" />
                </pattern>
              </defs>
              <rect x="1" y="1" width="26" height="12" fill={`url(#${uid}-legend-hatch)`} stroke={EXCURSION} strokeOpacity="0.7" />
            </Swatch>
            Excursion (hatched), ○ its peak
          </li>
        </ul>
        <dl className="tabular mt-3 grid grid-cols-2 gap-x-4 gap-y-2 text-sm sm:grid-cols-4">
          <div>
            <dt className="text-xs text-ink-600">Highest in view</dt>
            <dd className="font-semibold text-ink-950">{formatTempC(series.summary.maxC)}</dd>
            <dd className="text-xs text-ink-600">{series.summary.maxAtMs != null ? formatDateTime(series.summary.maxAtMs) : "—"}</dd>
          </div>
          <div>
            <dt className="text-xs text-ink-600">Lowest in view</dt>
            <dd className="font-semibold text-ink-950">{formatTempC(series.summary.minC)}</dd>
            <dd className="text-xs text-ink-600">{series.summary.minAtMs != null ? formatDateTime(series.summary.minAtMs) : "—"}</dd>
          </div>
          <div>
            <dt className="text-xs text-ink-600">Latest reading in view</dt>
            <dd className="font-semibold text-ink-950">{formatTempC(series.summary.last?.tempC)}</dd>
            <dd className="text-xs text-ink-600">{series.summary.last ? formatDateTime(series.summary.last.atMs) : "—"}</dd>
          </div>
          <div>
            <dt className="text-xs text-ink-600">In view</dt>
            <dd className="font-semibold text-ink-950">{formatCount(series.summary.count)} readings</dd>
            <dd className="text-xs text-ink-600">
              {series.excursions.length === 0 ? "no excursions" : `${series.excursions.length} excursion${series.excursions.length === 1 ? "" : "s"}${open ? `, ${open} open` : ""}`}
            </dd>
          </div>
        </dl>
      </figcaption>
    </figure>
  );
}
