import "server-only";
import { and, asc, count, desc, eq, gte, inArray, lt, sql } from "drizzle-orm";
import type { AuditListQuery } from "@/lib/audit/schemas";
import { getDb } from "@/db/client";
import { auditEvents, mixtures, rooms, sensors, sites, storageUnits, substances, users } from "@/db/schema";
import { AUDIT_REFERENCE_FIELDS, auditChanges, type AuditChange, type AuditReferenceKind, type AuditReferenceNames } from "@/lib/audit/format";

type AuditEventRow = typeof auditEvents.$inferSelect;

/**
 * The names of the records the events' before/after values point to (people, rooms, units …),
 * a query per kind of record, so the log can say "Assignee: Sam Officer" instead of an id.
 */
function referenceNames(rows: AuditEventRow[]): AuditReferenceNames {
  const ids = new Map<AuditReferenceKind, Set<number>>();
  for (const row of rows) {
    for (const snapshot of [row.before, row.after]) {
      if (typeof snapshot !== "object" || snapshot === null || Array.isArray(snapshot)) continue;
      for (const [key, kind] of Object.entries(AUDIT_REFERENCE_FIELDS)) {
        const value = (snapshot as Record<string, unknown>)[key];
        if (typeof value === "number") (ids.get(kind) ?? ids.set(kind, new Set()).get(kind)!).add(value);
      }
    }
  }
  const db = getDb();
  const names: AuditReferenceNames = {};
  const load = (kind: AuditReferenceKind, read: (list: number[]) => { id: number; name: string }[]) => {
    const list = [...(ids.get(kind) ?? [])];
    if (list.length) names[kind] = Object.fromEntries(read(list).map((r) => [r.id, r.name]));
  };
  load("user", (list) => db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, list)).all());
  load("room", (list) => db.select({ id: rooms.id, name: sql<string>`${rooms.code} || ' ' || ${rooms.name}` }).from(rooms).where(inArray(rooms.id, list)).all());
  load("storage_unit", (list) => db.select({ id: storageUnits.id, name: sql<string>`${storageUnits.code} || ' ' || ${storageUnits.name}` }).from(storageUnits).where(inArray(storageUnits.id, list)).all());
  load("site", (list) => db.select({ id: sites.id, name: sites.name }).from(sites).where(inArray(sites.id, list)).all());
  load("substance", (list) => db.select({ id: substances.id, name: substances.name }).from(substances).where(inArray(substances.id, list)).all());
  load("mixture", (list) => db.select({ id: mixtures.id, name: mixtures.name }).from(mixtures).where(inArray(mixtures.id, list)).all());
  load("sensor", (list) => db.select({ id: sensors.id, name: sensors.externalId }).from(sensors).where(inArray(sensors.id, list)).all());
  return names;
}

/** Events with their changes in words (only the fields that changed; records named). */
export function withChanges(rows: AuditEventRow[]): (AuditEventRow & { changes: AuditChange[] })[] {
  const names = referenceNames(rows);
  return rows.map((row) => ({ ...row, changes: row.action === "create" || row.action === "import" || row.action === "seed" ? [] : auditChanges(row, names) }));
}

/** The audit trail of one record, newest first. */
export function auditTrail(entityType: string, entityId: number | string, limit = 50) {
  const rows = getDb()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, entityType), eq(auditEvents.entityId, String(entityId))))
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(limit)
    .all();
  return withChanges(rows);
}

/** The audit log, newest first by default, filtered by record, action, person and date range (inclusive days, UTC). */
export function listAuditEvents(query: AuditListQuery) {
  const db = getDb();
  const pattern = query.q ? `%${query.q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%` : undefined;
  const where = and(
    query.entityType ? eq(auditEvents.entityType, query.entityType) : undefined,
    query.entityId ? eq(auditEvents.entityId, query.entityId) : undefined,
    query.action ? eq(auditEvents.action, query.action) : undefined,
    query.actor ? eq(auditEvents.actorLabel, query.actor.toLowerCase()) : undefined,
    query.from != null ? gte(auditEvents.at, new Date(query.from)) : undefined,
    query.to != null ? lt(auditEvents.at, new Date(query.to + 86_400_000)) : undefined,
    pattern ? sql`lower(${auditEvents.summary}) like ${pattern} escape '\\'` : undefined,
  );
  const total = db.select({ n: count() }).from(auditEvents).where(where).get()?.n ?? 0;
  const rows = db
    .select()
    .from(auditEvents)
    .where(where)
    .orderBy(query.dir === "asc" ? asc(auditEvents.at) : desc(auditEvents.at), query.dir === "asc" ? asc(auditEvents.id) : desc(auditEvents.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return { rows: withChanges(rows), total };
}
