/**
 * The worst-case temperature of a room or storage unit: the highest of its design maximum, its
 * highest reading in the look-back window and the peak of any open excursion — always with where
 * it came from. A temperature-controlled unit is also assessed "control lost": at its room's
 * worst case, as if it had failed and warmed up to the room. Pure.
 */
export type WorstCaseCandidate =
  | { kind: "design"; tempC: number; /** What the design value is, e.g. "upper end of the set range"; default "design maximum". */ label?: string }
  | { kind: "reading"; tempC: number; atMs: number; sensor: string }
  | { kind: "excursion"; tempC: number; atMs: number; sensor: string };

export type WorstCase = { tempC: number; source: WorstCaseCandidate; candidates: WorstCaseCandidate[]; description: string };

export const DEFAULT_LOOK_BACK_DAYS = 365;

function isoMinute(atMs: number): string {
  return new Date(atMs).toISOString().slice(0, 16).replace("T", " ");
}

export function describeCandidate(candidate: WorstCaseCandidate): string {
  const tempText = `${candidate.tempC.toFixed(1).replace("-", "−")} °C`;
  if (candidate.kind === "design") return `${tempText}, ${candidate.label ?? "design maximum"}`;
  if (candidate.kind === "reading") return `${tempText}, reading of ${isoMinute(candidate.atMs)} UTC from sensor ${candidate.sensor}`;
  return `${tempText}, peak of the open excursion on sensor ${candidate.sensor} (${isoMinute(candidate.atMs)} UTC)`;
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
