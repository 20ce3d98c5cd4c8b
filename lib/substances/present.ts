import type { ExposureLimit, Substance } from "@/db/schema";
import { classify } from "./vapor";

/** The JSON shape of a substance in list answers. */
export function substanceSummary(row: Substance) {
  const c = classify(row);
  return {
    id: row.id,
    cas: row.cas,
    name: row.name,
    synonyms: row.synonyms,
    formula: row.formula,
    physicalState: row.physicalState,
    molarMassGPerMol: row.molarMassGPerMol,
    normalBoilingPointC: row.normalBoilingPointC,
    flashPointC: row.flashPointC,
    lflVolPercent: row.lflVolPercent,
    uflVolPercent: row.uflVolPercent,
    ghsFlammableCategory: c.ghsCategory,
    nfpaLiquidClass: c.nfpaClass,
    retired: row.retiredAt != null,
  };
}

/** The JSON shape of one substance with every value and its source. */
export function substanceDetail(row: Substance & { exposureLimits: ExposureLimit[] }) {
  const c = classify(row);
  return {
    ...substanceSummary(row),
    meltingPointC: row.meltingPointC,
    enthalpyOfVaporizationKJPerMol: row.enthalpyOfVaporizationKJPerMol,
    enthalpyOfSublimationKJPerMol: row.enthalpyOfSublimationKJPerMol,
    liquidDensityKgPerM3: row.liquidDensityKgPerM3,
    autoignitionTempC: row.autoignitionTempC,
    lowerFlammableTemperatureC: c.lowerFlammableTemperatureC,
    correlations: row.correlations,
    exposureLimits: row.exposureLimits.map((l) => ({ kind: l.kind, value: l.value, unit: l.unit, body: l.body, source: l.source, note: l.note })),
    sources: row.sources,
    alternatives: row.alternatives,
    notes: row.notes,
    updatedAt: row.updatedAt.toISOString(),
  };
}
