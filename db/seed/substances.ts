/** Loads the sourced substance library (db/seed/substance-library.ts) into an empty substances table, and brings an installation's copy up to a new edition. */
import { and, count, eq, inArray, isNull } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { exposureLimits, settings, substances } from "@/db/schema";
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

/**
 * The library's edition. Raise it whenever the library's values or sources change: installations
 * then refresh their copy once (refreshSubstanceLibrary).
 */
export const SUBSTANCE_LIBRARY_EDITION = "2026-12-06";
export const LIBRARY_EDITION_KEY = "substanceLibrary.edition";

function insertLimits(tx: DbOrTx, substanceId: number, seed: SubstanceSeed): void {
  for (const limit of seed.exposureLimits) {
    tx.insert(exposureLimits)
      .values({ substanceId, kind: limit.kind, value: limit.value, unit: limit.unit, body: limit.body, source: limit.source, note: limit.note ?? null })
      .run();
  }
}

function recordEdition(tx: DbOrTx): void {
  tx.insert(settings)
    .values({ key: LIBRARY_EDITION_KEY, value: SUBSTANCE_LIBRARY_EDITION })
    .onConflictDoUpdate({ target: settings.key, set: { value: SUBSTANCE_LIBRARY_EDITION, updatedAt: new Date() } })
    .run();
}

/** Returns how many substances were loaded (0 when the table already had rows). */
export function seedSubstanceLibrary(tx: DbOrTx): number {
  const existing = tx.select({ n: count() }).from(substances).get()?.n ?? 0;
  if (existing > 0) return 0;
  for (const seed of substanceLibrary) {
    const row = tx.insert(substances).values(substanceRow(seed)).returning({ id: substances.id }).get();
    insertLimits(tx, row.id, seed);
  }
  recordEdition(tx);
  return substanceLibrary.length;
}

/**
 * Brings an installation's library substances up to this edition, once: every substance of the
 * library (matched by CAS number) that no person has edited (`updated_by_id` is null) takes the
 * library's values, sources, alternatives, notes and exposure limits. A substance someone edited
 * keeps what they set. Call inside a transaction. Returns the ids refreshed, or null when the
 * installation is already at this edition (or has no substances yet: seeding records the edition).
 */
export function refreshSubstanceLibrary(tx: DbOrTx): number[] | null {
  const stored = tx.select({ value: settings.value }).from(settings).where(eq(settings.key, LIBRARY_EDITION_KEY)).get()?.value;
  if (stored === SUBSTANCE_LIBRARY_EDITION) return null;
  const existing = tx.select({ n: count() }).from(substances).get()?.n ?? 0;
  if (existing === 0) return null;
  const byCas = new Map(substanceLibrary.map((seed) => [seed.cas, seed]));
  const unedited = tx
    .select({ id: substances.id, cas: substances.cas })
    .from(substances)
    .where(and(isNull(substances.updatedById), inArray(substances.cas, [...byCas.keys()])))
    .all();
  const refreshed: number[] = [];
  for (const { id, cas } of unedited) {
    const seed = byCas.get(cas!)!;
    tx.update(substances).set({ ...substanceRow(seed), updatedAt: new Date() }).where(eq(substances.id, id)).run();
    tx.delete(exposureLimits).where(eq(exposureLimits.substanceId, id)).run();
    insertLimits(tx, id, seed);
    refreshed.push(id);
  }
  recordEdition(tx);
  return refreshed;
}
