import "server-only";
import { desc, eq } from "drizzle-orm";
import { preparedOn, type DbOrTx } from "@/db/client";
import { readings, type Excursion } from "@/db/schema";
import { buildSnapshots, loadAssessmentSettings } from "@/lib/assessment/service";
import { unitThresholds, type UnitThreshold } from "@/lib/assessment/rules/unit-thresholds";
import { warmUpMinutesToReach, warmUpTemperatureC } from "@/lib/hazard";
import { warmUpsOfUnits } from "./warm-up";

const MINUTE_MS = 60_000;

/** A unit's threshold (its key: alerted once per excursion and key) as the projection meets it. */
export type ProjectedCrossing = UnitThreshold & {
  /** When the projected warm-up reaches it; null when already reached or never. */
  at: Date | null;
  /** Already at or above it at the latest reading. */
  reached: boolean;
  /** Reached already in control (at the unit's in-control worst case): not news during an excursion. */
  inControl: boolean;
};

export type ExcursionProjection = {
  excursionId: number;
  storageUnitId: number;
  latest: { at: Date; tempC: number };
  roomTempC: number;
  tauMin: number;
  tauSource: "fitted" | "default" | "set";
  tauReason: string;
  /** The projected warm-up from the latest reading, for the chart. */
  curve: { atMs: number; tempC: number }[];
  /** Earliest first: reached ones, then by the projected time; never-reached ones last. */
  crossings: ProjectedCrossing[];
};

/**
 * The warm-up of a unit whose open excursion is under way, projected from its latest reading with
 * the unit's τ (Newton's law of heating towards its room's worst case), and the clock times at which
 * its contents would cross their thresholds. Null when the excursion has ended, is not on a unit,
 * the unit has no warm-up, or the sensor has no reading.
 */
export function projectOpenExcursion(db: DbOrTx, excursion: Pick<Excursion, "id" | "sensorId" | "storageUnitId" | "endAt">, nowMs = Date.now()): ExcursionProjection | null {
  if (excursion.endAt !== null || excursion.storageUnitId === null) return null;
  const unitId = excursion.storageUnitId;
  const warmUp = warmUpsOfUnits(db, [unitId]).get(unitId);
  if (!warmUp) return null;
  const latestRow = db.select({ at: readings.at, tempC: readings.tempC }).from(readings).where(eq(readings.sensorId, excursion.sensorId)).orderBy(desc(readings.at)).limit(1).get();
  if (!latestRow) return null;
  const roomId = (preparedOn(db, "select room_id as roomId from storage_units where id = ?").get(unitId) as { roomId: number } | undefined)?.roomId;
  if (roomId === undefined) return null;
  const snapshot = buildSnapshots(db, [roomId], nowMs).find((s) => s.kind === "unit" && s.unit.id === unitId);
  if (!snapshot || snapshot.kind !== "unit") return null;
  const roomTempC = snapshot.room.worstCase?.tempC ?? null;
  if (roomTempC === null) return null;
  const latest = { at: latestRow.at, tempC: latestRow.tempC };
  const inControlTempC = snapshot.unit.worstCase.inControl?.tempC ?? snapshot.unit.setRange?.maxC ?? null;
  const warming = roomTempC > latest.tempC ? { roomTempC, startTempC: latest.tempC, tauMin: warmUp.tauMin } : null;

  const crossings: ProjectedCrossing[] = unitThresholds(snapshot, loadAssessmentSettings(db)).map((t) => {
    const inControl = inControlTempC !== null && t.tempC <= inControlTempC;
    if (t.tempC <= latest.tempC) return { ...t, at: null, reached: true, inControl };
    const minutes = warming ? warmUpMinutesToReach(warming, t.tempC) : null;
    return { ...t, at: minutes === null ? null : new Date(latest.at.getTime() + minutes * MINUTE_MS), reached: false, inControl };
  });
  crossings.sort((a, b) => {
    const rank = (c: ProjectedCrossing) => (c.reached ? 0 : c.at ? 1 : 2);
    return rank(a) - rank(b) || (a.at?.getTime() ?? 0) - (b.at?.getTime() ?? 0) || a.tempC - b.tempC;
  });

  // The curve: from the latest reading over three time constants (at most two days), 60 steps.
  const spanMin = Math.min(3 * warmUp.tauMin, 2 * 24 * 60);
  const curve: { atMs: number; tempC: number }[] = [];
  for (let k = 0; k <= 60; k += 1) {
    const minutes = (spanMin * k) / 60;
    curve.push({ atMs: latest.at.getTime() + minutes * MINUTE_MS, tempC: warming ? warmUpTemperatureC(warming, minutes) : latest.tempC });
  }
  return { excursionId: excursion.id, storageUnitId: unitId, latest, roomTempC, tauMin: warmUp.tauMin, tauSource: warmUp.source, tauReason: warmUp.reason, curve, crossings };
}

/** "diethyl ether: 25 % LFL at about 23:40 UTC" — the clock time in UTC, with the date when it is not the latest reading's day. */
export function crossingText(crossing: ProjectedCrossing, reference: Date): string {
  if (crossing.reached) return `${crossing.name}: ${crossing.threshold} already reached (${crossing.tempC.toFixed(1)} °C)`;
  if (!crossing.at) return `${crossing.name}: ${crossing.threshold} not reached by warming to the room`;
  // Rounded down to five minutes: "about" errs early.
  const iso = new Date(Math.floor(crossing.at.getTime() / 300_000) * 300_000).toISOString();
  const sameDay = iso.slice(0, 10) === reference.toISOString().slice(0, 10);
  return `${crossing.name}: ${crossing.threshold} at about ${sameDay ? "" : `${iso.slice(0, 10)} `}${iso.slice(11, 16)} UTC`;
}
