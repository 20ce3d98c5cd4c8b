import "server-only";
import { and, desc, eq } from "drizzle-orm";
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
