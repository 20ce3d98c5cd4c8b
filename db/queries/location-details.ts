import "server-only";
import { and, asc, count, eq, isNull, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers, rooms, sites, storageUnits, users } from "@/db/schema";

export function getSite(id: number) {
  return getDb().select().from(sites).where(eq(sites.id, id)).get() ?? null;
}

export function getRoom(id: number) {
  const db = getDb();
  const row = db
    .select({ room: rooms, siteName: sites.name, contactName: users.name })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .leftJoin(users, eq(users.id, rooms.facilitiesContactId))
    .where(eq(rooms.id, id))
    .get();
  if (!row) return null;
  const units = db
    .select({ unit: storageUnits, containerCount: count(containers.id) })
    .from(storageUnits)
    .leftJoin(containers, and(eq(containers.storageUnitId, storageUnits.id), ne(containers.state, "disposed")))
    .where(and(eq(storageUnits.roomId, id), isNull(storageUnits.retiredAt)))
    .groupBy(storageUnits.id)
    .orderBy(asc(storageUnits.code))
    .all();
  const volumeM3 = row.room.floorAreaM2 != null && row.room.heightM != null ? row.room.floorAreaM2 * row.room.heightM : null;
  return { ...row.room, siteName: row.siteName, facilitiesContactName: row.contactName, volumeM3, units };
}

export function getStorageUnit(id: number) {
  const row = getDb()
    .select({ unit: storageUnits, roomCode: rooms.code, roomName: rooms.name, siteId: rooms.siteId, siteName: sites.name, ownerName: users.name })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .leftJoin(users, eq(users.id, storageUnits.ownerId))
    .where(eq(storageUnits.id, id))
    .get();
  if (!row) return null;
  return { ...row.unit, roomCode: row.roomCode, roomName: row.roomName, siteId: row.siteId, siteName: row.siteName, ownerName: row.ownerName };
}
