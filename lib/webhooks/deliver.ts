import "server-only";
import { randomBytes } from "node:crypto";
import http from "node:http";
import https from "node:https";
import { RequestFilteringHttpAgent, RequestFilteringHttpsAgent } from "request-filtering-agent";
import { Webhook } from "standardwebhooks";
import { getDb, preparedOn, type Db } from "@/db/client";
import { webhookAllowHttpLoopback } from "@/lib/config";
import { DomainError } from "@/lib/errors";
import { coalescedJob } from "@/lib/jobs/coalesced";
import { log } from "@/lib/log";
import { workerWritesDone } from "@/lib/workers/write-gate";
import { decryptWebhookSecret } from "./secret";
import { METADATA_ADDRESSES, parseWebhookUrl, SOCKET_DENIED_ADDRESSES } from "./url-rules";

/** Waits after the 1st, 2nd … 6th failed attempt (each ±20 % jitter); after the 7th the delivery is `failed`. */
export const RETRY_DELAYS_MS = [30_000, 2 * 60_000, 10 * 60_000, 60 * 60_000, 6 * 60 * 60_000, 24 * 60 * 60_000];
export const MAX_ATTEMPTS = RETRY_DELAYS_MS.length + 1;
/** One attempt may take this long, connecting and reading the answer included. */
export const DELIVERY_TIMEOUT_MS = 10_000;
/** How much of a receiver's answer is read and kept for display; the rest is never read. */
export const RESPONSE_KEEP_BYTES = 4_096;
/** A claim older than this (the process died mid-send) makes the delivery due again. Far above the timeout. */
export const CLAIM_LEASE_MS = 2 * 60_000;
const BATCH_SIZE = 20;
const PARALLEL = 4;

/** The wait after `failedAttempts` failures, or null when the delivery has had all its attempts. */
export function retryDelayMs(failedAttempts: number, random: () => number = Math.random): number | null {
  if (failedAttempts >= MAX_ATTEMPTS) return null;
  const base = RETRY_DELAYS_MS[Math.max(0, failedAttempts - 1)];
  return Math.round(base * (0.8 + 0.4 * random()));
}

export type SendOutcome = { statusCode: number | null; error: string | null; body: string | null; durationMs: number };

/** A short, specific reason for a failed connection. */
function describeError(error: unknown, timeoutMs: number): string {
  const e = error as { name?: string; code?: string; message?: string };
  if (e.name === "AbortError" || e.name === "TimeoutError" || e.code === "ABORT_ERR") return `No answer within ${timeoutMs / 1000} s.`;
  const message = e.message ?? String(error);
  const refused = /DNS lookup (\S+?)\(.*is not allowed/.exec(message);
  if (refused) {
    return METADATA_ADDRESSES.includes(refused[1]) || /denyIPAddressList/.test(message)
      ? `Refused: the address (${refused[1]}) is one webhooks may never reach.`
      : `Refused: the address (${refused[1]}) is not public; allow private addresses for this endpoint if it is inside your network.`;
  }
  if (e.code === "ECONNREFUSED") return "Connection refused: nothing listens at that address and port.";
  if (e.code === "ENOTFOUND" || e.code === "EAI_AGAIN") return `The host name could not be resolved (${e.code}).`;
  if (e.code === "ECONNRESET") return "The receiver closed the connection before answering.";
  if (e.code && /CERT|SSL|TLS/.test(e.code)) return `TLS failed (${e.code}): the receiver's certificate is not trusted.`;
  return (e.code ? `${e.code}: ` : "") + message.slice(0, 200);
}

/**
 * One POST through an agent that checks every address it connects to (request-filtering-agent:
 * private, loopback and link-local refused unless allowed, metadata never), with a timeout over the
 * whole exchange, no redirects followed, and at most RESPONSE_KEEP_BYTES of the answer read.
 */
export function postSigned(
  url: URL,
  body: string,
  headers: Record<string, string>,
  opts: { allowPrivate: boolean; timeoutMs?: number },
): Promise<SendOutcome> {
  const timeoutMs = opts.timeoutMs ?? DELIVERY_TIMEOUT_MS;
  const started = performance.now();
  const filter = { allowPrivateIPAddress: opts.allowPrivate, denyIPAddressList: SOCKET_DENIED_ADDRESSES, keepAlive: false };
  const secure = url.protocol === "https:";
  const agent = secure ? new RequestFilteringHttpsAgent(filter) : new RequestFilteringHttpAgent(filter);
  return new Promise((resolve) => {
    let settled = false;
    const finish = (outcome: Omit<SendOutcome, "durationMs">) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      agent.destroy();
      resolve({ ...outcome, durationMs: Math.round(performance.now() - started) });
    };
    const request = (secure ? https : http).request(
      url,
      { method: "POST", agent, headers: { ...headers, "content-type": "application/json", "content-length": String(Buffer.byteLength(body)), "user-agent": "Headroom-Webhooks/1" } },
      (response) => {
        const statusCode = response.statusCode ?? 0;
        const chunks: Buffer[] = [];
        let kept = 0;
        const done = () => {
          const text = Buffer.concat(chunks).toString("utf8");
          const error =
            statusCode >= 200 && statusCode < 300
              ? null
              : statusCode >= 300 && statusCode < 400
                ? `Redirects are not followed (HTTP ${statusCode}${response.headers.location ? ` to ${String(response.headers.location).slice(0, 200)}` : ""}).`
                : `The receiver answered HTTP ${statusCode}.`;
          finish({ statusCode, error, body: text || null });
          response.destroy();
        };
        response.on("data", (chunk: Buffer) => {
          if (kept < RESPONSE_KEEP_BYTES) {
            chunks.push(chunk.subarray(0, RESPONSE_KEEP_BYTES - kept));
            kept += Math.min(chunk.length, RESPONSE_KEEP_BYTES - kept);
          }
          if (kept >= RESPONSE_KEEP_BYTES) done();
        });
        response.on("end", done);
        response.on("error", () => done());
      },
    );
    const timer = setTimeout(() => {
      request.destroy(Object.assign(new Error("timeout"), { name: "TimeoutError" }));
      finish({ statusCode: null, error: describeError({ name: "TimeoutError" }, timeoutMs), body: null });
    }, timeoutMs);
    request.on("error", (error) => finish({ statusCode: null, error: describeError(error, timeoutMs), body: null }));
    request.end(body);
  });
}

type DueRow = { id: number; endpointId: number; messageId: string; payload: string; attempts: number; url: string; allowPrivate: number; secretEncrypted: string };

export type WebhookRun = { delivered: number; retrying: number; failed: number };

/**
 * Sends every delivery that is due, on active endpoints. Each is claimed first (status `sending`
 * with a token and a lease), so two processes or ticks never send it at once; a claim whose lease
 * lapsed is due again. The webhook-id is the delivery's own, on every attempt. A 2xx makes it
 * `delivered` and it is never sent again; anything else is an attempt recorded and a retry after
 * RETRY_DELAYS_MS, then `failed`. Rows are never deleted.
 */
export async function deliverDueWebhooks(db: Db = getDb(), opts: { nowMs?: number; timeoutMs?: number; random?: () => number } = {}): Promise<WebhookRun> {
  const now = opts.nowMs ?? Date.now();
  const run: WebhookRun = { delivered: 0, retrying: 0, failed: 0 };
  const due = preparedOn(
    db,
    `select d.id from webhook_deliveries d join webhook_endpoints e on e.id = d.endpoint_id
      where e.active = 1 and ((d.status = 'pending' and d.next_attempt_at <= ?) or (d.status = 'sending' and d.lease_until < ?))
      order by d.next_attempt_at, d.id limit ${BATCH_SIZE}`,
  ).all(now, now) as { id: number }[];
  if (due.length === 0) return run;
  await workerWritesDone();
  const claim = preparedOn(
    db,
    `update webhook_deliveries set status = 'sending', claim_token = ?, lease_until = ?
      where id = ? and ((status = 'pending' and next_attempt_at <= ?) or (status = 'sending' and lease_until < ?))`,
  );
  const read = preparedOn(
    db,
    `select d.id, d.endpoint_id as endpointId, d.message_id as messageId, d.payload, d.attempts, e.url, e.allow_private as allowPrivate, e.secret_encrypted as secretEncrypted
       from webhook_deliveries d join webhook_endpoints e on e.id = d.endpoint_id where d.id = ?`,
  );
  const claimed: { row: DueRow; token: string }[] = [];
  for (const { id } of due) {
    const token = randomBytes(12).toString("base64url");
    if (claim.run(token, now + CLAIM_LEASE_MS, id, now, now).changes === 1) claimed.push({ row: read.get(id) as DueRow, token });
  }
  const queue = [...claimed];
  const worker = async () => {
    for (let next = queue.shift(); next; next = queue.shift()) {
      const outcome = await attempt(next.row, opts.timeoutMs);
      await workerWritesDone();
      const result = record(db, next.row, next.token, outcome, opts.random);
      run[result] += 1;
    }
  };
  await Promise.all(Array.from({ length: Math.min(PARALLEL, queue.length) }, worker));
  log.info({ job: "webhooks", ...run }, "job run");
  return run;
}

async function attempt(row: DueRow, timeoutMs?: number): Promise<SendOutcome & { at: number }> {
  const at = Date.now();
  try {
    const url = parseWebhookUrl(row.url, { allowHttpLoopback: webhookAllowHttpLoopback() });
    const signer = new Webhook(decryptWebhookSecret(row.secretEncrypted));
    const sentAt = new Date();
    const headers = {
      "webhook-id": row.messageId,
      "webhook-timestamp": String(Math.floor(sentAt.getTime() / 1000)),
      "webhook-signature": signer.sign(row.messageId, sentAt, row.payload),
    };
    return { ...(await postSigned(url, row.payload, headers, { allowPrivate: row.allowPrivate === 1, timeoutMs })), at };
  } catch (error) {
    const message = error instanceof DomainError || error instanceof Error ? error.message : String(error);
    return { statusCode: null, error: message.slice(0, 300), body: null, durationMs: Date.now() - at, at };
  }
}

function record(db: Db, row: DueRow, token: string, outcome: SendOutcome & { at: number }, random?: () => number): keyof WebhookRun {
  const attempts = row.attempts + 1;
  return db.transaction((tx) => {
    preparedOn(tx, "insert into webhook_attempts (delivery_id, at, duration_ms, status_code, error, response_body) values (?, ?, ?, ?, ?, ?)").run(
      row.id,
      outcome.at,
      outcome.durationMs,
      outcome.statusCode,
      outcome.error,
      outcome.body,
    );
    if (outcome.error === null) {
      preparedOn(
        tx,
        "update webhook_deliveries set status = 'delivered', attempts = ?, delivered_at = ?, last_status_code = ?, last_error = null, claim_token = null, lease_until = null where id = ? and claim_token = ?",
      ).run(attempts, Date.now(), outcome.statusCode, row.id, token);
      return "delivered";
    }
    const delay = retryDelayMs(attempts, random);
    preparedOn(
      tx,
      "update webhook_deliveries set status = ?, attempts = ?, next_attempt_at = ?, last_status_code = ?, last_error = ?, claim_token = null, lease_until = null where id = ? and claim_token = ?",
    ).run(delay === null ? "failed" : "pending", attempts, delay === null ? Date.now() : Date.now() + delay, outcome.statusCode, outcome.error, row.id, token);
    return delay === null ? "failed" : "retrying";
  });
}

const webhookJob = coalescedJob("webhooks", {
  testsEnv: "HEADROOM_WEBHOOKS_IN_TESTS",
  pass: async () => {
    const run = await deliverDueWebhooks();
    // A full batch: there may be more due (a burst of events), so go on without waiting for the timer.
    return { more: run.delivered + run.retrying + run.failed >= BATCH_SIZE };
  },
});

/** Runs a delivery pass now (coalescing overlapping requests); errors are logged, never thrown. */
export function kickWebhooks(): void {
  webhookJob.kick();
}

export function startWebhookJob(intervalMs = 3_000): void {
  webhookJob.start(intervalMs);
}
