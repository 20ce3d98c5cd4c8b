import "server-only";
import { asc, eq, isNull, and } from "drizzle-orm";
import { getDb } from "@/db/client";
import { mixtures, rooms, sites, storageUnits, users } from "@/db/schema";

/** Live storage units with their room and site, for location pickers. */
export function storageUnitOptions() {
  return getDb()
    .select({
      id: storageUnits.id,
      code: storageUnits.code,
      name: storageUnits.name,
      kind: storageUnits.kind,
      roomId: rooms.id,
      roomCode: rooms.code,
      roomName: rooms.name,
      siteName: sites.name,
    })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(and(isNull(storageUnits.retiredAt), isNull(rooms.retiredAt), isNull(sites.retiredAt)))
    .orderBy(asc(sites.name), asc(rooms.code), asc(storageUnits.code))
    .all();
}

export type StorageUnitOption = ReturnType<typeof storageUnitOptions>[number];

export function activeUserOptions() {
  return getDb()
    .select({ id: users.id, name: users.name, email: users.email, role: users.role })
    .from(users)
    .where(eq(users.active, true))
    .orderBy(asc(users.name))
    .all();
}

export function mixtureOptions() {
  return getDb().select({ id: mixtures.id, name: mixtures.name }).from(mixtures).where(isNull(mixtures.retiredAt)).orderBy(asc(mixtures.name)).all();
}

export function siteOptions() {
  return getDb().select({ id: sites.id, name: sites.name }).from(sites).where(isNull(sites.retiredAt)).orderBy(asc(sites.name)).all();
}
