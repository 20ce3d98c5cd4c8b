/**
 * The invented demo traces (db/seed/demo-traces.ts): the dates of the heat wave and the failure
 * weekend, and — for seed dates spread over a year — the excursions the readings must and must
 * not contain under the demo's thresholds. Check values are the demo scenario's own choices.
 */
import { describe, expect, it } from "vitest";
import { demoTraces, failureWeekendFor, heatWaveFor, READING_INTERVAL_MS } from "@/db/seed/demo-traces";
import { detectExcursions, type ExcursionRule } from "@/lib/temperatures/excursions";

const iso = (ms: number) => new Date(ms).toISOString();
const rule = (thresholdC: number, minDurationMin: number): ExcursionRule => ({ thresholdC, minDurationMs: minDurationMin * 60_000 });

describe("demo event dates", () => {
  it("puts the heat wave on 10–19 July of the latest July that is over, inside the year of readings", () => {
    expect(iso(heatWaveFor(Date.parse("2026-12-02T09:00:00Z")).startMs)).toBe("2026-07-10T00:00:00.000Z");
    expect(iso(heatWaveFor(Date.parse("2026-12-02T09:00:00Z")).endMs)).toBe("2026-07-19T00:00:00.000Z");
    expect(iso(heatWaveFor(Date.parse("2026-07-25T00:00:00Z")).startMs)).toBe("2026-07-10T00:00:00.000Z");
    expect(iso(heatWaveFor(Date.parse("2026-07-05T12:00:00Z")).startMs)).toBe("2025-07-10T00:00:00.000Z");
    // Seeded mid-July: last year's 10 July is before the first reading; the wave starts a day in.
    expect(iso(heatWaveFor(Date.parse("2026-07-15T10:00:00Z")).startMs)).toBe("2025-07-17T00:00:00.000Z");
  });

  it("fails the refrigerator over the last full weekend of the month three months back, Friday 19:00 to Monday 08:30 UTC", () => {
    const at = (seed: string) => {
      const { startMs, repairMs } = failureWeekendFor(Date.parse(seed));
      return [iso(startMs), iso(repairMs)];
    };
    expect(at("2026-12-02T09:00:00Z")).toEqual(["2026-09-25T19:00:00.000Z", "2026-09-28T08:30:00.000Z"]);
    expect(at("2026-01-15T00:00:00Z")).toEqual(["2025-10-24T19:00:00.000Z", "2025-10-27T08:30:00.000Z"]);
    // May 2027 ends on a Monday: its last full weekend is 28–30 May, not the 31st.
    expect(at("2027-08-20T00:00:00Z")).toEqual(["2027-05-28T19:00:00.000Z", "2027-05-31T08:30:00.000Z"]);
  });
});

describe.each(["2026-12-02T09:07:00Z", "2026-07-15T10:00:00Z", "2027-03-03T00:00:00Z", "2027-06-01T09:00:00Z"])("demo traces seeded at %s", (seed) => {
  const traces = demoTraces(Date.parse(seed));
  const series = (externalId: string) => Array.from(traces.tempsC.get(externalId)!, (tempC, i) => ({ atMs: traces.firstMs + i * READING_INTERVAL_MS, tempC }));

  it("has a year of quarter-hour readings for all eleven loggers", () => {
    expect(traces.count).toBe(35_040);
    expect([...traces.tempsC.keys()].sort()).toEqual(["S-201", "S-202", "S-203", "S-204", "S-205", "S-206", "S-207", "S-208", "S-209", "S-210", "S-211"]);
  });

  it("shows the heat wave in B-014 as afternoon excursions above 30 °C, the hottest at 31–33 °C", () => {
    const found = detectExcursions(series("S-201"), rule(30, 60));
    expect(found.length).toBeGreaterThanOrEqual(3);
    for (const e of found) {
      expect(e.startMs).toBeGreaterThanOrEqual(traces.heatWave.startMs);
      expect(e.endMs!).toBeLessThanOrEqual(traces.heatWave.endMs);
    }
    const hottest = Math.max(...found.map((e) => e.peakTempC));
    expect(hottest).toBeGreaterThanOrEqual(31);
    expect(hottest).toBeLessThanOrEqual(33);
    // Outside the heat wave the store stays in its usual 18–25 °C.
    const usual = series("S-201").filter((r) => r.atMs < traces.heatWave.startMs - 86_400_000 || r.atMs > traces.heatWave.endMs + 86_400_000);
    expect(Math.min(...usual.map((r) => r.tempC))).toBeGreaterThanOrEqual(17.5);
    expect(Math.max(...usual.map((r) => r.tempC))).toBeLessThanOrEqual(25);
  });

  it("shows FSR-1's failure as the one excursion, about 60 h up to 20–22 °C", () => {
    const [failure, ...others] = detectExcursions(series("S-205"), rule(8, 30));
    expect(others).toEqual([]);
    expect(failure.startMs).toBeGreaterThan(traces.failure.startMs);
    expect(failure.endMs!).toBeGreaterThan(traces.failure.repairMs);
    expect(failure.durationMs / 3_600_000).toBeGreaterThan(58);
    expect(failure.durationMs / 3_600_000).toBeLessThan(65);
    expect(failure.peakTempC).toBeGreaterThanOrEqual(19.5);
    expect(failure.peakTempC).toBeLessThanOrEqual(22.5);
  });

  it("keeps door openings to single readings: above a threshold at times, never an excursion", () => {
    const fr1 = series("S-203");
    expect(fr1.filter((r) => r.tempC > 8).length).toBeGreaterThan(20);
    expect(fr1.some((r, i) => i > 0 && r.tempC > 8 && fr1[i - 1].tempC > 8)).toBe(false);
    expect(detectExcursions(fr1, rule(8, 30))).toEqual([]);
    expect(detectExcursions(series("S-206"), rule(-10, 30))).toEqual([]);
    expect(detectExcursions(series("S-207"), rule(-60, 20))).toEqual([]);
    expect(detectExcursions(series("S-208"), rule(8, 45))).toEqual([]);
    expect(detectExcursions(series("S-210"), rule(8, 30))).toEqual([]);
    // In normal running the refrigerators sit at 3–6 °C.
    const sorted = fr1.map((r) => r.tempC).sort((a, b) => a - b);
    expect(sorted[Math.floor(sorted.length * 0.01)]).toBeGreaterThanOrEqual(3);
    expect(sorted[Math.floor(sorted.length * 0.95)]).toBeLessThanOrEqual(6);
  });
});

describe("determinism", () => {
  it("gives the same readings for the same end, and the same readings at the same instants for another end", () => {
    const a = demoTraces(Date.parse("2026-12-02T09:00:00Z"));
    const b = demoTraces(Date.parse("2026-12-02T09:00:00Z"));
    const later = demoTraces(Date.parse("2026-12-12T09:00:00Z"));
    for (const id of ["S-201", "S-203", "S-211"]) {
      expect(b.tempsC.get(id)).toEqual(a.tempsC.get(id));
      // 30 days in, the start-up has decayed: the shared instants agree (the later run is 960 readings on).
      const offset = (later.firstMs - a.firstMs) / READING_INTERVAL_MS;
      expect(Array.from(later.tempsC.get(id)!.slice(30 * 96, 300 * 96))).toEqual(Array.from(a.tempsC.get(id)!.slice(offset + 30 * 96, offset + 300 * 96)));
    }
  });
});
