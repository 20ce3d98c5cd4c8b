import "server-only";
import { randomBytes } from "node:crypto";
import { preparedOn, type DbOrTx } from "@/db/client";
import type { WebhookEventType } from "./events";

/** A Standard Webhooks message id: `msg_` and 16 random bytes; the webhook-id of every attempt. */
export function newMessageId(): string {
  return `msg_${randomBytes(16).toString("base64url")}`;
}

type Subscriber = { id: number; events: string[] };

/** The active endpoints and what they receive: one small prepared query (the table holds a handful of rows). */
export function activeSubscribers(tx: DbOrTx): Subscriber[] {
  const rows = preparedOn(tx, "select id, events from webhook_endpoints where active = 1").all() as { id: number; events: string }[];
  return rows.map((r) => ({ id: r.id, events: JSON.parse(r.events) as string[] }));
}

/** Whether anyone listens at all: lets hot paths skip building payloads. */
export function anyActiveEndpoint(tx: DbOrTx): boolean {
  return preparedOn(tx, "select 1 from webhook_endpoints where active = 1 limit 1").get() !== undefined;
}

/**
 * Queues one event for every active endpoint subscribed to it, in the caller's transaction: the
 * deliveries exist exactly when the event does (a rolled-back change leaves none). The body is
 * fixed here — `{ type, timestamp, data }` — and signed anew at each attempt. Returns the number queued.
 */
export function enqueueWebhookEvent(tx: DbOrTx, type: WebhookEventType, data: Record<string, unknown>, opts: { at?: Date; subscribers?: Subscriber[] } = {}): number {
  const subscribers = (opts.subscribers ?? activeSubscribers(tx)).filter((s) => s.events.includes(type));
  if (subscribers.length === 0) return 0;
  const payload = JSON.stringify({ type, timestamp: (opts.at ?? new Date()).toISOString(), data });
  const insert = preparedOn(tx, "insert into webhook_deliveries (endpoint_id, message_id, event_type, payload, status, attempts, next_attempt_at) values (?, ?, ?, ?, 'pending', 0, ?)");
  const now = Date.now();
  for (const s of subscribers) insert.run(s.id, newMessageId(), type, payload, now);
  return subscribers.length;
}
