import "server-only";
import { and, asc, count, desc, eq, isNull, or, sql, type SQL } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { rooms, sites, storageUnits } from "@/db/schema";
import type { AnySQLiteColumn } from "drizzle-orm/sqlite-core";
import type { roomListQuerySchema, siteListQuerySchema, storageUnitListQuerySchema } from "@/lib/locations/schemas";

const like = (column: SQL | AnySQLiteColumn, q: string) => sql`lower(${column}) like ${`%${q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`} escape '\\'`;

export function listSites(query: z.output<typeof siteListQuerySchema>) {
  const db = getDb();
  const where = and(isNull(sites.retiredAt), query.q ? like(sql`${sites.name}`, query.q) : undefined);
  const total = db.select({ n: count() }).from(sites).where(where).get()?.n ?? 0;
  const rows = db
    .select()
    .from(sites)
    .where(where)
    .orderBy(query.dir === "desc" ? desc(sites.name) : asc(sites.name))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows, total };
}

export function listRooms(query: z.output<typeof roomListQuerySchema>) {
  const db = getDb();
  const where = and(
    isNull(rooms.retiredAt),
    query.siteId ? eq(rooms.siteId, query.siteId) : undefined,
    query.kind ? eq(rooms.kind, query.kind) : undefined,
    query.q ? or(like(rooms.code, query.q), like(sql`${rooms.name}`, query.q)) : undefined,
  );
  const dir = query.dir === "desc" ? desc : asc;
  const order = {
    code: [dir(rooms.code)],
    name: [dir(rooms.name)],
    site: [dir(sites.name), dir(rooms.code)],
    designMaxTempC: [sql`${rooms.designMaxTempC} ${sql.raw(query.dir)} nulls last`],
  }[query.sort];
  const total = db.select({ n: count() }).from(rooms).where(where).get()?.n ?? 0;
  const rows = db
    .select({
      id: rooms.id,
      siteId: rooms.siteId,
      siteName: sites.name,
      code: rooms.code,
      name: rooms.name,
      kind: rooms.kind,
      floorAreaM2: rooms.floorAreaM2,
      heightM: rooms.heightM,
      volumeM3: sql<number | null>`${rooms.floorAreaM2} * ${rooms.heightM}`,
      airChangesPerHour: rooms.airChangesPerHour,
      mixingFactor: rooms.mixingFactor,
      designMaxTempC: rooms.designMaxTempC,
      sprinklered: rooms.sprinklered,
      setMinC: rooms.setMinC,
      setMaxC: rooms.setMaxC,
      facilitiesContactId: rooms.facilitiesContactId,
    })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(where)
    .orderBy(...order, dir(rooms.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows, total };
}

export function listStorageUnits(query: z.output<typeof storageUnitListQuerySchema>) {
  const db = getDb();
  const where = and(
    isNull(storageUnits.retiredAt),
    query.roomId ? eq(storageUnits.roomId, query.roomId) : undefined,
    query.siteId ? eq(rooms.siteId, query.siteId) : undefined,
    query.kind ? eq(storageUnits.kind, query.kind) : undefined,
    query.q ? or(like(storageUnits.code, query.q), like(sql`${storageUnits.name}`, query.q)) : undefined,
  );
  const dir = query.dir === "desc" ? desc : asc;
  const order = {
    code: [dir(storageUnits.code)],
    name: [dir(storageUnits.name)],
    kind: [dir(storageUnits.kind)],
    room: [dir(sites.name), dir(rooms.code), dir(storageUnits.code)],
  }[query.sort];
  const total = db.select({ n: count() }).from(storageUnits).innerJoin(rooms, eq(rooms.id, storageUnits.roomId)).where(where).get()?.n ?? 0;
  const rows = db
    .select({
      id: storageUnits.id,
      roomId: storageUnits.roomId,
      roomCode: rooms.code,
      siteId: rooms.siteId,
      siteName: sites.name,
      code: storageUnits.code,
      name: storageUnits.name,
      kind: storageUnits.kind,
      internalVolumeL: storageUnits.internalVolumeL,
      setMinC: storageUnits.setMinC,
      setMaxC: storageUnits.setMaxC,
      excursionThresholdC: storageUnits.excursionThresholdC,
      excursionMinDurationMin: storageUnits.excursionMinDurationMin,
      ventilated: storageUnits.ventilated,
      ignitionSourceFree: storageUnits.ignitionSourceFree,
      ownerId: storageUnits.ownerId,
    })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(where)
    .orderBy(...order, dir(storageUnits.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows, total };
}
