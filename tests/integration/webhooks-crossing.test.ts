/**
 * The time-to-danger warning as a webhook: an open excursion on the demo's −20 °C freezer FZ-1
 * (sensor S-206, τ set to one hour) warming towards its room's 27.0 °C, checked by the crossing
 * watch. One `excursion.crossing_warning` per excursion and set of thresholds, in the warning's
 * transaction, signed and verified, its body as the API document describes it. Invented demo data.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Webhook } from "standardwebhooks";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { webhookDeliveries } from "@/db/schema";
import { checkCrossingAlerts } from "@/lib/alerts/crossing-alerts";
import { deliverDueWebhooks } from "@/lib/webhooks/deliver";
import { startWebhookReceiver, type WebhookReceiver } from "@/lib/webhooks/receiver-fake";
import { createWebhookEndpoint } from "@/lib/webhooks/service";
import { expectDocumentedPayload } from "./helpers/webhook-payloads";
import { openWarmingExcursionOnFz1 } from "./helpers/warming-freezer";
import { makeUser } from "./helpers/world";

const NOW = Date.parse("2026-12-04T22:00:00Z");
let receiver: WebhookReceiver;
let secret: string;
let excursionId: number, unitId: number;

beforeAll(async () => {
  const db = getDb();
  await seedDemo(db, { bcryptCost: 4, nowMs: Date.parse("2026-12-02T09:07:00Z") });
  receiver = await startWebhookReceiver({ port: 0 });
  ({ secret } = await createWebhookEndpoint(makeUser("admin"), { url: `${receiver.url}/warnings`, description: "Night porter's pager", events: ["excursion.crossing_warning"], allowPrivate: true }));
  ({ unitId, excursionId } = openWarmingExcursionOnFz1(db, NOW));
});

afterAll(async () => {
  await receiver.close();
});

describe("the crossing warning as a webhook", () => {
  it("is queued once with the warning and delivered signed, with the thresholds and their clock times", async () => {
    checkCrossingAlerts(getDb(), NOW);
    const queued = getDb().select().from(webhookDeliveries).all();
    expect(queued).toHaveLength(1);
    expect(queued[0].eventType).toBe("excursion.crossing_warning");
    // A minute later: the same thresholds are not news.
    checkCrossingAlerts(getDb(), NOW + 60_000);
    expect(getDb().select().from(webhookDeliveries).all()).toHaveLength(1);

    expect(await deliverDueWebhooks()).toEqual({ delivered: 1, retrying: 0, failed: 0 });
    const [got] = receiver.received;
    expect(got.path).toBe("/warnings");
    const payload = new Webhook(secret).verify(got.body, { "webhook-id": got.webhookId!, "webhook-timestamp": got.webhookTimestamp!, "webhook-signature": got.webhookSignature! }) as {
      type: string;
      timestamp: string;
      data: { excursion: Record<string, unknown>; location: Record<string, unknown>; crossings: Record<string, unknown>[] };
    };
    expect(payload.type).toBe("excursion.crossing_warning");
    expect(expectDocumentedPayload(got.body)).toBe("excursion.crossing_warning");
    expect(payload.timestamp).toBe(new Date(NOW).toISOString());
    expect(payload.data.excursion).toEqual({ id: excursionId, url: `http://localhost:3999/temperatures/excursions/${excursionId}`, latestTempC: 0, latestAt: new Date(NOW).toISOString() });
    expect(payload.data.location).toMatchObject({ storageUnitId: unitId });
    const lfl = payload.data.crossings.find((c) => c.name === "methanol" && c.threshold === "LFL" && c.rule === "enclosure-lfl")!;
    expect(lfl).toMatchObject({ reached: false, description: "methanol: LFL at about 22:15 UTC" });
    // 16.8 min after 22:00 (see excursion-projection.test.ts).
    const minutes = (Date.parse(lfl.at as string) - NOW) / 60_000;
    expect(minutes).toBeGreaterThan(16.0);
    expect(minutes).toBeLessThan(17.6);
  });
});
