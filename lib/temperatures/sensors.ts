import "server-only";
import { and, asc, desc, eq, isNull, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb, type DbOrTx } from "@/db/client";
import { rooms, sensors, sites, storageUnits, type Sensor } from "@/db/schema";
import { auditSnapshot, changedFields } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { rethrowConstraint } from "@/lib/db-errors";
import { NotFoundError, ValidationError } from "@/lib/errors";
import { escapeLike, withoutUndefined } from "@/lib/objects";
import type { SensorInput, SensorListQuery, SensorUpdate } from "./schemas";

const DEVICE_UNIQUE = { "sensors.external_id": { field: "externalId", message: "Another sensor already has this device id." } };

/** A live room (and site) or a live storage unit (in a live room); a 400 on the field otherwise. */
function requireLiveLocation(tx: DbOrTx, location: { roomId?: number | null; storageUnitId?: number | null }): void {
  if (location.roomId != null) {
    const room = tx
      .select({ retiredAt: rooms.retiredAt, siteRetiredAt: sites.retiredAt })
      .from(rooms)
      .innerJoin(sites, eq(sites.id, rooms.siteId))
      .where(eq(rooms.id, location.roomId))
      .get();
    if (!room || room.retiredAt || room.siteRetiredAt) throw new ValidationError("Choose an existing room.", { roomId: ["Choose an existing room."] });
  }
  if (location.storageUnitId != null) {
    const unit = tx
      .select({ retiredAt: storageUnits.retiredAt, roomRetiredAt: rooms.retiredAt })
      .from(storageUnits)
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .where(eq(storageUnits.id, location.storageUnitId))
      .get();
    if (!unit || unit.retiredAt || unit.roomRetiredAt) {
      throw new ValidationError("Choose an existing storage unit.", { storageUnitId: ["Choose an existing storage unit."] });
    }
  }
}

export function createSensor(actor: SessionUser, input: SensorInput): Sensor {
  try {
    return getDb().transaction((tx) => {
      requireLiveLocation(tx, input);
      const sensor = tx
        .insert(sensors)
        .values({ externalId: input.externalId, name: input.name, roomId: input.roomId ?? null, storageUnitId: input.storageUnitId ?? null })
        .returning()
        .get();
      recordAudit(tx, actor, { action: "create", entityType: "sensor", entityId: sensor.id, summary: `Registered sensor ${sensor.externalId} (${sensor.name})`, after: auditSnapshot(sensor) });
      return sensor;
    });
  } catch (error) {
    rethrowConstraint(error, DEVICE_UNIQUE);
  }
}

/**
 * Renames, moves or switches a sensor off/on. A move names the new room or unit and clears the
 * other, so the sensor stays in exactly one place. Its past readings and excursions stay with it;
 * stored excursions keep the location they happened in.
 */
export function updateSensor(actor: SessionUser, id: number, input: SensorUpdate): Sensor {
  try {
    return getDb().transaction((tx) => {
      const before = tx.select().from(sensors).where(eq(sensors.id, id)).get();
      if (!before) throw new NotFoundError("That sensor");
      const moving = input.roomId !== undefined || input.storageUnitId !== undefined;
      const location = moving ? { roomId: input.roomId ?? null, storageUnitId: input.storageUnitId ?? null } : {};
      if (moving && (location.roomId !== before.roomId || location.storageUnitId !== before.storageUnitId)) requireLiveLocation(tx, location);
      const patch = withoutUndefined({ externalId: input.externalId, name: input.name, active: input.active, ...location });
      const after = tx.update(sensors).set({ ...patch, updatedAt: new Date() }).where(eq(sensors.id, id)).returning().get();
      const diff = changedFields(auditSnapshot(before), auditSnapshot(after));
      if (diff.keys.length) {
        const what = diff.keys.map((k) => ({ roomId: "location", storageUnitId: "location", active: after.active ? "switched on" : "switched off" })[k as "roomId"] ?? k);
        recordAudit(tx, actor, {
          action: "update",
          entityType: "sensor",
          entityId: id,
          summary: `Updated sensor ${after.externalId} (${[...new Set(what)].join(", ")})`,
          before: diff.before,
          after: diff.after,
        });
      }
      return after;
    });
  } catch (error) {
    rethrowConstraint(error, DEVICE_UNIQUE);
  }
}

export function listSensorRows() {
  return getDb()
    .select({
      id: sensors.id,
      externalId: sensors.externalId,
      name: sensors.name,
      active: sensors.active,
      roomId: sensors.roomId,
      storageUnitId: sensors.storageUnitId,
      roomCode: rooms.code,
      unitCode: storageUnits.code,
    })
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .orderBy(asc(sensors.externalId))
    .all();
}

// The room a sensor is in: its own room, or its unit's room.
const unitRooms = alias(rooms, "unit_rooms");

/** Latest reading per sensor through the (sensor_id, at) primary key: one index probe per row. */
const lastReadingAt = sql<number | null>`(select max(r.at) from readings r where r.sensor_id = ${sensors.id})`;
const lastReadingTempC = sql<number | null>`(select r.temp_c from readings r where r.sensor_id = ${sensors.id} order by r.at desc limit 1)`;
const openExcursions = sql<number>`(select count(*) from excursions e where e.sensor_id = ${sensors.id} and e.end_at is null)`;

function sensorListSelect() {
  return {
    id: sensors.id,
    externalId: sensors.externalId,
    name: sensors.name,
    active: sensors.active,
    roomId: sql<number>`coalesce(${sensors.roomId}, ${unitRooms.id})`,
    roomCode: sql<string>`coalesce(${rooms.code}, ${unitRooms.code})`,
    roomName: sql<string>`coalesce(${rooms.name}, ${unitRooms.name})`,
    storageUnitId: sensors.storageUnitId,
    unitCode: storageUnits.code,
    unitName: storageUnits.name,
    lastReadingAt,
    lastReadingTempC,
    openExcursions,
  };
}

export type SensorListRow = {
  id: number;
  externalId: string;
  name: string;
  active: boolean;
  roomId: number;
  roomCode: string;
  roomName: string;
  storageUnitId: number | null;
  unitCode: string | null;
  unitName: string | null;
  /** Epoch ms of the latest reading, or null. */
  lastReadingAt: number | null;
  lastReadingTempC: number | null;
  openExcursions: number;
};

function sensorQuery(where: SQL | undefined) {
  return getDb()
    .select(sensorListSelect())
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .leftJoin(unitRooms, eq(unitRooms.id, storageUnits.roomId))
    .where(where);
}

/** The sensors list: paged, sorted and filtered in SQL. */
export function listSensors(query: SensorListQuery): { rows: SensorListRow[]; total: number } {
  const q = query.q ? `%${escapeLike(query.q.toLowerCase())}%` : null;
  const where = and(
    q ? or(sql`lower(${sensors.externalId}) like ${q} escape '\\'`, sql`lower(${sensors.name}) like ${q} escape '\\'`) : undefined,
    query.status ? eq(sensors.active, query.status === "on") : undefined,
    query.excursion === "open" ? sql`exists (select 1 from excursions e where e.sensor_id = ${sensors.id} and e.end_at is null)` : undefined,
  );
  const dir = query.dir === "desc" ? desc : asc;
  const order = {
    externalId: [dir(sensors.externalId)],
    name: [dir(sensors.name), dir(sensors.externalId)],
    location: [dir(sql`coalesce(${rooms.code}, ${unitRooms.code})`), dir(sql`coalesce(${storageUnits.code}, '')`), dir(sensors.externalId)],
    lastReadingAt: [sql`${lastReadingAt} ${sql.raw(query.dir)} nulls last`, asc(sensors.externalId)],
  }[query.sort];
  const total = getDb().select({ n: sql<number>`count(*)` }).from(sensors).where(where).get()?.n ?? 0;
  const rows = sensorQuery(where)
    .orderBy(...order, asc(sensors.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows: rows.map(normaliseRow), total };
}

function normaliseRow(row: Record<string, unknown>): SensorListRow {
  const r = row as SensorListRow & { active: boolean | number };
  return { ...r, active: Boolean(r.active), openExcursions: Number(r.openExcursions ?? 0) };
}

/** One sensor with its location, latest reading and open excursions; null when there is none. */
export function getSensor(id: number): (SensorListRow & { createdAt: Date; siteName: string }) | null {
  const row = getDb()
    .select({ ...sensorListSelect(), createdAt: sensors.createdAt, siteName: sites.name })
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .leftJoin(unitRooms, eq(unitRooms.id, storageUnits.roomId))
    .leftJoin(sites, sql`${sites.id} = coalesce(${rooms.siteId}, ${unitRooms.siteId})`)
    .where(eq(sensors.id, id))
    .get();
  if (!row) return null;
  return { ...normaliseRow(row), createdAt: row.createdAt, siteName: row.siteName ?? "" };
}

/** The sensors attached directly to a room or to a storage unit, with their latest reading. */
export function sensorsAt(location: { roomId: number } | { storageUnitId: number }): SensorListRow[] {
  const where = "roomId" in location ? eq(sensors.roomId, location.roomId) : eq(sensors.storageUnitId, location.storageUnitId);
  return sensorQuery(where).orderBy(desc(sensors.active), asc(sensors.externalId)).all().map(normaliseRow);
}

export type SensorLocationOption = { value: string; label: string; group: string };

/**
 * Where a sensor can go: every live room ("room:12") and storage unit ("unit:34"), grouped by
 * site and room, for the location select of the sensor forms.
 */
export function sensorLocationOptions(): SensorLocationOption[] {
  const db = getDb();
  const roomRows = db
    .select({ id: rooms.id, code: rooms.code, name: rooms.name, siteName: sites.name })
    .from(rooms)
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .where(and(isNull(rooms.retiredAt), isNull(sites.retiredAt)))
    .orderBy(asc(sites.name), asc(rooms.code))
    .all();
  const unitRows = db
    .select({ id: storageUnits.id, code: storageUnits.code, name: storageUnits.name, roomId: storageUnits.roomId })
    .from(storageUnits)
    .where(isNull(storageUnits.retiredAt))
    .orderBy(asc(storageUnits.code))
    .all();
  return roomRows.flatMap((room) => {
    const group = `${room.siteName} · ${room.code} ${room.name}`;
    return [
      { value: `room:${room.id}`, label: `Room ${room.code} ${room.name} (the room itself)`, group },
      ...unitRows.filter((u) => u.roomId === room.id).map((u) => ({ value: `unit:${u.id}`, label: `Unit ${u.code} ${u.name}`, group })),
    ];
  });
}
