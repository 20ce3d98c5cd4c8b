import "server-only";
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { webhookEndpoints } from "@/db/schema";
import { WEBHOOK_EVENT_TYPES } from "./events";
import { storeWebhookEndpoint } from "./service";

/**
 * The demo's signing secret, published like the demo ingest key: the local receiver is given it so
 * it can check signatures. Demo only — a real endpoint gets a random secret, shown once.
 */
export const DEMO_WEBHOOK_SECRET = `whsec_${Buffer.from("headroom-demo-webhook-secret-0001").toString("base64")}`;
export const DEMO_WEBHOOK_DESCRIPTION = "Local demo receiver (records deliveries, checks signatures)";

/**
 * `npm run demo`: one endpoint for the local receiver — http to the loopback, private addresses
 * allowed, every event. Registered once; its address follows WEBHOOK_FAKE_PORT. Returns its id.
 */
export function ensureDemoWebhookEndpoint(db: Db, url: string): number {
  return db.transaction((tx) => {
    const existing = tx.select().from(webhookEndpoints).where(eq(webhookEndpoints.description, DEMO_WEBHOOK_DESCRIPTION)).get();
    if (existing) {
      if (existing.url !== url) tx.update(webhookEndpoints).set({ url, updatedAt: new Date() }).where(eq(webhookEndpoints.id, existing.id)).run();
      return existing.id;
    }
    return storeWebhookEndpoint(tx, { system: "demo" }, {
      url,
      description: DEMO_WEBHOOK_DESCRIPTION,
      events: [...WEBHOOK_EVENT_TYPES],
      allowPrivate: true,
      secret: DEMO_WEBHOOK_SECRET,
      createdById: null,
    }).id;
  });
}
