import "server-only";
import { and, asc, count, desc, eq, isNull, sql } from "drizzle-orm";
import type { z } from "zod";
import type { mixtureListQuerySchema } from "@/lib/mixtures/schemas";
import { getDb } from "@/db/client";
import { mixtureComponents, mixtures, substances } from "@/db/schema";

export function getMixture(id: number) {
  const db = getDb();
  const mixture = db.select().from(mixtures).where(eq(mixtures.id, id)).get();
  if (!mixture) return null;
  const components = db
    .select({ substanceId: mixtureComponents.substanceId, fraction: mixtureComponents.fraction, name: substances.name, cas: substances.cas })
    .from(mixtureComponents)
    .innerJoin(substances, eq(substances.id, mixtureComponents.substanceId))
    .where(eq(mixtureComponents.mixtureId, id))
    .orderBy(asc(mixtureComponents.id))
    .all();
  return { ...mixture, components };
}

export function listMixtures(query: z.output<typeof mixtureListQuerySchema>) {
  const db = getDb();
  const where = and(isNull(mixtures.retiredAt), query.q ? sql`lower(${mixtures.name}) like ${`%${query.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`} escape '\\'` : undefined);
  const dir = query.dir === "desc" ? desc : asc;
  const total = db.select({ n: count() }).from(mixtures).where(where).get()?.n ?? 0;
  const rows = db
    .select({
      id: mixtures.id,
      name: mixtures.name,
      description: mixtures.description,
      fractionBasis: mixtures.fractionBasis,
      createdAt: mixtures.createdAt,
      components: sql<number>`(select count(*) from ${mixtureComponents} where ${mixtureComponents.mixtureId} = ${mixtures.id})`,
    })
    .from(mixtures)
    .where(where)
    .orderBy(query.sort === "createdAt" ? dir(mixtures.createdAt) : dir(mixtures.name), dir(mixtures.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows, total };
}
