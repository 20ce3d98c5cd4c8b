/**
 * The warm-up fit on synthetic data with a known τ. The check values are analytic: readings are
 * generated from Newton's law of heating, T(t) = T_room − (T_room − T_start)·e^(−t/τ), by hand-written
 * code in this file (for a varying room, by integrating dT/dt = (T_room(t) − T)/τ in 1-second steps),
 * so the fit must give back the τ they were made with.
 */
import { describe, expect, it } from "vitest";
import { fitWarmUp, interpolateTempC, prepareExcursion, simulateWarmUpC, type WarmUpExcursionInput, type WarmUpPoint } from "@/lib/temperatures/warm-up-fit";

const MIN = 60_000;
const T0 = Date.UTC(2026, 2, 7, 1, 0);

/** Readings every `stepMin` from `startMs` following Newton's law with a constant room. */
function newtonSeries(opts: { startMs: number; startTempC: number; roomTempC: number; tauMin: number; count: number; stepMin?: number; noiseC?: (i: number) => number }): WarmUpPoint[] {
  const step = opts.stepMin ?? 5;
  return Array.from({ length: opts.count }, (_, i) => ({
    atMs: opts.startMs + i * step * MIN,
    tempC: opts.roomTempC - (opts.roomTempC - opts.startTempC) * Math.exp(-(i * step) / opts.tauMin) + (i > 0 && opts.noiseC ? opts.noiseC(i) : 0),
  }));
}

/** A deterministic noise source in [−amplitude, +amplitude] (a linear congruential generator). */
function noise(amplitudeC: number, seed: number): (i: number) => number {
  let state = seed;
  return () => {
    state = (state * 1_103_515_245 + 12_345) % 2 ** 31;
    return (state / 2 ** 31) * 2 * amplitudeC - amplitudeC;
  };
}

describe("fitting a unit's warm-up time constant", () => {
  it("gives back τ within 1 % from clean readings of one failure against a constant room (analytic)", () => {
    const readings = newtonSeries({ startMs: T0, startTempC: 4, roomTempC: 21, tauMin: 190, count: 40 });
    const { fit, rejected } = fitWarmUp([{ excursionId: 1, readings, room: { source: "design", tempC: 21 } }]);
    expect(rejected).toEqual([]);
    expect(fit).not.toBeNull();
    expect(Math.abs(fit!.tauMin - 190) / 190).toBeLessThan(0.01);
    expect(fit!.rmsErrorC).toBeLessThan(0.01);
    expect(fit!).toMatchObject({ excursionCount: 1, readingCount: 40, roomTempC: 21, roomTempSource: "design", excursionIds: [1] });
  });

  it("fits one τ to two failures with different start and room temperatures, each starting from its own first reading", () => {
    const a = newtonSeries({ startMs: T0, startTempC: 4, roomTempC: 21, tauMin: 300, count: 30, stepMin: 10 });
    const b = newtonSeries({ startMs: T0 + 30 * 24 * 60 * MIN, startTempC: 5.5, roomTempC: 26, tauMin: 300, count: 12, stepMin: 15 });
    const { fit } = fitWarmUp([
      { excursionId: 7, readings: a, room: { source: "design", tempC: 21 } },
      { excursionId: 9, readings: b, room: { source: "design", tempC: 26 } },
    ]);
    expect(Math.abs(fit!.tauMin - 300) / 300).toBeLessThan(0.01);
    expect(fit!.excursionCount).toBe(2);
    expect(fit!.readingCount).toBe(42);
    expect(fit!.excursionIds).toEqual([7, 9]);
    // Time-weighted mean room: (21 °C × 290 min + 26 °C × 165 min) / 455 min = 22.81 °C (by hand).
    expect(fit!.roomTempC).toBeCloseTo((21 * 290 + 26 * 165) / 455, 6);
  });

  it("gives back τ within 3 % when every reading carries up to ±0.2 °C of noise, with an RMS error of about the noise", () => {
    const readings = newtonSeries({ startMs: T0, startTempC: 4, roomTempC: 22, tauMin: 240, count: 60, noiseC: noise(0.2, 42) });
    const { fit } = fitWarmUp([{ excursionId: 1, readings, room: { source: "design", tempC: 22 } }]);
    expect(Math.abs(fit!.tauMin - 240) / 240).toBeLessThan(0.03);
    // Uniform noise on ±0.2 °C has a standard deviation of 0.2/√3 = 0.115 °C (by hand).
    expect(fit!.rmsErrorC).toBeGreaterThan(0.05);
    expect(fit!.rmsErrorC).toBeLessThan(0.2);
  });

  it("follows a room whose temperature changes during the failure (its own sensor readings), τ within 1 %", () => {
    const tauMin = 150;
    // The room warms from 19 °C to 25 °C over 6 hours (a weekend without air-conditioning), read every 15 minutes.
    const roomAtC = (minutes: number) => 19 + (6 * Math.min(minutes, 360)) / 360;
    const room: WarmUpPoint[] = Array.from({ length: 30 }, (_, i) => ({ atMs: T0 - 60 * MIN + i * 15 * MIN, tempC: roomAtC(i * 15 - 60) }));
    // The unit: dT/dt = (T_room(t) − T)/τ integrated in 1-second steps from 3 °C, read every 10 minutes.
    const readings: WarmUpPoint[] = [];
    let tempC = 3;
    for (let s = 0; s <= 300 * 60; s++) {
      if (s % 600 === 0) readings.push({ atMs: T0 + s * 1000, tempC });
      tempC += ((roomAtC(s / 60) - tempC) / tauMin) * (1 / 60);
    }
    const { fit } = fitWarmUp([{ excursionId: 3, readings, room: { source: "sensor", series: [room] } }]);
    expect(Math.abs(fit!.tauMin - tauMin) / tauMin).toBeLessThan(0.01);
    expect(fit!.roomTempSource).toBe("sensor");
    // Against a constant room at the design maximum the same readings fit worse: the room matters.
    const constant = fitWarmUp([{ excursionId: 3, readings, room: { source: "design", tempC: 25 } }]);
    expect(Math.abs(constant.fit!.tauMin - tauMin) / tauMin).toBeGreaterThan(0.05);
  });

  it("rejects excursions it cannot use, each with its reason, and fits the rest", () => {
    const good = newtonSeries({ startMs: T0, startTempC: 4, roomTempC: 21, tauMin: 200, count: 20 });
    const inputs: WarmUpExcursionInput[] = [
      { excursionId: 1, readings: good.slice(0, 3), room: { source: "design", tempC: 21 } },
      { excursionId: 2, readings: [4, 4.2, 4.1, 4.4, 4.3].map((tempC, i) => ({ atMs: T0 + i * 5 * MIN, tempC })), room: { source: "design", tempC: 21 } },
      { excursionId: 3, readings: newtonSeries({ startMs: T0, startTempC: 4, roomTempC: 30, tauMin: 200, count: 10 }), room: { source: "design", tempC: 5 } },
      { excursionId: 4, readings: good, room: null },
      { excursionId: 5, readings: good, room: { source: "design", tempC: 21 } },
      { excursionId: 6, readings: newtonSeries({ startMs: T0, startTempC: 4, roomTempC: 40, tauMin: 60, count: 30 }), room: { source: "design", tempC: 21 } },
    ];
    const { fit, rejected } = fitWarmUp(inputs);
    expect(rejected).toEqual([
      { excursionId: 1, reason: "too few readings on the way up (3; at least 4 are needed)" },
      { excursionId: 2, reason: "not rising: 4.0 °C to a peak of 4.4 °C, less than 1 °C" },
      { excursionId: 3, reason: "room not warmer than the unit: the room's design maximum average 5.0 °C against the unit's 4.0 °C at the start" },
      { excursionId: 4, reason: "no room temperature: the room has no sensor readings over the stretch and no design maximum" },
      { excursionId: 6, reason: expect.stringMatching(/^the unit rose above its room \(peak 3\d\.\d °C, the room's design maximum at most 21\.0 °C\)/) },
    ]);
    expect(fit!.excursionIds).toEqual([5]);
    expect(Math.abs(fit!.tauMin - 200) / 200).toBeLessThan(0.01);
  });

  it("has no fit when no excursion is usable", () => {
    expect(fitWarmUp([]).fit).toBeNull();
    expect(fitWarmUp([{ excursionId: 1, readings: [], room: { source: "design", tempC: 20 } }]).fit).toBeNull();
  });
});

describe("the pieces of the fit", () => {
  it("interpolates a room series linearly and holds its ends (by hand)", () => {
    const s = [
      { atMs: 0, tempC: 20 },
      { atMs: 10, tempC: 22 },
    ];
    expect(interpolateTempC(s, -5)).toBe(20);
    expect(interpolateTempC(s, 5)).toBe(21);
    expect(interpolateTempC(s, 15)).toBe(22);
  });

  it("simulates Newton's law exactly for a constant room: 4 °C towards 21 °C with τ = 100 min is 21 − 17·e^(−1) = 14.746 °C after 100 min (by hand)", () => {
    const prepared = prepareExcursion({
      excursionId: 1,
      readings: [0, 25, 50, 75, 100].map((m) => ({ atMs: m * MIN, tempC: 21 - 17 * Math.exp(-m / 100) })),
      room: { source: "design", tempC: 21 },
    });
    if ("reason" in prepared) throw new Error(prepared.reason);
    const temps = simulateWarmUpC(prepared, 100);
    expect(temps[4]).toBeCloseTo(21 - 17 * Math.exp(-1), 9);
    expect(temps[4]).toBeCloseTo(14.746, 3);
  });
});
