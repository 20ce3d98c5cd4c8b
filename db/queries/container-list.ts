import "server-only";
import { and, asc, count, desc, eq, inArray, ne, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers, mixtures, rooms, sites, storageUnits, substances, users } from "@/db/schema";
import type { ContainerListQuery } from "@/lib/inventory/schemas";
import { escapeLike } from "@/lib/objects";

/**
 * Filters of the container list. Label search is a prefix range on the unique label index;
 * substance search goes through the (small) substances table first. Site and room filters are
 * written on the location tables when the query joins them, else as a list of storage units.
 */
function conditions(query: ContainerListQuery, userId: number, options: { locationJoined?: boolean } = {}): SQL | undefined {
  const db = getDb();
  const parts: (SQL | undefined)[] = [];
  const state = query.state ?? "live";
  if (state === "live") parts.push(ne(containers.state, "disposed"));
  else if (state !== "all") parts.push(eq(containers.state, state));
  if (query.storageUnitId) parts.push(eq(containers.storageUnitId, query.storageUnitId));
  if (options.locationJoined) {
    // The query joins the location tables: filtering on them lets SQLite walk site → rooms →
    // units → containers in location order instead of sorting the site's containers.
    if (query.roomId) parts.push(eq(storageUnits.roomId, query.roomId));
    if (query.siteId) parts.push(eq(rooms.siteId, query.siteId));
  } else {
    if (query.roomId) parts.push(inArray(containers.storageUnitId, db.select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.roomId, query.roomId))));
    if (query.siteId) {
      parts.push(
        inArray(
          containers.storageUnitId,
          db.select({ id: storageUnits.id }).from(storageUnits).innerJoin(rooms, eq(rooms.id, storageUnits.roomId)).where(eq(rooms.siteId, query.siteId)),
        ),
      );
    }
  }
  if (query.ownerId) parts.push(eq(containers.ownerId, query.ownerId));
  if (query.mine) parts.push(eq(containers.ownerId, userId));
  if (query.substanceId) parts.push(eq(containers.substanceId, query.substanceId));
  if (query.q) {
    const q = query.q.trim();
    const pattern = `%${escapeLike(q.toLowerCase())}%`;
    // One branch per index (label, substance, mixture), joined by UNION ALL: written as one OR,
    // SQLite would test every container against all three.
    const byLabel = db
      .select({ id: containers.id })
      .from(containers)
      .where(and(sql`${containers.label} >= ${q}`, sql`${containers.label} < ${q + "\u{10FFFF}"}`));
    const bySubstance = db
      .select({ id: containers.id })
      .from(containers)
      .where(
        inArray(
          containers.substanceId,
          db
            .select({ id: substances.id })
            .from(substances)
            .where(or(sql`lower(${substances.name}) like ${pattern} escape '\\'`, sql`lower(${substances.synonyms}) like ${pattern} escape '\\'`, eq(substances.cas, q))),
        ),
      );
    const byMixture = db
      .select({ id: containers.id })
      .from(containers)
      .where(inArray(containers.mixtureId, db.select({ id: mixtures.id }).from(mixtures).where(sql`lower(${mixtures.name}) like ${pattern} escape '\\'`)));
    parts.push(inArray(containers.id, byLabel.unionAll(bySubstance).unionAll(byMixture)));
  }
  return and(...parts);
}

function orderBy(query: ContainerListQuery): SQL[] {
  const dir = query.dir === "desc" ? desc : asc;
  const nullsLast = (column: SQL | typeof containers.expiresAt) => sql`${column} ${sql.raw(query.dir === "desc" ? "desc" : "asc")} nulls last`;
  switch (query.sort) {
    case "label":
      return [dir(containers.label)];
    case "substance":
      return [nullsLast(sql`coalesce(${substances.name}, ${mixtures.name})`), dir(containers.id)];
    case "amount":
      return [dir(containers.amountUnit), dir(containers.amount), dir(containers.id)];
    case "state":
      return [dir(containers.state), dir(containers.id)];
    case "location":
      return [dir(sites.name), dir(rooms.code), dir(storageUnits.code), dir(containers.label)];
    case "owner":
      return [nullsLast(sql`${users.name}`), dir(containers.id)];
    case "expiresAt":
      return [nullsLast(containers.expiresAt), dir(containers.id)];
    default:
      return [dir(containers.updatedAt), dir(containers.id)];
  }
}

/**
 * One page in two steps: first the ids of the page, joining only the tables the sort needs, then
 * the 25 full rows by id. Sorting thousands of matches then moves ids, not whole joined rows. The
 * location joins never drop a container (storage_unit_id is a non-null foreign key), so leaving
 * them out of the first step changes no answer.
 */
export function listContainers(query: ContainerListQuery, userId: number) {
  const db = getDb();
  const where = conditions(query, userId);
  const total = db.select({ n: count() }).from(containers).where(where).get()?.n ?? 0;

  let page = db.select({ id: containers.id }).from(containers).$dynamic();
  if (query.sort === "location") {
    page = page
      .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .innerJoin(sites, eq(sites.id, rooms.siteId));
  } else if (query.sort === "substance") {
    page = page.leftJoin(substances, eq(substances.id, containers.substanceId)).leftJoin(mixtures, eq(mixtures.id, containers.mixtureId));
  } else if (query.sort === "owner") {
    page = page.leftJoin(users, eq(users.id, containers.ownerId));
  }
  const ids = page
    .where(query.sort === "location" ? conditions(query, userId, { locationJoined: true }) : where)
    .orderBy(...orderBy(query))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all()
    .map((row) => row.id);
  if (ids.length === 0) return { rows: [], total };

  const found = db
    .select({
      id: containers.id,
      label: containers.label,
      substanceId: containers.substanceId,
      substanceName: substances.name,
      substanceCas: substances.cas,
      mixtureId: containers.mixtureId,
      mixtureName: mixtures.name,
      amount: containers.amount,
      amountUnit: containers.amountUnit,
      state: containers.state,
      containerKind: containers.containerKind,
      storageUnitId: containers.storageUnitId,
      unitCode: storageUnits.code,
      roomId: rooms.id,
      roomCode: rooms.code,
      siteName: sites.name,
      ownerId: containers.ownerId,
      ownerName: users.name,
      expiresAt: containers.expiresAt,
      updatedAt: containers.updatedAt,
    })
    .from(containers)
    .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .leftJoin(substances, eq(substances.id, containers.substanceId))
    .leftJoin(mixtures, eq(mixtures.id, containers.mixtureId))
    .leftJoin(users, eq(users.id, containers.ownerId))
    .where(inArray(containers.id, ids))
    .all();
  const byId = new Map(found.map((row) => [row.id, row]));
  const rows = ids.flatMap((id) => byId.get(id) ?? []);
  return { rows, total };
}

export type ContainerListRow = ReturnType<typeof listContainers>["rows"][number];
