import "server-only";
import { and, asc, eq, lte, lt } from "drizzle-orm";
import { Resend } from "resend";
import { getDb, type Db } from "@/db/client";
import { emailMessages, type EmailMessage } from "@/db/schema";
import { mailApiKey, mailBaseUrl, mailFrom } from "@/lib/config";
import { coalescedJob } from "@/lib/jobs/coalesced";
import { log } from "@/lib/log";

const BATCH_SIZE = 20;
const BACKOFF_BASE_MS = 5_000;
const BACKOFF_MAX_MS = 60 * 60 * 1000;
/** A message left "sending" this long (the process died mid-send) is queued again. */
const STALE_SENDING_MS = 5 * 60 * 1000;

/** Exponential backoff: 5 s, 10 s, 20 s … capped at an hour. A failed message is never dropped. */
export function backoffMs(attempts: number): number {
  return Math.min(BACKOFF_MAX_MS, BACKOFF_BASE_MS * 2 ** Math.max(0, attempts - 1));
}

export function mailClient(): Resend {
  return new Resend(mailApiKey(), { baseUrl: mailBaseUrl() });
}

async function sendOne(client: Resend, message: EmailMessage): Promise<{ id: string } | { error: string }> {
  try {
    const { data, error } = await client.emails.send(
      { from: mailFrom(), to: message.toAddresses, subject: message.subject, html: message.html, text: message.text },
      { idempotencyKey: message.idempotencyKey },
    );
    if (error || !data) return { error: error ? `${error.name}: ${error.message ?? "no message"}` : "empty response" };
    return { id: data.id };
  } catch (error) {
    return { error: error instanceof Error ? error.message : String(error) };
  }
}

export type DeliveryRun = { sent: number; failed: number };

/** Sends every message that is due. Each message is claimed first, so two runs never send it twice. */
export async function deliverDueMessages(db: Db = getDb(), now = Date.now()): Promise<DeliveryRun> {
  const stale = and(eq(emailMessages.status, "sending"), lt(emailMessages.nextAttemptAt, new Date(now - STALE_SENDING_MS)));
  // Read first: an UPDATE takes the write lock even when it changes nothing, and while a worker
  // thread holds it (a long import) this thread would wait for it, every request with it.
  if (db.select({ id: emailMessages.id }).from(emailMessages).where(stale).limit(1).get()) {
    db.update(emailMessages).set({ status: "queued" }).where(stale).run();
  }
  const due = db
    .select()
    .from(emailMessages)
    .where(and(eq(emailMessages.status, "queued"), lte(emailMessages.nextAttemptAt, new Date(now))))
    .orderBy(asc(emailMessages.nextAttemptAt), asc(emailMessages.id))
    .limit(BATCH_SIZE)
    .all();
  const run: DeliveryRun = { sent: 0, failed: 0 };
  if (due.length === 0) return run;
  const client = mailClient();
  for (const message of due) {
    const claimed = db
      .update(emailMessages)
      .set({ status: "sending", nextAttemptAt: new Date(now) })
      .where(and(eq(emailMessages.id, message.id), eq(emailMessages.status, "queued")))
      .run();
    if (claimed.changes !== 1) continue;
    const outcome = await sendOne(client, message);
    const attempts = message.attempts + 1;
    if ("id" in outcome) {
      db.update(emailMessages)
        .set({ status: "sent", attempts, sentAt: new Date(), providerMessageId: outcome.id, lastError: null })
        .where(eq(emailMessages.id, message.id))
        .run();
      run.sent += 1;
    } else {
      db.update(emailMessages)
        .set({ status: "queued", attempts, lastError: outcome.error, nextAttemptAt: new Date(Date.now() + backoffMs(attempts)) })
        .where(eq(emailMessages.id, message.id))
        .run();
      run.failed += 1;
    }
  }
  log.info({ job: "outbox", ...run }, "job run");
  return run;
}

const outboxJob = coalescedJob("outbox", { testsEnv: "HEADROOM_OUTBOX_IN_TESTS", pass: async () => void (await deliverDueMessages()) });

/** Runs a delivery pass now (coalescing overlapping requests); errors are logged, never thrown. */
export function kickOutbox(): void {
  outboxJob.kick();
}

export function startOutboxJob(intervalMs = 2_000): void {
  outboxJob.start(intervalMs);
}
