import "server-only";
import { and, eq, gte, inArray, isNull, lt, or, type SQL } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { emailMessages, excursions, findingEvents, findings, rooms, sensors, storageUnits, users, type User } from "@/db/schema";
import { dailyDigestEmail, formatDurationMin, formatEmailInstant, formatEmailTempC } from "@/emails/excursion";
import { appUrl } from "@/lib/config";
import { log } from "@/lib/log";
import { enqueueEmail } from "@/lib/mail/outbox";

/** The digest goes out once a day, at this hour (UTC). */
export const DIGEST_HOUR_UTC = 7;
const DAY_MS = 86_400_000;

export type DigestWindow = { sinceMs: number; untilMs: number };
export type DigestSection = { heading: string; lines: string[] };
/** One part of the digest; returns null when it has nothing to say to this person. */
export type DigestSectionBuilder = (tx: DbOrTx, user: User, window: DigestWindow) => DigestSection | null;

/**
 * Locations a person answers for: every location for a safety officer; otherwise the units they
 * own and the rooms (with their units) whose facilities contact they are.
 */
function responsibleScope(tx: DbOrTx, user: User): SQL | null | "all" {
  if (user.role === "safety_officer") return "all";
  const roomIds = tx.select({ id: rooms.id }).from(rooms).where(eq(rooms.facilitiesContactId, user.id)).all().map((r) => r.id);
  const unitIds = tx
    .select({ id: storageUnits.id })
    .from(storageUnits)
    .where(roomIds.length ? or(eq(storageUnits.ownerId, user.id), inArray(storageUnits.roomId, roomIds)) : eq(storageUnits.ownerId, user.id))
    .all()
    .map((u) => u.id);
  const parts: SQL[] = [];
  if (roomIds.length) parts.push(inArray(excursions.roomId, roomIds));
  if (unitIds.length) parts.push(inArray(excursions.storageUnitId, unitIds));
  return parts.length ? or(...parts)! : null;
}

export const excursionDigestSection: DigestSectionBuilder = (tx, user, window) => {
  if (user.alertExcursions === "off") return null;
  const scope = responsibleScope(tx, user);
  if (scope === null) return null;
  const since = new Date(window.sinceMs);
  const until = new Date(window.untilMs);
  const happened = or(
    and(gte(excursions.startAt, since), lt(excursions.startAt, until)),
    and(gte(excursions.endAt, since), lt(excursions.endAt, until)),
    and(isNull(excursions.endAt), isNull(excursions.acknowledgedAt)),
  )!;
  const rows = tx
    .select({
      startAt: excursions.startAt,
      endAt: excursions.endAt,
      peakTempC: excursions.peakTempC,
      peakAt: excursions.peakAt,
      thresholdC: excursions.thresholdC,
      acknowledgedAt: excursions.acknowledgedAt,
      sensor: sensors.externalId,
      unitCode: storageUnits.code,
      roomCode: rooms.code,
    })
    .from(excursions)
    .innerJoin(sensors, eq(sensors.id, excursions.sensorId))
    .leftJoin(storageUnits, eq(storageUnits.id, excursions.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, excursions.roomId))
    .where(scope === "all" ? happened : and(scope, happened))
    .orderBy(excursions.startAt)
    .limit(50)
    .all();
  if (rows.length === 0) return null;
  return {
    heading: `Temperature excursions (${rows.length}${rows.length === 50 ? " or more" : ""})`,
    lines: rows.map((row) => {
      const where = row.unitCode ? `Unit ${row.unitCode}` : `Room ${row.roomCode ?? "?"}`;
      const span = row.endAt
        ? `${formatEmailInstant(row.startAt)} – ${formatEmailInstant(row.endAt)} (${formatDurationMin((row.endAt.getTime() - row.startAt.getTime()) / 60_000)})`
        : `open since ${formatEmailInstant(row.startAt)}${row.acknowledgedAt ? "" : ", not acknowledged"}`;
      return `${where}, sensor ${row.sensor}: above ${formatEmailTempC(row.thresholdC)} ${span}, peak ${formatEmailTempC(row.peakTempC)}`;
    }),
  };
};

function findingScope(tx: DbOrTx, user: User): SQL | null | "all" {
  if (user.role === "safety_officer") return "all";
  const roomIds = tx.select({ id: rooms.id }).from(rooms).where(eq(rooms.facilitiesContactId, user.id)).all().map((r) => r.id);
  const unitIds = tx.select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.ownerId, user.id)).all().map((u) => u.id);
  const parts: SQL[] = [];
  if (roomIds.length) parts.push(inArray(findings.roomId, roomIds));
  if (unitIds.length) parts.push(inArray(findings.storageUnitId, unitIds));
  return parts.length ? or(...parts)! : null;
}

const DIGEST_EVENT_LABEL: Record<string, string> = { raised: "Raised", reopened: "Re-opened", auto_resolved: "Resolved itself", resolved: "Resolved", risk_accepted: "Risk accepted" };

export const findingDigestSection: DigestSectionBuilder = (tx, user, window) => {
  if (user.alertFindings === "off") return null;
  const scope = findingScope(tx, user);
  if (scope === null) return null;
  const happened = and(
    gte(findingEvents.at, new Date(window.sinceMs)),
    lt(findingEvents.at, new Date(window.untilMs)),
    inArray(findingEvents.kind, ["raised", "reopened", "auto_resolved", "resolved", "risk_accepted"]),
  )!;
  const rows = tx
    .select({ kind: findingEvents.kind, severity: findings.severity, title: findings.title, id: findings.id })
    .from(findingEvents)
    .innerJoin(findings, eq(findings.id, findingEvents.findingId))
    .where(scope === "all" ? happened : and(scope, happened))
    .orderBy(findingEvents.at)
    .limit(50)
    .all();
  if (rows.length === 0) return null;
  return {
    heading: `Register (${rows.length}${rows.length === 50 ? " or more" : ""} changes)`,
    lines: rows.map((row) => `${DIGEST_EVENT_LABEL[row.kind] ?? row.kind}: ${row.severity.toUpperCase()} — ${row.title} (${appUrl()}/register/${row.id})`),
  };
};

/** The digest's parts, in order. */
export const DIGEST_SECTIONS: DigestSectionBuilder[] = [findingDigestSection, excursionDigestSection];

function wantsDigest(user: User): boolean {
  return user.dailyDigest || user.alertExcursions === "digest" || user.alertFindings === "digest";
}

/**
 * The digest is queued at its hour, never hours later under that hour's label: a process that was
 * down at 07:00 UTC and starts later leaves that day's digest out (tomorrow's lists every open,
 * unacknowledged excursion again) rather than sending a "07:00 UTC" digest at noon.
 */
export const DIGEST_LATE_LIMIT_MS = 2 * 60_000;

/** The digest hour of the UTC day of `nowMs` (ms). */
export function digestSlotOf(nowMs: number): number {
  const now = new Date(nowMs);
  return Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate(), DIGEST_HOUR_UTC);
}

/** Whether `nowMs` falls within DIGEST_LATE_LIMIT_MS after a digest hour. */
export function isDigestDue(nowMs: number): boolean {
  const slotMs = digestSlotOf(nowMs);
  return nowMs >= slotMs && nowMs - slotMs <= DIGEST_LATE_LIMIT_MS;
}

/** Milliseconds from `nowMs` to the next digest hour (today's if it is still ahead, else tomorrow's). */
export function msUntilNextDigest(nowMs: number): number {
  const today = digestSlotOf(nowMs);
  return (nowMs < today ? today : today + DAY_MS) - nowMs;
}

/**
 * Queues today's digest for everyone who wants one and has something to read, once per person and
 * day (the idempotency key is the person and the date). Does nothing outside the minutes just after
 * DIGEST_HOUR_UTC (see DIGEST_LATE_LIMIT_MS).
 */
export function queueDailyDigests(nowMs = Date.now(), db: DbOrTx = getDb()): number {
  if (!isDigestDue(nowMs)) return 0;
  const now = new Date(nowMs);
  const day = now.toISOString().slice(0, 10);
  const untilMs = digestSlotOf(nowMs);
  const window = { sinceMs: untilMs - DAY_MS, untilMs };
  let queued = 0;
  for (const user of db.select().from(users).where(eq(users.active, true)).all()) {
    if (!wantsDigest(user)) continue;
    const idempotencyKey = `digest:${user.id}:${day}`;
    if (db.select({ id: emailMessages.id }).from(emailMessages).where(eq(emailMessages.idempotencyKey, idempotencyKey)).get()) continue;
    db.transaction((tx) => {
      const sections = DIGEST_SECTIONS.map((build) => build(tx, user, window)).filter((s): s is DigestSection => s !== null);
      if (sections.length === 0) return;
      const message = dailyDigestEmail({ name: user.name, dayLabel: `${day} ${String(DIGEST_HOUR_UTC).padStart(2, "0")}:00 UTC`, sections, link: appUrl() });
      queued += enqueueEmail(tx, { ...message, kind: "daily_digest", to: [user.email], recipientUserId: user.id, idempotencyKey }) ? 1 : 0;
    });
  }
  if (queued) log.info({ queued, day }, "daily digests queued");
  return queued;
}

const globalDigest = globalThis as unknown as { headroomDigestTimer?: NodeJS.Timeout };

/**
 * Runs the digest at its hour: a timer set for the next DIGEST_HOUR_UTC, set again after each run.
 * On start it runs at once only when the hour has just passed (a restart at 07:01), so a process
 * started at noon sends nothing until tomorrow's hour.
 */
export function startDigestJob(): void {
  if (globalDigest.headroomDigestTimer) return;
  const run = () => {
    try {
      const nowMs = Date.now();
      if (isDigestDue(nowMs)) queueDailyDigests(nowMs);
      else if (msUntilNextDigest(nowMs) > 60_000) {
        log.warn({ day: new Date(nowMs).toISOString().slice(0, 10) }, "daily digest skipped: its hour had passed more than two minutes before the timer ran");
      }
    } catch (error) {
      log.error({ err: error }, "daily digest failed; it is tried again at the next digest hour");
    }
    schedule();
  };
  const schedule = () => {
    // A timer never fires early by more than a rounding; the run checks the hour itself.
    globalDigest.headroomDigestTimer = setTimeout(run, msUntilNextDigest(Date.now()));
    globalDigest.headroomDigestTimer.unref?.();
  };
  const nowMs = Date.now();
  if (isDigestDue(nowMs)) {
    try {
      queueDailyDigests(nowMs);
    } catch (error) {
      log.error({ err: error }, "daily digest failed; it is tried again at the next digest hour");
    }
  }
  schedule();
}

/** Stops the digest timer (tests, shutdown). */
export function stopDigestJob(): void {
  if (globalDigest.headroomDigestTimer) clearTimeout(globalDigest.headroomDigestTimer);
  globalDigest.headroomDigestTimer = undefined;
}
