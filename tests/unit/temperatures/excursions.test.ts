import { describe, expect, it } from "vitest";
import { createExcursionDetector, detectExcursions, type DetectedExcursion, type TemperatureReading } from "@/lib/temperatures/excursions";
import { fahrenheitToCelsius, toCelsius } from "@/lib/temperatures/units";

const MIN = 60_000;
const t0 = Date.UTC(2026, 6, 10, 8, 0);
/** A reading every 5 minutes from t0, one per temperature given. */
const series = (temps: number[], stepMin = 5): TemperatureReading[] => temps.map((tempC, i) => ({ atMs: t0 + i * stepMin * MIN, tempC }));
const fridge = { thresholdC: 8, minDurationMs: 30 * MIN };

describe("excursion detection", () => {
  it("finds a period above the threshold that lasts at least the minimum duration, with start, end and peak", () => {
    // 4 °C, then above 8 °C from the 3rd reading (10 min) to the 11th (50 min), back at 5 °C at 55 min.
    const found = detectExcursions(series([4, 6, 9, 11, 14, 16, 15, 13, 12, 10, 9, 5, 4]), fridge);
    expect(found).toEqual([
      { startMs: t0 + 10 * MIN, endMs: t0 + 55 * MIN, peakTempC: 16, peakAtMs: t0 + 25 * MIN, durationMs: 45 * MIN, readingsAbove: 9, longestGapMs: 5 * MIN },
    ]);
  });

  it("ignores a spike shorter than the minimum duration (door opened briefly)", () => {
    expect(detectExcursions(series([5, 12, 13, 6, 5]), fridge)).toEqual([]);
  });

  it("counts an excursion that lasts exactly the minimum duration", () => {
    const found = detectExcursions(series([5, 9, 9, 9, 9, 9, 9, 5]), fridge); // above from 5 to 35 min: 30 min
    expect(found).toHaveLength(1);
    expect(found[0].durationMs).toBe(30 * MIN);
  });

  it("treats a reading exactly at the threshold as within limits", () => {
    expect(detectExcursions(series(Array(20).fill(8)), fridge)).toEqual([]);
    const found = detectExcursions(series([8, 8.01, 8.01, 8.01, 8.01, 8.01, 8.01, 8.01, 8]), fridge);
    expect(found).toHaveLength(1);
    expect(found[0].endMs).toBe(t0 + 40 * MIN);
  });

  it("gives the same answer for readings that arrive out of order", () => {
    const ordered = series([4, 6, 9, 11, 14, 16, 15, 13, 12, 10, 9, 5, 4]);
    const shuffled = [ordered[7], ordered[0], ordered[12], ordered[3], ordered[5], ordered[1], ordered[10], ordered[2], ordered[9], ordered[4], ordered[11], ordered[6], ordered[8]];
    expect(detectExcursions(shuffled, fridge)).toEqual(detectExcursions(ordered, fridge));
  });

  it("counts a reading sent twice once, keeping the higher temperature", () => {
    const readings = [...series([5, 9, 9, 9, 9, 9, 9, 5]), { atMs: t0 + 15 * MIN, tempC: 12 }];
    const found = detectExcursions(readings, fridge);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ peakTempC: 12, peakAtMs: t0 + 15 * MIN, readingsAbove: 6 });
  });

  it("keeps an excursion going across a gap in the data and reports the gap", () => {
    // Above at 08:00 and 08:05, logger silent until 10:05 (still above), back below at 10:10.
    const readings: TemperatureReading[] = [
      { atMs: t0 - 5 * MIN, tempC: 5 },
      { atMs: t0, tempC: 10 },
      { atMs: t0 + 5 * MIN, tempC: 11 },
      { atMs: t0 + 125 * MIN, tempC: 19 },
      { atMs: t0 + 130 * MIN, tempC: 6 },
    ];
    const [excursion] = detectExcursions(readings, fridge);
    expect(excursion).toMatchObject({ startMs: t0, endMs: t0 + 130 * MIN, peakTempC: 19, longestGapMs: 120 * MIN });
  });

  it("reports an excursion still going at the last reading as open, once it has lasted the minimum", () => {
    const open = detectExcursions(series([5, 9, 12, 15, 18, 20, 21, 22]), fridge);
    expect(open).toHaveLength(1);
    expect(open[0]).toMatchObject({ endMs: null, durationMs: 30 * MIN, peakTempC: 22 });
    expect(detectExcursions(series([5, 9, 12]), fridge)).toEqual([]); // only 5 min so far
  });

  it("finds several excursions in one series", () => {
    const found = detectExcursions(series([5, 9, 9, 9, 9, 9, 9, 9, 5, 5, 10, 10, 10, 10, 10, 10, 10, 5]), fridge);
    expect(found.map((e) => [e.startMs, e.endMs])).toEqual([
      [t0 + 5 * MIN, t0 + 40 * MIN],
      [t0 + 50 * MIN, t0 + 85 * MIN],
    ]);
  });

  it("works for a freezer whose threshold is below zero", () => {
    const found = detectExcursions(series([-20, -18, -9, -7, -5, -6, -8, -9.5, -12, -19]), { thresholdC: -10, minDurationMs: 20 * MIN });
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ startMs: t0 + 10 * MIN, endMs: t0 + 40 * MIN, peakTempC: -5 });
  });

  it("detects the same excursion from °F readings converted to °C", () => {
    // 46.4 °F = 8 °C exactly; 50 °F = 10 °C (definition of the Fahrenheit scale).
    const fahrenheit = [41, 50, 50, 50, 50, 50, 50, 50, 46.4].map((f, i) => ({ atMs: t0 + i * 5 * MIN, tempC: toCelsius(f, "F") }));
    const celsius = series([5, 10, 10, 10, 10, 10, 10, 10, 8]);
    const fromF = detectExcursions(fahrenheit, fridge);
    expect(fromF).toHaveLength(1);
    expect(fromF[0].peakTempC).toBeCloseTo(10, 10);
    expect(fromF.map((e) => [e.startMs, e.endMs])).toEqual(detectExcursions(celsius, fridge).map((e) => [e.startMs, e.endMs]));
  });

  it("rejects nonsense input", () => {
    expect(() => detectExcursions([{ atMs: Number.NaN, tempC: 4 }], fridge)).toThrow(RangeError);
    expect(() => detectExcursions(series([4]), { thresholdC: Number.NaN, minDurationMs: 0 })).toThrow(/threshold/);
    expect(() => detectExcursions(series([4]), { thresholdC: 8, minDurationMs: -1 })).toThrow(/minimum duration/);
  });
});

describe("°F handling", () => {
  it("converts by the definition of the Fahrenheit scale", () => {
    // 32 °F = 0 °C, 212 °F = 100 °C, −40 °F = −40 °C (NIST SP 811, definition of the scales).
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(fahrenheitToCelsius(212)).toBe(100);
    expect(fahrenheitToCelsius(-40)).toBe(-40);
    expect(toCelsius(77, "F")).toBe(25);
    expect(toCelsius(21.4, "C")).toBe(21.4);
  });

  it("refuses temperatures below absolute zero and non-numbers", () => {
    expect(() => toCelsius(-500, "F")).toThrow(/absolute zero/);
    expect(() => toCelsius(Number.POSITIVE_INFINITY, "C")).toThrow(/finite/);
  });
});

describe("the incremental detector for sorted readings", () => {
  const run = (readings: TemperatureReading[], rule = fridge) => {
    const detector = createExcursionDetector(rule);
    const found: DetectedExcursion[] = [];
    for (const reading of readings) {
      const completed = detector.push(reading);
      if (completed) found.push(completed);
    }
    return [...found, ...detector.finish()];
  };

  it("finds what detectExcursions finds, closed and open, one reading at a time", () => {
    const temps = [5, 9, 9, 9, 9, 9, 9, 9, 5, 5, 10, 10, 10, 10, 10, 10, 10, 5, 4, 11, 12, 13, 14, 15, 16, 17];
    const found = run(series(temps));
    expect(found).toEqual(detectExcursions(series(temps), fridge));
    expect(found.map((e) => [e.startMs, e.endMs])).toEqual([
      [t0 + 5 * MIN, t0 + 40 * MIN],
      [t0 + 50 * MIN, t0 + 85 * MIN],
      [t0 + 95 * MIN, null],
    ]);
  });

  it("hands over a closed excursion when the reading after the one that ended it arrives", () => {
    const detector = createExcursionDetector(fridge);
    const readings = series([5, 9, 9, 9, 9, 9, 9, 9, 5, 5]);
    const completedAt = readings.map((r) => detector.push(r));
    // The 9th reading (5 °C at 40 min) ends the excursion; it is decided when the 10th arrives.
    expect(completedAt.map((e) => (e ? e.endMs : null))).toEqual([null, null, null, null, null, null, null, null, null, t0 + 40 * MIN]);
    expect(detector.finish()).toEqual([]);
  });

  it("counts readings at the same instant once, with the higher temperature", () => {
    const readings = series([5, 9, 9, 9, 9, 9, 9, 5]);
    readings.splice(3, 0, { atMs: readings[3].atMs, tempC: 12 });
    const [excursion] = run(readings);
    expect(excursion).toMatchObject({ peakTempC: 12, peakAtMs: t0 + 15 * MIN, readingsAbove: 6 });
  });

  it("refuses readings out of time order and readings after finish", () => {
    const detector = createExcursionDetector(fridge);
    detector.push({ atMs: t0 + MIN, tempC: 4 });
    expect(() => detector.push({ atMs: t0, tempC: 4 })).toThrow(/time order/);
    detector.finish();
    expect(() => detector.push({ atMs: t0 + 2 * MIN, tempC: 4 })).toThrow(/finished/);
  });

  it("runs through a year of 30-second readings (1,051,200) and finds the 12 monthly excursions", () => {
    const detector = createExcursionDetector(fridge);
    const start = Date.UTC(2026, 0, 1);
    const found: DetectedExcursion[] = [];
    const step = 30_000;
    for (let i = 0; i < 365 * 2880; i++) {
      const atMs = start + i * step;
      const day = new Date(atMs).getUTCDate();
      const hour = new Date(atMs).getUTCHours();
      // 12 °C from 10:00 to 11:00 on the 15th of every month, 5 °C otherwise.
      const completed = detector.push({ atMs, tempC: day === 15 && hour === 10 ? 12 : 5 });
      if (completed) found.push(completed);
    }
    found.push(...detector.finish());
    expect(found).toHaveLength(12);
    expect(found.every((e) => e.durationMs === 60 * MIN && e.peakTempC === 12)).toBe(true);
  });
});
