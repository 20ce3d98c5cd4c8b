/**
 * A broken bottle in a closed unit: for the largest container of each volatile liquid with an LFL,
 * how long after it breaks the unit's free volume reaches 25 % of the LFL and the LFL (pool
 * evaporation at the EPA RMP Eq. D-1 rate into still air, slowed as the air saturates, capped by
 * what the bottle holds). At the unit's in-control worst case: a bottle that breaks in a working unit.
 */
import { enclosedSpillTimes, spillPoolArea, type EnclosedSpillResult } from "@/lib/hazard";
import { createAssessmentCache } from "./cache";
import { AssessmentContext, isClosedUnit, largestByVolume } from "./context";
import { unitEnclosureVolume } from "./missing-data";
import type { AssessmentSettings, LocationSnapshot } from "./types";

/** The fractions of the LFL timed: the usual alarm level and the LFL itself. */
export const BROKEN_BOTTLE_LFL_FRACTIONS = [0.25, 1] as const;

export type BrokenBottle = {
  substanceId: number;
  name: string;
  containerId: number;
  containerLabel: string;
  volumeL: number;
  tempC: number;
  result: EnclosedSpillResult;
};

/** Null when the unit is not closed or its volume is unknown; otherwise one entry per volatile liquid with an LFL. */
export function brokenBottles(snapshot: LocationSnapshot, settings: AssessmentSettings): BrokenBottle[] | null {
  if (snapshot.kind !== "unit") return null;
  const ctx = new AssessmentContext(snapshot, settings, createAssessmentCache());
  const unit = ctx.unit;
  if (unit === null || !isClosedUnit(unit) || unit.internalVolumeL === null) return null;
  const volume = unitEnclosureVolume(ctx, unit);
  const freeVolumeM3 = volume.freeVolumeM3;
  if (freeVolumeM3 === null || !(freeVolumeM3 > 0)) return null;
  const tempC = unit.worstCase.inControl?.tempC ?? snapshot.room.worstCase?.tempC ?? null;
  if (tempC === null) return null;
  // The pool cannot spread wider than the unit's floor: the face of a cube of its internal volume.
  const floorAreaM2 = Math.pow(unit.internalVolumeL / 1000, 2 / 3);
  const out: BrokenBottle[] = [];
  for (const group of ctx.liquidGroups()) {
    if (group.content.kind !== "substance") continue;
    const substance = group.content.substance;
    if (substance.lflVolPercent === null || substance.liquidDensityKgPerM3 === null) continue;
    const largest = largestByVolume(group);
    if (largest.volumeL === null || !(largest.volumeL > 0)) continue;
    const saturation = ctx.saturation(substance, tempC);
    if (!saturation.ok || !(saturation.result.pressureKPa > 0)) continue;
    const pool = spillPoolArea({ volumeL: largest.volumeL, depthM: settings.spill.poolDepthM, maxAreaM2: floorAreaM2 });
    const result = enclosedSpillTimes({
      liquidVolumeL: largest.volumeL,
      liquidDensityKgPerM3: substance.liquidDensityKgPerM3,
      molarMassGPerMol: substance.molarMassGPerMol,
      vaporPressureKPa: saturation.result.pressureKPa,
      tempC,
      freeVolumeM3,
      poolAreaM2: pool.areaM2,
      windSpeedMPerS: settings.spill.airSpeedMPerS,
      ambientPressureKPa: ctx.pressureKPa,
      lflVolPercent: substance.lflVolPercent,
      lflFractions: BROKEN_BOTTLE_LFL_FRACTIONS,
    });
    out.push({ substanceId: substance.id, name: group.name, containerId: largest.liquid.containerId, containerLabel: largest.liquid.label, volumeL: largest.volumeL, tempC, result });
  }
  return out.sort((a, b) => (a.result.times[0].minutes ?? Infinity) - (b.result.times[0].minutes ?? Infinity));
}
