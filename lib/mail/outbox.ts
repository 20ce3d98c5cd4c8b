import "server-only";
import { randomUUID } from "node:crypto";
import type { DbOrTx } from "@/db/client";
import { emailMessages } from "@/db/schema";
import type { RenderedEmail } from "@/emails/layout";

export type OutboxEntry = RenderedEmail & {
  kind: string;
  to: string[];
  recipientUserId?: number | null;
  /** Stable key for messages that must never be queued twice (e.g. one alert per event). */
  idempotencyKey?: string;
};

/**
 * Queues a message in the caller's transaction: it exists exactly when the event that caused it
 * does. The delivery job sends it later, with retries.
 */
export function enqueueEmail(tx: DbOrTx, entry: OutboxEntry): number {
  const row = tx
    .insert(emailMessages)
    .values({
      kind: entry.kind,
      toAddresses: entry.to,
      subject: entry.subject,
      html: entry.html,
      text: entry.text,
      recipientUserId: entry.recipientUserId ?? null,
      idempotencyKey: entry.idempotencyKey ?? `${entry.kind}:${randomUUID()}`,
    })
    .onConflictDoNothing({ target: emailMessages.idempotencyKey })
    .returning({ id: emailMessages.id })
    .get();
  return row?.id ?? 0;
}
