/**
 * Pure helpers behind the temperature trace chart: the rows it draws (with breaks where the
 * logger was silent), the temperature axis, UTC time ticks and the words that describe the
 * chart to someone who cannot see it. Times are epoch milliseconds and shown in UTC.
 */
import { formatDateTime, formatDurationMin, formatTempC } from "@/lib/format/numbers";
import type { ReadingSeries } from "@/lib/temperatures/series";

const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const DAY_MS = 24 * HOUR_MS;

export type TraceRow = { atMs: number; tempC: number | null; range: [number, number] | null; minC: number | null; maxC: number | null; count: number };

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/**
 * The rows to draw. A silence longer than five typical intervals (or 2.5 buckets) becomes a break
 * in the line, so the chart never draws a straight line across hours without readings.
 */
export function traceRows(series: Pick<ReadingSeries, "points" | "bucketMs">): TraceRow[] {
  const { points } = series;
  if (points.length === 0) return [];
  const steps = points.slice(1).map((p, i) => p.atMs - points[i].atMs).sort((a, b) => a - b);
  const typicalMs = series.bucketMs ?? (steps.length ? steps[Math.floor(steps.length / 2)] : 0);
  const gapMs = series.bucketMs != null ? 2.5 * series.bucketMs : Math.max(5 * typicalMs, 15 * MINUTE_MS);
  const rows: TraceRow[] = [];
  points.forEach((p, i) => {
    if (i > 0 && p.atMs - points[i - 1].atMs > gapMs) {
      rows.push({ atMs: points[i - 1].atMs + 1, tempC: null, range: null, minC: null, maxC: null, count: 0 });
    }
    rows.push({ atMs: p.atMs, tempC: p.tempC, range: [p.minC, p.maxC], minC: p.minC, maxC: p.maxC, count: p.count });
  });
  return rows;
}

export type TemperatureAxis = { domain: [number, number]; ticks: number[] };

/**
 * The temperature axis: the readings, the set range and the threshold with at least a degree of
 * room, on steps of 1, 2, 5, 10 or 20 °C so the ticks are evenly spaced whole numbers.
 */
export function temperatureAxis(series: Pick<ReadingSeries, "summary" | "location">, maxTicks = 10, extraC: readonly number[] = []): TemperatureAxis {
  const values = [series.summary.minC, series.summary.maxC, series.location.setMinC, series.location.setMaxC, series.location.thresholdC, ...extraC].filter(
    (v): v is number => v != null && Number.isFinite(v),
  );
  const low = values.length ? Math.min(...values) - 1 : 0;
  const high = values.length ? Math.max(...values) + 1 : 10;
  const step = [1, 2, 5, 10, 20, 50].find((s) => (Math.ceil(high / s) - Math.floor(low / s)) <= maxTicks - 1) ?? 100;
  const from = Math.floor(low / step) * step;
  const to = Math.max(Math.ceil(high / step) * step, from + 2 * step);
  const ticks: number[] = [];
  for (let t = from; t <= to; t += step) ticks.push(t);
  return { domain: [from, to], ticks };
}

const TICK_STEPS_MS = [15 * MINUTE_MS, 30 * MINUTE_MS, HOUR_MS, 2 * HOUR_MS, 3 * HOUR_MS, 6 * HOUR_MS, 12 * HOUR_MS, DAY_MS, 2 * DAY_MS, 7 * DAY_MS, 14 * DAY_MS];

export type TimeTicks = { ticks: number[]; unit: "time" | "day" | "month" };

/** Ticks on whole UTC hours, days or months, at most about `maxTicks` of them. */
export function timeTicks(fromMs: number, toMs: number, maxTicks = 8): TimeTicks {
  const spanMs = toMs - fromMs;
  const step = TICK_STEPS_MS.find((s) => spanMs / s <= maxTicks);
  if (step != null) {
    // Weekly ticks fall on Mondays (1970-01-01, day 0 of epoch time, was a Thursday).
    const offsetMs = step >= 7 * DAY_MS ? 4 * DAY_MS : 0;
    const first = Math.ceil((fromMs - offsetMs) / step) * step + offsetMs;
    const ticks: number[] = [];
    for (let t = first; t <= toMs; t += step) ticks.push(t);
    return { ticks, unit: step < DAY_MS ? "time" : "day" };
  }
  const months = Math.ceil(spanMs / (30.44 * DAY_MS) / maxTicks);
  const start = new Date(fromMs);
  const ticks: number[] = [];
  // Months counted from year 0, so a two-month step lands on the same months every year.
  for (let index = start.getUTCFullYear() * 12 + start.getUTCMonth(); ; index += 1) {
    const t = Date.UTC(Math.floor(index / 12), index % 12, 1);
    if (t > toMs) break;
    if (t >= fromMs && index % months === 0) ticks.push(t);
  }
  return { ticks, unit: "month" };
}

const pad = (n: number) => String(n).padStart(2, "0");

/** "15:00" (with the day at midnight), "14 Jul" or "Jul 2026", all UTC. */
export function formatTick(ms: number, unit: TimeTicks["unit"]): string {
  const d = new Date(ms);
  if (unit === "month") return d.getUTCMonth() === 0 ? `${MONTHS[0]} ${d.getUTCFullYear()}` : MONTHS[d.getUTCMonth()];
  const day = `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}`;
  if (unit === "day") return day;
  const time = `${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}`;
  return time === "00:00" ? day : time;
}

/** "Set range 2–8 °C", "Set range up to 8 °C". */
export function setRangeText(setMinC: number | null, setMaxC: number | null): string | null {
  if (setMaxC == null) return null;
  const plain = (t: number) => formatTempC(t).replace(/ °C$/, "").replace(/\.0$/, "");
  return setMinC == null ? `Set range up to ${plain(setMaxC)} °C` : `Set range ${plain(setMinC)}–${plain(setMaxC)} °C`;
}

/** The bucket width in words: "6 h", "5 min", "2 days". */
export function bucketText(bucketMs: number): string {
  return formatDurationMin(bucketMs / MINUTE_MS);
}

/** The chart's accessible name: what it shows, its extremes and its excursions. */
export function traceDescription(series: ReadingSeries): string {
  const where = `${series.location.kind === "unit" ? "storage unit" : "room"} ${series.location.code}`;
  const window = `from ${formatDateTime(series.fromMs)} to ${formatDateTime(series.toMs)}`;
  if (series.summary.count === 0) return `Temperature trace of sensor ${series.sensor.externalId} on ${where} ${window}: no readings in this window.`;
  const parts = [
    `Temperature trace of sensor ${series.sensor.externalId} on ${where} ${window}`,
    `${series.summary.count.toLocaleString("en-GB")} readings${series.resolution === "bucket" && series.bucketMs ? `, drawn as ${bucketText(series.bucketMs)} means with their range` : ""}`,
    `highest ${formatTempC(series.summary.maxC)} at ${formatDateTime(series.summary.maxAtMs)}`,
    `lowest ${formatTempC(series.summary.minC)}`,
  ];
  const range = setRangeText(series.location.setMinC, series.location.setMaxC);
  if (range) parts.push(range.replace(/^Set/, "set"));
  if (series.location.thresholdC != null) parts.push(`excursion threshold ${formatTempC(series.location.thresholdC)}`);
  const open = series.excursions.filter((e) => e.endAtMs == null).length;
  parts.push(
    series.excursions.length === 0
      ? "no excursions"
      : `${series.excursions.length} excursion${series.excursions.length === 1 ? "" : "s"}${open ? `, ${open} still open` : ""}, highest peak ${formatTempC(Math.max(...series.excursions.map((e) => e.peakTempC)))}`,
  );
  return `${parts.join("; ")}.`;
}
