import "server-only";
import { and, asc, count, desc, eq, gt, gte, isNotNull, isNull, like, lt, lte, or, sql, type SQL } from "drizzle-orm";
import type { AnySQLiteColumn } from "drizzle-orm/sqlite-core";
import { getDb } from "@/db/client";
import { exposureLimits, substances, type Substance } from "@/db/schema";
import { escapeLike } from "@/lib/objects";

export type SubstanceSortKey = "name" | "cas" | "normalBoilingPointC" | "flashPointC" | "lflVolPercent" | "molarMassGPerMol";
export type SubstanceGhsFilter = "1" | "2" | "3" | "4" | "none";
export type SubstanceListQuery = {
  q?: string;
  cas?: string;
  ghs?: SubstanceGhsFilter;
  sort?: SubstanceSortKey;
  dir?: "asc" | "desc";
  page: number;
  pageSize: number;
  includeRetired?: boolean;
};

const SORT_COLUMNS = {
  name: substances.name,
  cas: substances.cas,
  normalBoilingPointC: substances.normalBoilingPointC,
  flashPointC: substances.flashPointC,
  lflVolPercent: substances.lflVolPercent,
  molarMassGPerMol: substances.molarMassGPerMol,
} satisfies Record<SubstanceSortKey, AnySQLiteColumn>;

/**
 * The GHS flammable-liquid category in SQL, the same cut-offs as `ghsFlammableCategory` in
 * lib/hazard/classification.ts (GHS Rev. 10, table 2.6.1): both flash point and initial boiling
 * point are needed to classify; above 93 °C the liquid is not in a flammable category.
 */
function ghsCondition(category: SubstanceGhsFilter): SQL | undefined {
  const fp = substances.flashPointC;
  const bp = substances.normalBoilingPointC;
  switch (category) {
    case "1":
      return and(isNotNull(bp), lt(fp, 23), lte(bp, 35));
    case "2":
      return and(lt(fp, 23), gt(bp, 35));
    case "3":
      return and(isNotNull(bp), gte(fp, 23), lte(fp, 60));
    case "4":
      return and(isNotNull(bp), gt(fp, 60), lte(fp, 93));
    case "none":
      return or(isNull(fp), isNull(bp), gt(fp, 93));
  }
}

/**
 * Paged search by name, synonym or CAS number, sorted in SQL. Empty values sort last in both
 * directions; `id` breaks ties in the sort's own direction, so a descending page is the exact
 * reverse of an ascending one and an index on the column can be walked either way.
 */
export function listSubstances(query: SubstanceListQuery) {
  const db = getDb();
  const conditions: (SQL | undefined)[] = [query.includeRetired ? undefined : isNull(substances.retiredAt)];
  if (query.q) {
    const pattern = `%${escapeLike(query.q.trim().toLowerCase())}%`;
    conditions.push(
      or(
        sql`lower(${substances.name}) like ${pattern} escape '\\'`,
        sql`lower(${substances.synonyms}) like ${pattern} escape '\\'`,
        like(substances.cas, pattern),
      ),
    );
  }
  if (query.cas) conditions.push(eq(substances.cas, query.cas.trim()));
  if (query.ghs) conditions.push(ghsCondition(query.ghs));
  const where = and(...conditions);
  const total = db.select({ n: count() }).from(substances).where(where).get()?.n ?? 0;

  const column = SORT_COLUMNS[query.sort ?? "name"];
  const direction = query.dir === "desc" ? desc : asc;
  // SQLite puts NULL first when ascending; the name and the molar mass are NOT NULL and need no
  // clause, which keeps the name index usable for the default order.
  const order: SQL[] = column.notNull
    ? [direction(column), direction(substances.id)]
    : [sql`${column} ${sql.raw(query.dir === "desc" ? "desc" : "asc")} nulls last`, direction(substances.id)];
  const rows = db
    .select()
    .from(substances)
    .where(where)
    .orderBy(...order)
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows, total };
}

export function getSubstance(id: number): (Substance & { exposureLimits: (typeof exposureLimits.$inferSelect)[] }) | null {
  const db = getDb();
  const row = db.select().from(substances).where(eq(substances.id, id)).get();
  if (!row) return null;
  const limits = db.select().from(exposureLimits).where(eq(exposureLimits.substanceId, id)).orderBy(asc(exposureLimits.id)).all();
  return { ...row, exposureLimits: limits };
}
