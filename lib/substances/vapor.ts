/**
 * Stored substance rows → the hazard engine's inputs, and the computations the substance pages
 * and the API show. Pure: takes plain rows, returns plain data.
 */
import {
  ghsFlammableCategory,
  lowerFlammableTemperatureC,
  nfpaLiquidClass,
  saturatedConcentration,
  saturationPressure,
  STANDARD_ATMOSPHERE_KPA,
  type VaporPressureCorrelation,
  type VaporProperties,
} from "@/lib/hazard";

export type SubstanceVaporFields = {
  molarMassGPerMol: number;
  correlations: unknown[];
  normalBoilingPointC: number | null;
  enthalpyOfVaporizationKJPerMol: number | null;
  meltingPointC: number | null;
  flashPointC: number | null;
  lflVolPercent: number | null;
  uflVolPercent: number | null;
};

const defined = <T,>(value: T | null): T | undefined => (value == null ? undefined : value);

export function toVaporProperties(row: SubstanceVaporFields): VaporProperties {
  return {
    molarMassGPerMol: row.molarMassGPerMol,
    correlations: row.correlations as VaporPressureCorrelation[],
    normalBoilingPointC: defined(row.normalBoilingPointC),
    enthalpyOfVaporizationKJPerMol: defined(row.enthalpyOfVaporizationKJPerMol),
    meltingPointC: defined(row.meltingPointC),
    flashPointC: defined(row.flashPointC),
    lflVolPercent: defined(row.lflVolPercent),
    uflVolPercent: defined(row.uflVolPercent),
  };
}

/** Psat and the saturated concentration at one temperature (the API's vapor-pressure answer). */
export function vaporAt(row: SubstanceVaporFields, tempC: number, ambientPressureKPa = STANDARD_ATMOSPHERE_KPA) {
  const props = toVaporProperties(row);
  const pressure = saturationPressure(props, tempC);
  const concentration = saturatedConcentration(props, tempC, ambientPressureKPa);
  return {
    tempC,
    ambientPressureKPa,
    pressureKPa: pressure.pressureKPa,
    method: pressure.method,
    extrapolated: pressure.extrapolated,
    warnings: pressure.warnings,
    saturatedConcentration: {
      ppm: concentration.ppm,
      mgPerM3: concentration.mgPerM3,
      volumePercent: concentration.volumePercent,
      boils: concentration.boils,
      warnings: concentration.warnings,
    },
  };
}

export type ClassificationSummary = {
  ghsCategory: 1 | 2 | 3 | 4 | null;
  nfpaClass: string | null;
  lowerFlammableTemperatureC: number | null;
};

export function classify(row: SubstanceVaporFields): ClassificationSummary {
  const canClassify = row.flashPointC != null && row.normalBoilingPointC != null;
  let lft: number | null = null;
  if (row.lflVolPercent != null) {
    try {
      lft = lowerFlammableTemperatureC(toVaporProperties(row));
    } catch {
      lft = null;
    }
  }
  return {
    ghsCategory: canClassify ? ghsFlammableCategory(row.flashPointC!, row.normalBoilingPointC!) : null,
    nfpaClass: canClassify ? nfpaLiquidClass(row.flashPointC!, row.normalBoilingPointC!) : null,
    lowerFlammableTemperatureC: lft,
  };
}

export type CurvePoint = { tempC: number; pressureKPa: number; extrapolated: boolean };

/** The vapor-pressure curve over a temperature span, for the substance page's chart. */
export function vaporPressureCurve(row: SubstanceVaporFields, fromC = -40, toC = 60, stepC = 1): CurvePoint[] {
  const props = toVaporProperties(row);
  const points: CurvePoint[] = [];
  for (let tempC = fromC; tempC <= toC + 1e-9; tempC += stepC) {
    try {
      const result = saturationPressure(props, tempC);
      points.push({ tempC, pressureKPa: result.pressureKPa, extrapolated: result.extrapolated || result.method.startsWith("clausius") });
    } catch {
      // A temperature the data cannot reach is left out of the curve.
    }
  }
  return points;
}
