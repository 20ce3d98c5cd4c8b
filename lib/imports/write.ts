/**
 * The database side of imports: compare validated rows with what Headroom already holds (a plan:
 * what to create, what to update, what is unchanged, and what may not be changed at all), then
 * write a plan inside the caller's transaction.
 *
 * Updates change only what the file fills in: an empty cell, and a cell the validator filled with
 * a default, keep the existing record's own value, so an import never erases data.
 */
import "server-only";
import type Database from "better-sqlite3";
import { and, eq, inArray, ne, sql } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import {
  containerMoves,
  containers,
  rooms,
  sites,
  storageUnits,
  type AmountUnit,
  type Container,
  type NewContainer,
  type NewRoom,
  type NewStorageUnit,
  type Room,
  type StorageUnit,
} from "@/db/schema";
import { auditSnapshot, changedFields } from "@/lib/audit/diff";
import { recordAudit, type AuditActor } from "@/lib/audit/record";
import { ConflictError } from "@/lib/errors";
import type { ImportIssue } from "./columns";
import type { ValidContainerRow } from "./containers";
import type { LocationValidation, ValidRoom, ValidUnit } from "./locations";
import { foldName } from "./lookups";
import type { ParsedTable } from "./parse";

/** Rows per multi-row INSERT: well under SQLite's limit on bound parameters. */
const INSERT_CHUNK = 400; // storage units per multi-row insert

function chunks<T>(items: readonly T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

const count = (n: number) => n.toLocaleString("en-GB");

function plural(n: number, one: string, many = `${one}s`): string {
  return `${count(n)} ${n === 1 ? one : many}`;
}

const byLine = (a: ImportIssue, b: ImportIssue) => a.line - b.line;

// ---------------------------------------------------------------------------------------------
// Containers
// ---------------------------------------------------------------------------------------------

/** Volume units convert to mL, mass units to g. */
const UNIT_BASE: Record<AmountUnit, { dimension: "volume" | "mass"; factor: number }> = {
  mL: { dimension: "volume", factor: 1 },
  L: { dimension: "volume", factor: 1000 },
  g: { dimension: "mass", factor: 1 },
  kg: { dimension: "mass", factor: 1000 },
};

type ContainerValues = Pick<
  NewContainer,
  | "substanceId"
  | "mixtureId"
  | "amount"
  | "amountUnit"
  | "capacity"
  | "capacityUnit"
  | "containerKind"
  | "state"
  | "storageUnitId"
  | "ownerId"
  | "receivedAt"
  | "openedAt"
  | "expiresAt"
  | "notes"
>;

export type ContainerUpdate = {
  id: number;
  line: number;
  label: string;
  fromStorageUnitId: number;
  set: Partial<ContainerValues>;
  before: Record<string, unknown>;
  after: Record<string, unknown>;
  keys: string[];
};

export type ContainerPlan = {
  creates: ValidContainerRow[];
  updates: ContainerUpdate[];
  unchanged: number;
  /** Problems found only against the database (disposed containers, amount and capacity that no longer fit). */
  issues: ImportIssue[];
};

export type ContainerImportCounts = { created: number; updated: number; unchanged: number };

const toDate = (ms: number | null) => (ms === null ? null : new Date(ms));

function sameValue(a: unknown, b: unknown): boolean {
  const plain = (v: unknown) => (v instanceof Date ? v.getTime() : (v ?? null));
  return plain(a) === plain(b);
}

/** What the row says, leaving out what the row left to a default or left empty. */
function rowValues(row: ValidContainerRow): Partial<ContainerValues> {
  const values: Partial<ContainerValues> = {
    substanceId: row.substanceId,
    mixtureId: row.mixtureId,
    amount: row.amount,
    amountUnit: row.amountUnit,
    storageUnitId: row.storageUnitId,
  };
  if (row.capacity !== null && row.capacityUnit !== null) {
    values.capacity = row.capacity;
    values.capacityUnit = row.capacityUnit;
  }
  if (!row.defaulted.includes("containerKind")) values.containerKind = row.containerKind;
  if (!row.defaulted.includes("state")) values.state = row.state;
  if (row.ownerId !== null) values.ownerId = row.ownerId;
  if (row.receivedAt !== null) values.receivedAt = toDate(row.receivedAt);
  if (row.openedAt !== null) values.openedAt = toDate(row.openedAt);
  if (row.expiresAt !== null) values.expiresAt = toDate(row.expiresAt);
  if (row.notes !== null) values.notes = row.notes;
  return values;
}

function capacityIssue(
  line: number,
  amount: number,
  amountUnit: AmountUnit,
  capacity: number | null | undefined,
  capacityUnit: AmountUnit | null | undefined,
  capacityFromFile: boolean,
): ImportIssue | undefined {
  if (capacity == null || !capacityUnit) return undefined;
  const a = UNIT_BASE[amountUnit];
  const c = UNIT_BASE[capacityUnit];
  const where = capacityFromFile ? "" : " Headroom has";
  if (a.dimension !== c.dimension) {
    return {
      line,
      column: capacityFromFile ? "capacity_unit" : "amount_unit",
      value: capacityFromFile ? capacityUnit : amountUnit,
      message:
        `The amount is in ${amountUnit} (a ${a.dimension}) but the capacity${where} is in ${capacityUnit} (a ${c.dimension}); ` +
        "give both as volumes (mL, L) or both as masses (g, kg).",
    };
  }
  if (!capacityFromFile && amount * a.factor > capacity * c.factor * (1 + 1e-9)) {
    return {
      line,
      column: "amount",
      value: String(amount),
      message: `The amount ${amount} ${amountUnit} is more than the container's capacity of ${capacity} ${capacityUnit} recorded in Headroom; check the amount and its unit, or give the capacity too.`,
    };
  }
  return undefined;
}

/** One query for any number of labels: the labels travel as a single JSON array parameter. */
function existingByLabel(db: DbOrTx, labels: string[]): Map<string, Container> {
  const found = new Map<string, Container>();
  if (labels.length === 0) return found;
  const rows = db
    .select()
    .from(containers)
    .where(sql`${containers.label} in (select value from json_each(${JSON.stringify(labels)}))`)
    .all();
  for (const row of rows) found.set(row.label, row);
  return found;
}

/** Compares validated rows with the containers already in Headroom, by label. */
export function planContainerImport(db: DbOrTx, rows: ValidContainerRow[]): ContainerPlan {
  const existing = existingByLabel(
    db,
    rows.map((r) => r.label),
  );
  const plan: ContainerPlan = { creates: [], updates: [], unchanged: 0, issues: [] };
  for (const row of rows) {
    const before = existing.get(row.label);
    if (!before) {
      const issue = capacityIssue(row.line, row.amount, row.amountUnit, row.capacity, row.capacityUnit, true);
      if (issue) plan.issues.push(issue);
      else plan.creates.push(row);
      continue;
    }
    if (before.state === "disposed") {
      plan.issues.push({
        line: row.line,
        column: "label",
        value: row.label,
        message:
          `Container ${row.label} was disposed of; its record is kept and an import cannot change it. ` +
          "Remove this row, or give a new container its own label.",
      });
      continue;
    }
    const values = rowValues(row);
    const fromFile = values.capacity !== undefined;
    const issue = capacityIssue(
      row.line,
      row.amount,
      row.amountUnit,
      fromFile ? values.capacity : before.capacity,
      fromFile ? values.capacityUnit : before.capacityUnit,
      fromFile,
    );
    if (issue) {
      plan.issues.push(issue);
      continue;
    }
    const differing = (Object.keys(values) as (keyof ContainerValues)[]).filter((k) => !sameValue(before[k], values[k]));
    if (differing.length === 0) {
      plan.unchanged += 1;
      continue;
    }
    const current = Object.fromEntries(differing.map((k) => [k, before[k]]));
    const diff = changedFields(auditSnapshot(current), auditSnapshot(Object.fromEntries(differing.map((k) => [k, values[k]]))));
    const set = Object.fromEntries(diff.keys.map((k) => [k, values[k as keyof ContainerValues]])) as Partial<ContainerValues>;
    plan.updates.push({
      id: before.id,
      line: row.line,
      label: row.label,
      fromStorageUnitId: before.storageUnitId,
      set,
      before: diff.before,
      after: diff.after,
      keys: diff.keys,
    });
  }
  plan.issues.sort(byLine);
  return plan;
}

/** Writes a container plan in the caller's transaction: inserts with their first placement, updates with moves and audit. */
export function writeContainerPlan(
  tx: DbOrTx,
  sqlite: Database.Database,
  actor: AuditActor & { id: number },
  plan: ContainerPlan,
  fileName: string,
): ContainerImportCounts {
  const now = new Date();
  const nowMs = now.getTime();
  // Plain prepared statements on the connection that holds the caller's transaction: 10,000
  // inserts this way take a fraction of the time a query builder needs to render them.
  const insertContainer = sqlite.prepare(
    `insert into containers (label, substance_id, mixture_id, amount, amount_unit, capacity, capacity_unit, container_kind,
       state, storage_unit_id, owner_id, received_at, opened_at, expires_at, notes, created_at, updated_at)
     values (@label, @substanceId, @mixtureId, @amount, @amountUnit, @capacity, @capacityUnit, @containerKind,
       @state, @storageUnitId, @ownerId, @receivedAt, @openedAt, @expiresAt, @notes, @now, @now)`,
  );
  const insertMove = sqlite.prepare(
    "insert into container_moves (container_id, from_storage_unit_id, to_storage_unit_id, moved_by_id, moved_at) values (?, null, ?, ?, ?)",
  );
  for (const row of plan.creates) {
    const { lastInsertRowid } = insertContainer.run({
      label: row.label,
      substanceId: row.substanceId,
      mixtureId: row.mixtureId,
      amount: row.amount,
      amountUnit: row.amountUnit,
      capacity: row.capacity,
      capacityUnit: row.capacityUnit,
      containerKind: row.containerKind,
      state: row.state,
      storageUnitId: row.storageUnitId,
      ownerId: row.ownerId,
      receivedAt: row.receivedAt,
      openedAt: row.openedAt,
      expiresAt: row.expiresAt,
      notes: row.notes,
      now: nowMs,
    });
    insertMove.run(lastInsertRowid, row.storageUnitId, actor.id, nowMs);
  }

  for (const update of plan.updates) {
    const result = tx
      .update(containers)
      .set({ ...update.set, updatedAt: now })
      .where(and(eq(containers.id, update.id), ne(containers.state, "disposed")))
      .run();
    if (result.changes !== 1) {
      throw new ConflictError(`Container ${update.label} (line ${update.line}) changed while the file was imported; check the file again.`);
    }
    if (update.set.storageUnitId !== undefined && update.set.storageUnitId !== update.fromStorageUnitId) {
      tx.insert(containerMoves)
        .values({ containerId: update.id, fromStorageUnitId: update.fromStorageUnitId, toStorageUnitId: update.set.storageUnitId, movedById: actor.id, movedAt: now })
        .run();
    }
    recordAudit(tx, actor, {
      action: "update",
      entityType: "container",
      entityId: update.id,
      summary: `Updated container ${update.label} from ${fileName}, line ${update.line} (${update.keys.join(", ")})`,
      before: update.before,
      after: update.after,
    });
  }

  const counts = { created: plan.creates.length, updated: plan.updates.length, unchanged: plan.unchanged };
  const total = counts.created + counts.updated + counts.unchanged;
  recordAudit(tx, actor, {
    action: "import",
    entityType: "container",
    summary:
      `Imported ${plural(total, "container")} from ${fileName} (${count(counts.created)} created, ${count(counts.updated)} updated` +
      (counts.unchanged ? `, ${count(counts.unchanged)} unchanged)` : ")"),
    after: { fileName, ...counts },
  });
  return counts;
}

// ---------------------------------------------------------------------------------------------
// Locations
// ---------------------------------------------------------------------------------------------

export type LocationCounts = { sites: number; rooms: number; units: number };

type RoomValues = Omit<NewRoom, "id" | "siteId" | "code" | "createdAt" | "updatedAt" | "retiredAt" | "notes" | "facilitiesContactId">;
type UnitValues = Omit<NewStorageUnit, "id" | "roomId" | "code" | "createdAt" | "updatedAt" | "retiredAt" | "notes" | "ownerId">;

type RoomTarget = { existingId: number } | { newSiteName: string };

export type LocationUpdate<T> = {
  id: number;
  line: number;
  label: string;
  set: Partial<T>;
  before: Record<string, unknown>;
  after: Record<string, unknown>;
  keys: string[];
};

export type LocationPlan = {
  newSites: string[];
  existingSiteCount: number;
  newRooms: { room: ValidRoom; site: RoomTarget; values: RoomValues }[];
  roomUpdates: LocationUpdate<RoomValues>[];
  unchangedRooms: number;
  /** A unit goes into an existing room (by id) or a room this import creates (by its key). */
  newUnits: { unit: ValidUnit; roomId?: number; roomKey?: string; values: UnitValues }[];
  unitUpdates: LocationUpdate<UnitValues>[];
  unchangedUnits: number;
  issues: ImportIssue[];
};

const roomKeyOf = (siteName: string, code: string) => `${foldName(siteName)}\u0000${code}`;

/** Nullable fields the file left empty keep the record's value; so do fields filled by default. */
function present<T extends Record<string, unknown>>(values: T, defaulted: readonly string[]): Partial<T> {
  return Object.fromEntries(Object.entries(values).filter(([k, v]) => v !== null && !defaulted.includes(k))) as Partial<T>;
}

function roomValues(room: ValidRoom): RoomValues {
  return {
    name: room.name,
    kind: room.kind,
    floorAreaM2: room.floorAreaM2,
    heightM: room.heightM,
    airChangesPerHour: room.airChangesPerHour,
    mixingFactor: room.mixingFactor,
    designMaxTempC: room.designMaxTempC,
    sprinklered: room.sprinklered,
    setMinC: room.setMinC,
    setMaxC: room.setMaxC,
    excursionThresholdC: room.excursionThresholdC,
    excursionMinDurationMin: room.excursionMinDurationMin,
  };
}

function unitValues(unit: ValidUnit): UnitValues {
  return {
    name: unit.name,
    kind: unit.kind,
    internalVolumeL: unit.internalVolumeL,
    setMinC: unit.setMinC,
    setMaxC: unit.setMaxC,
    excursionThresholdC: unit.excursionThresholdC,
    excursionMinDurationMin: unit.excursionMinDurationMin,
    ventilated: unit.ventilated,
    ignitionSourceFree: unit.ignitionSourceFree,
  };
}

function diffUpdate<T extends Record<string, unknown>>(
  before: Record<string, unknown>,
  values: Partial<T>,
): { set: Partial<T>; before: Record<string, unknown>; after: Record<string, unknown>; keys: string[] } {
  const current = Object.fromEntries(Object.keys(values).map((k) => [k, before[k]]));
  const diff = changedFields(auditSnapshot(current), auditSnapshot(values));
  const set = Object.fromEntries(diff.keys.map((k) => [k, values[k]])) as Partial<T>;
  return { set, before: diff.before, after: diff.after, keys: diff.keys };
}

function setRangeIssue(
  line: number,
  column: string,
  what: string,
  merged: { setMinC?: number | null; setMaxC?: number | null },
): ImportIssue | undefined {
  const { setMinC, setMaxC } = merged;
  if (setMinC == null || setMaxC == null || setMinC <= setMaxC) return undefined;
  return {
    line,
    column,
    value: String(setMaxC),
    message: `With the values in Headroom, the set range of ${what} would run from ${setMinC} °C to ${setMaxC} °C; give both ends of the range so the minimum is not above the maximum.`,
  };
}

/** The first line naming each site, by folded name. */
function siteLines(table: ParsedTable): Map<string, number> {
  const lines = new Map<string, number>();
  for (const row of table.rows) {
    const folded = foldName(row.cells.site ?? "");
    if (folded !== "" && !lines.has(folded)) lines.set(folded, row.line);
  }
  return lines;
}

export function planLocationImport(db: DbOrTx, validation: LocationValidation, table: ParsedTable): LocationPlan {
  const plan: LocationPlan = {
    newSites: [],
    existingSiteCount: 0,
    newRooms: [],
    roomUpdates: [],
    unchangedRooms: 0,
    newUnits: [],
    unitUpdates: [],
    unchangedUnits: 0,
    issues: [],
  };
  const firstLine = siteLines(table);

  // Sites: a retired site keeps its name, so a file naming it cannot create it again.
  const retiredSites = new Map<string, string>();
  for (const site of db.select({ name: sites.name, retiredAt: sites.retiredAt }).from(sites).all()) {
    if (site.retiredAt) retiredSites.set(foldName(site.name), site.name);
  }
  const siteIdByName = new Map<string, number>();
  const blockedSites = new Set<string>();
  for (const site of validation.sites) {
    const folded = foldName(site.name);
    if (site.existingId !== undefined) {
      siteIdByName.set(folded, site.existingId);
      plan.existingSiteCount += 1;
    } else if (retiredSites.has(folded)) {
      blockedSites.add(folded);
      plan.issues.push({
        line: firstLine.get(folded) ?? 0,
        column: "site",
        value: site.name,
        message: `Site “${retiredSites.get(folded)}” was retired in Headroom; an import cannot add rooms to it or create it again. Use the site's current name, or ask an administrator.`,
      });
    } else plan.newSites.push(site.name);
  }

  const siteIds = [...siteIdByName.values()];
  const existingRooms = siteIds.length ? db.select().from(rooms).where(inArray(rooms.siteId, siteIds)).all() : [];
  const roomsByKey = new Map<string, Room>();
  const roomsByFolded = new Map<string, Room>();
  for (const room of existingRooms) {
    roomsByKey.set(`${room.siteId}\u0000${room.code}`, room);
    roomsByFolded.set(`${room.siteId}\u0000${room.code.toLowerCase()}`, room);
  }
  const roomIds = existingRooms.map((r) => r.id);
  const existingUnits: StorageUnit[] = roomIds.length ? db.select().from(storageUnits).where(inArray(storageUnits.roomId, roomIds)).all() : [];
  const unitsByKey = new Map<string, StorageUnit>();
  const unitsByFolded = new Map<string, StorageUnit>();
  for (const unit of existingUnits) {
    unitsByKey.set(`${unit.roomId}\u0000${unit.code}`, unit);
    unitsByFolded.set(`${unit.roomId}\u0000${unit.code.toLowerCase()}`, unit);
  }

  /** Existing room id for each room of the file that is kept, by the file's key; undefined for new rooms. */
  const roomIdByKey = new Map<string, number | undefined>();
  const roomCodes = (room: Pick<Room, "code">, siteName: string) => `room ${room.code} at ${siteName}`;

  for (const room of validation.rooms) {
    const folded = foldName(room.siteName);
    if (blockedSites.has(folded)) continue;
    const values = roomValues(room);
    const siteId = siteIdByName.get(folded);
    const key = roomKeyOf(room.siteName, room.code);
    if (siteId === undefined) {
      plan.newRooms.push({ room, site: { newSiteName: room.siteName }, values });
      roomIdByKey.set(key, undefined);
      continue;
    }
    const before = roomsByKey.get(`${siteId}\u0000${room.code}`);
    if (!before) {
      const twin = roomsByFolded.get(`${siteId}\u0000${room.code.toLowerCase()}`);
      if (twin) {
        plan.issues.push({
          line: room.line,
          column: "room_code",
          value: room.code,
          message: `Room code ${room.code} differs from room ${twin.code} already at ${room.siteName} only in capital letters. Write the code as Headroom has it, or choose a clearly different code.`,
        });
        continue;
      }
      plan.newRooms.push({ room, site: { existingId: siteId }, values });
      roomIdByKey.set(key, undefined);
      continue;
    }
    if (before.retiredAt) {
      plan.issues.push({
        line: room.line,
        column: "room_code",
        value: room.code,
        message: `Room ${room.code} at ${room.siteName} was retired in Headroom; its code stays with the retired room. Choose another code for a new room.`,
      });
      continue;
    }
    const patch = present(values, room.defaulted);
    const merged = { ...before, ...patch };
    const rangeIssue = setRangeIssue(room.line, "room_set_max_c", roomCodes(room, room.siteName), merged);
    if (rangeIssue) {
      plan.issues.push(rangeIssue);
      continue;
    }
    roomIdByKey.set(key, before.id);
    const diff = diffUpdate<RoomValues>(before, patch);
    if (diff.keys.length === 0) plan.unchangedRooms += 1;
    else plan.roomUpdates.push({ id: before.id, line: room.line, label: `${room.code} at ${room.siteName}`, ...diff });
  }

  for (const unit of validation.units) {
    const key = roomKeyOf(unit.siteName, unit.roomCode);
    if (!roomIdByKey.has(key)) continue; // its room was refused above, with an issue
    const roomId = roomIdByKey.get(key);
    const values = unitValues(unit);
    const what = `unit ${unit.code} in room ${unit.roomCode}`;
    if (roomId === undefined) {
      plan.newUnits.push({ unit, roomKey: key, values });
      continue;
    }
    const before = unitsByKey.get(`${roomId}\u0000${unit.code}`);
    if (!before) {
      const twin = unitsByFolded.get(`${roomId}\u0000${unit.code.toLowerCase()}`);
      if (twin) {
        plan.issues.push({
          line: unit.line,
          column: "unit_code",
          value: unit.code,
          message: `Unit code ${unit.code} differs from unit ${twin.code} already in room ${unit.roomCode} only in capital letters. Write the code as Headroom has it, or choose a clearly different code.`,
        });
        continue;
      }
      plan.newUnits.push({ unit, roomId, values });
      continue;
    }
    if (before.retiredAt) {
      plan.issues.push({
        line: unit.line,
        column: "unit_code",
        value: unit.code,
        message: `Storage unit ${unit.code} in room ${unit.roomCode} was retired in Headroom; its code stays with the retired unit. Choose another code for a new unit.`,
      });
      continue;
    }
    const patch = present(values, unit.defaulted);
    const rangeIssue = setRangeIssue(unit.line, "set_max_c", what, { ...before, ...patch });
    if (rangeIssue) {
      plan.issues.push(rangeIssue);
      continue;
    }
    const diff = diffUpdate<UnitValues>(before, patch);
    if (diff.keys.length === 0) plan.unchangedUnits += 1;
    else plan.unitUpdates.push({ id: before.id, line: unit.line, label: `${unit.code} in room ${unit.roomCode} at ${unit.siteName}`, ...diff });
  }
  plan.issues.sort(byLine);
  return plan;
}

export function locationPlanCounts(plan: LocationPlan): { created: LocationCounts; updated: LocationCounts; unchanged: LocationCounts } {
  return {
    created: { sites: plan.newSites.length, rooms: plan.newRooms.length, units: plan.newUnits.length },
    updated: { sites: 0, rooms: plan.roomUpdates.length, units: plan.unitUpdates.length },
    unchanged: { sites: plan.existingSiteCount, rooms: plan.unchangedRooms, units: plan.unchangedUnits },
  };
}

export function writeLocationPlan(
  tx: DbOrTx,
  actor: AuditActor & { id: number },
  plan: LocationPlan,
  fileName: string,
): ReturnType<typeof locationPlanCounts> {
  const now = new Date();
  const newSiteIds = new Map<string, number>();
  for (const name of plan.newSites) {
    const site = tx.insert(sites).values({ name, createdAt: now, updatedAt: now }).returning({ id: sites.id }).get();
    newSiteIds.set(foldName(name), site.id);
  }

  const newRoomIds = new Map<string, number>();
  for (const { room, site, values } of plan.newRooms) {
    const siteId = "existingId" in site ? site.existingId : newSiteIds.get(foldName(site.newSiteName))!;
    const inserted = tx.insert(rooms).values({ ...values, siteId, code: room.code, createdAt: now, updatedAt: now }).returning({ id: rooms.id }).get();
    newRoomIds.set(roomKeyOf(room.siteName, room.code), inserted.id);
  }

  for (const part of chunks(plan.newUnits, INSERT_CHUNK)) {
    tx.insert(storageUnits)
      .values(part.map(({ unit, roomId, roomKey, values }) => ({ ...values, roomId: roomId ?? newRoomIds.get(roomKey!)!, code: unit.code, createdAt: now, updatedAt: now })))
      .run();
  }

  for (const update of plan.roomUpdates) {
    tx.update(rooms).set({ ...update.set, updatedAt: now }).where(eq(rooms.id, update.id)).run();
    recordAudit(tx, actor, {
      action: "update",
      entityType: "room",
      entityId: update.id,
      summary: `Updated room ${update.label} from ${fileName}, line ${update.line} (${update.keys.join(", ")})`,
      before: update.before,
      after: update.after,
    });
  }
  for (const update of plan.unitUpdates) {
    tx.update(storageUnits).set({ ...update.set, updatedAt: now }).where(eq(storageUnits.id, update.id)).run();
    recordAudit(tx, actor, {
      action: "update",
      entityType: "storage_unit",
      entityId: update.id,
      summary: `Updated storage unit ${update.label} from ${fileName}, line ${update.line} (${update.keys.join(", ")})`,
      before: update.before,
      after: update.after,
    });
  }

  const counts = locationPlanCounts(plan);
  const { created, updated } = counts;
  recordAudit(tx, actor, {
    action: "import",
    entityType: "location",
    summary:
      `Imported locations from ${fileName}: created ${plural(created.sites, "site")}, ${plural(created.rooms, "room")} and ` +
      `${plural(created.units, "storage unit")}; updated ${plural(updated.rooms, "room")} and ${plural(updated.units, "storage unit")}`,
    after: { fileName, ...counts, newSites: plan.newSites },
  });
  return counts;
}
