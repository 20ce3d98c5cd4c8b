import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { rooms, sites, storageUnits, users, type AlertDelivery } from "@/db/schema";
import { appUrl } from "@/lib/config";

export type AlertRecipient = {
  id: number;
  email: string;
  name: string;
  alertExcursions: AlertDelivery;
  alertFindings: AlertDelivery;
  dailyDigest: boolean;
  /** Why this person is told: owner, facilities contact, safety officer. */
  reasons: string[];
};

export type AlertLocation = { roomId: number; storageUnitId: number | null; label: string; link: string };

/** Where an alert happened, as people name it, with the page to open. */
export function describeAlertLocation(tx: DbOrTx, where: { roomId?: number | null; storageUnitId?: number | null }): AlertLocation | null {
  if (where.storageUnitId != null) {
    const row = tx
      .select({ unitId: storageUnits.id, unitCode: storageUnits.code, unitName: storageUnits.name, roomId: rooms.id, roomCode: rooms.code, roomName: rooms.name, siteName: sites.name })
      .from(storageUnits)
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .innerJoin(sites, eq(sites.id, rooms.siteId))
      .where(eq(storageUnits.id, where.storageUnitId))
      .get();
    if (!row) return null;
    return {
      roomId: row.roomId,
      storageUnitId: row.unitId,
      label: `${row.unitCode} ${row.unitName}, room ${row.roomCode} ${row.roomName}, ${row.siteName}`,
      link: `${appUrl()}/locations/units/${row.unitId}`,
    };
  }
  if (where.roomId == null) return null;
  const row = tx
    .select({ roomId: rooms.id, roomCode: rooms.code, roomName: rooms.name, siteName: sites.name })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(eq(rooms.id, where.roomId))
    .get();
  if (!row) return null;
  return { roomId: row.roomId, storageUnitId: null, label: `room ${row.roomCode} ${row.roomName}, ${row.siteName}`, link: `${appUrl()}/locations/rooms/${row.roomId}` };
}

/**
 * The people responsible for a location: the unit's owner, the room's facilities contact and every
 * safety officer — active accounts only, each once, with their alert choices.
 */
export function responsibleUsers(tx: DbOrTx, location: { roomId: number; storageUnitId: number | null }): AlertRecipient[] {
  const reasons = new Map<number, string[]>();
  const add = (id: number | null | undefined, reason: string) => {
    if (id == null) return;
    reasons.set(id, [...(reasons.get(id) ?? []), reason]);
  };
  if (location.storageUnitId != null) {
    add(tx.select({ ownerId: storageUnits.ownerId }).from(storageUnits).where(eq(storageUnits.id, location.storageUnitId)).get()?.ownerId, "unit owner");
  }
  add(tx.select({ contactId: rooms.facilitiesContactId }).from(rooms).where(eq(rooms.id, location.roomId)).get()?.contactId, "facilities contact");
  for (const officer of tx.select({ id: users.id }).from(users).where(and(eq(users.role, "safety_officer"), eq(users.active, true))).all()) {
    add(officer.id, "safety officer");
  }
  if (reasons.size === 0) return [];
  return tx
    .select({ id: users.id, email: users.email, name: users.name, alertExcursions: users.alertExcursions, alertFindings: users.alertFindings, dailyDigest: users.dailyDigest })
    .from(users)
    .where(and(inArray(users.id, [...reasons.keys()]), eq(users.active, true)))
    .all()
    .map((user) => ({ ...user, reasons: reasons.get(user.id) ?? [] }));
}
