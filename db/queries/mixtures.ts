import "server-only";
import { asc, eq } from "drizzle-orm";
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
