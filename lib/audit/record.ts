import "server-only";
import type { DbOrTx } from "@/db/client";
import { auditEvents } from "@/db/schema";

export type AuditActor = { id: number; email: string } | { system: string };

export type AuditEntry = {
  action: string;
  entityType: string;
  entityId?: string | number | null;
  summary: string;
  before?: unknown;
  after?: unknown;
};

/** Writes one audit event inside the caller's transaction, so it lands or fails with the change. */
export function recordAudit(tx: DbOrTx, actor: AuditActor, entry: AuditEntry): void {
  tx.insert(auditEvents)
    .values({
      actorId: "id" in actor ? actor.id : null,
      actorLabel: "id" in actor ? actor.email : actor.system,
      action: entry.action,
      entityType: entry.entityType,
      entityId: entry.entityId == null ? null : String(entry.entityId),
      summary: entry.summary,
      before: entry.before ?? null,
      after: entry.after ?? null,
    })
    .run();
}
