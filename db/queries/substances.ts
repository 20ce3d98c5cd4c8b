import "server-only";
import { and, asc, count, eq, isNull, like, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { exposureLimits, substances, type Substance } from "@/db/schema";

export type SubstanceListQuery = { q?: string; cas?: string; page: number; pageSize: number; includeRetired?: boolean };

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (ch) => `\\${ch}`);
}

/** Paged search by name, synonym or CAS number; uses the name index for ordering. */
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
  const where = and(...conditions);
  const total = db.select({ n: count() }).from(substances).where(where).get()?.n ?? 0;
  const rows = db
    .select()
    .from(substances)
    .where(where)
    .orderBy(asc(substances.name), asc(substances.id))
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
