import "server-only";
import { and, asc, desc, eq, gte, inArray, isNull, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb, type DbOrTx } from "@/db/client";
import { excursions, readings, rooms, sensors, settings, storageUnits, users } from "@/db/schema";
import { controlLostWorstCase, DEFAULT_LOOK_BACK_DAYS, selectWorstCase, type WorstCase, type WorstCaseCandidate } from "./worst-case";

export const LOOK_BACK_SETTING = "worstCaseLookBackDays";

/** The look-back window for the highest reading, in days (setting, default 365). */
export function lookBackDays(db: DbOrTx = getDb()): number {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, LOOK_BACK_SETTING)).get();
  const days = Number(row?.value);
  return Number.isFinite(days) && days >= 1 && days <= 3650 ? days : DEFAULT_LOOK_BACK_DAYS;
}

type SensorRef = { id: number; externalId: string };

function sensorsAt(db: DbOrTx, where: SQL): SensorRef[] {
  return db.select({ id: sensors.id, externalId: sensors.externalId }).from(sensors).where(where).all();
}

/** The highest reading of these sensors since `sinceMs` (the later one on a tie). */
export function highestReading(db: DbOrTx, sensorRefs: SensorRef[], sinceMs: number): WorstCaseCandidate | null {
  if (sensorRefs.length === 0) return null;
  const row = db
    .select({ sensorId: readings.sensorId, atMs: sql<number>`${readings.at}`, tempC: readings.tempC })
    .from(readings)
    .where(and(inArray(readings.sensorId, sensorRefs.map((s) => s.id)), gte(readings.at, new Date(sinceMs))))
    .orderBy(desc(readings.tempC), desc(readings.at))
    .limit(1)
    .get();
  if (!row) return null;
  return { kind: "reading", tempC: row.tempC, atMs: row.atMs, sensor: sensorRefs.find((s) => s.id === row.sensorId)?.externalId ?? String(row.sensorId) };
}

function openExcursionPeaks(db: DbOrTx, sensorRefs: SensorRef[]): WorstCaseCandidate[] {
  if (sensorRefs.length === 0) return [];
  return db
    .select({ sensorId: excursions.sensorId, peakTempC: excursions.peakTempC, peakAtMs: sql<number>`${excursions.peakAt}` })
    .from(excursions)
    .where(and(inArray(excursions.sensorId, sensorRefs.map((s) => s.id)), isNull(excursions.endAt)))
    .all()
    .map((row) => ({ kind: "excursion" as const, tempC: row.peakTempC, atMs: row.peakAtMs, sensor: sensorRefs.find((s) => s.id === row.sensorId)?.externalId ?? String(row.sensorId) }));
}

function roomCandidates(db: DbOrTx, roomId: number, sinceMs: number): WorstCaseCandidate[] | null {
  const room = db.select({ designMaxTempC: rooms.designMaxTempC }).from(rooms).where(eq(rooms.id, roomId)).get();
  if (!room) return null;
  const refs = sensorsAt(db, eq(sensors.roomId, roomId));
  const candidates: WorstCaseCandidate[] = [];
  if (room.designMaxTempC != null) candidates.push({ kind: "design", tempC: room.designMaxTempC });
  const highest = highestReading(db, refs, sinceMs);
  if (highest) candidates.push(highest);
  candidates.push(...openExcursionPeaks(db, refs));
  return candidates;
}

/**
 * A room's worst-case temperature: the highest of its design maximum, the highest reading of its
 * own sensors in the look-back window and the peak of any open excursion on them.
 */
export function worstCaseForRoom(roomId: number, nowMs = Date.now(), db: DbOrTx = getDb()): WorstCase | null {
  const candidates = roomCandidates(db, roomId, nowMs - lookBackDays(db) * 86_400_000);
  return candidates ? selectWorstCase(candidates) : null;
}

export type LocationWorstCase = {
  /** The unit as it runs: for a controlled unit its own worst case; otherwise the room's and its own together. */
  inControl: WorstCase | null;
  /** A controlled unit that has failed and warmed up to its room (null for a unit without a set range). */
  controlLost: WorstCase | null;
  /** The unit keeps a set range (refrigerator, freezer): assessed twice. */
  controlled: boolean;
};

/**
 * A storage unit's worst case. A unit with a set range is assessed in control (upper end of its set
 * range, its sensors' highest reading, open excursion peaks) and "control lost" at its room's worst
 * case; a unit without one (shelving, a cabinet) sits at room temperature, so its room's candidates
 * count with its own.
 */
export function worstCaseForUnit(unitId: number, nowMs = Date.now(), db: DbOrTx = getDb()): LocationWorstCase {
  const unit = db.select({ roomId: storageUnits.roomId, setMaxC: storageUnits.setMaxC }).from(storageUnits).where(eq(storageUnits.id, unitId)).get();
  if (!unit) return { inControl: null, controlLost: null, controlled: false };
  const sinceMs = nowMs - lookBackDays(db) * 86_400_000;
  const refs = sensorsAt(db, eq(sensors.storageUnitId, unitId));
  const own: WorstCaseCandidate[] = [];
  const controlled = unit.setMaxC != null;
  if (controlled) own.push({ kind: "design", tempC: unit.setMaxC!, label: "upper end of the set range" });
  const highest = highestReading(db, refs, sinceMs);
  if (highest) own.push(highest);
  own.push(...openExcursionPeaks(db, refs));
  const room = roomCandidates(db, unit.roomId, sinceMs) ?? [];
  if (!controlled) return { inControl: selectWorstCase([...own, ...room]), controlLost: null, controlled };
  const inControl = selectWorstCase(own);
  return { inControl, controlLost: controlLostWorstCase(inControl, selectWorstCase(room)), controlled };
}

export type ExcursionRow = {
  id: number;
  sensorId: number;
  sensorExternalId: string;
  sensorName: string;
  roomId: number | null;
  roomCode: string | null;
  storageUnitId: number | null;
  unitCode: string | null;
  thresholdC: number;
  startAt: Date;
  endAt: Date | null;
  peakTempC: number;
  peakAt: Date;
  /** End − start; for an open excursion, up to the latest reading. */
  durationMin: number;
  acknowledgedAt: Date | null;
  acknowledgedByName: string | null;
  acknowledgeComment: string | null;
};

export type ExcursionFilter = {
  sensorId?: number;
  /** Excursions of the room's own sensors. */
  roomId?: number;
  /** Excursions of the room's sensors and of every unit in it. */
  inRoomId?: number;
  storageUnitId?: number;
  open?: boolean;
  limit?: number;
};

/** Excursions newest first, open ones first. */
export function listExcursions(filter: ExcursionFilter = {}, db: DbOrTx = getDb()): ExcursionRow[] {
  const unitRoom = alias(rooms, "unit_room");
  const conditions: SQL[] = [];
  if (filter.sensorId != null) conditions.push(eq(excursions.sensorId, filter.sensorId));
  if (filter.roomId != null) conditions.push(eq(excursions.roomId, filter.roomId));
  if (filter.storageUnitId != null) conditions.push(eq(excursions.storageUnitId, filter.storageUnitId));
  if (filter.inRoomId != null) conditions.push(or(eq(excursions.roomId, filter.inRoomId), eq(storageUnits.roomId, filter.inRoomId))!);
  if (filter.open) conditions.push(isNull(excursions.endAt));
  const lastReadingAt = sql<number | null>`(select max(${readings.at}) from ${readings} where ${readings.sensorId} = ${excursions.sensorId})`;
  const rows = db
    .select({
      id: excursions.id,
      sensorId: excursions.sensorId,
      sensorExternalId: sensors.externalId,
      sensorName: sensors.name,
      roomId: excursions.roomId,
      roomCode: sql<string | null>`coalesce(${rooms.code}, ${unitRoom.code})`,
      storageUnitId: excursions.storageUnitId,
      unitCode: storageUnits.code,
      thresholdC: excursions.thresholdC,
      startAt: excursions.startAt,
      endAt: excursions.endAt,
      peakTempC: excursions.peakTempC,
      peakAt: excursions.peakAt,
      lastReadingAtMs: lastReadingAt,
      acknowledgedAt: excursions.acknowledgedAt,
      acknowledgedByName: users.name,
      acknowledgeComment: excursions.acknowledgeComment,
    })
    .from(excursions)
    .innerJoin(sensors, eq(sensors.id, excursions.sensorId))
    .leftJoin(rooms, eq(rooms.id, excursions.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, excursions.storageUnitId))
    .leftJoin(unitRoom, eq(unitRoom.id, storageUnits.roomId))
    .leftJoin(users, eq(users.id, excursions.acknowledgedById))
    .where(conditions.length ? and(...conditions) : undefined)
    .orderBy(sql`${excursions.endAt} is not null`, desc(excursions.startAt), asc(excursions.id))
    .limit(Math.min(filter.limit ?? 200, 1000))
    .all();
  return rows.map(({ lastReadingAtMs, ...row }) => {
    const endMs = row.endAt?.getTime() ?? lastReadingAtMs ?? row.startAt.getTime();
    return { ...row, durationMin: Math.max(0, (endMs - row.startAt.getTime()) / 60_000) };
  });
}
