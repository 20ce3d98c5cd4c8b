import "server-only";
import { and, asc, count, desc, eq, gte, lt, sql } from "drizzle-orm";
import type { AuditListQuery } from "@/lib/audit/schemas";
import { getDb } from "@/db/client";
import { auditEvents } from "@/db/schema";

/** The audit trail of one record, newest first. */
export function auditTrail(entityType: string, entityId: number | string, limit = 50) {
  return getDb()
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entityType, entityType), eq(auditEvents.entityId, String(entityId))))
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(limit)
    .all();
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
  return { rows, total };
}
