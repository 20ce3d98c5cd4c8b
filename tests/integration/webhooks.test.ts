/**
 * Signed webhooks end to end: an endpoint registered against the local receiver, real events
 * (a re-assessment that raises a finding, an excursion through the logger ingest) queued in their
 * own transactions, the delivery job, the Standard Webhooks signatures checked with the package's
 * verifier, retries under the same webhook-id, claims, the address checked again on the socket,
 * and the admin's server actions behind the permission. Invented data.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { Webhook } from "standardwebhooks";
import { getDb } from "@/db/client";
import { containers, findings, rooms, sensors, sites, storageUnits, substances, webhookAttempts, webhookDeliveries, webhookEndpoints, type User } from "@/db/schema";
import { seedSubstanceLibrary } from "@/db/seed/substances";
import { reassessRooms } from "@/lib/assessment/service";
import { ConflictError } from "@/lib/errors";
import { ingestReadings } from "@/lib/temperatures/ingest";
import { deliverDueWebhooks, MAX_ATTEMPTS } from "@/lib/webhooks/deliver";
import { WEBHOOK_EVENT_TYPES } from "@/lib/webhooks/events";
import { decryptWebhookSecret } from "@/lib/webhooks/secret";
import { createWebhookEndpoint, retryWebhookDelivery, setWebhookEndpointActive, storeWebhookEndpoint } from "@/lib/webhooks/service";
import { startWebhookReceiver, type WebhookReceiver } from "@/lib/webhooks/receiver-fake";
import { makeUser, sessionCookieFor } from "./helpers/world";

// Server actions read the session cookie through next/headers: the test hands them one.
const cookieJar = vi.hoisted(() => ({ value: "" }));
vi.mock("next/headers", () => ({
  cookies: async () => ({
    get: (name: string) => {
      const pair = cookieJar.value.split("; ").find((p) => p.startsWith(`${name}=`));
      return pair ? { name, value: pair.slice(name.length + 1) } : undefined;
    },
    set: () => undefined,
    delete: () => undefined,
  }),
  headers: async () => new Headers(),
}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

const MIN = 60_000;
const T0 = Date.parse("2026-03-06T17:00:00Z");
const at = (minutes: number) => new Date(T0 + minutes * MIN).toISOString();
const series = (sensor: string, fromMin: number, temps: number[]) => temps.map((tempC, i) => ({ sensor, at: at(fromMin + 5 * i), tempC }));

let receiver: WebhookReceiver;
let admin: User, researcher: User;
let endpointId: number, secret: string;
let roomId: number, fridgeId: number, etherId: number;

const deliveries = () => getDb().select().from(webhookDeliveries).where(eq(webhookDeliveries.endpointId, endpointId)).orderBy(webhookDeliveries.id).all();
const attemptsOf = (id: number) => getDb().select().from(webhookAttempts).where(eq(webhookAttempts.deliveryId, id)).orderBy(webhookAttempts.id).all();
const later = (ms: number) => ({ nowMs: Date.now() + ms });
/** Runs the job until nothing due is left (it sends at most 20 per run). */
async function drain() {
  const total = { delivered: 0, retrying: 0, failed: 0 };
  for (;;) {
    const run = await deliverDueWebhooks();
    total.delivered += run.delivered;
    total.retrying += run.retrying;
    total.failed += run.failed;
    if (run.delivered + run.retrying + run.failed === 0) return total;
  }
}

function verified(index = 0) {
  const got = receiver.received[index];
  const payload = new Webhook(secret).verify(got.body, { "webhook-id": got.webhookId!, "webhook-timestamp": got.webhookTimestamp!, "webhook-signature": got.webhookSignature! }) as {
    type: string;
    timestamp: string;
    data: Record<string, Record<string, unknown>>;
  };
  return { got, payload };
}

beforeAll(async () => {
  receiver = await startWebhookReceiver({ port: 0 });
  admin = makeUser("admin");
  researcher = makeUser("researcher");
  const db = getDb();
  db.transaction((tx) => seedSubstanceLibrary(tx));
  etherId = db.select().from(substances).where(eq(substances.cas, "60-29-7")).get()!.id;
  const site = db.insert(sites).values({ name: "Hook campus" }).returning().get();
  roomId = db.insert(rooms).values({ siteId: site.id, code: "H-1", name: "Hook lab", designMaxTempC: 27 }).returning().get().id;
  fridgeId = db
    .insert(storageUnits)
    .values({ roomId, code: "FR-H", name: "Kitchen-type fridge", kind: "domestic_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30 })
    .returning()
    .get().id;
  db.insert(sensors).values({ externalId: "H-FR", name: "Fridge logger", storageUnitId: fridgeId }).run();
});

afterAll(async () => {
  await receiver.close();
});

beforeEach(() => {
  receiver.received.length = 0;
  receiver.failNext(0);
});

describe("registering an endpoint", () => {
  it("returns the secret once and stores it only encrypted", async () => {
    const created = await createWebhookEndpoint(admin, { url: `${receiver.url}/hooks`, description: "Building alarm panel", events: [...WEBHOOK_EVENT_TYPES], allowPrivate: true });
    secret = created.secret;
    endpointId = created.endpoint.id;
    receiver.setSecret(secret);
    expect(secret).toMatch(/^whsec_[A-Za-z0-9+/]{43}=$/);
    const row = getDb().select().from(webhookEndpoints).where(eq(webhookEndpoints.id, endpointId)).get()!;
    expect(row.url).toBe(`${receiver.url}/hooks`);
    expect(row.secretEncrypted.startsWith("v1:")).toBe(true);
    expect(row.secretEncrypted).not.toContain(secret.slice(6));
    expect(JSON.stringify(row)).not.toContain(secret.slice(6, 20));
    expect(decryptWebhookSecret(row.secretEncrypted)).toBe(secret);
  });

  it("refuses a private address unless the admin allows it, and changes nothing", async () => {
    const before = getDb().select().from(webhookEndpoints).all().length;
    await expect(createWebhookEndpoint(admin, { url: `${receiver.url}/hooks`, description: "No choice made", events: ["finding.raised"], allowPrivate: false })).rejects.toThrow(
      "127.0.0.1 is a loopback address; allow private addresses for this endpoint if it is inside your network.",
    );
    await expect(createWebhookEndpoint(admin, { url: "http://169.254.169.254/latest/meta-data", description: "Metadata", events: ["finding.raised"], allowPrivate: true })).rejects.toThrow(
      "Use an https:// address. Plain http:// is accepted only for a receiver on this machine (localhost, 127.0.0.1).",
    );
    await expect(createWebhookEndpoint(admin, { url: "https://169.254.169.254/latest", description: "Metadata", events: ["finding.raised"], allowPrivate: true })).rejects.toThrow(
      "169.254.169.254 is a cloud metadata address, which webhooks may never reach.",
    );
    expect(getDb().select().from(webhookEndpoints).all()).toHaveLength(before);
  });
});

describe("events queued in their own transaction and delivered signed", () => {
  it("a re-assessment that raises a finding sends finding.raised, signed and verifiable", async () => {
    getDb().insert(containers).values({ label: "HK-ETHER", amount: 1000, amountUnit: "mL", storageUnitId: fridgeId, substanceId: etherId }).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "a bottle was added" }));
    const raised = getDb().select().from(findings).where(eq(findings.roomId, roomId)).all();
    expect(raised.length).toBeGreaterThan(0);
    const queued = deliveries();
    expect(queued).toHaveLength(raised.length);
    expect(queued.every((d) => d.eventType === "finding.raised" && d.status === "pending" && d.attempts === 0)).toBe(true);

    const run = await deliverDueWebhooks();
    expect(run).toEqual({ delivered: raised.length, retrying: 0, failed: 0 });
    expect(receiver.received).toHaveLength(raised.length);
    for (let i = 0; i < raised.length; i += 1) {
      const { got, payload } = verified(i);
      expect(got.signatureValid).toBe(true);
      expect(got.path).toBe("/hooks");
      const delivery = queued.find((d) => d.messageId === got.webhookId)!;
      expect(delivery).toBeDefined();
      expect(got.body).toBe(delivery.payload);
      expect(payload.type).toBe("finding.raised");
      const finding = raised.find((f) => f.id === payload.data.finding.id)!;
      expect(payload.data.finding).toMatchObject({ id: finding.id, rule: finding.rule, severity: finding.severity, title: finding.title, reopened: false, url: `http://localhost:3999/register/${finding.id}` });
      expect(payload.data.location).toMatchObject({ roomId, storageUnitId: finding.storageUnitId });
    }
    const after = deliveries();
    expect(after.every((d) => d.status === "delivered" && d.attempts === 1 && d.lastStatusCode === 200 && d.deliveredAt !== null)).toBe(true);
    expect(attemptsOf(after[0].id)).toMatchObject([{ statusCode: 200, error: null, responseBody: '{"ok":true}' }]);

    // Run again: nothing is due, nothing is sent.
    expect(await deliverDueWebhooks(getDb(), later(48 * 3600_000))).toEqual({ delivered: 0, retrying: 0, failed: 0 });
    expect(receiver.received).toHaveLength(raised.length);
  });

  it("an excursion started through the logger ingest sends excursion.started", async () => {
    const before = deliveries().length;
    const result = ingestReadings(series("H-FR", 0, [5, 9, 10.5, 12, 13.4, 14.2, 14.8, 15.1]));
    expect(result.excursions.opened).toBe(1);
    const fresh = deliveries().slice(before);
    const started = fresh.filter((d) => d.eventType === "excursion.started");
    expect(started).toHaveLength(1);
    await deliverDueWebhooks();
    const got = receiver.received.find((r) => r.webhookId === started[0].messageId)!;
    const payload = new Webhook(secret).verify(got.body, { "webhook-id": got.webhookId!, "webhook-timestamp": got.webhookTimestamp!, "webhook-signature": got.webhookSignature! }) as {
      type: string;
      timestamp: string;
      data: { excursion: Record<string, unknown>; location: Record<string, unknown> };
    };
    expect(payload.type).toBe("excursion.started");
    expect(payload.timestamp).toBe(at(5));
    expect(payload.data.excursion).toMatchObject({ sensor: "H-FR", thresholdC: 8, startAt: at(5), endAt: null, peakTempC: 15.1 });
    expect(payload.data.excursion.url).toMatch(/^http:\/\/localhost:3999\/temperatures\/excursions\/\d+$/);
    expect(payload.data.location).toMatchObject({ storageUnitId: fridgeId, roomId, label: "FR-H Kitchen-type fridge, room H-1 Hook lab, Hook campus" });
  });

  it("a failing receiver: the attempt is recorded, retried later under the same webhook-id, then never again", async () => {
    receiver.failNext(1, 500);
    const before = deliveries().length;
    ingestReadings(series("H-FR", 40, [7, 5, 4]));
    const ended = deliveries().slice(before).filter((d) => d.eventType === "excursion.ended");
    expect(ended).toHaveLength(1);

    const first = await deliverDueWebhooks();
    expect(first).toEqual({ delivered: 0, retrying: 1, failed: 0 });
    let row = deliveries().find((d) => d.id === ended[0].id)!;
    expect(row).toMatchObject({ status: "pending", attempts: 1, lastStatusCode: 500, lastError: "The receiver answered HTTP 500." });
    const wait = row.nextAttemptAt.getTime() - Date.now();
    expect(wait).toBeGreaterThan(20_000); // 30 s ± 20 %
    expect(wait).toBeLessThanOrEqual(36_000);
    expect(attemptsOf(row.id)).toMatchObject([{ statusCode: 500, error: "The receiver answered HTTP 500." }]);

    // Not due yet: nothing sent.
    expect(await deliverDueWebhooks()).toEqual({ delivered: 0, retrying: 0, failed: 0 });
    expect(receiver.received).toHaveLength(1);

    expect(await deliverDueWebhooks(getDb(), later(40_000))).toEqual({ delivered: 1, retrying: 0, failed: 0 });
    expect(receiver.received).toHaveLength(2);
    expect(receiver.received[0].webhookId).toBe(ended[0].messageId);
    expect(receiver.received[1].webhookId).toBe(ended[0].messageId);
    expect(receiver.received[0].webhookSignature).not.toBe(""); // signed anew, same id
    expect(receiver.received.map((r) => r.answeredStatus)).toEqual([200, 500]);
    row = deliveries().find((d) => d.id === ended[0].id)!;
    expect(row).toMatchObject({ status: "delivered", attempts: 2, lastStatusCode: 200, lastError: null });
    expect(attemptsOf(row.id).map((a) => a.statusCode)).toEqual([500, 200]);

    // After a 2xx it is never sent again, and "Retry now" is refused.
    expect(await deliverDueWebhooks(getDb(), later(7 * 24 * 3600_000))).toEqual({ delivered: 0, retrying: 0, failed: 0 });
    expect(receiver.received).toHaveLength(2);
    expect(() => retryWebhookDelivery(admin, row.id)).toThrow(ConflictError);
  });

  it("gives up after its attempts as failed, keeps the row, and an admin can retry it now", async () => {
    receiver.failNext(MAX_ATTEMPTS, 503);
    ingestReadings(series("H-FR", 120, [9, 10.5, 12, 13.4, 14.2, 14.8, 15.1]));
    const started = deliveries().filter((d) => d.eventType === "excursion.started" && d.status === "pending");
    expect(started).toHaveLength(1);
    let offset = 0;
    for (let i = 1; i <= MAX_ATTEMPTS; i += 1) {
      const run = await deliverDueWebhooks(getDb(), later(offset));
      expect(run).toEqual(i < MAX_ATTEMPTS ? { delivered: 0, retrying: 1, failed: 0 } : { delivered: 0, retrying: 0, failed: 1 });
      offset += 30 * 3600_000; // past the longest wait (24 h + 20 %)
    }
    const failed = deliveries().find((d) => d.id === started[0].id)!;
    expect(failed).toMatchObject({ status: "failed", attempts: MAX_ATTEMPTS, lastStatusCode: 503 });
    expect(attemptsOf(failed.id)).toHaveLength(MAX_ATTEMPTS);
    expect(new Set(receiver.received.map((r) => r.webhookId))).toEqual(new Set([started[0].messageId]));
    expect(await deliverDueWebhooks(getDb(), later(offset))).toEqual({ delivered: 0, retrying: 0, failed: 0 });

    retryWebhookDelivery(admin, failed.id);
    expect(await deliverDueWebhooks()).toEqual({ delivered: 1, retrying: 0, failed: 0 });
    expect(deliveries().find((d) => d.id === failed.id)).toMatchObject({ status: "delivered", attempts: MAX_ATTEMPTS + 1 });
  });

  it("a rolled-back transaction leaves no delivery", () => {
    const before = deliveries().length;
    // The bottle is disposed of: re-assessment would resolve its findings.
    getDb().update(containers).set({ state: "disposed" }).where(eq(containers.label, "HK-ETHER")).run();
    expect(() =>
      getDb().transaction((tx) => {
        const result = reassessRooms(tx, [roomId], { reason: "a test that rolls back" });
        expect(result.raised + result.resolved + result.updated).toBeGreaterThan(0);
        expect(tx.select().from(webhookDeliveries).all().length).toBeGreaterThan(before);
        throw new Error("roll back");
      }),
    ).toThrow("roll back");
    expect(deliveries()).toHaveLength(before);
  });
});

describe("claims, leases and the address on the socket", () => {
  it("two runs at once send each delivery once; a lapsed claim is due again", async () => {
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "the bottle was disposed of" }));
    const pending = deliveries().filter((d) => d.status === "pending");
    expect(pending.length).toBeGreaterThan(0);
    expect(pending.every((d) => d.eventType === "finding.resolved")).toBe(true);
    const [a, b] = await Promise.all([deliverDueWebhooks(), deliverDueWebhooks()]);
    expect(a.delivered + b.delivered).toBe(pending.length);
    expect(receiver.received).toHaveLength(pending.length);
    expect(new Set(receiver.received.map((r) => r.webhookId)).size).toBe(pending.length);

    // A process that died mid-send: status "sending" with its lease passed.
    const stuck = pending[0].id;
    getDb().update(webhookDeliveries).set({ status: "sending", claimToken: "dead", leaseUntil: new Date(Date.now() - 1) }).where(eq(webhookDeliveries.id, stuck)).run();
    expect(await deliverDueWebhooks()).toEqual({ delivered: 1, retrying: 0, failed: 0 });
    // A claim still within its lease is left alone.
    getDb().update(webhookDeliveries).set({ status: "sending", claimToken: "live", leaseUntil: new Date(Date.now() + 60_000) }).where(eq(webhookDeliveries.id, stuck)).run();
    expect(await deliverDueWebhooks()).toEqual({ delivered: 0, retrying: 0, failed: 0 });
  });

  it("refuses a private address at delivery time when the endpoint does not allow it", async () => {
    const sneaky = getDb().transaction((tx) =>
      storeWebhookEndpoint(tx, { system: "test" }, { url: `${receiver.url}/sneaky`, description: "Saved before its host moved", events: ["finding.resolved"], allowPrivate: false, secret, createdById: null }),
    );
    // The bottle is back in use, then disposed of again: its findings re-open, then resolve.
    getDb().update(containers).set({ state: "sealed" }).where(eq(containers.label, "HK-ETHER")).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "bottle back" }));
    getDb().update(containers).set({ state: "disposed" }).where(eq(containers.label, "HK-ETHER")).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "bottle disposed of" }));
    const queued = getDb().select().from(webhookDeliveries).where(eq(webhookDeliveries.endpointId, sneaky.id)).all();
    expect(queued.length).toBeGreaterThan(0);
    receiver.received.length = 0;
    await deliverDueWebhooks();
    expect(receiver.received.filter((r) => r.path === "/sneaky")).toHaveLength(0);
    const [attempt] = attemptsOf(queued[0].id);
    expect(attempt).toMatchObject({ statusCode: null, error: "Refused: the address (127.0.0.1) is not public; allow private addresses for this endpoint if it is inside your network." });
    setWebhookEndpointActive({ system: "test" }, sneaky.id, false);
  });

  it("queues nothing for a paused endpoint", () => {
    setWebhookEndpointActive({ system: "test" }, endpointId, false);
    const before = deliveries().length;
    ingestReadings(series("H-FR", 600, [9, 10.5, 12, 13.4, 14.2, 14.8, 15.1]));
    expect(deliveries()).toHaveLength(before);
    setWebhookEndpointActive({ system: "test" }, endpointId, true);
  });
});

describe("the admin's server actions", () => {
  const form = (values: Record<string, string | string[]>) => {
    const data = new FormData();
    for (const [key, value] of Object.entries(values)) for (const v of [value].flat()) data.append(key, v);
    return data;
  };

  it("refuse a non-admin and change nothing", async () => {
    const { createWebhookEndpointAction, rotateWebhookSecretAction } = await import("@/app/(app)/admin/webhooks/actions");
    const before = getDb().select().from(webhookEndpoints).all();
    cookieJar.value = await sessionCookieFor(researcher);
    const refused = await createWebhookEndpointAction(undefined, form({ url: `${receiver.url}/x`, description: "Mine", events: ["finding.raised"], allowPrivate: "on" }));
    expect(refused.status).toBe("error");
    expect(refused.error?.[""]).toEqual(["Your role does not allow this."]);
    const rotate = await rotateWebhookSecretAction(undefined, form({ id: String(endpointId) }));
    expect(rotate.error?.[""]).toEqual(["Your role does not allow this."]);
    expect(getDb().select().from(webhookEndpoints).all()).toEqual(before);
    cookieJar.value = "";
    const anonymous = await createWebhookEndpointAction(undefined, form({ url: `${receiver.url}/x`, description: "Mine", events: ["finding.raised"] }));
    expect(anonymous.error?.[""]).toEqual(["Sign in to continue."]);
  });

  it("let an admin register an endpoint (the secret comes back once) and rotate its secret", async () => {
    const { createWebhookEndpointAction, rotateWebhookSecretAction } = await import("@/app/(app)/admin/webhooks/actions");
    cookieJar.value = await sessionCookieFor(admin);
    const bad = await createWebhookEndpointAction(undefined, form({ url: "http://hooks.example.org/x", description: "Plain", events: ["finding.raised"] }));
    expect(bad.error?.url).toEqual(["Use an https:// address. Plain http:// is accepted only for a receiver on this machine (localhost, 127.0.0.1)."]);
    const created = await createWebhookEndpointAction(undefined, form({ url: `${receiver.url}/admin`, description: "From the form", events: ["finding.raised", "finding.resolved"], allowPrivate: "on" }));
    expect(created.status).toBe("success");
    expect(created.message).toMatch(/^whsec_/);
    const row = getDb().select().from(webhookEndpoints).where(eq(webhookEndpoints.description, "From the form")).get()!;
    expect(row).toMatchObject({ events: ["finding.raised", "finding.resolved"], allowPrivate: true, active: true });
    expect(decryptWebhookSecret(row.secretEncrypted)).toBe(created.message);
    const rotated = await rotateWebhookSecretAction(undefined, form({ id: String(row.id) }));
    expect(rotated.message).toMatch(/^whsec_/);
    expect(rotated.message).not.toBe(created.message);
    expect(decryptWebhookSecret(getDb().select().from(webhookEndpoints).where(eq(webhookEndpoints.id, row.id)).get()!.secretEncrypted)).toBe(rotated.message);
  });
});

describe("saving endpoints is rate-limited per administrator", () => {
  it("refuses the save over the limit with when to try again, and stores nothing", async () => {
    const { createWebhookEndpointAction } = await import("@/app/(app)/admin/webhooks/actions");
    const busy = makeUser("admin");
    cookieJar.value = await sessionCookieFor(busy);
    process.env.RATE_LIMIT_WEBHOOK_SAVE_USER = "1";
    try {
      const data = () => {
        const f = new FormData();
        for (const [k, v] of Object.entries({ url: `${receiver.url}/limited`, description: "Limited", events: "finding.raised", allowPrivate: "on" })) f.append(k, v);
        return f;
      };
      expect((await createWebhookEndpointAction(undefined, data())).status).toBe("success");
      const refused = await createWebhookEndpointAction(undefined, data());
      expect(refused.error?.[""]?.[0]).toMatch(/^Too many webhook endpoints saved\. Try again in \d+ minutes?\.$/);
      expect(getDb().select().from(webhookEndpoints).where(eq(webhookEndpoints.description, "Limited")).all()).toHaveLength(1);
    } finally {
      delete process.env.RATE_LIMIT_WEBHOOK_SAVE_USER;
      cookieJar.value = "";
    }
  });
});

describe("the demo's endpoint and the local receiver", () => {
  it("registers the receiver once, follows its port, and the receiver checks signatures with the demo secret", async () => {
    const { DEMO_WEBHOOK_SECRET, ensureDemoWebhookEndpoint } = await import("@/lib/webhooks/demo-endpoint");
    const demoReceiver = await startWebhookReceiver({ port: 0, secret: DEMO_WEBHOOK_SECRET });
    try {
      const first = ensureDemoWebhookEndpoint(getDb(), "http://127.0.0.1:1/headroom");
      const again = ensureDemoWebhookEndpoint(getDb(), `${demoReceiver.url}/headroom`);
      expect(again).toBe(first);
      const row = getDb().select().from(webhookEndpoints).where(eq(webhookEndpoints.id, first)).get()!;
      expect(row).toMatchObject({ url: `${demoReceiver.url}/headroom`, allowPrivate: true, active: true, events: [...WEBHOOK_EVENT_TYPES] });
      expect(decryptWebhookSecret(row.secretEncrypted)).toBe(DEMO_WEBHOOK_SECRET);

      getDb().update(containers).set({ state: "sealed" }).where(eq(containers.label, "HK-ETHER")).run();
      getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "the bottle is back" }));
      await drain();
      expect(demoReceiver.received.length).toBeGreaterThan(0);
      expect(demoReceiver.received.every((r) => r.signatureValid === true && r.answeredStatus === 200 && r.eventType === "finding.raised")).toBe(true);

      // A receiver holding another secret records the signature as invalid and answers 401: the delivery waits for a retry.
      demoReceiver.received.length = 0;
      demoReceiver.setSecret(`whsec_${Buffer.from("some-other-secret-entirely-000000").toString("base64")}`);
      getDb().update(containers).set({ state: "disposed" }).where(eq(containers.label, "HK-ETHER")).run();
      getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "disposed of again" }));
      const run = await drain();
      expect(run.retrying).toBeGreaterThan(0);
      const refused = demoReceiver.received.find((r) => r.eventType === "finding.resolved")!;
      expect(refused).toMatchObject({ signatureValid: false, verifyError: "No matching signature found", answeredStatus: 401 });
      const response = await fetch(`${demoReceiver.url}/deliveries`);
      expect(((await response.json()) as { data: unknown[] }).data).toHaveLength(demoReceiver.received.length);
    } finally {
      await demoReceiver.close();
    }
  });
});

describe("a finding a person resolves", () => {
  it("sends finding.resolved with resolvedBy person, in the step's transaction", async () => {
    const { applyFindingStep } = await import("@/lib/register/workflow");
    const officer = makeUser("safety_officer");
    getDb().update(containers).set({ state: "sealed" }).where(eq(containers.label, "HK-ETHER")).run();
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { reason: "the bottle is back once more" }));
    await drain();
    const open = getDb().select().from(findings).where(eq(findings.roomId, roomId)).all().filter((f) => f.status === "open");
    expect(open.length).toBeGreaterThan(0);
    // Gone from the fridge, not yet re-assessed: the person's resolve is confirmed by the check.
    getDb().update(containers).set({ state: "disposed" }).where(eq(containers.label, "HK-ETHER")).run();
    const before = getDb().select().from(webhookDeliveries).all().length;
    const result = applyFindingStep({ id: officer.id, email: officer.email, name: officer.name, role: officer.role }, open[0].id, { kind: "resolve", note: "Bottle taken to the solvent store." });
    expect(result.status).toBe("resolved");
    const fresh = getDb().select().from(webhookDeliveries).all().slice(before);
    const byPerson = fresh.filter((d) => d.eventType === "finding.resolved" && (JSON.parse(d.payload) as { data: { finding: { id: number; resolvedBy: string } } }).data.finding.id === open[0].id);
    expect(byPerson.length).toBeGreaterThan(0);
    expect((JSON.parse(byPerson[0].payload) as { data: { finding: Record<string, unknown> } }).data.finding).toMatchObject({ id: open[0].id, status: "resolved", resolvedBy: "person" });
  });
});
