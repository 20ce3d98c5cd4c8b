import "server-only";
import { and, asc, desc, eq, inArray, isNotNull, lt, lte } from "drizzle-orm";
import { getDb, preparedOn, type DbOrTx } from "@/db/client";
import { excursions, readings, rooms, sensors, storageUnits, warmUpFits, type WarmUpFit as StoredWarmUpFit } from "@/db/schema";
import { queueReassessment } from "@/lib/assessment/jobs";
import { formatNumber } from "@/lib/format/numbers";
import { fitWarmUp, ROOM_MARGIN_MS, simulateWarmUpC, type RejectedExcursion, type WarmUpExcursionInput, type WarmUpFit, type WarmUpPoint } from "./warm-up-fit";
import { NotFoundError } from "@/lib/errors";
import { worstCaseForRoom } from "./queries";
import { formatTauMin } from "./warm-up-defaults";
import { unitIsTemperatureControlled, warmUpsOfUnits, type UnitWarmUp } from "./warm-up";

/** The latest failures a fit looks at, and the readings it takes from each at most: the fit stays cheap. */
export const FIT_MAX_EXCURSIONS = 20;
export const FIT_MAX_READINGS_PER_EXCURSION = 5_000;

type UnitRow = { id: number; code: string; roomId: number; kind: (typeof storageUnits.$inferSelect)["kind"]; setMinC: number | null; setMaxC: number | null; designMaxTempC: number | null };

function unitRow(db: DbOrTx, unitId: number): UnitRow | undefined {
  return db
    .select({
      id: storageUnits.id,
      code: storageUnits.code,
      roomId: storageUnits.roomId,
      kind: storageUnits.kind,
      setMinC: storageUnits.setMinC,
      setMaxC: storageUnits.setMaxC,
      designMaxTempC: rooms.designMaxTempC,
    })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .where(eq(storageUnits.id, unitId))
    .get();
}

const SERIES_SQL = `select at, temp_c from readings where sensor_id = ? and at >= ? and at <= ? order by at limit ?`;

function seriesOf(db: DbOrTx, sensorId: number, fromMs: number, toMs: number, limit: number): WarmUpPoint[] {
  const rows = preparedOn(db, SERIES_SQL).raw(true).all(sensorId, fromMs, toMs, limit) as [number, number][];
  return rows.map(([atMs, tempC]) => ({ atMs, tempC }));
}

/**
 * The fit's inputs for a unit: the rising part of each of its ended excursions (the latest
 * FIT_MAX_EXCURSIONS) — from the last reading at or below the excursion's threshold before its start
 * up to its peak — and its room's temperature over that stretch: the room's own sensors' readings,
 * else its design maximum.
 */
export function loadWarmUpInputs(db: DbOrTx, unitId: number, onlyExcursionIds?: readonly number[]): WarmUpExcursionInput[] {
  const unit = unitRow(db, unitId);
  if (!unit) return [];
  const conditions = [eq(excursions.storageUnitId, unitId), isNotNull(excursions.endAt)];
  if (onlyExcursionIds) conditions.push(inArray(excursions.id, [...onlyExcursionIds]));
  const unitExcursions = db
    .select({ id: excursions.id, sensorId: excursions.sensorId, thresholdC: excursions.thresholdC, startAt: excursions.startAt, peakAt: excursions.peakAt })
    .from(excursions)
    .where(and(...conditions))
    .orderBy(desc(excursions.startAt))
    .limit(FIT_MAX_EXCURSIONS)
    .all()
    .reverse();
  if (unitExcursions.length === 0) return [];
  const roomSensorIds = db.select({ id: sensors.id }).from(sensors).where(eq(sensors.roomId, unit.roomId)).all().map((s) => s.id);
  return unitExcursions.map((excursion) => {
    const startMs = excursion.startAt.getTime();
    const peakMs = excursion.peakAt.getTime();
    const anchor = db
      .select({ at: readings.at })
      .from(readings)
      .where(and(eq(readings.sensorId, excursion.sensorId), lt(readings.at, excursion.startAt), lte(readings.tempC, excursion.thresholdC)))
      .orderBy(desc(readings.at))
      .limit(1)
      .get();
    const fromMs = anchor?.at.getTime() ?? startMs;
    const unitSeries = seriesOf(db, excursion.sensorId, fromMs, peakMs, FIT_MAX_READINGS_PER_EXCURSION);
    const roomSeries = roomSensorIds.map((id) => seriesOf(db, id, fromMs - ROOM_MARGIN_MS, peakMs + ROOM_MARGIN_MS, 4 * FIT_MAX_READINGS_PER_EXCURSION)).filter((s) => s.length > 0);
    const room: WarmUpExcursionInput["room"] =
      roomSeries.length > 0 ? { source: "sensor", series: roomSeries } : unit.designMaxTempC != null ? { source: "design", tempC: unit.designMaxTempC } : null;
    return { excursionId: excursion.id, readings: unitSeries, room };
  });
}

export type RefitOutcome = {
  unitId: number;
  fit: WarmUpFit | null;
  rejected: RejectedExcursion[];
  /** A new row was written (the fit used other excursions or readings than the latest one). */
  stored: StoredWarmUpFit | null;
  /** The re-assessment queued for the unit's room after a new fit. */
  reassessmentJobId: number | null;
};

function sameFit(latest: StoredWarmUpFit | undefined, fit: WarmUpFit): boolean {
  if (!latest) return false;
  const ids = [...latest.excursionIds].sort((a, b) => a - b);
  const next = [...fit.excursionIds].sort((a, b) => a - b);
  return (
    latest.readingCount === fit.readingCount &&
    latest.roomTempSource === fit.roomTempSource &&
    ids.length === next.length &&
    ids.every((id, i) => id === next[i])
  );
}

/**
 * Fits the unit's τ again from its recorded failures and keeps the result when it used other
 * excursions or readings than the latest stored fit. After a new fit the unit's room is queued for
 * re-assessment (time to danger depends on τ) unless `queue` is false (the demo seed assesses
 * everything itself). Call inside a transaction.
 */
export function refitUnitWarmUp(tx: DbOrTx, unitId: number, opts: { nowMs?: number; queue?: boolean; requestedById?: number | null } = {}): RefitOutcome {
  const unit = unitRow(tx, unitId);
  if (!unit || !unitIsTemperatureControlled(unit)) return { unitId, fit: null, rejected: [], stored: null, reassessmentJobId: null };
  const { fit, rejected } = fitWarmUp(loadWarmUpInputs(tx, unitId));
  if (!fit) return { unitId, fit, rejected, stored: null, reassessmentJobId: null };
  const latest = tx.select().from(warmUpFits).where(eq(warmUpFits.storageUnitId, unitId)).orderBy(desc(warmUpFits.id)).limit(1).get();
  if (sameFit(latest, fit)) return { unitId, fit, rejected, stored: null, reassessmentJobId: null };
  const stored = tx
    .insert(warmUpFits)
    .values({
      storageUnitId: unitId,
      tauMin: fit.tauMin,
      rmsErrorC: fit.rmsErrorC,
      excursionCount: fit.excursionCount,
      readingCount: fit.readingCount,
      roomTempC: fit.roomTempC,
      roomTempSource: fit.roomTempSource,
      excursionIds: fit.excursionIds,
      fittedAt: new Date(opts.nowMs ?? Date.now()),
    })
    .returning()
    .get();
  let reassessmentJobId: number | null = null;
  if (opts.queue !== false) {
    const reason = `the warm-up of storage unit ${unit.code} was fitted again (τ = ${formatTauMin(fit.tauMin)}, RMS error ${formatNumber(fit.rmsErrorC, 2)} °C)`;
    reassessmentJobId = queueReassessment(tx, { roomIds: [unit.roomId], reason }, opts.requestedById ?? null).id;
  }
  return { unitId, fit, rejected, stored, reassessmentJobId };
}

/** Every fit of a unit, newest first: its history. */
export function warmUpFitHistory(db: DbOrTx, unitId: number, limit = 50): StoredWarmUpFit[] {
  return db.select().from(warmUpFits).where(eq(warmUpFits.storageUnitId, unitId)).orderBy(desc(warmUpFits.id)).limit(limit).all();
}

/** One excursion of the latest fit with the fitted curve at its readings' times, for the unit's chart. */
export type FittedExcursionCurve = {
  excursionId: number;
  sensorId: number;
  /** When the excursion ended (the unit back within limits). */
  endAtMs: number | null;
  points: { atMs: number; measuredC: number; fittedC: number }[];
};

/**
 * The latest fit's curve over each excursion it was fitted to (the model from each excursion's first
 * reading with the fitted τ, against the room's temperature then), and why the unit's other ended
 * excursions cannot be used (as the fit would judge them now). Null without a fit.
 */
export function fittedCurves(unitId: number, db: DbOrTx = getDb()): { fit: StoredWarmUpFit; curves: FittedExcursionCurve[]; rejected: RejectedExcursion[] } | null {
  const [latest] = warmUpFitHistory(db, unitId, 1);
  if (!latest) return null;
  const { used, rejected } = fitWarmUp(loadWarmUpInputs(db, unitId));
  const fittedIds = new Set(latest.excursionIds);
  const stored = new Map(
    db
      .select({ id: excursions.id, sensorId: excursions.sensorId, endAt: excursions.endAt })
      .from(excursions)
      .where(inArray(excursions.id, latest.excursionIds.length ? latest.excursionIds : [-1]))
      .all()
      .map((e) => [e.id, e]),
  );
  const curves = used
    .filter((e) => fittedIds.has(e.excursionId))
    .map((e) => {
      const fitted = simulateWarmUpC(e, latest.tauMin);
      const excursion = stored.get(e.excursionId);
      return { excursionId: e.excursionId, sensorId: excursion?.sensorId ?? 0, endAtMs: excursion?.endAt?.getTime() ?? null, points: e.readings.map((r, i) => ({ atMs: r.atMs, measuredC: r.tempC, fittedC: fitted[i] })) };
    });
  return { fit: latest, curves, rejected };
}

/** The units (temperature-controlled, live) that have ended excursions: those the demo seed fits. */
export function unitsWithEndedExcursions(db: DbOrTx): number[] {
  return db
    .selectDistinct({ id: excursions.storageUnitId })
    .from(excursions)
    .where(and(isNotNull(excursions.storageUnitId), isNotNull(excursions.endAt)))
    .orderBy(asc(excursions.storageUnitId))
    .all()
    .map((r) => r.id as number);
}

/** What the API and the unit page show of a unit's warm-up. */
export type UnitWarmUpSummary = {
  tauMinutes: number;
  source: UnitWarmUp["source"];
  fit: { excursions: number; readings: number; rmsErrorC: number } | null;
  /** The temperature the unit warms towards after a failure: its room's worst case, as "control lost" uses it; null when the room has none. */
  roomTempC: number | null;
  reason: string;
  note: string | null;
  fitHistory: { tauMinutes: number; rmsErrorC: number; excursions: number; readings: number; roomTempC: number; roomTempSource: "sensor" | "design"; excursionIds: number[]; fittedAt: string }[];
};

const round = (value: number, digits: number) => Number(value.toFixed(digits));

/**
 * A unit's warm-up for the API and its page. A unit that does not exist, is retired or is not
 * temperature-controlled has none (404, saying which).
 */
export function unitWarmUpSummary(unitId: number, nowMs = Date.now(), db: DbOrTx = getDb()): UnitWarmUpSummary {
  const unit = db
    .select({ id: storageUnits.id, code: storageUnits.code, roomId: storageUnits.roomId, retiredAt: storageUnits.retiredAt, note: storageUnits.warmUpTauNote })
    .from(storageUnits)
    .where(eq(storageUnits.id, unitId))
    .get();
  if (!unit || unit.retiredAt) throw new NotFoundError("That storage unit");
  const warmUp = warmUpsOfUnits(db, [unitId]).get(unitId);
  if (!warmUp) {
    throw new NotFoundError(
      `Storage unit ${unit.code} is not temperature-controlled (not a refrigerator or freezer, and no set range), so it has no warm-up: it is assessed at its room's temperature.`,
    );
  }
  const room = worstCaseForRoom(unit.roomId, nowMs, db);
  return {
    tauMinutes: round(warmUp.tauMin, 1),
    source: warmUp.source,
    fit: warmUp.fit ? { excursions: warmUp.fit.excursions, readings: warmUp.fit.readings, rmsErrorC: round(warmUp.fit.rmsErrorC, 3) } : null,
    roomTempC: room ? room.tempC : null,
    reason: warmUp.reason,
    note: warmUp.source === "set" ? unit.note : null,
    fitHistory: warmUpFitHistory(db, unitId).map((f) => ({
      tauMinutes: round(f.tauMin, 1),
      rmsErrorC: round(f.rmsErrorC, 3),
      excursions: f.excursionCount,
      readings: f.readingCount,
      roomTempC: round(f.roomTempC, 2),
      roomTempSource: f.roomTempSource,
      excursionIds: f.excursionIds,
      fittedAt: f.fittedAt.toISOString(),
    })),
  };
}
