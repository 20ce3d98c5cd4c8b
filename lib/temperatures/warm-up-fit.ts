/**
 * Fitting a unit's warm-up time constant τ to its own recorded failures. Pure: the caller loads the
 * readings and stores the result.
 *
 * Model: Newton's law of heating, dT/dt = (T_room(t) − T)/τ. Over each interval between two of the
 * unit's readings the room's temperature is taken as constant at its value at the interval's
 * midpoint, where the law's solution is exact: T₁ = T_room − (T_room − T₀)·e^(−Δt/τ)
 * (`warmUpTemperatureC` of the physics engine). Each excursion starts from its own first reading
 * (the last in-range reading before the excursion) and runs to its peak; one τ is fitted to all
 * usable excursions together by least squares (Levenberg–Marquardt on ln τ, started from the best
 * point of a coarse grid so that it cannot settle in a far-off local minimum).
 */
import { levenbergMarquardt } from "ml-levenberg-marquardt";
import { warmUpTemperatureC } from "@/lib/hazard";

export type WarmUpPoint = { atMs: number; tempC: number };

/** The room's temperature over an excursion's rising part: its own sensors' readings, or its design maximum. */
export type WarmUpRoom =
  | { source: "sensor"; /** One series per room sensor, each in time order. */ series: readonly (readonly WarmUpPoint[])[] }
  | { source: "design"; tempC: number };

export type WarmUpExcursionInput = {
  excursionId: number;
  /** The unit's readings from the last in-range reading before the excursion's start up to its peak, in time order. */
  readings: readonly WarmUpPoint[];
  /** Null when the room has neither sensor readings over the stretch nor a design maximum. */
  room: WarmUpRoom | null;
};

/** An excursion taken into the fit, with the room temperature at each interval's midpoint. */
export type UsableExcursion = {
  excursionId: number;
  readings: readonly WarmUpPoint[];
  startTempC: number;
  /** Room temperature over each interval between consecutive readings (length readings − 1). */
  roomTempsC: number[];
  /** Mean of `roomTempsC` weighted by the intervals' lengths. */
  meanRoomTempC: number;
  roomTempSource: "sensor" | "design";
};

export type RejectedExcursion = { excursionId: number; reason: string };

export type WarmUpFit = {
  tauMin: number;
  rmsErrorC: number;
  excursionCount: number;
  readingCount: number;
  /** Mean room temperature over the fitted readings (weighted by time). */
  roomTempC: number;
  /** "sensor" when every excursion had the room's own readings, "design" when any used the design maximum. */
  roomTempSource: "sensor" | "design";
  excursionIds: number[];
};

export type WarmUpFitResult = { fit: WarmUpFit | null; used: UsableExcursion[]; rejected: RejectedExcursion[] };

export const MIN_READINGS_PER_EXCURSION = 4;
/** A rise smaller than this from the first reading to the peak is no warm-up to fit (a logger's noise is a few tenths). */
export const MIN_RISE_C = 1;
/** The room must be at least this much warmer than the unit's first reading. */
export const MIN_ROOM_LEAD_C = 2;
/** A unit more than this above its room was warmed by something other than the room. */
export const MAX_ABOVE_ROOM_C = 1;
/** The range a fitted τ may take: 5 minutes to 30 days (the range a person may set too). */
export const TAU_MIN_BOUND_MIN = 5;
export const TAU_MAX_BOUND_MIN = 30 * 24 * 60;
/** Room readings this far before the start and after the peak still describe the stretch. */
export const ROOM_MARGIN_MS = 2 * 60 * 60_000;

const MINUTE_MS = 60_000;

function fmtC(tempC: number): string {
  return `${tempC.toFixed(1).replace("-", "−")} °C`;
}

/** A series' value at a time: linear between readings, held flat beyond its ends. */
export function interpolateTempC(series: readonly WarmUpPoint[], atMs: number): number {
  if (series.length === 0) return Number.NaN;
  if (atMs <= series[0].atMs) return series[0].tempC;
  const last = series[series.length - 1];
  if (atMs >= last.atMs) return last.tempC;
  let lo = 0;
  let hi = series.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (series[mid].atMs <= atMs) lo = mid;
    else hi = mid;
  }
  const a = series[lo];
  const b = series[hi];
  if (b.atMs === a.atMs) return Math.max(a.tempC, b.tempC);
  return a.tempC + ((b.tempC - a.tempC) * (atMs - a.atMs)) / (b.atMs - a.atMs);
}

/** The room's temperature at an instant: the mean over its sensors (each interpolated), or its design maximum. */
export function roomTempAtC(room: WarmUpRoom, atMs: number): number {
  if (room.source === "design") return room.tempC;
  const values = room.series.filter((s) => s.length > 0).map((s) => interpolateTempC(s, atMs));
  return values.reduce((sum, v) => sum + v, 0) / values.length;
}

/** Checks one excursion and prepares it for the fit, or says why it cannot be used. */
export function prepareExcursion(input: WarmUpExcursionInput): UsableExcursion | RejectedExcursion {
  const { excursionId } = input;
  // Equal instants count once (the higher temperature, as excursion detection does).
  const readings: WarmUpPoint[] = [];
  for (const r of input.readings) {
    if (!Number.isFinite(r.atMs) || !Number.isFinite(r.tempC)) continue;
    const prev = readings[readings.length - 1];
    if (prev && r.atMs < prev.atMs) return { excursionId, reason: "its readings are not in time order" };
    if (prev && r.atMs === prev.atMs) prev.tempC = Math.max(prev.tempC, r.tempC);
    else readings.push({ atMs: r.atMs, tempC: r.tempC });
  }
  if (readings.length < MIN_READINGS_PER_EXCURSION) {
    return { excursionId, reason: `too few readings on the way up (${readings.length}; at least ${MIN_READINGS_PER_EXCURSION} are needed)` };
  }
  const startTempC = readings[0].tempC;
  const peakTempC = Math.max(...readings.map((r) => r.tempC));
  if (peakTempC - startTempC < MIN_RISE_C) {
    return { excursionId, reason: `not rising: ${fmtC(startTempC)} to a peak of ${fmtC(peakTempC)}, less than ${MIN_RISE_C} °C` };
  }
  const room = input.room;
  if (room === null || (room.source === "sensor" && room.series.every((s) => s.length === 0))) {
    return { excursionId, reason: "no room temperature: the room has no sensor readings over the stretch and no design maximum" };
  }
  const roomTempsC: number[] = [];
  let weighted = 0;
  for (let i = 1; i < readings.length; i++) {
    const roomTempC = roomTempAtC(room, (readings[i - 1].atMs + readings[i].atMs) / 2);
    roomTempsC.push(roomTempC);
    weighted += roomTempC * (readings[i].atMs - readings[i - 1].atMs);
  }
  const meanRoomTempC = weighted / (readings[readings.length - 1].atMs - readings[0].atMs);
  const roomWord = room.source === "design" ? "the room's design maximum" : "the room's readings";
  if (meanRoomTempC - startTempC < MIN_ROOM_LEAD_C) {
    return { excursionId, reason: `room not warmer than the unit: ${roomWord} average ${fmtC(meanRoomTempC)} against the unit's ${fmtC(startTempC)} at the start` };
  }
  if (peakTempC > Math.max(...roomTempsC) + MAX_ABOVE_ROOM_C) {
    return { excursionId, reason: `the unit rose above its room (peak ${fmtC(peakTempC)}, ${roomWord} at most ${fmtC(Math.max(...roomTempsC))}): something other than the room warmed it` };
  }
  return { excursionId, readings, startTempC, roomTempsC, meanRoomTempC, roomTempSource: room.source };
}

/** The model's temperatures at an excursion's reading times for a τ, starting from its first reading. */
export function simulateWarmUpC(excursion: Pick<UsableExcursion, "readings" | "roomTempsC">, tauMin: number): number[] {
  const temps = [excursion.readings[0].tempC];
  for (let i = 1; i < excursion.readings.length; i++) {
    const minutes = (excursion.readings[i].atMs - excursion.readings[i - 1].atMs) / MINUTE_MS;
    temps.push(warmUpTemperatureC({ roomTempC: excursion.roomTempsC[i - 1], startTempC: temps[i - 1], tauMin }, minutes));
  }
  return temps;
}

/**
 * d T / d ln τ at each reading: with a = e^(−Δt/τ), T₁ = R − (R − T₀)·a gives
 * dT₁/dτ = a·dT₀/dτ − (R − T₀)·a·Δt/τ², and d/d ln τ = τ·d/dτ.
 */
function sensitivities(excursion: UsableExcursion, tauMin: number, temps: number[]): number[] {
  const out = [0];
  let dTdTau = 0;
  for (let i = 1; i < excursion.readings.length; i++) {
    const minutes = (excursion.readings[i].atMs - excursion.readings[i - 1].atMs) / MINUTE_MS;
    const a = Math.exp(-minutes / tauMin);
    dTdTau = a * dTdTau - (excursion.roomTempsC[i - 1] - temps[i - 1]) * a * (minutes / (tauMin * tauMin));
    out.push(dTdTau * tauMin);
  }
  return out;
}

function sumOfSquaresC2(used: readonly UsableExcursion[], tauMin: number): number {
  let sum = 0;
  for (const e of used) {
    const temps = simulateWarmUpC(e, tauMin);
    for (let i = 1; i < temps.length; i++) sum += (temps[i] - e.readings[i].tempC) ** 2;
  }
  return sum;
}

/**
 * Fits one τ to a unit's excursions. Excursions that cannot be used are listed with the reason; with
 * none usable the fit is null. The first reading of each excursion is its start, not a data point.
 */
export function fitWarmUp(inputs: readonly WarmUpExcursionInput[]): WarmUpFitResult {
  const used: UsableExcursion[] = [];
  const rejected: RejectedExcursion[] = [];
  for (const input of inputs) {
    const prepared = prepareExcursion(input);
    if ("reason" in prepared) rejected.push(prepared);
    else used.push(prepared);
  }
  if (used.length === 0) return { fit: null, used, rejected };

  // The data points: every reading after each excursion's first, addressed by index.
  const points: { excursion: number; index: number; tempC: number }[] = [];
  used.forEach((e, excursion) => e.readings.forEach((r, index) => index > 0 && points.push({ excursion, index, tempC: r.tempC })));

  // A coarse grid over ln τ first: the sum of squares is smooth in ln τ but may be flat far off.
  const lnMin = Math.log(TAU_MIN_BOUND_MIN);
  const lnMax = Math.log(TAU_MAX_BOUND_MIN);
  let bestLnTau = lnMin;
  let bestSum = Number.POSITIVE_INFINITY;
  const steps = 80;
  for (let k = 0; k <= steps; k++) {
    const lnTau = lnMin + ((lnMax - lnMin) * k) / steps;
    const sum = sumOfSquaresC2(used, Math.exp(lnTau));
    if (sum < bestSum) {
      bestSum = sum;
      bestLnTau = lnTau;
    }
  }

  // One model evaluation per parameter value, shared by every point.
  let cachedLnTau = Number.NaN;
  let cachedTemps: number[][] = [];
  let cachedSens: number[][] = [];
  const evaluate = (lnTau: number) => {
    if (lnTau === cachedLnTau) return;
    const tauMin = Math.exp(lnTau);
    cachedTemps = used.map((e) => simulateWarmUpC(e, tauMin));
    cachedSens = used.map((e, i) => sensitivities(e, tauMin, cachedTemps[i]));
    cachedLnTau = lnTau;
  };
  const result = levenbergMarquardt(
    { x: points.map((_, i) => i), y: points.map((p) => p.tempC) },
    ([lnTau]) => {
      evaluate(lnTau);
      return (i) => cachedTemps[points[i].excursion][points[i].index];
    },
    {
      initialValues: [bestLnTau],
      minValues: [lnMin],
      maxValues: [lnMax],
      maxIterations: 25,
      errorTolerance: 1e-12,
      improvementThreshold: 1e-6,
      damping: 1e-3,
      jacobianFunction: ([lnTau]) => {
        evaluate(lnTau);
        return (i) => [cachedSens[points[i].excursion][points[i].index]];
      },
    },
  );
  let lnTau = result.parameterValues[0];
  // Levenberg–Marquardt keeps its best point; never worse than the grid's.
  if (!(sumOfSquaresC2(used, Math.exp(lnTau)) <= bestSum)) lnTau = bestLnTau;
  const tauMin = Math.exp(lnTau);
  const rmsErrorC = Math.sqrt(sumOfSquaresC2(used, tauMin) / points.length);

  let roomWeighted = 0;
  let spanMs = 0;
  for (const e of used) {
    const span = e.readings[e.readings.length - 1].atMs - e.readings[0].atMs;
    roomWeighted += e.meanRoomTempC * span;
    spanMs += span;
  }
  return {
    fit: {
      tauMin,
      rmsErrorC,
      excursionCount: used.length,
      readingCount: used.reduce((n, e) => n + e.readings.length, 0),
      roomTempC: roomWeighted / spanMs,
      roomTempSource: used.every((e) => e.roomTempSource === "sensor") ? "sensor" : "design",
      excursionIds: used.map((e) => e.excursionId),
    },
    used,
    rejected,
  };
}
