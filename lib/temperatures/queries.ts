import "server-only";
import { and, asc, desc, eq, gte, inArray, isNotNull, isNull, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb, type DbOrTx } from "@/db/client";
import { excursions, readings, rooms, sensors, settings, storageUnits, users } from "@/db/schema";
import { controlledUnitWorstCase, DEFAULT_LOOK_BACK_DAYS, selectWorstCase, type UnitExcursion, type WorstCase, type WorstCaseCandidate } from "./worst-case";

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

/**
 * The highest reading of these sensors since `sinceMs` (the later one on a tie). One query per
 * sensor down the (sensor, temperature, time) index: it stops at the first reading inside the window
 * — with `outsideExcursions`, at the first one outside every excursion of its sensor (a controlled
 * unit in control: those readings count as control lost).
 */
export function highestReading(db: DbOrTx, sensorRefs: SensorRef[], sinceMs: number, outsideExcursions = false): Extract<WorstCaseCandidate, { kind: "reading" }> | null {
  let best: Extract<WorstCaseCandidate, { kind: "reading" }> | null = null;
  for (const ref of sensorRefs) {
    const conditions: SQL[] = [eq(readings.sensorId, ref.id), gte(readings.at, new Date(sinceMs))];
    if (outsideExcursions) {
      conditions.push(
        sql`not exists (select 1 from ${excursions} where ${excursions.sensorId} = ${readings.sensorId} and ${excursions.startAt} <= ${readings.at} and (${excursions.endAt} is null or ${excursions.endAt} > ${readings.at}))`,
      );
    }
    const row = db
      .select({ atMs: sql<number>`${readings.at}`, tempC: readings.tempC })
      .from(readings)
      .where(and(...conditions))
      .orderBy(desc(readings.tempC), desc(readings.at))
      .limit(1)
      .get();
    if (!row) continue;
    if (!best || row.tempC > best.tempC || (row.tempC === best.tempC && row.atMs > best.atMs)) {
      best = { kind: "reading", tempC: row.tempC, atMs: row.atMs, sensor: ref.externalId };
    }
  }
  return best;
}

type WindowExcursion = { sensorId: number; excursion: UnitExcursion; candidate: WorstCaseCandidate };

/** The excursions of these sensors that lasted into the window (ended since `sinceMs`, or open), oldest first. */
function excursionsInWindow(db: DbOrTx, sensorRefs: SensorRef[], sinceMs: number): WindowExcursion[] {
  if (sensorRefs.length === 0) return [];
  const names = new Map(sensorRefs.map((s) => [s.id, s.externalId]));
  return db
    .select({
      sensorId: excursions.sensorId,
      startAtMs: sql<number>`${excursions.startAt}`,
      endAtMs: sql<number | null>`${excursions.endAt}`,
      peakTempC: excursions.peakTempC,
      peakAtMs: sql<number>`${excursions.peakAt}`,
    })
    .from(excursions)
    .where(and(inArray(excursions.sensorId, sensorRefs.map((s) => s.id)), or(isNull(excursions.endAt), gte(excursions.endAt, new Date(sinceMs)))))
    .orderBy(asc(excursions.startAt), asc(excursions.id))
    .all()
    .map((row) => {
      const sensor = names.get(row.sensorId) ?? String(row.sensorId);
      const excursion: UnitExcursion = { sensor, startMs: row.startAtMs, endMs: row.endAtMs, peakTempC: row.peakTempC, peakAtMs: row.peakAtMs };
      const candidate: WorstCaseCandidate =
        row.endAtMs === null ? { kind: "excursion", tempC: row.peakTempC, atMs: row.peakAtMs, sensor } : { kind: "excursion", tempC: row.peakTempC, atMs: row.peakAtMs, sensor, ended: true };
      return { sensorId: row.sensorId, excursion, candidate };
    });
}

/**
 * One peak instant everywhere: a highest reading that is an excursion's peak (same sensor, same
 * temperature) takes that excursion's stored peak_at — its first reading at the peak — rather than
 * a later reading at the same temperature.
 */
function atExcursionPeak<C extends Extract<WorstCaseCandidate, { kind: "reading" }>>(reading: C | null, windowExcursions: readonly WindowExcursion[]): C | null {
  if (!reading) return null;
  const peak = windowExcursions.filter((e) => e.excursion.sensor === reading.sensor && e.excursion.peakTempC === reading.tempC).at(-1);
  return peak ? { ...reading, atMs: peak.excursion.peakAtMs } : reading;
}

/** A sensor group's highest reading (at its excursion's peak instant when it is one) and its open excursions' peaks. */
function sensorGroupCandidates(db: DbOrTx, refs: SensorRef[], windowExcursions: readonly WindowExcursion[], sinceMs: number): WorstCaseCandidate[] {
  if (refs.length === 0) return [];
  const found: WorstCaseCandidate[] = [];
  const highest = atExcursionPeak(highestReading(db, refs, sinceMs), windowExcursions);
  if (highest) found.push(highest);
  for (const e of windowExcursions) if (e.excursion.endMs === null) found.push(e.candidate);
  return found;
}

function roomCandidates(db: DbOrTx, roomId: number, sinceMs: number): WorstCaseCandidate[] | null {
  const room = db.select({ designMaxTempC: rooms.designMaxTempC }).from(rooms).where(eq(rooms.id, roomId)).get();
  if (!room) return null;
  const refs = sensorsAt(db, eq(sensors.roomId, roomId));
  const candidates: WorstCaseCandidate[] = [];
  if (room.designMaxTempC != null) candidates.push({ kind: "design", tempC: room.designMaxTempC });
  candidates.push(...sensorGroupCandidates(db, refs, excursionsInWindow(db, refs, sinceMs), sinceMs));
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

/** A room's worst-case candidates, to hand to worstCaseForUnit for each of its units. */
export function roomWorstCandidates(roomId: number, nowMs = Date.now(), db: DbOrTx = getDb()): { roomId: number; candidates: WorstCaseCandidate[] } {
  return { roomId, candidates: roomCandidates(db, roomId, nowMs - lookBackDays(db) * 86_400_000) ?? [] };
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
 * range, its sensors' highest reading outside their excursions) and "control lost" (the higher of
 * its room's worst case and its highest excursion peak); a unit without one (shelving, a cabinet)
 * sits at room temperature, so its room's candidates count with its own (and open excursion peaks).
 */
export function worstCaseForUnit(unitId: number, nowMs = Date.now(), db: DbOrTx = getDb(), roomWorst?: { roomId: number; candidates: WorstCaseCandidate[] }): LocationWorstCase {
  const unit = db.select({ id: storageUnits.id, roomId: storageUnits.roomId, setMaxC: storageUnits.setMaxC }).from(storageUnits).where(eq(storageUnits.id, unitId)).get();
  if (!unit) return { inControl: null, controlLost: null, controlled: false };
  const days = lookBackDays(db);
  const sinceMs = nowMs - days * 86_400_000;
  const refs = sensorsAt(db, eq(sensors.storageUnitId, unitId));
  const room = roomWorst && roomWorst.roomId === unit.roomId ? roomWorst.candidates : (roomCandidates(db, unit.roomId, sinceMs) ?? []);
  return unitWorstCase(db, unit.setMaxC, refs, excursionsInWindow(db, refs, sinceMs), room, sinceMs, days);
}

/** A unit's worst case from its set range, its own sensors (with their excursions in the window) and its room's candidates. */
function unitWorstCase(db: DbOrTx, setMaxC: number | null, refs: SensorRef[], unitExcursions: WindowExcursion[], room: WorstCaseCandidate[], sinceMs: number, days: number): LocationWorstCase {
  if (setMaxC == null) {
    return { inControl: selectWorstCase([...sensorGroupCandidates(db, refs, unitExcursions, sinceMs), ...room]), controlLost: null, controlled: false };
  }
  const { inControl, controlLost } = controlledUnitWorstCase({
    setMaxC,
    highestOutside: highestReading(db, refs, sinceMs, unitExcursions.length > 0),
    excursions: unitExcursions.map((e) => e.excursion),
    room: selectWorstCase(room),
    lookBackDays: days,
  });
  return { inControl, controlLost, controlled: true };
}

/**
 * The worst cases of many rooms and their units at once, for a re-assessment: the same values as
 * roomWorstCandidates and worstCaseForUnit, read in a few queries (the look-back setting once, the
 * sensors and open excursions of all the rooms together, and the highest reading only of the
 * sensors there are) instead of several queries per unit.
 */
export function worstCasesForRooms(
  db: DbOrTx,
  roomIds: number[],
  nowMs = Date.now(),
): { room(roomId: number): WorstCaseCandidate[]; unit(unit: { id: number; roomId: number; setMaxC: number | null }): LocationWorstCase } {
  const days = lookBackDays(db);
  const sinceMs = nowMs - days * 86_400_000;
  const roomRows = roomIds.length ? db.select({ id: rooms.id, designMaxTempC: rooms.designMaxTempC }).from(rooms).where(inArray(rooms.id, roomIds)).all() : [];
  const sensorRows = roomIds.length
    ? db
        .select({ id: sensors.id, externalId: sensors.externalId, roomId: sensors.roomId, storageUnitId: sensors.storageUnitId })
        .from(sensors)
        .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
        .where(or(inArray(sensors.roomId, roomIds), inArray(storageUnits.roomId, roomIds)))
        .all()
    : [];
  const windowExcursions = excursionsInWindow(db, sensorRows, sinceMs);
  const excursionsOf = (refs: SensorRef[]): WindowExcursion[] => {
    const ids = new Set(refs.map((r) => r.id));
    return windowExcursions.filter((e) => ids.has(e.sensorId));
  };
  const sensorCandidates = (refs: SensorRef[]): WorstCaseCandidate[] => sensorGroupCandidates(db, refs, excursionsOf(refs), sinceMs);
  const roomCandidatesById = new Map<number, WorstCaseCandidate[]>();
  for (const row of roomRows) {
    const candidates: WorstCaseCandidate[] = [];
    if (row.designMaxTempC != null) candidates.push({ kind: "design", tempC: row.designMaxTempC });
    candidates.push(...sensorCandidates(sensorRows.filter((s) => s.roomId === row.id)));
    roomCandidatesById.set(row.id, candidates);
  }
  const unitSensors = new Map<number, SensorRef[]>();
  for (const s of sensorRows) {
    if (s.storageUnitId == null) continue;
    const list = unitSensors.get(s.storageUnitId) ?? [];
    list.push(s);
    unitSensors.set(s.storageUnitId, list);
  }
  const roomOf = (roomId: number) => roomCandidatesById.get(roomId) ?? roomCandidates(db, roomId, sinceMs) ?? [];
  return {
    room: roomOf,
    unit: (unit) => {
      const refs = unitSensors.get(unit.id) ?? [];
      return unitWorstCase(db, unit.setMaxC, refs, excursionsOf(refs), roomOf(unit.roomId), sinceMs, days);
    },
  };
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
  /** One excursion. */
  id?: number;
  sensorId?: number;
  /** Excursions of the room's own sensors. */
  roomId?: number;
  /** Excursions of the room's sensors and of every unit in it. */
  inRoomId?: number;
  storageUnitId?: number;
  open?: boolean;
  /** Not acknowledged yet, ended or not. */
  awaitingAcknowledgement?: boolean;
  /** Acknowledged (true) or not (false). */
  acknowledged?: boolean;
  limit?: number;
};

function excursionConditions(filter: ExcursionFilter): SQL[] {
  const conditions: SQL[] = [];
  if (filter.id != null) conditions.push(eq(excursions.id, filter.id));
  if (filter.sensorId != null) conditions.push(eq(excursions.sensorId, filter.sensorId));
  if (filter.roomId != null) conditions.push(eq(excursions.roomId, filter.roomId));
  if (filter.storageUnitId != null) conditions.push(eq(excursions.storageUnitId, filter.storageUnitId));
  if (filter.inRoomId != null) conditions.push(or(eq(excursions.roomId, filter.inRoomId), eq(storageUnits.roomId, filter.inRoomId))!);
  if (filter.open) conditions.push(isNull(excursions.endAt));
  if (filter.awaitingAcknowledgement || filter.acknowledged === false) conditions.push(isNull(excursions.acknowledgedAt));
  if (filter.acknowledged === true) conditions.push(isNotNull(excursions.acknowledgedAt));
  return conditions;
}

/** How many excursions match (the list itself stops at its limit). */
export function countExcursions(filter: ExcursionFilter = {}, db: DbOrTx = getDb()): number {
  const conditions = excursionConditions(filter);
  const row = db
    .select({ n: sql<number>`count(*)` })
    .from(excursions)
    .leftJoin(storageUnits, eq(storageUnits.id, excursions.storageUnitId))
    .where(conditions.length ? and(...conditions) : undefined)
    .get();
  return row?.n ?? 0;
}

/** Excursions newest first, open ones first. */
export function listExcursions(filter: ExcursionFilter = {}, db: DbOrTx = getDb()): ExcursionRow[] {
  const unitRoom = alias(rooms, "unit_room");
  const conditions = excursionConditions(filter);
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
