import "server-only";
import { desc } from "drizzle-orm";
import { getDb } from "@/db/client";
import { emailMessages } from "@/db/schema";

export function recentOutbox(limit = 50) {
  return getDb()
    .select({
      id: emailMessages.id,
      kind: emailMessages.kind,
      toAddresses: emailMessages.toAddresses,
      subject: emailMessages.subject,
      status: emailMessages.status,
      attempts: emailMessages.attempts,
      lastError: emailMessages.lastError,
      nextAttemptAt: emailMessages.nextAttemptAt,
      createdAt: emailMessages.createdAt,
      sentAt: emailMessages.sentAt,
    })
    .from(emailMessages)
    .orderBy(desc(emailMessages.id))
    .limit(limit)
    .all();
}
