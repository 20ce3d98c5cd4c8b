import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { settings } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { allRoomIds, kickReassessments, queueReassessment } from "./jobs";
import type { AssessmentSettings } from "./rules";
import { ASSESSMENT_SETTINGS_KEY } from "./service";

/** Saves the safety officers' thresholds and queues the re-assessment of every location. */
export function saveAssessmentSettings(actor: SessionUser, value: AssessmentSettings): { jobId: number } {
  const job = getDb().transaction((tx) => {
    const before = tx.select({ value: settings.value }).from(settings).where(eq(settings.key, ASSESSMENT_SETTINGS_KEY)).get();
    tx.insert(settings)
      .values({ key: ASSESSMENT_SETTINGS_KEY, value, updatedById: actor.id })
      .onConflictDoUpdate({ target: settings.key, set: { value, updatedById: actor.id, updatedAt: new Date() } })
      .run();
    recordAudit(tx, actor, { action: "update", entityType: "setting", entityId: ASSESSMENT_SETTINGS_KEY, summary: "Changed the assessment thresholds and assumptions", before: before?.value ?? null, after: value });
    return queueReassessment(tx, { roomIds: allRoomIds(tx), reason: "the assessment settings changed" }, actor.id);
  });
  kickReassessments();
  return { jobId: job.id };
}
