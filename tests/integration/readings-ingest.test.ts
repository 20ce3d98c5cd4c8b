/** The logger ingest API: key checks, all-or-nothing batches, duplicates stored once. */
import { beforeAll, describe, expect, it } from "vitest";
import { eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { readings, sensors, storageUnits, users } from "@/db/schema";
import * as readingsRoute from "@/app/api/v1/readings/route";
import * as keysRoute from "@/app/api/v1/api-keys/route";
import * as keyRoute from "@/app/api/v1/api-keys/[id]/route";
import { createApiKey } from "@/lib/api-keys/service";
import { call, sessionCookieFor } from "./helpers/world";

let key: string;
let testSensorIds: number[];
let admin: { id: number; email: string; name: string; role: "admin" };

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  const adminRow = getDb().select().from(users).where(eq(users.role, "admin")).get()!;
  admin = { id: adminRow.id, email: adminRow.email, name: adminRow.name, role: "admin" };
  const fridge = getDb().select().from(storageUnits).where(eq(storageUnits.code, "FR-1")).get()!;
  testSensorIds = getDb().insert(sensors).values([
    { externalId: "LOG-FR1", name: "Teaching-lab refrigerator logger", storageUnitId: fridge.id },
    { externalId: "LOG-OFF", name: "Retired logger", storageUnitId: fridge.id, active: false },
  ]).returning({ id: sensors.id }).all().map((s) => s.id);
  key = createApiKey(admin, { name: "Logger gateway", scopes: ["readings:write"] }).key;
});

async function ingest(body: unknown, authorization?: string) {
  authorization ??= `Bearer ${key}`;
  const headers: Record<string, string> = { "content-type": "application/json" };
  if (authorization) headers.authorization = authorization;
  const response = await readingsRoute.POST(new Request("http://localhost/api/v1/readings", { method: "POST", headers, body: JSON.stringify(body) }));
  return { status: response.status, body: await response.json() };
}

// The demo's own sensors come with a year of readings; these tests count their loggers' only.
const storedCount = () => getDb().$count(readings, inArray(readings.sensorId, testSensorIds));

describe("POST /api/v1/sensors", () => {
  it("registers a logger on one unit, refuses a second with the same device id, and needs exactly one location", async () => {
    const { POST } = await import("@/app/api/v1/sensors/route");
    const facilities = getDb().select().from(users).where(eq(users.role, "facilities")).get()!;
    const cookie = await sessionCookieFor(facilities);
    const unit = getDb().select().from(storageUnits).where(eq(storageUnits.code, "FSR-1")).get()!;
    const created = await call(POST, { method: "POST", body: { externalId: "LOG-FSR1", name: "Synthesis fridge logger", storageUnitId: unit.id }, cookie });
    expect(created.status).toBe(201);
    expect(created.body.data).toMatchObject({ externalId: "LOG-FSR1", storageUnitId: unit.id, roomId: null });
    const again = await call(POST, { method: "POST", body: { externalId: "LOG-FSR1", name: "Copy", storageUnitId: unit.id }, cookie });
    expect(again.status).toBe(409);
    expect(again.body.error.fields.externalId[0]).toMatch(/already has this device id/);
    const nowhere = await call(POST, { method: "POST", body: { externalId: "LOG-X", name: "Nowhere" }, cookie });
    expect(nowhere.status).toBe(400);
    expect(nowhere.body.error.fields.storageUnitId[0]).toMatch(/one room or one storage unit/);
  });
});

describe("POST /api/v1/readings", () => {
  it("answers 401 for a missing, malformed or wrong key", async () => {
    const batch = { readings: [{ sensor: "LOG-FR1", at: "2026-07-14T15:40:00+02:00", tempC: 5.1 }] };
    for (const header of ["", "Basic abc", "Bearer hrk_not-a-real-key-0000000000"]) {
      const response = await ingest(batch, header);
      expect(response.status).toBe(401);
      expect(response.body.error.code).toBe("unauthenticated");
    }
    expect(await storedCount()).toBe(0);
  });

  it("stores a valid batch (202) and stores a reading sent twice once", async () => {
    const batch = {
      readings: [
        { sensor: "LOG-FR1", at: "2026-07-14T15:40:00+02:00", tempC: 5.1 },
        { sensor: "LOG-FR1", at: "2026-07-14T13:45:00Z", tempC: 5.3 },
        { sensor: "LOG-FR1", at: "2026-07-14T13:45:00.000Z", tempC: 5.3 },
      ],
    };
    expect(await ingest(batch)).toEqual({ status: 202, body: { accepted: 2, duplicates: 1, conflicts: 0, conflictRows: [] } });
    expect(await ingest(batch)).toEqual({ status: 202, body: { accepted: 0, duplicates: 3, conflicts: 0, conflictRows: [] } });
    expect(await storedCount()).toBe(2);
    const stored = getDb().select().from(readings).where(inArray(readings.sensorId, testSensorIds)).all().map((r) => r.at.toISOString()).sort();
    expect(stored).toEqual(["2026-07-14T13:40:00.000Z", "2026-07-14T13:45:00.000Z"]); // +02:00 converted to UTC
  });

  it("rejects a batch with any bad row whole, with every row's error", async () => {
    const before = await storedCount();
    const response = await ingest({
      readings: [
        { sensor: "LOG-FR1", at: "2026-07-15T10:00:00Z", tempC: 4.2 },
        { sensor: "LOG-FR1", at: "2026-07-15 10:05", tempC: 4.3 },
        { sensor: "LOG-XX", at: "2026-07-15T10:10:00Z", tempC: 4.4 },
        { sensor: "LOG-FR1", at: "2026-07-15T10:15:00Z", tempC: "warm" },
        { sensor: "LOG-OFF", at: "2026-07-15T10:20:00Z", tempC: 4.4 },
        { at: "2026-07-15T10:25:00Z", tempC: 900 },
      ],
    });
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("batch_rejected");
    expect(response.body.error.rows.map((r: { index: number; field: string }) => `${r.index}:${r.field}`)).toEqual([
      "1:at",
      "2:sensor",
      "3:tempC",
      "4:sensor",
      "5:sensor",
      "5:tempC",
    ]);
    expect(response.body.error.rows[1].message).toMatch(/No sensor has the device id “LOG-XX”/);
    expect(await storedCount()).toBe(before);
  });

  it("answers 400 for a body that is not a batch", async () => {
    expect((await ingest({ readings: [] })).status).toBe(400);
    expect((await ingest({ nope: true })).status).toBe(400);
  });

  it("answers 401 once the key is revoked", async () => {
    const cookie = await sessionCookieFor(getDb().select().from(users).where(eq(users.id, admin.id)).get()!);
    const created = await call(keysRoute.POST, { method: "POST", body: { name: "Temporary" }, cookie });
    expect(created.status).toBe(201);
    expect(created.body.key).toMatch(/^hrk_/);
    const temporary = created.body.key as string;
    const batch = { readings: [{ sensor: "LOG-FR1", at: "2026-07-16T10:00:00Z", tempC: 4 }] };
    expect((await ingest(batch, `Bearer ${temporary}`)).status).toBe(202);
    const revoked = await call(keyRoute.DELETE, { method: "DELETE", cookie, params: { id: String(created.body.data.id) } });
    expect(revoked.status).toBe(200);
    expect((await ingest(batch, `Bearer ${temporary}`)).status).toBe(401);
    const listed = await call(keysRoute.GET, { cookie });
    expect(JSON.stringify(listed.body)).not.toContain(temporary);
  });
});
