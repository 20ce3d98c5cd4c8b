/**
 * The webhook payloads the API document describes are the ones delivered: real events (a bottle of
 * ether in a kitchen-type fridge raised, escalated, resolved by re-assessment and by a person; an
 * excursion through the logger ingest started and ended) delivered to the local receiver, each body
 * verified and parsed with its event's documented schema, with exactly the documented keys.
 * excursion.crossing_warning is checked the same way in webhooks-crossing.test.ts. Invented data.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { Webhook } from "standardwebhooks";
import { getDb } from "@/db/client";
import { containers, findings, rooms, sensors, sites, storageUnits, substances, type User } from "@/db/schema";
import { seedSubstanceLibrary } from "@/db/seed/substances";
import { reassessRooms } from "@/lib/assessment/service";
import { applyFindingStep } from "@/lib/register/workflow";
import { ingestReadings } from "@/lib/temperatures/ingest";
import { deliverDueWebhooks } from "@/lib/webhooks/deliver";
import { WEBHOOK_EVENT_TYPES } from "@/lib/webhooks/events";
import { startWebhookReceiver, type WebhookReceiver } from "@/lib/webhooks/receiver-fake";
import { createWebhookEndpoint } from "@/lib/webhooks/service";
import { expectDocumentedPayload } from "./helpers/webhook-payloads";
import { makeUser } from "./helpers/world";

const MIN = 60_000;
const T0 = Date.parse("2026-03-06T17:00:00Z");
const at = (minutes: number) => new Date(T0 + minutes * MIN).toISOString();
const series = (sensor: string, fromMin: number, temps: number[]) => temps.map((tempC, i) => ({ sensor, at: at(fromMin + 5 * i), tempC }));

let receiver: WebhookReceiver;
let secret: string;
let officer: User;
let roomId: number;
/** Every event name seen in a delivered, documented body. */
const seen: string[] = [];

/** Sends everything due, then checks every body that arrived: signed, and as documented. */
async function deliverAndCheck(): Promise<{ type: string; data: Record<string, Record<string, unknown>> }[]> {
  receiver.received.length = 0;
  for (;;) {
    const run = await deliverDueWebhooks();
    if (run.delivered + run.retrying + run.failed === 0) break;
  }
  expect(receiver.received.length).toBeGreaterThan(0);
  return receiver.received.map((got) => {
    new Webhook(secret).verify(got.body, { "webhook-id": got.webhookId!, "webhook-timestamp": got.webhookTimestamp!, "webhook-signature": got.webhookSignature! });
    seen.push(expectDocumentedPayload(got.body));
    return JSON.parse(got.body) as { type: string; data: Record<string, Record<string, unknown>> };
  });
}

beforeAll(async () => {
  receiver = await startWebhookReceiver({ port: 0 });
  officer = makeUser("safety_officer");
  ({ secret } = await createWebhookEndpoint(makeUser("admin"), { url: `${receiver.url}/hooks`, description: "Facilities alarm panel", events: [...WEBHOOK_EVENT_TYPES], allowPrivate: true }));
  const db = getDb();
  db.transaction((tx) => seedSubstanceLibrary(tx));
  const etherId = db.select().from(substances).where(eq(substances.cas, "60-29-7")).get()!.id;
  const site = db.insert(sites).values({ name: "Payload campus" }).returning().get();
  roomId = db.insert(rooms).values({ siteId: site.id, code: "P-1", name: "Payload lab", designMaxTempC: 27 }).returning().get().id;
  const fridgeId = db
    .insert(storageUnits)
    .values({ roomId, code: "FR-P", name: "Kitchen-type fridge", kind: "domestic_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30 })
    .returning()
    .get().id;
  db.insert(sensors).values({ externalId: "P-FR", name: "Fridge logger", storageUnitId: fridgeId }).run();
  db.insert(containers).values({ label: "PL-ETHER", amount: 1000, amountUnit: "mL", storageUnitId: fridgeId, substanceId: etherId }).run();
});

afterAll(async () => {
  await receiver.close();
});

describe("delivered webhook bodies match the documented schemas", () => {
  it("finding.raised", async () => {
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "a bottle was added" }));
    const bodies = await deliverAndCheck();
    expect(bodies.every((b) => b.type === "finding.raised" && b.data.finding.reopened === false)).toBe(true);
  });

  it("finding.escalated", async () => {
    // A finding being worked on, last assessed lower than it is: re-assessment escalates it.
    const target = getDb().select().from(findings).where(eq(findings.roomId, roomId)).all().find((f) => f.severity !== "low")!;
    expect(target).toBeDefined();
    getDb().update(findings).set({ severity: "low", status: "acknowledged" }).where(eq(findings.id, target.id)).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "checked again", force: true }));
    const bodies = await deliverAndCheck();
    const escalated = bodies.find((b) => b.type === "finding.escalated" && b.data.finding.id === target.id)!;
    expect(escalated.data.finding).toMatchObject({ previousSeverity: "low", severity: target.severity, status: "acknowledged" });
  });

  it("finding.resolved, by a person and by re-assessment; finding.raised when re-opened", async () => {
    const open = getDb().select().from(findings).where(and(eq(findings.roomId, roomId), eq(findings.status, "open"))).all();
    expect(open.length).toBeGreaterThan(0);
    getDb().update(containers).set({ state: "disposed" }).where(eq(containers.label, "PL-ETHER")).run();
    applyFindingStep({ id: officer.id, email: officer.email, name: officer.name, role: officer.role }, open[0].id, { kind: "resolve", note: "Bottle taken to the solvent store." });
    const byPerson = await deliverAndCheck();
    expect(byPerson.some((b) => b.type === "finding.resolved" && b.data.finding.resolvedBy === "person")).toBe(true);

    // The bottle is back (its findings re-open), then disposed of again (re-assessment resolves them).
    getDb().update(containers).set({ state: "sealed" }).where(eq(containers.label, "PL-ETHER")).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "the bottle is back", force: true }));
    const reopened = await deliverAndCheck();
    expect(reopened.some((b) => b.type === "finding.raised" && b.data.finding.reopened === true)).toBe(true);
    getDb().update(containers).set({ state: "disposed" }).where(eq(containers.label, "PL-ETHER")).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "the bottle was disposed of", force: true }));
    const resolved = await deliverAndCheck();
    expect(resolved.some((b) => b.type === "finding.resolved" && b.data.finding.resolvedBy === "re-assessment")).toBe(true);
  });

  it("excursion.started and excursion.ended", async () => {
    ingestReadings(series("P-FR", 0, [5, 9, 10.5, 12, 13.4, 14.2, 14.8, 15.1]));
    const started = await deliverAndCheck();
    expect(started.find((b) => b.type === "excursion.started")!.data.excursion.endAt).toBeNull();
    ingestReadings(series("P-FR", 40, [7, 5, 4]));
    const ended = await deliverAndCheck();
    expect(ended.find((b) => b.type === "excursion.ended")!.data.excursion.endAt).toBe(at(40));
  });

  it("covered every event but the crossing warning (webhooks-crossing.test.ts)", () => {
    expect(new Set(seen)).toEqual(new Set(WEBHOOK_EVENT_TYPES.filter((t) => t !== "excursion.crossing_warning")));
  });
});
