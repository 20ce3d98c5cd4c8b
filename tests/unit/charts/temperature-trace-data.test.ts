import { describe, expect, it } from "vitest";
import { formatTick, setRangeText, temperatureAxis, timeTicks, traceDescription, traceRows } from "@/components/charts/temperature-trace-data";
import { formatDurationMin } from "@/lib/format/numbers";
import type { ReadingSeries } from "@/lib/temperatures/series";

const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;
const T0 = Date.UTC(2026, 6, 14); // 2026-07-14T00:00Z

const point = (atMs: number, tempC: number) => ({ atMs, tempC, minC: tempC, maxC: tempC, count: 1 });

function series(overrides: Partial<ReadingSeries> = {}): ReadingSeries {
  return {
    sensor: { id: 1, externalId: "S-204", name: "Door logger", active: true },
    location: { kind: "unit", id: 3, code: "FR-2", name: "Fridge", setMinC: 2, setMaxC: 8, thresholdC: 8, minDurationMin: 30 },
    fromMs: T0,
    toMs: T0 + DAY,
    resolution: "raw",
    bucketMs: null,
    points: [point(T0, 4.1), point(T0 + 15 * HOUR + 40 * MIN, 14.2), point(T0 + 16 * HOUR, 5)],
    summary: { count: 3, minC: 4.1, minAtMs: T0, maxC: 14.2, maxAtMs: T0 + 15 * HOUR + 40 * MIN, last: { atMs: T0 + 16 * HOUR, tempC: 5 } },
    extent: { firstAtMs: T0, lastAtMs: T0 + 16 * HOUR },
    excursions: [{ id: 9, thresholdC: 8, startAtMs: T0 + 15 * HOUR, endAtMs: null, peakTempC: 14.2, peakAtMs: T0 + 15 * HOUR + 40 * MIN, acknowledged: false }],
    ...overrides,
  };
}

describe("traceRows", () => {
  it("breaks the line where the logger was silent for more than five typical intervals", () => {
    const points = [0, 10, 20, 30, 40, 200, 210].map((m) => point(T0 + m * MIN, 5));
    const rows = traceRows({ points, bucketMs: null });
    // Median interval 10 min → gaps over max(50 min, 15 min) break; 40 → 200 min is one.
    expect(rows.map((r) => r.tempC)).toEqual([5, 5, 5, 5, 5, null, 5, 5]);
    expect(rows[5].atMs).toBe(T0 + 40 * MIN + 1);
  });

  it("breaks bucketed series after 2.5 empty buckets and keeps each bucket's range", () => {
    const b = 6 * HOUR;
    const points = [
      { atMs: T0, tempC: 5, minC: 4, maxC: 7, count: 72 },
      { atMs: T0 + b, tempC: 5, minC: 4, maxC: 6, count: 72 },
      { atMs: T0 + 4 * b, tempC: 6, minC: 5, maxC: 9, count: 72 },
    ];
    const rows = traceRows({ points, bucketMs: b });
    expect(rows.map((r) => r.range)).toEqual([[4, 7], [4, 6], null, [5, 9]]);
  });
});

describe("temperatureAxis", () => {
  it("spans readings, set range and threshold on even whole-degree steps", () => {
    // 2–14.2 °C with a degree either side: 1 … 15.2 → step 2 → 0 … 16.
    expect(temperatureAxis(series())).toEqual({ domain: [0, 16], ticks: [0, 2, 4, 6, 8, 10, 12, 14, 16] });
  });

  it("handles a freezer below zero and a room without limits", () => {
    const freezer = series({ location: { kind: "unit", id: 1, code: "FZ-1", name: "Freezer", setMinC: -25, setMaxC: -15, thresholdC: -10, minDurationMin: 30 }, summary: { count: 1, minC: -21, minAtMs: T0, maxC: -18, maxAtMs: T0, last: null } });
    // −25 … −10 °C with a degree either side: −26 … −9 → step 2 → −26 … −8.
    expect(temperatureAxis(freezer)).toEqual({ domain: [-26, -8], ticks: [-26, -24, -22, -20, -18, -16, -14, -12, -10, -8] });
    const empty = series({ location: { kind: "room", id: 1, code: "B-1", name: "Lab", setMinC: null, setMaxC: null, thresholdC: null, minDurationMin: null }, summary: { count: 0, minC: null, minAtMs: null, maxC: null, maxAtMs: null, last: null } });
    expect(temperatureAxis(empty)).toEqual({ domain: [0, 10], ticks: [0, 2, 4, 6, 8, 10] });
  });
});

describe("timeTicks and formatTick (UTC)", () => {
  it("puts a day's ticks on whole hours and names midnight by its date", () => {
    const { ticks, unit } = timeTicks(T0 + 30 * MIN, T0 + DAY + 30 * MIN);
    expect(unit).toBe("time");
    expect(ticks.map((t) => formatTick(t, unit))).toEqual(["03:00", "06:00", "09:00", "12:00", "15:00", "18:00", "21:00", "15 Jul"]);
  });

  it("puts a month on days and a year on months, with the year at January", () => {
    const month = timeTicks(T0, T0 + 30 * DAY);
    expect(month.unit).toBe("day");
    // Weekly, on Mondays: 2026-07-14 is a Tuesday.
    expect(month.ticks.map((t) => formatTick(t, month.unit))).toEqual(["20 Jul", "27 Jul", "3 Aug", "10 Aug"]);
    const year = timeTicks(Date.UTC(2025, 11, 2), Date.UTC(2026, 11, 2));
    expect(year.unit).toBe("month");
    expect(year.ticks.map((t) => formatTick(t, year.unit))).toEqual(["Jan 2026", "Mar", "May", "Jul", "Sep", "Nov"]);
  });
});

describe("words for the chart", () => {
  it("formats durations and set ranges", () => {
    expect(formatDurationMin(45)).toBe("45 min");
    expect(formatDurationMin(125)).toBe("2 h 5 min");
    expect(formatDurationMin(60 * 27)).toBe("1 day 3 h");
    expect(setRangeText(2, 8)).toBe("Set range 2–8 °C");
    expect(setRangeText(-25, -15)).toBe("Set range −25–−15 °C");
    expect(setRangeText(null, 8)).toBe("Set range up to 8 °C");
    expect(setRangeText(2, null)).toBeNull();
  });

  it("describes the chart for a screen reader: window, extremes, limits and excursions", () => {
    expect(traceDescription(series())).toBe(
      "Temperature trace of sensor S-204 on storage unit FR-2 from 2026-07-14 00:00 UTC to 2026-07-15 00:00 UTC; 3 readings; highest 14.2 °C at 2026-07-14 15:40 UTC; lowest 4.1 °C; set range 2–8 °C; excursion threshold 8.0 °C; 1 excursion, 1 still open, highest peak 14.2 °C.",
    );
  });
});
