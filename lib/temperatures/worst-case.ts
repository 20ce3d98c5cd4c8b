/**
 * The worst-case temperature of a room or storage unit: the highest of its design maximum, its
 * highest reading in the look-back window and the peak of any open excursion — always with where
 * it came from. A temperature-controlled unit is assessed twice: "in control" (the upper end of
 * its set range and its readings outside its excursions) and "control lost" (the higher of its
 * room's worst case — as if it had failed and warmed up to the room — and its highest excursion
 * peak). An excursion is the unit out of control, so its readings count only for "control lost".
 * Pure.
 */
export type WorstCaseCandidate =
  | { kind: "design"; tempC: number; /** What the design value is, e.g. "upper end of the set range"; default "design maximum". */ label?: string }
  | {
      kind: "reading";
      tempC: number;
      atMs: number;
      sensor: string;
      /** The readings inside this many excursions were left out (they count as control lost), over the look-back window below. */
      excludedExcursions?: number;
      lookBackDays?: number;
    }
  | { kind: "excursion"; tempC: number; atMs: number; sensor: string; /** The excursion has ended (a stored end); absent or false while it lasts. */ ended?: boolean };

export type WorstCase = {
  tempC: number;
  source: WorstCaseCandidate;
  candidates: WorstCaseCandidate[];
  description: string;
  /** In control: the excursions whose readings were left out (they count as control lost). */
  excludedExcursions?: number;
};

export const DEFAULT_LOOK_BACK_DAYS = 365;

function isoMinute(atMs: number): string {
  return new Date(atMs).toISOString().slice(0, 16).replace("T", " ");
}

function tempText(tempC: number): string {
  return `${tempC.toFixed(1).replace("-", "−")} °C`;
}

function excursionsWord(count: number): string {
  return count === 1 ? "1 excursion" : `${count} excursions`;
}

export function describeCandidate(candidate: WorstCaseCandidate): string {
  const text = tempText(candidate.tempC);
  if (candidate.kind === "design") return `${text}, ${candidate.label ?? "design maximum"}`;
  if (candidate.kind === "reading") {
    if (candidate.excludedExcursions) {
      const days = candidate.lookBackDays ?? DEFAULT_LOOK_BACK_DAYS;
      return `${text}, highest reading in the last ${days} days outside ${excursionsWord(candidate.excludedExcursions)} (excluded: they count as control lost), ${isoMinute(candidate.atMs)} UTC from sensor ${candidate.sensor}`;
    }
    return `${text}, reading of ${isoMinute(candidate.atMs)} UTC from sensor ${candidate.sensor}`;
  }
  return candidate.ended
    ? `${text}, peak of the excursion on sensor ${candidate.sensor} (${isoMinute(candidate.atMs)} UTC, ended)`
    : `${text}, peak of the open excursion on sensor ${candidate.sensor} (${isoMinute(candidate.atMs)} UTC)`;
}

/** The highest candidate; on a tie the design value wins (it does not depend on a sensor). Null when nothing is known. */
export function selectWorstCase(candidates: readonly WorstCaseCandidate[]): WorstCase | null {
  const usable = candidates.filter((c) => Number.isFinite(c.tempC));
  if (usable.length === 0) return null;
  const rank = { design: 0, excursion: 1, reading: 2 } as const;
  const best = [...usable].sort((a, b) => b.tempC - a.tempC || rank[a.kind] - rank[b.kind])[0];
  return { tempC: best.tempC, source: best, candidates: [...usable], description: describeCandidate(best) };
}

/** "Control lost": a controlled unit assessed at its room's worst case (never below its own). */
export function controlLostWorstCase(unit: WorstCase | null, room: WorstCase | null): WorstCase | null {
  if (!room) return unit;
  if (!unit || room.tempC >= unit.tempC) return { ...room, description: `${room.description} (the room's worst case, as if the unit had failed)` };
  return unit;
}

/** An excursion of a controlled unit's sensor, as the worst case needs it. */
export type UnitExcursion = { sensor: string; startMs: number; endMs: number | null; peakTempC: number; peakAtMs: number };

/**
 * Whether a reading lies inside an excursion: from its first reading above the threshold up to,
 * not including, its first reading back at or below it (`excursions.ts`); an open one to now.
 */
export function insideExcursion(atMs: number, excursion: Pick<UnitExcursion, "startMs" | "endMs">): boolean {
  return atMs >= excursion.startMs && (excursion.endMs === null || atMs < excursion.endMs);
}

/** The highest reading outside every excursion (the later one on a tie), or null. */
export function highestReadingOutside<R extends { atMs: number; tempC: number }>(
  readings: readonly R[],
  excursions: readonly Pick<UnitExcursion, "startMs" | "endMs">[],
): R | null {
  let best: R | null = null;
  for (const reading of readings) {
    if (excursions.some((e) => insideExcursion(reading.atMs, e))) continue;
    if (!best || reading.tempC > best.tempC || (reading.tempC === best.tempC && reading.atMs > best.atMs)) best = reading;
  }
  return best;
}

/**
 * A temperature-controlled unit's two worst cases.
 * - In control: the upper end of its set range and its highest reading outside its excursions in
 *   the look-back window (`highestOutside`, found by the caller without those readings).
 * - Control lost: the higher of its room's worst case and the highest peak of its excursions in
 *   the window — never below in control.
 */
export function controlledUnitWorstCase(input: {
  setMaxC: number;
  highestOutside: Extract<WorstCaseCandidate, { kind: "reading" }> | null;
  excursions: readonly UnitExcursion[];
  room: WorstCase | null;
  lookBackDays: number;
}): { inControl: WorstCase; controlLost: WorstCase } {
  const excluded = input.excursions.length;
  const own: WorstCaseCandidate[] = [{ kind: "design", tempC: input.setMaxC, label: "upper end of the set range" }];
  if (input.highestOutside) {
    own.push(excluded > 0 ? { ...input.highestOutside, excludedExcursions: excluded, lookBackDays: input.lookBackDays } : input.highestOutside);
  }
  let inControl = selectWorstCase(own) as WorstCase;
  if (excluded > 0) {
    inControl = { ...inControl, excludedExcursions: excluded };
    if (inControl.source.kind !== "reading") {
      inControl.description = `${inControl.description}; the readings inside ${excursionsWord(excluded)} in the last ${input.lookBackDays} days are excluded (they count as control lost)`;
    }
  }
  const peaks: WorstCaseCandidate[] = input.excursions.map((e) => ({ kind: "excursion", tempC: e.peakTempC, atMs: e.peakAtMs, sensor: e.sensor, ended: e.endMs !== null }));
  const highestPeak = selectWorstCase(peaks);
  let controlLost: WorstCase | null;
  if (highestPeak && (!input.room || highestPeak.tempC > input.room.tempC)) {
    const rest = input.room ? `; above the room's worst case of ${tempText(input.room.tempC)}` : "";
    controlLost = {
      ...highestPeak,
      candidates: [...highestPeak.candidates, ...(input.room?.candidates ?? [])],
      description: `${highestPeak.description}, the highest of the unit's excursions in the last ${input.lookBackDays} days${rest}`,
    };
  } else {
    controlLost = input.room ? { ...input.room, description: `${input.room.description} (the room's worst case, as if the unit had failed)` } : null;
  }
  // Never below in control; with neither a room nor an excursion, in control stands for both.
  if (!controlLost || controlLost.tempC < inControl.tempC) controlLost = inControl;
  return { inControl, controlLost };
}
