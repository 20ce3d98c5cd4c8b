import "server-only";
import { and, count, desc, eq, inArray, isNull, ne, notInArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import {
  auditEvents,
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
  openFindings: Record<Severity, number>;
  openExcursions: number;
  unacknowledgedExcursions: number;
  sites: number;
  rooms: number;
  storageUnits: number;
  containers: number;
  myContainers: number;
  substances: number;
  sensors: number;
  queuedEmails: number;
};

export async function overviewCounts(userId: number): Promise<OverviewCounts> {
  const db = getDb();
  const bySeverity = db
    .select({ severity: findings.severity, n: count() })
    .from(findings)
    .where(inArray(findings.status, OPEN_STATUSES))
    .groupBy(findings.severity)
    .all();
  const openFindings = Object.fromEntries(SEVERITIES.map((s) => [s, 0])) as Record<Severity, number>;
  for (const row of bySeverity) openFindings[row.severity] = row.n;
  const liveContainers = notInArray(containers.state, ["disposed"]);
  return {
    openFindings,
    openExcursions: await db.$count(excursions, isNull(excursions.endAt)),
    unacknowledgedExcursions: await db.$count(excursions, isNull(excursions.acknowledgedAt)),
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
