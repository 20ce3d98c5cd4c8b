import "server-only";
import { and, asc, desc, eq, gt, gte, isNull, lt, lte, or, sql } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { excursions, readings, rooms, sensors, storageUnits, users, type Excursion } from "@/db/schema";
import { queueExcursionWebhooks } from "@/lib/webhooks/domain-events";
import { queueExcursionAlerts, type ExcursionAlertEvent } from "@/lib/alerts/excursion-alerts";
import { auditSnapshot } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { scopeFor } from "@/lib/auth/permissions";
import { ConflictError, DomainError, ForbiddenError, NotFoundError } from "@/lib/errors";
import { createExcursionDetector, type DetectedExcursion, type ExcursionRule } from "./excursions";
import { queueWarmUpFits } from "./warm-up-jobs";

export type SensorExcursionRule = ExcursionRule & { minDurationMin: number; roomId: number | null; storageUnitId: number | null; externalId: string };

/**
 * A sensor's excursion rule comes from where it hangs: the storage unit's threshold and minimum
 * duration when it is on a unit, the room's otherwise. No threshold set → no excursions.
 */
export function excursionRuleFor(tx: DbOrTx, sensorId: number): SensorExcursionRule | null {
  const row = tx
    .select({
      externalId: sensors.externalId,
      roomId: sensors.roomId,
      storageUnitId: sensors.storageUnitId,
      unitThresholdC: storageUnits.excursionThresholdC,
      unitMinDurationMin: storageUnits.excursionMinDurationMin,
      roomThresholdC: rooms.excursionThresholdC,
      roomMinDurationMin: rooms.excursionMinDurationMin,
    })
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .where(eq(sensors.id, sensorId))
    .get();
  if (!row) return null;
  const onUnit = row.storageUnitId != null;
  const thresholdC = onUnit ? row.unitThresholdC : row.roomThresholdC;
  if (thresholdC == null) return null;
  const minDurationMin = (onUnit ? row.unitMinDurationMin : row.roomMinDurationMin) ?? 0;
  return { thresholdC, minDurationMin, minDurationMs: minDurationMin * 60_000, roomId: row.roomId, storageUnitId: row.storageUnitId, externalId: row.externalId };
}

export type RefreshResult = { opened: number; closed: number; updated: number };

/**
 * Re-runs excursion detection for these sensors over the readings that new data can affect and
 * stores the result: new excursions inserted, open ones extended or closed, peaks updated, and
 * excursions that new readings joined together merged (an acknowledgement is carried over).
 *
 * The window starts at the last reading at or below the threshold before the earliest newly
 * stored reading (or before any stored excursion still open or overlapping it): nothing earlier
 * can change. Call it inside the transaction that stored the readings, so that the readings, the
 * excursions and their alert e-mails land together.
 */
export function refreshExcursions(tx: DbOrTx, sensorIds: number[], opts: { sinceMs?: number; notify?: boolean } = {}): RefreshResult {
  const total: RefreshResult = { opened: 0, closed: 0, updated: 0 };
  for (const sensorId of [...new Set(sensorIds)]) {
    const rule = excursionRuleFor(tx, sensorId);
    if (!rule) continue;
    const events: ExcursionAlertEvent[] = [];
    const result = refreshSensor(tx, sensorId, rule, opts.sinceMs, events);
    total.opened += result.opened;
    total.closed += result.closed;
    total.updated += result.updated;
    // An ended excursion of a unit is a recorded failure: its warm-up is fitted again in the background.
    if (rule.storageUnitId != null && events.some((e) => e.excursion.endAt != null)) queueWarmUpFits(tx, [rule.storageUnitId]);
    if (opts.notify && events.length) queueExcursionWebhooks(tx, rule.externalId, events);
    if (opts.notify && events.length) queueExcursionAlerts(tx, { sensorExternalId: rule.externalId, minDurationMin: rule.minDurationMin, roomId: rule.roomId, storageUnitId: rule.storageUnitId }, events);
  }
  return total;
}

function refreshSensor(tx: DbOrTx, sensorId: number, rule: SensorExcursionRule, sinceMs: number | undefined, events: ExcursionAlertEvent[]): RefreshResult {
  const result: RefreshResult = { opened: 0, closed: 0, updated: 0 };
  let fromMs = sinceMs ?? null;
  if (fromMs != null) {
    const overlapping = tx
      .select({ startAt: excursions.startAt })
      .from(excursions)
      .where(and(eq(excursions.sensorId, sensorId), or(isNull(excursions.endAt), gte(excursions.endAt, new Date(fromMs)))))
      .orderBy(asc(excursions.startAt))
      .limit(1)
      .get();
    if (overlapping) fromMs = Math.min(fromMs, overlapping.startAt.getTime());
  }
  // The last reading within limits before the window: detection starts there.
  const anchor =
    fromMs == null
      ? null
      : tx
          .select({ atMs: sql<number>`${readings.at}` })
          .from(readings)
          .where(and(eq(readings.sensorId, sensorId), lt(readings.at, new Date(fromMs)), lte(readings.tempC, rule.thresholdC)))
          .orderBy(desc(readings.at))
          .limit(1)
          .get();
  const anchorMs = anchor?.atMs ?? null;

  // Streamed in time order through the incremental detector: a logger file of a million readings
  // is never held as an array of rows (drizzle's .all() would build one object per reading).
  const series = tx
    .select({ atMs: sql<number>`${readings.at}`, tempC: readings.tempC })
    .from(readings)
    .where(anchorMs == null ? eq(readings.sensorId, sensorId) : and(eq(readings.sensorId, sensorId), gte(readings.at, new Date(anchorMs))))
    .orderBy(asc(readings.at))
    .toSQL();
  const detector = createExcursionDetector(rule);
  const detected: DetectedExcursion[] = [];
  const rows = getDb().$client.prepare(series.sql).raw(true).iterate(...series.params) as IterableIterator<[number, number]>;
  for (const [atMs, tempC] of rows) {
    const completed = detector.push({ atMs, tempC });
    if (completed) detected.push(completed);
  }
  detected.push(...detector.finish());

  const stored = tx
    .select()
    .from(excursions)
    .where(
      anchorMs == null
        ? eq(excursions.sensorId, sensorId)
        : and(eq(excursions.sensorId, sensorId), or(gt(excursions.startAt, new Date(anchorMs)), isNull(excursions.endAt), gt(excursions.endAt, new Date(anchorMs)))),
    )
    .orderBy(asc(excursions.startAt))
    .all();

  const matched = new Set<number>();
  const endOf = (endMs: number | null) => endMs ?? Number.POSITIVE_INFINITY;
  for (const found of detected) {
    const overlapping = stored.filter(
      (s) => !matched.has(s.id) && s.startAt.getTime() <= endOf(found.endMs) && found.startMs <= endOf(s.endAt?.getTime() ?? null),
    );
    const values = {
      thresholdC: rule.thresholdC,
      startAt: new Date(found.startMs),
      endAt: found.endMs == null ? null : new Date(found.endMs),
      peakTempC: found.peakTempC,
      peakAt: new Date(found.peakAtMs),
    };
    if (overlapping.length === 0) {
      const row = tx
        .insert(excursions)
        .values({ sensorId, roomId: rule.roomId, storageUnitId: rule.storageUnitId, ...values })
        .returning()
        .get();
      result.opened += 1;
      events.push({ kind: found.endMs == null ? "started" : "recorded", excursion: row });
      continue;
    }
    const [keep, ...merged] = overlapping;
    for (const other of [keep, ...merged]) matched.add(other.id);
    const acknowledgement = [keep, ...merged].find((e) => e.acknowledgedAt);
    for (const other of merged) tx.delete(excursions).where(eq(excursions.id, other.id)).run();
    const changed =
      merged.length > 0 ||
      keep.startAt.getTime() !== found.startMs ||
      (keep.endAt?.getTime() ?? null) !== found.endMs ||
      keep.peakTempC !== found.peakTempC ||
      keep.peakAt.getTime() !== found.peakAtMs ||
      keep.thresholdC !== rule.thresholdC;
    if (!changed) continue;
    const row = tx
      .update(excursions)
      .set({
        ...values,
        ...(acknowledgement && !keep.acknowledgedAt
          ? { acknowledgedAt: acknowledgement.acknowledgedAt, acknowledgedById: acknowledgement.acknowledgedById, acknowledgeComment: acknowledgement.acknowledgeComment }
          : {}),
        updatedAt: new Date(),
      })
      .where(eq(excursions.id, keep.id))
      .returning()
      .get();
    if (keep.endAt == null && found.endMs != null) {
      result.closed += 1;
      events.push({ kind: "ended", excursion: row });
    } else {
      result.updated += 1;
    }
  }
  // Stored excursions the readings no longer show under the same threshold were superseded
  // (joined into another one above). One stored under a different threshold is history: kept.
  for (const old of stored) {
    if (matched.has(old.id) || old.thresholdC !== rule.thresholdC) continue;
    tx.delete(excursions).where(eq(excursions.id, old.id)).run();
    result.updated += 1;
  }
  return result;
}

/** Facilities, safety officers and admins acknowledge an excursion with a comment; audited. */
export function acknowledgeExcursion(actor: SessionUser, excursionId: number, comment: string): Excursion {
  return getDb().transaction((tx) => acknowledgeInTx(tx, actor, excursionId, comment));
}

const isoMinute = (at: Date) => at.toISOString().slice(0, 16).replace("T", " ");

/** May this person acknowledge this excursion? The permission matrix's scope; "own" means a location they answer for. */
function mayAcknowledge(tx: DbOrTx, actor: SessionUser, excursion: Excursion): boolean {
  const scope = scopeFor(actor.role, "excursions.acknowledge");
  if (scope === "all") return true;
  if (scope !== "own") return false;
  const roomId =
    excursion.roomId ??
    (excursion.storageUnitId == null ? null : (tx.select({ roomId: storageUnits.roomId }).from(storageUnits).where(eq(storageUnits.id, excursion.storageUnitId)).get()?.roomId ?? null));
  const ownsUnit =
    excursion.storageUnitId != null &&
    tx.select({ id: storageUnits.id }).from(storageUnits).where(and(eq(storageUnits.id, excursion.storageUnitId), eq(storageUnits.ownerId, actor.id))).get() != null;
  const contact = roomId != null && tx.select({ id: rooms.id }).from(rooms).where(and(eq(rooms.id, roomId), eq(rooms.facilitiesContactId, actor.id))).get() != null;
  return ownsUnit || contact;
}

function acknowledgeInTx(tx: DbOrTx, actor: SessionUser, excursionId: number, comment: string | null): Excursion {
  const before = tx.select().from(excursions).where(eq(excursions.id, excursionId)).get();
  if (!before) throw new NotFoundError("No such excursion.");
  if (!mayAcknowledge(tx, actor, before)) throw new ForbiddenError("You may not acknowledge this excursion.");
  if (before.acknowledgedAt) {
    const by = before.acknowledgedById == null ? null : tx.select({ name: users.name }).from(users).where(eq(users.id, before.acknowledgedById)).get();
    throw new ConflictError(`This excursion was already acknowledged${by ? ` by ${by.name}` : ""} on ${isoMinute(before.acknowledgedAt)} UTC.`);
  }
  const after = tx
    .update(excursions)
    .set({ acknowledgedAt: new Date(), acknowledgedById: actor.id, acknowledgeComment: comment, updatedAt: new Date() })
    .where(and(eq(excursions.id, excursionId), isNull(excursions.acknowledgedAt)))
    .returning()
    .get();
  const sensor = tx.select({ externalId: sensors.externalId }).from(sensors).where(eq(sensors.id, before.sensorId)).get();
  recordAudit(tx, actor, {
    action: "acknowledge",
    entityType: "excursion",
    entityId: excursionId,
    summary: `Acknowledged the excursion on sensor ${sensor?.externalId ?? before.sensorId} from ${isoMinute(before.startAt)} UTC${comment ? `: ${comment}` : ""}`,
    before: auditSnapshot(before),
    after: auditSnapshot(after),
  });
  return after;
}

export type AcknowledgeOutcome = { excursionId: number; ok: boolean; error?: string };

/**
 * Several excursions acknowledged at once with one note, in one transaction. Each is checked on
 * its own (it exists, this person may acknowledge it, nobody has yet); one that cannot be
 * acknowledged is reported with the reason and the others are still acknowledged.
 */
export function acknowledgeExcursions(actor: SessionUser, excursionIds: readonly number[], note: string | null): AcknowledgeOutcome[] {
  return getDb().transaction((tx) =>
    [...new Set(excursionIds)].map((excursionId) => {
      try {
        acknowledgeInTx(tx, actor, excursionId, note);
        return { excursionId, ok: true };
      } catch (error) {
        if (error instanceof DomainError) return { excursionId, ok: false, error: error.message };
        throw error;
      }
    }),
  );
}
