/**
 * The vapor over a stored liquid at one temperature, from the memoised engine results: a pure
 * substance at its saturation concentration, a mixture by Raoult's law (pᵢ = xᵢ·Pᵢsat).
 */
import type { Scenario } from "@/db/enums";
import type { SaturatedConcentrationResult } from "@/lib/hazard";
import type { AssessmentContext, ContentGroup } from "./context";
import type { SubstanceSnapshot } from "./types";

export type ComponentVapor = {
  readonly substance: SubstanceSnapshot;
  readonly moleFraction: number;
  readonly massFraction: number;
  /** The pure component's saturation result. */
  readonly saturation: SaturatedConcentrationResult;
  /** xᵢ·Pᵢsat (the pure vapor pressure for a pure substance). */
  readonly partialPressureKPa: number;
  /** Equilibrium concentration over the liquid, capped with the total at 10⁶ ppm when it boils. */
  readonly concentrationPpm: number;
};

export type GroupVapor = {
  readonly components: ComponentVapor[];
  readonly totalPressureKPa: number;
  readonly boils: boolean;
  /** Names of components left out because their vapor pressure could not be computed. */
  readonly leftOut: string[];
};

/** Null when no component's vapor pressure can be computed (the gaps are reported as missing data). Memoised per group and temperature. */
export function groupVapor(ctx: AssessmentContext, group: ContentGroup, tempC: number, scenario: Scenario): GroupVapor | null {
  const memo = group.vaporMemo;
  for (let i = 0; i < memo.length; i++) if (memo[i].tempC === tempC) return memo[i].vapor as GroupVapor | null;
  const vapor = computeGroupVapor(ctx, group, tempC, scenario);
  memo.push({ tempC, vapor });
  return vapor;
}

function computeGroupVapor(ctx: AssessmentContext, group: ContentGroup, tempC: number, scenario: Scenario): GroupVapor | null {
  const leftOut: string[] = [];
  const content = group.content;
  if (content.kind === "substance") {
    const substance = content.substance;
    if (!ctx.vaporPressureAvailable(substance, scenario, group)) return null;
    const entry = ctx.saturation(substance, tempC);
    if (!entry.ok) {
      ctx.calculationFailed(substance, scenario, group, entry.error.message);
      return null;
    }
    const saturation = entry.result;
    const component: ComponentVapor = {
      substance,
      moleFraction: 1,
      massFraction: 1,
      saturation,
      partialPressureKPa: saturation.pressureKPa,
      concentrationPpm: saturation.ppm,
    };
    return { components: [component], totalPressureKPa: saturation.pressureKPa, boils: saturation.boils, leftOut };
  }
  const partial: ComponentVapor[] = [];
  let totalPressureKPa = 0;
  for (const c of content.mixture.components) {
    const substance = c.substance;
    if (!ctx.vaporPressureAvailable(substance, scenario, group)) {
      leftOut.push(substance.name);
      continue;
    }
    const entry = ctx.saturation(substance, tempC);
    if (!entry.ok) {
      ctx.calculationFailed(substance, scenario, group, entry.error.message);
      leftOut.push(substance.name);
      continue;
    }
    const partialPressureKPa = c.moleFraction * entry.result.pressureKPa;
    totalPressureKPa += partialPressureKPa;
    partial.push({ substance, moleFraction: c.moleFraction, massFraction: c.massFraction, saturation: entry.result, partialPressureKPa, concentrationPpm: 0 });
  }
  if (partial.length === 0) return null;
  const boils = totalPressureKPa >= ctx.pressureKPa;
  const scale = boils ? 1e6 / totalPressureKPa : 1e6 / ctx.pressureKPa;
  return {
    components: partial.map((c) => ({ ...c, concentrationPpm: c.partialPressureKPa * scale })),
    totalPressureKPa,
    boils,
    leftOut,
  };
}
/**
 * The LFL of a substance, or null. A substance with a flash point (or a flammable class) but no
 * LFL is reported as missing data; one with neither is taken as not flammable.
 */
export function lflOf(ctx: AssessmentContext, substance: SubstanceSnapshot, group: ContentGroup, scenario: Scenario): number | null {
  if (substance.lflVolPercent !== null && substance.lflVolPercent > 0) return substance.lflVolPercent;
  if (substance.flashPointC !== null || substance.ghsCategory !== null) {
    ctx.missing({
      kind: "no-lfl",
      subject: { kind: "substance", id: substance.id },
      subjectName: substance.name,
      scenario,
      what: "no LFL (lower flammable limit)",
      consequence: "its vapor cannot be expressed as a fraction of the LFL; it is left out of the % LFL of every enclosure and spill",
      substanceId: substance.id,
      containerIds: group.containers.map((c) => c.liquid.containerId),
    });
  }
  return null;
}
