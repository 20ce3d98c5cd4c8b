import "server-only";
import { asc, count, eq, isNull, and, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers, rooms, sites, storageUnits, users } from "@/db/schema";

/** Sites → rooms → storage units, with live container counts, for the locations overview. */
export function locationsTree() {
  const db = getDb();
  const siteRows = db.select().from(sites).where(isNull(sites.retiredAt)).orderBy(asc(sites.name)).all();
  const roomRows = db
    .select({ room: rooms, contactName: users.name })
    .from(rooms)
    .leftJoin(users, eq(users.id, rooms.facilitiesContactId))
    .where(isNull(rooms.retiredAt))
    .orderBy(asc(rooms.code))
    .all();
  const unitRows = db
    .select({ unit: storageUnits, containerCount: count(containers.id) })
    .from(storageUnits)
    .leftJoin(containers, and(eq(containers.storageUnitId, storageUnits.id), ne(containers.state, "disposed")))
    .where(isNull(storageUnits.retiredAt))
    .groupBy(storageUnits.id)
    .orderBy(asc(storageUnits.code))
    .all();
  return siteRows.map((site) => ({
    site,
    rooms: roomRows
      .filter((r) => r.room.siteId === site.id)
      .map((r) => ({
        room: r.room,
        contactName: r.contactName,
        units: unitRows.filter((u) => u.unit.roomId === r.room.id),
      })),
  }));
}
