/** Loads the sourced substance library (db/seed/substance-library.ts) into an empty substances table. */
import { count } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { exposureLimits, substances } from "@/db/schema";
import { substanceLibrary, type SubstanceSeed } from "./substance-library";

/** The library names a few source keys after its own fields; the table's columns differ. */
function sourcesByColumn(seed: SubstanceSeed): Record<string, string> {
  const renamed: Record<string, string> = {
    autoignitionC: "autoignitionTempC",
    liquidDensityGPerMl: "liquidDensityKgPerM3",
    ...(seed.physicalState === "solid" ? { enthalpyOfVaporizationKJPerMol: "enthalpyOfSublimationKJPerMol" } : {}),
  };
  return Object.fromEntries(Object.entries(seed.sources).map(([key, source]) => [renamed[key] ?? key, source]));
}

export function substanceRow(seed: SubstanceSeed): typeof substances.$inferInsert {
  const isSublimingSolid = seed.physicalState === "solid";
  return {
    cas: seed.cas,
    name: seed.name,
    synonyms: seed.synonyms,
    formula: seed.formula,
    physicalState: seed.physicalState,
    molarMassGPerMol: seed.molarMassGPerMol,
    normalBoilingPointC: seed.normalBoilingPointC,
    meltingPointC: seed.meltingPointC ?? null,
    enthalpyOfVaporizationKJPerMol: isSublimingSolid ? null : (seed.enthalpyOfVaporizationKJPerMol ?? null),
    enthalpyOfSublimationKJPerMol: isSublimingSolid ? (seed.enthalpyOfVaporizationKJPerMol ?? null) : null,
    liquidDensityKgPerM3: seed.liquidDensityKgPerM3 ?? (seed.liquidDensityGPerMl != null ? seed.liquidDensityGPerMl * 1000 : null),
    flashPointC: seed.flashPointC ?? null,
    lflVolPercent: seed.lflVolPercent ?? null,
    uflVolPercent: seed.uflVolPercent ?? null,
    autoignitionTempC: seed.autoignitionC ?? null,
    correlations: seed.correlations as unknown as typeof substances.$inferInsert["correlations"],
    sources: sourcesByColumn(seed),
    alternatives: seed.alternativeFlammability,
    notes: seed.notes.length ? seed.notes.join("\n") : null,
  };
}

/** Returns how many substances were loaded (0 when the table already had rows). */
export function seedSubstanceLibrary(tx: DbOrTx): number {
  const existing = tx.select({ n: count() }).from(substances).get()?.n ?? 0;
  if (existing > 0) return 0;
  for (const seed of substanceLibrary) {
    const row = tx.insert(substances).values(substanceRow(seed)).returning({ id: substances.id }).get();
    for (const limit of seed.exposureLimits) {
      tx.insert(exposureLimits)
        .values({ substanceId: row.id, kind: limit.kind, value: limit.value, unit: limit.unit, body: limit.body, source: limit.source, note: limit.note ?? null })
        .run();
    }
  }
  return substanceLibrary.length;
}
