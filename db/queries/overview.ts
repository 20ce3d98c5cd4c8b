import "server-only";
import { and, count, desc, eq, inArray, isNotNull, isNull, max, ne, notInArray, or, sql, type SQL } from "drizzle-orm";
import { findingsVisibleTo } from "@/db/queries/findings";
import { scopeFor, type Scope } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { getDb } from "@/db/client";
import {
  auditEvents,
  findingEvents,
  containers,
  emailMessages,
  excursions,
  findings,
  rooms,
  sensors,
  sites,
  storageUnits,
  substances,
  SEVERITIES,
  type Severity,
} from "@/db/schema";

const OPEN_STATUSES = ["open", "acknowledged", "mitigating"] as const;

export type OverviewCounts = {
  /** Open findings per severity in the reader's scope of the register. */
  openFindings: Record<Severity, number>;
  /** Excursions in the reader's scope: every location, the facilities contact's own, none for a researcher. */
  openExcursions: number;
  unacknowledgedExcursions: number;
  /** Open excursions across every location (what facilities staff see beyond their own). */
  allOpenExcursions: number;
  /** Rooms the reader is the facilities contact for, and storage units they own. */
  myRooms: number;
  myUnits: number;
  sites: number;
  rooms: number;
  storageUnits: number;
  containers: number;
  myContainers: number;
  substances: number;
  sensors: number;
  queuedEmails: number;
};

export async function overviewCounts(user: SessionUser, scope: Scope | null): Promise<OverviewCounts> {
  const userId = user.id;
  const db = getDb();
  const bySeverity = db
    .select({ severity: findings.severity, n: count() })
    .from(findings)
    .where(scope ? and(inArray(findings.status, OPEN_STATUSES), findingsVisibleTo(user, scope)) : sql`0`)
    .groupBy(findings.severity)
    .all();
  const openFindings = Object.fromEntries(SEVERITIES.map((s) => [s, 0])) as Record<Severity, number>;
  for (const row of bySeverity) openFindings[row.severity] = row.n;
  const liveContainers = notInArray(containers.state, ["disposed"]);
  const excursionScope = excursionsVisibleTo(user);
  const allOpenExcursions = excursionScope === null ? 0 : await db.$count(excursions, isNull(excursions.endAt));
  return {
    openFindings,
    openExcursions: excursionScope === null ? 0 : excursionScope === undefined ? allOpenExcursions : await db.$count(excursions, and(isNull(excursions.endAt), excursionScope)),
    unacknowledgedExcursions: excursionScope === null ? 0 : await db.$count(excursions, and(isNull(excursions.acknowledgedAt), excursionScope)),
    allOpenExcursions,
    myRooms: await db.$count(rooms, and(isNull(rooms.retiredAt), eq(rooms.facilitiesContactId, userId))),
    myUnits: await db.$count(storageUnits, and(isNull(storageUnits.retiredAt), eq(storageUnits.ownerId, userId))),
    sites: await db.$count(sites, isNull(sites.retiredAt)),
    rooms: await db.$count(rooms, isNull(rooms.retiredAt)),
    storageUnits: await db.$count(storageUnits, isNull(storageUnits.retiredAt)),
    containers: await db.$count(containers, liveContainers),
    myContainers: await db.$count(containers, and(liveContainers, eq(containers.ownerId, userId))),
    substances: await db.$count(substances, isNull(substances.retiredAt)),
    sensors: await db.$count(sensors, eq(sensors.active, true)),
    queuedEmails: await db.$count(emailMessages, ne(emailMessages.status, "sent")),
  };
}

/**
 * Which excursions the Overview counts for a reader: undefined for every location, a condition for
 * facilities staff (the rooms they are the contact for, with their units, and the units they own),
 * null for a role that does not read temperatures.
 */
function excursionsVisibleTo(user: SessionUser): SQL | undefined | null {
  const scope = scopeFor(user.role, "temperatures.read");
  if (!scope) return null;
  if (user.role !== "facilities") return undefined;
  const db = getDb();
  const contactRooms = db.select({ id: rooms.id }).from(rooms).where(eq(rooms.facilitiesContactId, user.id));
  return or(
    inArray(excursions.roomId, contactRooms),
    inArray(
      excursions.storageUnitId,
      db
        .select({ id: storageUnits.id })
        .from(storageUnits)
        .where(or(eq(storageUnits.ownerId, user.id), inArray(storageUnits.roomId, contactRooms))),
    ),
  );
}

export function recentAuditEvents(limit = 8) {
  return getDb()
    .select({ id: auditEvents.id, at: auditEvents.at, actorLabel: auditEvents.actorLabel, summary: auditEvents.summary })
    .from(auditEvents)
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(limit)
    .all();
}

export function sitesWithRoomCounts() {
  return getDb()
    .select({ id: sites.id, name: sites.name, atmosphericPressureKPa: sites.atmosphericPressureKPa, rooms: count(rooms.id) })
    .from(sites)
    .leftJoin(rooms, and(eq(rooms.siteId, sites.id), isNull(rooms.retiredAt)))
    .where(isNull(sites.retiredAt))
    .groupBy(sites.id)
    .orderBy(sites.name)
    .all();
}

/**
 * The locations closest to their limits: for each room or unit, its open finding with the highest
 * ratio of computed value to limit (whatever the severity), highest first.
 */
export function locationsClosestToLimits(user: SessionUser, scope: Scope, limit = 6) {
  const db = getDb();
  const ratio = max(findings.ratio);
  // "+" keeps SQLite from walking the status or (room, unit) index, reading most findings' rows
  // one by one in its order: the open findings are most of the register, read faster in one pass.
  const roomId = sql<number | null>`+${findings.roomId}`;
  const storageUnitId = sql<number | null>`+${findings.storageUnitId}`;
  return db
    .select({
      roomId: findings.roomId,
      storageUnitId: findings.storageUnitId,
      roomCode: rooms.code,
      unitCode: storageUnits.code,
      ratio,
      findings: count(),
    })
    .from(findings)
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, findings.storageUnitId))
    .where(and(inArray(sql`+${findings.status}`, OPEN_STATUSES), isNotNull(findings.ratio), findingsVisibleTo(user, scope)))
    .groupBy(roomId, storageUnitId)
    .orderBy(desc(ratio))
    .limit(limit)
    .all();
}

/** The register's latest events (raised, resolved, worked on), for the people who may read them. */
export function recentFindingEvents(user: SessionUser, scope: Scope, limit = 8) {
  return getDb()
    .select({ id: findingEvents.id, kind: findingEvents.kind, at: findingEvents.at, note: findingEvents.note, findingId: findings.id, title: findings.title, severity: findings.severity })
    .from(findingEvents)
    .innerJoin(findings, eq(findings.id, findingEvents.findingId))
    .where(findingsVisibleTo(user, scope))
    .orderBy(desc(findingEvents.at), desc(findingEvents.id))
    .limit(limit)
    .all();
}
