import "server-only";
import { and, count, desc, eq, inArray, sql } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { webhookAttempts, webhookDeliveries, webhookEndpoints, type WebhookDeliveryStatus, type WebhookEndpoint } from "@/db/schema";
import { recordAudit, type AuditActor } from "@/lib/audit/record";
import { webhookAllowHttpLoopback } from "@/lib/config";
import { ConflictError, NotFoundError } from "@/lib/errors";
import type { WebhookEventType } from "./events";
import { encryptWebhookSecret, generateWebhookSecret } from "./secret";
import { checkWebhookUrl, type Lookup } from "./url-rules";

export type EndpointInput = { url: string; description: string; events: WebhookEventType[]; allowPrivate: boolean };

/** At most this many endpoints: each event fans out to all of them inside the event's transaction. */
export const MAX_WEBHOOK_ENDPOINTS = 20;

function endpointSummary(row: Pick<WebhookEndpoint, "url" | "description" | "events" | "allowPrivate" | "active">) {
  return { url: row.url, description: row.description, events: row.events, allowPrivate: row.allowPrivate, active: row.active };
}

/**
 * Stores an endpoint inside the caller's transaction with its audit event; the secret given is
 * encrypted. `createWebhookEndpoint` is the way in for people (it checks the URL first); the demo
 * uses this with its published demo secret.
 */
export function storeWebhookEndpoint(tx: DbOrTx, actor: AuditActor, input: EndpointInput & { url: string; secret: string; createdById: number | null }): WebhookEndpoint {
  const total = tx.select({ n: count() }).from(webhookEndpoints).get()?.n ?? 0;
  if (total >= MAX_WEBHOOK_ENDPOINTS) throw new ConflictError(`There are already ${MAX_WEBHOOK_ENDPOINTS} endpoints. Pause or reuse one; each event is sent to every endpoint that receives it.`);
  const row = tx
    .insert(webhookEndpoints)
    .values({ url: input.url, description: input.description, events: input.events, allowPrivate: input.allowPrivate, active: true, secretEncrypted: encryptWebhookSecret(input.secret), createdById: input.createdById })
    .returning()
    .get();
  recordAudit(tx, actor, { action: "create", entityType: "webhook_endpoint", entityId: row.id, summary: `Registered webhook endpoint “${row.description}” (${row.url}) for ${row.events.join(", ")}`, after: endpointSummary(row) });
  return row;
}

/** Registers an endpoint; the signing secret is returned this once and stored only encrypted. */
export async function createWebhookEndpoint(actor: AuditActor & { id: number }, input: EndpointInput, opts: { lookup?: Lookup } = {}): Promise<{ secret: string; endpoint: WebhookEndpoint }> {
  const url = await checkWebhookUrl(input.url, { allowPrivate: input.allowPrivate, allowHttpLoopback: webhookAllowHttpLoopback(), lookup: opts.lookup });
  const secret = generateWebhookSecret();
  const endpoint = getDb().transaction((tx) => storeWebhookEndpoint(tx, actor, { ...input, url, secret, createdById: actor.id }));
  return { secret, endpoint };
}

function endpointOrThrow(tx: DbOrTx, id: number): WebhookEndpoint {
  const row = tx.select().from(webhookEndpoints).where(eq(webhookEndpoints.id, id)).get();
  if (!row) throw new NotFoundError("That webhook endpoint");
  return row;
}

/** Changes address, description, events or the private-address choice; the URL is checked again. */
export async function updateWebhookEndpoint(actor: AuditActor, id: number, input: EndpointInput, opts: { lookup?: Lookup } = {}): Promise<WebhookEndpoint> {
  endpointOrThrow(getDb(), id);
  const url = await checkWebhookUrl(input.url, { allowPrivate: input.allowPrivate, allowHttpLoopback: webhookAllowHttpLoopback(), lookup: opts.lookup });
  return getDb().transaction((tx) => {
    const before = endpointOrThrow(tx, id);
    const after = tx
      .update(webhookEndpoints)
      .set({ url, description: input.description, events: input.events, allowPrivate: input.allowPrivate, updatedAt: new Date() })
      .where(eq(webhookEndpoints.id, id))
      .returning()
      .get();
    recordAudit(tx, actor, { action: "update", entityType: "webhook_endpoint", entityId: id, summary: `Changed webhook endpoint “${after.description}”`, before: endpointSummary(before), after: endpointSummary(after) });
    return after;
  });
}

/** Pauses (deliveries wait, new events are not queued for it) or resumes an endpoint. */
export function setWebhookEndpointActive(actor: AuditActor, id: number, active: boolean): WebhookEndpoint {
  return getDb().transaction((tx) => {
    const before = endpointOrThrow(tx, id);
    if (before.active === active) throw new ConflictError(active ? "That endpoint is already active." : "That endpoint is already paused.");
    const after = tx.update(webhookEndpoints).set({ active, updatedAt: new Date() }).where(eq(webhookEndpoints.id, id)).returning().get();
    recordAudit(tx, actor, { action: active ? "resume" : "pause", entityType: "webhook_endpoint", entityId: id, summary: `${active ? "Resumed" : "Paused"} webhook endpoint “${after.description}”` });
    return after;
  });
}

/** A new signing secret, returned this once; deliveries not yet sent are signed with it. */
export function rotateWebhookSecret(actor: AuditActor, id: number): { secret: string; endpoint: WebhookEndpoint } {
  const secret = generateWebhookSecret();
  const endpoint = getDb().transaction((tx) => {
    endpointOrThrow(tx, id);
    const after = tx.update(webhookEndpoints).set({ secretEncrypted: encryptWebhookSecret(secret), secretRotatedAt: new Date(), updatedAt: new Date() }).where(eq(webhookEndpoints.id, id)).returning().get();
    recordAudit(tx, actor, { action: "rotate_secret", entityType: "webhook_endpoint", entityId: id, summary: `Rotated the signing secret of webhook endpoint “${after.description}”` });
    return after;
  });
  return { secret, endpoint };
}

/** "Retry now": a failed or waiting delivery is due at once (a failed one gets one more attempt). */
export function retryWebhookDelivery(actor: AuditActor, id: number) {
  return getDb().transaction((tx) => {
    const row = tx.select().from(webhookDeliveries).where(eq(webhookDeliveries.id, id)).get();
    if (!row) throw new NotFoundError("That delivery");
    if (row.status === "delivered") throw new ConflictError("That delivery was received already; it is not sent again.");
    if (row.status === "sending") throw new ConflictError("That delivery is being sent right now.");
    const after = tx.update(webhookDeliveries).set({ status: "pending", nextAttemptAt: new Date() }).where(and(eq(webhookDeliveries.id, id), inArray(webhookDeliveries.status, ["pending", "failed"]))).returning().get();
    recordAudit(tx, actor, { action: "retry", entityType: "webhook_delivery", entityId: id, summary: `Retry now: ${row.eventType} delivery ${row.messageId}` });
    const endpoint = tx.select({ active: webhookEndpoints.active }).from(webhookEndpoints).where(eq(webhookEndpoints.id, row.endpointId)).get();
    return { ...after, endpointActive: endpoint?.active ?? false };
  });
}

export function listWebhookEndpoints() {
  const db = getDb();
  const rows = db
    .select({
      id: webhookEndpoints.id,
      url: webhookEndpoints.url,
      description: webhookEndpoints.description,
      events: webhookEndpoints.events,
      allowPrivate: webhookEndpoints.allowPrivate,
      active: webhookEndpoints.active,
      createdAt: webhookEndpoints.createdAt,
      secretRotatedAt: webhookEndpoints.secretRotatedAt,
    })
    .from(webhookEndpoints)
    .orderBy(webhookEndpoints.id)
    .all();
  const counts = db
    .select({ endpointId: webhookDeliveries.endpointId, status: webhookDeliveries.status, n: count() })
    .from(webhookDeliveries)
    .groupBy(webhookDeliveries.endpointId, webhookDeliveries.status)
    .all();
  return rows.map((row) => ({
    ...row,
    counts: Object.fromEntries(counts.filter((c) => c.endpointId === row.id).map((c) => [c.status, c.n])) as Partial<Record<WebhookDeliveryStatus, number>>,
  }));
}

export const DELIVERIES_PAGE_SIZE = 25;

/** A page of deliveries, newest first, with their attempts; by endpoint and status when asked. */
export function listWebhookDeliveries(filter: { endpointId?: number; status?: WebhookDeliveryStatus; page?: number }) {
  const db = getDb();
  const where = and(
    filter.endpointId ? eq(webhookDeliveries.endpointId, filter.endpointId) : undefined,
    filter.status ? eq(webhookDeliveries.status, filter.status) : undefined,
  );
  const total = db.select({ n: count() }).from(webhookDeliveries).where(where).get()?.n ?? 0;
  const page = Math.max(1, Math.min(filter.page ?? 1, Math.max(1, Math.ceil(total / DELIVERIES_PAGE_SIZE))));
  const rows = db
    .select({
      id: webhookDeliveries.id,
      endpointId: webhookDeliveries.endpointId,
      endpointDescription: webhookEndpoints.description,
      endpointActive: webhookEndpoints.active,
      messageId: webhookDeliveries.messageId,
      eventType: webhookDeliveries.eventType,
      payload: webhookDeliveries.payload,
      status: webhookDeliveries.status,
      attempts: webhookDeliveries.attempts,
      nextAttemptAt: webhookDeliveries.nextAttemptAt,
      lastStatusCode: webhookDeliveries.lastStatusCode,
      lastError: webhookDeliveries.lastError,
      createdAt: webhookDeliveries.createdAt,
      deliveredAt: webhookDeliveries.deliveredAt,
    })
    .from(webhookDeliveries)
    .innerJoin(webhookEndpoints, eq(webhookEndpoints.id, webhookDeliveries.endpointId))
    .where(where)
    .orderBy(desc(webhookDeliveries.id))
    .limit(DELIVERIES_PAGE_SIZE)
    .offset((page - 1) * DELIVERIES_PAGE_SIZE)
    .all();
  const attempts = rows.length
    ? db
        .select()
        .from(webhookAttempts)
        .where(inArray(webhookAttempts.deliveryId, rows.map((r) => r.id)))
        .orderBy(webhookAttempts.id)
        .all()
    : [];
  return {
    total,
    page,
    pageCount: Math.max(1, Math.ceil(total / DELIVERIES_PAGE_SIZE)),
    rows: rows.map((r) => ({ ...r, attemptList: attempts.filter((a) => a.deliveryId === r.id) })),
  };
}

/** For tests and the demo: how many deliveries wait. */
export function pendingWebhookCount(): number {
  return getDb().select({ n: count() }).from(webhookDeliveries).where(sql`${webhookDeliveries.status} in ('pending', 'sending')`).get()?.n ?? 0;
}
