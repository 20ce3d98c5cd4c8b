/**
 * What an import file may refer to, loaded from the database once per import into maps, so
 * checking 10,000 rows costs a handful of queries rather than several per row. Retired records
 * are left out: a file cannot store a container in a retired unit or name a retired substance.
 */
import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { mixtures, rooms, sites, storageUnits, substances, users } from "@/db/schema";
import type { ContainerLookups } from "./containers";
import type { LocationLookups } from "./locations";

/** Names compare as the validators pass them: trimmed, runs of spaces collapsed, and here without regard to case. */
export function foldName(name: string): string {
  return name.trim().replace(/\s+/g, " ").toLowerCase();
}

const KEY_SEPARATOR = "\u0000";
const key = (...parts: string[]) => parts.join(KEY_SEPARATOR);

/** Sites by folded name; the first (lowest id) wins if two differ only in capitals. */
function liveSiteIds(db: DbOrTx): Map<string, number> {
  const byName = new Map<string, number>();
  const rows = db.select({ id: sites.id, name: sites.name }).from(sites).where(isNull(sites.retiredAt)).orderBy(sites.id).all();
  for (const row of rows) {
    const folded = foldName(row.name);
    if (!byName.has(folded)) byName.set(folded, row.id);
  }
  return byName;
}

export function loadContainerLookups(db: DbOrTx): ContainerLookups {
  const substanceByCas = new Map<string, number>();
  const substanceByName = new Map<string, number>();
  const substanceRows = db
    .select({ id: substances.id, cas: substances.cas, name: substances.name, synonyms: substances.synonyms })
    .from(substances)
    .where(isNull(substances.retiredAt))
    .orderBy(substances.id)
    .all();
  // Names first, then synonyms, so a synonym never hides another substance's own name.
  for (const row of substanceRows) {
    if (row.cas) substanceByCas.set(row.cas, row.id);
    const folded = foldName(row.name);
    if (!substanceByName.has(folded)) substanceByName.set(folded, row.id);
  }
  for (const row of substanceRows) {
    for (const synonym of row.synonyms ?? []) {
      const folded = foldName(synonym);
      if (folded !== "" && !substanceByName.has(folded)) substanceByName.set(folded, row.id);
    }
  }

  const mixtureByName = new Map<string, number>();
  for (const row of db.select({ id: mixtures.id, name: mixtures.name }).from(mixtures).where(isNull(mixtures.retiredAt)).orderBy(mixtures.id).all()) {
    const folded = foldName(row.name);
    if (!mixtureByName.has(folded)) mixtureByName.set(folded, row.id);
  }

  const siteByName = liveSiteIds(db);
  const roomIds = new Map<string, number>();
  const unitIds = new Map<string, number>();
  const unitRows = db
    .select({ siteName: sites.name, roomId: rooms.id, roomCode: rooms.code, unitId: storageUnits.id, unitCode: storageUnits.code, unitRetiredAt: storageUnits.retiredAt })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .leftJoin(storageUnits, eq(storageUnits.roomId, rooms.id))
    .where(and(isNull(sites.retiredAt), isNull(rooms.retiredAt)))
    .orderBy(rooms.id, storageUnits.id)
    .all();
  for (const row of unitRows) {
    const site = foldName(row.siteName);
    const roomKey = key(site, row.roomCode);
    if (!roomIds.has(roomKey)) roomIds.set(roomKey, row.roomId);
    if (row.unitId != null && row.unitCode != null && row.unitRetiredAt == null) {
      const unitKey = key(site, row.roomCode, row.unitCode);
      if (!unitIds.has(unitKey)) unitIds.set(unitKey, row.unitId);
    }
  }

  const userByEmail = new Map<string, number>();
  for (const row of db.select({ id: users.id, email: users.email }).from(users).where(eq(users.active, true)).all()) {
    userByEmail.set(row.email.trim().toLowerCase(), row.id);
  }

  return {
    substanceIdByCas: (cas) => substanceByCas.get(cas),
    substanceIdByName: (name) => substanceByName.get(foldName(name)),
    mixtureIdByName: (name) => mixtureByName.get(foldName(name)),
    storageUnitId: (site, roomCode, unitCode) => unitIds.get(key(foldName(site), roomCode, unitCode)),
    userIdByEmail: (email) => userByEmail.get(email.trim().toLowerCase()),
    siteIdByName: (name) => siteByName.get(foldName(name)),
    roomIdByCode: (site, roomCode) => roomIds.get(key(foldName(site), roomCode)),
  };
}

export function loadLocationLookups(db: DbOrTx): LocationLookups {
  const siteByName = liveSiteIds(db);
  return { siteIdByName: (name) => siteByName.get(foldName(name)) };
}
