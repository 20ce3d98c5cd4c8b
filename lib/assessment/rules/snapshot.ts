/**
 * Builders for the snapshots the rules read, from plain stored fields. Build each substance once
 * per assessment run and share it: the engine compiles a property set once and the assessment
 * cache keys on the snapshot object.
 */
import {
  ghsFlammableCategory,
  massToMoleFractions,
  nfpaLiquidClass,
  type ExposureLimit,
  type VaporPressureCorrelation,
  type VaporProperties,
} from "@/lib/hazard";
import type { LiquidClass } from "@/db/enums";
import type { MixtureComponentSnapshot, MixtureSnapshot, PhysicalState, QuantityLimitSetting, SubstanceSnapshot } from "./types";

const orUndefined = <T,>(value: T | null | undefined): T | undefined => (value == null ? undefined : value);

/** The stored fields of a substance the rules use (the `substances` row, its exposure limits). */
export type SubstanceFields = {
  id: number;
  name: string;
  cas: string | null;
  physicalState: PhysicalState;
  molarMassGPerMol: number;
  correlations: readonly unknown[];
  normalBoilingPointC: number | null;
  enthalpyOfVaporizationKJPerMol: number | null;
  meltingPointC: number | null;
  flashPointC: number | null;
  lflVolPercent: number | null;
  uflVolPercent: number | null;
  liquidDensityKgPerM3: number | null;
  exposureLimits: readonly { kind: ExposureLimit["kind"]; value: number; unit: ExposureLimit["unit"]; body?: string | null; source?: string | null }[];
  sources?: Readonly<Record<string, string>> | null;
};

export function buildSubstanceSnapshot(fields: SubstanceFields): SubstanceSnapshot {
  const correlations = fields.correlations as VaporPressureCorrelation[];
  const props: VaporProperties = {
    molarMassGPerMol: fields.molarMassGPerMol,
    correlations,
    normalBoilingPointC: orUndefined(fields.normalBoilingPointC),
    enthalpyOfVaporizationKJPerMol: orUndefined(fields.enthalpyOfVaporizationKJPerMol),
    meltingPointC: orUndefined(fields.meltingPointC),
    flashPointC: orUndefined(fields.flashPointC),
    lflVolPercent: orUndefined(fields.lflVolPercent),
    uflVolPercent: orUndefined(fields.uflVolPercent),
  };
  const classifiable = fields.flashPointC != null && fields.normalBoilingPointC != null;
  return {
    id: fields.id,
    name: fields.name,
    cas: fields.cas,
    physicalState: fields.physicalState,
    props,
    molarMassGPerMol: fields.molarMassGPerMol,
    hasCorrelation: correlations.length > 0,
    normalBoilingPointC: fields.normalBoilingPointC,
    flashPointC: fields.flashPointC,
    lflVolPercent: fields.lflVolPercent,
    liquidDensityKgPerM3: fields.liquidDensityKgPerM3,
    exposureLimits: fields.exposureLimits.map((limit) => ({
      kind: limit.kind,
      value: limit.value,
      unit: limit.unit,
      ...(limit.body ? { body: limit.body } : {}),
      ...(limit.source ? { source: limit.source } : {}),
    })),
    ghsCategory: classifiable ? ghsFlammableCategory(fields.flashPointC as number, fields.normalBoilingPointC as number) : null,
    nfpaClass: classifiable ? nfpaLiquidClass(fields.flashPointC as number, fields.normalBoilingPointC as number) : null,
    sources: fields.sources ?? {},
  };
}

/**
 * A mixture from its components (mass or mole fractions as stored; normalised here). Without a
 * measured flash point the lowest component flash point stands in, for screening only: a mixture
 * can flash below every component (minimum flash-point behaviour), so a measured or SDS value
 * should be recorded.
 */
export function buildMixtureSnapshot(input: {
  id: number;
  name: string;
  fractionBasis: "mass" | "mole";
  components: readonly { substance: SubstanceSnapshot; fraction: number }[];
  /** A measured or SDS flash point of the mixture, when known. */
  flashPointC?: number | null;
}): MixtureSnapshot {
  const warnings: string[] = [];
  const total = input.components.reduce((sum, component) => sum + component.fraction, 0);
  if (input.components.length > 0 && Math.abs(total - 1) > 0.001) {
    warnings.push(`The ${input.fractionBasis} fractions of ${input.name} sum to ${Number(total.toPrecision(4))}; they were normalised to 1`);
  }
  let components: MixtureComponentSnapshot[] = [];
  if (input.components.length > 0 && total > 0) {
    const normalised = input.components.map((component) => component.fraction / total);
    if (input.fractionBasis === "mass") {
      const moles = massToMoleFractions(
        input.components.map((component, i) => ({ massFraction: normalised[i], molarMassGPerMol: component.substance.molarMassGPerMol })),
      );
      components = input.components.map((component, i) => ({ substance: component.substance, moleFraction: moles[i], massFraction: normalised[i] }));
    } else {
      const masses = input.components.map((component, i) => normalised[i] * component.substance.molarMassGPerMol);
      const massTotal = masses.reduce((sum, mass) => sum + mass, 0);
      components = input.components.map((component, i) => ({ substance: component.substance, moleFraction: normalised[i], massFraction: masses[i] / massTotal }));
    }
  }
  const flashPoints = components.map((c) => c.substance.flashPointC).filter((v): v is number => v !== null);
  const boilingPoints = components.map((c) => c.substance.normalBoilingPointC).filter((v): v is number => v !== null);
  const measured = input.flashPointC ?? null;
  const flashPointC = measured ?? (flashPoints.length > 0 ? Math.min(...flashPoints) : null);
  if (measured === null && flashPointC !== null) {
    warnings.push(
      `No measured flash point for ${input.name}: the lowest component flash point (${flashPointC} °C) is used for screening; a mixture can flash below all of its components`,
    );
  }
  const boilingPointC = boilingPoints.length > 0 ? Math.min(...boilingPoints) : null;
  const classifiable = flashPointC !== null && boilingPointC !== null;
  let liquidDensityKgPerM3: number | null = null;
  if (components.length > 0 && components.every((c) => c.substance.liquidDensityKgPerM3 !== null && c.substance.liquidDensityKgPerM3 > 0)) {
    // Ideal mixing (volumes additive): 1/ρ = Σ wᵢ/ρᵢ.
    liquidDensityKgPerM3 = 1 / components.reduce((sum, c) => sum + c.massFraction / (c.substance.liquidDensityKgPerM3 as number), 0);
  }
  return {
    id: input.id,
    name: input.name,
    components,
    flashPointC,
    flashPointBasis: measured !== null ? "measured" : flashPointC !== null ? "lowest-component" : null,
    boilingPointC,
    ghsCategory: classifiable ? ghsFlammableCategory(flashPointC, boilingPointC) : null,
    nfpaClass: classifiable ? nfpaLiquidClass(flashPointC, boilingPointC) : null,
    liquidDensityKgPerM3,
    warnings,
  };
}

const SCOPE_NAMES: Record<QuantityLimitSetting["scope"], string> = {
  room: "Room",
  flammable_cabinet: "Flammable-liquid cabinet",
  storage_unit: "Storage unit",
};

/** A stored quantity-limit row (the `quantity_limits` table) as a setting; its name is made from the scope and classes. */
export function quantityLimitFromRow(row: {
  id: number;
  scope: QuantityLimitSetting["scope"];
  liquidClasses: readonly LiquidClass[];
  maxVolumeL: number;
  sprinkleredMaxVolumeL: number | null;
  basis: string;
}): QuantityLimitSetting {
  return {
    id: row.id,
    name: `${SCOPE_NAMES[row.scope]}, Class ${row.liquidClasses.join(", ")}`,
    scope: row.scope,
    liquidClasses: [...row.liquidClasses],
    maxVolumeL: row.maxVolumeL,
    sprinkleredMaxVolumeL: row.sprinkleredMaxVolumeL,
    basis: row.basis,
  };
}
