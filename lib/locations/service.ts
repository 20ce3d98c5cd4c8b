import "server-only";
import { reassessRooms } from "@/lib/assessment/service";
import { and, count, eq, inArray, isNull, ne } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { containers, rooms, sites, storageUnits, users, type Room, type Site, type StorageUnit } from "@/db/schema";
import { auditSnapshot, changedFields } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { rethrowConstraint } from "@/lib/db-errors";
import { ConflictError, NotFoundError, ValidationError } from "@/lib/errors";
import type { RoomInput, SiteInput, StorageUnitInput } from "./schemas";
import { withoutUndefined } from "@/lib/objects";
import { unitIsTemperatureControlled } from "@/lib/temperatures/warm-up";

const SITE_UNIQUE = { "sites.name": { field: "name", message: "A site with this name already exists." } };
const ROOM_UNIQUE = { "rooms.site_id, rooms.code": { field: "code", message: "This site already has a room with that code." } };
const UNIT_UNIQUE = {
  "storage_units.room_id, storage_units.code": { field: "code", message: "This room already has a storage unit with that code." },
};

function requireUser(tx: DbOrTx, id: number | null | undefined, field: string, roles?: string[]): void {
  if (id == null) return;
  const user = tx.select({ id: users.id, role: users.role, active: users.active }).from(users).where(eq(users.id, id)).get();
  if (!user || !user.active) throw new ValidationError("Choose an active person.", { [field]: ["Choose an active person."] });
  if (roles && !roles.includes(user.role)) {
    throw new ValidationError("That person's role does not fit here.", { [field]: ["That person's role does not fit here."] });
  }
}

// ----- sites ---------------------------------------------------------------------------------

export function createSite(actor: SessionUser, input: SiteInput): Site {
  try {
    return getDb().transaction((tx) => {
      const site = tx
        .insert(sites)
        .values({ ...input, atmosphericPressureKPa: input.atmosphericPressureKPa ?? 101.325 })
        .returning()
        .get();
      recordAudit(tx, actor, { action: "create", entityType: "site", entityId: site.id, summary: `Created site ${site.name}`, after: auditSnapshot(site) });
      return site;
    });
  } catch (error) {
    rethrowConstraint(error, SITE_UNIQUE);
  }
}

export function updateSite(actor: SessionUser, id: number, input: Partial<SiteInput>): Site {
  try {
    return getDb().transaction((tx) => {
      const before = tx.select().from(sites).where(eq(sites.id, id)).get();
      if (!before) throw new NotFoundError("That site");
      const patch = withoutUndefined({ ...input, atmosphericPressureKPa: input.atmosphericPressureKPa === null ? 101.325 : input.atmosphericPressureKPa });
      const after = tx.update(sites).set({ ...patch, updatedAt: new Date() }).where(eq(sites.id, id)).returning().get();
      const diff = changedFields(auditSnapshot(before), auditSnapshot(after));
      if (diff.keys.length) {
        recordAudit(tx, actor, { action: "update", entityType: "site", entityId: id, summary: `Updated site ${after.name} (${diff.keys.join(", ")})`, before: diff.before, after: diff.after });
      }
      return after;
    });
  } catch (error) {
    rethrowConstraint(error, SITE_UNIQUE);
  }
}

// ----- rooms ---------------------------------------------------------------------------------

function requireLiveSite(tx: DbOrTx, siteId: number): Site {
  const site = tx.select().from(sites).where(eq(sites.id, siteId)).get();
  if (!site || site.retiredAt) throw new ValidationError("Choose an existing site.", { siteId: ["Choose an existing site."] });
  return site;
}

export function createRoom(actor: SessionUser, input: RoomInput): Room {
  try {
    return getDb().transaction((tx) => {
      const site = requireLiveSite(tx, input.siteId);
      requireUser(tx, input.facilitiesContactId, "facilitiesContactId");
      const room = tx
        .insert(rooms)
        .values({ ...input, mixingFactor: input.mixingFactor ?? 0.5, sprinklered: input.sprinklered ?? false })
        .returning()
        .get();
      recordAudit(tx, actor, {
        action: "create",
        entityType: "room",
        entityId: room.id,
        summary: `Created room ${room.code} ${room.name} at ${site.name}`,
        after: auditSnapshot(room),
      });
      return room;
    });
  } catch (error) {
    rethrowConstraint(error, ROOM_UNIQUE);
  }
}

export function updateRoom(actor: SessionUser, id: number, input: Partial<RoomInput>): Room {
  try {
    return getDb().transaction((tx) => {
      const before = tx.select().from(rooms).where(eq(rooms.id, id)).get();
      if (!before || before.retiredAt) throw new NotFoundError("That room");
      if (input.siteId !== undefined && input.siteId !== before.siteId) requireLiveSite(tx, input.siteId);
      requireUser(tx, input.facilitiesContactId, "facilitiesContactId");
      const merged = { ...before, ...withoutUndefined(input) };
      if (merged.setMinC != null && merged.setMaxC != null && merged.setMinC > merged.setMaxC) {
        throw new ValidationError("The set range maximum must not be below its minimum.", { setMaxC: ["The set range maximum must not be below its minimum."] });
      }
      const patch = withoutUndefined({ ...input, mixingFactor: input.mixingFactor === null ? 0.5 : input.mixingFactor });
      const after = tx.update(rooms).set({ ...patch, updatedAt: new Date() }).where(eq(rooms.id, id)).returning().get();
      const diff = changedFields(auditSnapshot(before), auditSnapshot(after));
      if (diff.keys.length) {
        recordAudit(tx, actor, { action: "update", entityType: "room", entityId: id, summary: `Updated room ${after.code} (${diff.keys.join(", ")})`, before: diff.before, after: diff.after });
        reassessRooms(tx, [id], { reason: `room ${after.code} changed (${diff.keys.join(", ")})` });
      }
      return after;
    });
  } catch (error) {
    rethrowConstraint(error, ROOM_UNIQUE);
  }
}

function liveContainerCount(tx: DbOrTx, unitIds: number[]): number {
  if (unitIds.length === 0) return 0;
  return (
    tx
      .select({ n: count() })
      .from(containers)
      .where(and(inArray(containers.storageUnitId, unitIds), ne(containers.state, "disposed")))
      .get()?.n ?? 0
  );
}

/** Retires a room and its units; refused while any container that is not disposed is stored there. */
export function retireRoom(actor: SessionUser, id: number): Room {
  return getDb().transaction((tx) => {
    const room = tx.select().from(rooms).where(eq(rooms.id, id)).get();
    if (!room || room.retiredAt) throw new NotFoundError("That room");
    const unitIds = tx.select({ id: storageUnits.id }).from(storageUnits).where(and(eq(storageUnits.roomId, id), isNull(storageUnits.retiredAt))).all().map((u) => u.id);
    const stored = liveContainerCount(tx, unitIds);
    if (stored > 0) throw new ConflictError(`Room ${room.code} still holds ${stored} container${stored === 1 ? "" : "s"}; move or dispose of them first.`);
    const now = new Date();
    if (unitIds.length) tx.update(storageUnits).set({ retiredAt: now, updatedAt: now }).where(inArray(storageUnits.id, unitIds)).run();
    const after = tx.update(rooms).set({ retiredAt: now, updatedAt: now }).where(eq(rooms.id, id)).returning().get();
    recordAudit(tx, actor, {
      action: "retire",
      entityType: "room",
      entityId: id,
      summary: `Retired room ${room.code} ${room.name}${unitIds.length ? ` and its ${unitIds.length} storage unit${unitIds.length === 1 ? "" : "s"}` : ""}`,
      before: { retiredAt: null },
      after: { retiredAt: now.toISOString() },
    });
    reassessRooms(tx, [id], { reason: `room ${room.code} retired` });
    return after;
  });
}

// ----- storage units -------------------------------------------------------------------------

function requireLiveRoom(tx: DbOrTx, roomId: number): Room {
  const room = tx.select().from(rooms).where(eq(rooms.id, roomId)).get();
  if (!room || room.retiredAt) throw new ValidationError("Choose an existing room.", { roomId: ["Choose an existing room."] });
  return room;
}

const WARM_UP_ONLY_CONTROLLED = "A warm-up time constant applies only to a temperature-controlled unit (a refrigerator, a freezer or a unit with a set range).";

/** τ belongs to temperature-controlled units: elsewhere it would never be used. */
function requireWarmUpOnControlledUnit(unit: Pick<StorageUnit, "kind"> & { setMinC?: number | null; setMaxC?: number | null; warmUpTauMin?: number | null }): void {
  if (unit.warmUpTauMin != null && !unitIsTemperatureControlled({ kind: unit.kind, setMinC: unit.setMinC ?? null, setMaxC: unit.setMaxC ?? null })) {
    throw new ValidationError(WARM_UP_ONLY_CONTROLLED, { warmUpTauMin: [WARM_UP_ONLY_CONTROLLED] });
  }
}

/** The note explains a person's τ: without one (cleared back to the fitted or default value) it is cleared too. */
function warmUpChanges(before: StorageUnit, input: Partial<StorageUnitInput>): Partial<StorageUnitInput> {
  const tauAfter = input.warmUpTauMin === undefined ? before.warmUpTauMin : input.warmUpTauMin;
  const noteAfter = input.warmUpTauNote === undefined ? before.warmUpTauNote : input.warmUpTauNote;
  if (tauAfter == null && noteAfter != null) return { ...input, warmUpTauNote: null };
  return input;
}

export function createStorageUnit(actor: SessionUser, input: StorageUnitInput): StorageUnit {
  try {
    return getDb().transaction((tx) => {
      requireWarmUpOnControlledUnit(input);
      if (input.warmUpTauMin == null) input = { ...input, warmUpTauNote: null };
      const room = requireLiveRoom(tx, input.roomId);
      requireUser(tx, input.ownerId, "ownerId");
      const unit = tx
        .insert(storageUnits)
        .values({ ...input, ventilated: input.ventilated ?? false, ignitionSourceFree: input.ignitionSourceFree ?? false })
        .returning()
        .get();
      recordAudit(tx, actor, {
        action: "create",
        entityType: "storage_unit",
        entityId: unit.id,
        summary: `Created storage unit ${unit.code} ${unit.name} in room ${room.code}`,
        after: auditSnapshot(unit),
      });
      reassessRooms(tx, [room.id], { reason: `storage unit ${unit.code} added` });
      return unit;
    });
  } catch (error) {
    rethrowConstraint(error, UNIT_UNIQUE);
  }
}

export function updateStorageUnit(actor: SessionUser, id: number, input: Partial<StorageUnitInput>): StorageUnit {
  try {
    return getDb().transaction((tx) => {
      const before = tx.select().from(storageUnits).where(eq(storageUnits.id, id)).get();
      if (!before || before.retiredAt) throw new NotFoundError("That storage unit");
      if (input.roomId !== undefined && input.roomId !== before.roomId) requireLiveRoom(tx, input.roomId);
      requireUser(tx, input.ownerId, "ownerId");
      const changes = warmUpChanges(before, input);
      const merged = { ...before, ...withoutUndefined(changes) };
      if (merged.setMinC != null && merged.setMaxC != null && merged.setMinC > merged.setMaxC) {
        throw new ValidationError("The set range maximum must not be below its minimum.", { setMaxC: ["The set range maximum must not be below its minimum."] });
      }
      requireWarmUpOnControlledUnit(merged);
      const after = tx.update(storageUnits).set({ ...withoutUndefined(changes), updatedAt: new Date() }).where(eq(storageUnits.id, id)).returning().get();
      const diff = changedFields(auditSnapshot(before), auditSnapshot(after));
      if (diff.keys.length) {
        recordAudit(tx, actor, { action: "update", entityType: "storage_unit", entityId: id, summary: `Updated storage unit ${after.code} (${diff.keys.join(", ")})`, before: diff.before, after: diff.after });
        reassessRooms(tx, [before.roomId, after.roomId], { reason: `storage unit ${after.code} changed (${diff.keys.join(", ")})` });
      }
      return after;
    });
  } catch (error) {
    rethrowConstraint(error, UNIT_UNIQUE);
  }
}

export function retireStorageUnit(actor: SessionUser, id: number): StorageUnit {
  return getDb().transaction((tx) => {
    const unit = tx.select().from(storageUnits).where(eq(storageUnits.id, id)).get();
    if (!unit || unit.retiredAt) throw new NotFoundError("That storage unit");
    const stored = liveContainerCount(tx, [id]);
    if (stored > 0) throw new ConflictError(`Storage unit ${unit.code} still holds ${stored} container${stored === 1 ? "" : "s"}; move or dispose of them first.`);
    const now = new Date();
    const after = tx.update(storageUnits).set({ retiredAt: now, updatedAt: now }).where(eq(storageUnits.id, id)).returning().get();
    recordAudit(tx, actor, { action: "retire", entityType: "storage_unit", entityId: id, summary: `Retired storage unit ${unit.code} ${unit.name}`, before: { retiredAt: null }, after: { retiredAt: now.toISOString() } });
    reassessRooms(tx, [unit.roomId], { reason: `storage unit ${unit.code} retired` });
    return after;
  });
}
