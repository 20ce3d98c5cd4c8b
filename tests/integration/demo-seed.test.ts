/**
 * The demo seed's temperatures: a year of readings per demo logger, the excursions they hold (the
 * July heat wave in B-014, the weekend failure of FSR-1, none from door openings), the demo ingest
 * key, and the README's `curl` examples run against the ingest route handler as written.
 * Check values come from the invented demo scenario (db/seed/demo-traces.ts) and README.md.
 */
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { and, asc, count, eq, gt, inArray, like, max } from "drizzle-orm";
import { getDb } from "@/db/client";
import { DEMO_INGEST_KEY, DEMO_INGEST_KEY_NAME } from "@/db/seed/demo-readings";
import { seedDemo } from "@/db/seed/demo";
import { apiKeys, auditEvents, emailMessages, excursions, readings, sensors, users } from "@/db/schema";
import * as readingsRoute from "@/app/api/v1/readings/route";

const SEEDED_AT = Date.parse("2026-12-02T09:07:00Z"); // readings end at the quarter hour before: 09:00
const HOUR_MS = 3_600_000;

const sensorId = (externalId: string) => getDb().select({ id: sensors.id }).from(sensors).where(eq(sensors.externalId, externalId)).get()!.id;
const excursionsOf = (externalId: string) => getDb().select().from(excursions).where(eq(excursions.sensorId, sensorId(externalId))).orderBy(asc(excursions.startAt)).all();

beforeAll(async () => {
  const startedAt = performance.now();
  expect(await seedDemo(getDb(), { bcryptCost: 4, nowMs: SEEDED_AT })).toBe(true);
  // Reported, not asserted: speed is measured by the bench scripts, not by tests.
  console.log(`demo seed: ${((performance.now() - startedAt) / 1000).toFixed(1)} s`);
}, 60_000);

describe("demo sensors and readings", () => {
  it("registers eleven loggers, each with a year of readings every 15 minutes up to the seed time", () => {
    const rows = getDb()
      .select({ externalId: sensors.externalId, n: count(), maxC: max(readings.tempC) })
      .from(sensors)
      .innerJoin(readings, eq(readings.sensorId, sensors.id))
      .groupBy(sensors.id)
      .orderBy(asc(sensors.externalId))
      .all();
    expect(rows.map((r) => r.externalId)).toEqual(["S-201", "S-202", "S-203", "S-204", "S-205", "S-206", "S-207", "S-208", "S-209", "S-210", "S-211"]);
    for (const row of rows) expect(row.n).toBe(365 * 96); // 35,040: a year at 96 readings a day
    const span = getDb().select({ first: readings.at }).from(readings).where(eq(readings.sensorId, sensorId("S-201"))).orderBy(asc(readings.at)).limit(1).get()!;
    expect(span.first.toISOString()).toBe("2025-12-02T09:15:00.000Z");
    const last = getDb().select({ at: max(readings.at) }).from(readings).get()!;
    expect(new Date(Number(last.at)).toISOString()).toBe("2026-12-02T09:00:00.000Z");
    // Every refrigerator, freezer and the cold room has its own logger.
    const placed = getDb().select({ externalId: sensors.externalId, name: sensors.name, roomId: sensors.roomId, unitId: sensors.storageUnitId }).from(sensors).all();
    expect(placed.filter((s) => s.unitId != null).map((s) => s.name)).toEqual(["2.107 FR-1 interior", "2.115 FSR-1 interior", "2.115 FZ-1 interior", "2.115 FZ-2 interior", "R-1.02 XR-1 interior"]);
    expect(placed.find((s) => s.externalId === "S-208")).toMatchObject({ name: "B-020 cold room", unitId: null });
  });
});

describe("demo excursions", () => {
  it("finds the July heat wave in B-014: one unacknowledged excursion per hot afternoon, the hottest about 32 °C", () => {
    const found = excursionsOf("S-201");
    expect(found.length).toBeGreaterThanOrEqual(3);
    expect(found.length).toBeLessThanOrEqual(9);
    for (const e of found) {
      expect(e.thresholdC).toBe(30); // B-014's store policy in the demo
      expect(e.startAt.getTime()).toBeGreaterThanOrEqual(Date.parse("2026-07-10T00:00:00Z"));
      expect(e.endAt!.getTime()).toBeLessThanOrEqual(Date.parse("2026-07-19T00:00:00Z"));
      expect(e.endAt!.getTime() - e.startAt.getTime()).toBeGreaterThanOrEqual(60 * 60_000);
      const peakHour = e.peakAt.getUTCHours();
      expect(peakHour).toBeGreaterThanOrEqual(12);
      expect(peakHour).toBeLessThanOrEqual(19);
      expect(e.acknowledgedAt).toBeNull();
    }
    const hottest = Math.max(...found.map((e) => e.peakTempC));
    expect(hottest).toBeGreaterThanOrEqual(31);
    expect(hottest).toBeLessThanOrEqual(33);
  });

  it("finds FSR-1's weekend failure as one excursion of about 60 hours peaking at 20–22 °C, acknowledged by facilities after the repair", () => {
    const [failure, ...others] = excursionsOf("S-205");
    expect(others).toEqual([]);
    // The last full weekend of September 2026: compressor off Friday 25th 19:00, repaired Monday 28th 08:30 (UTC).
    expect(failure.startAt.getTime()).toBeGreaterThan(Date.parse("2026-09-25T19:00:00Z"));
    expect(failure.startAt.getTime()).toBeLessThan(Date.parse("2026-09-25T21:00:00Z"));
    expect(failure.endAt!.getTime()).toBeGreaterThan(Date.parse("2026-09-28T08:30:00Z"));
    expect(failure.endAt!.getTime()).toBeLessThan(Date.parse("2026-09-28T11:00:00Z"));
    const hours = (failure.endAt!.getTime() - failure.startAt.getTime()) / HOUR_MS;
    expect(hours).toBeGreaterThan(58);
    expect(hours).toBeLessThan(65);
    expect(failure.peakTempC).toBeGreaterThanOrEqual(20);
    expect(failure.peakTempC).toBeLessThanOrEqual(22);
    const facilities = getDb().select().from(users).where(eq(users.role, "facilities")).get()!;
    expect(failure.acknowledgedById).toBe(facilities.id);
    expect(failure.acknowledgedAt!.getTime()).toBeGreaterThan(failure.endAt!.getTime());
    expect(failure.acknowledgeComment).toMatch(/relay failed.*every container sealed/s);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "excursion"), eq(auditEvents.entityId, String(failure.id)))).get()!;
    expect(audit).toMatchObject({ action: "acknowledge", actorId: facilities.id, at: failure.acknowledgedAt });
  });

  it("raises none for door openings: FR-1 goes above 8 °C for single readings, never for its 30 minutes", async () => {
    const spikes = await getDb().$count(readings, and(eq(readings.sensorId, sensorId("S-203")), gt(readings.tempC, 8)));
    expect(spikes).toBeGreaterThan(20);
    expect(excursionsOf("S-203")).toEqual([]);
    for (const quiet of ["S-206", "S-207", "S-208", "S-210"]) expect(excursionsOf(quiet)).toEqual([]);
    // Only B-014's afternoons and FSR-1's weekend; all closed, none e-mailed (they are history).
    const all = getDb().select({ sensor: sensors.externalId, endAt: excursions.endAt }).from(excursions).innerJoin(sensors, eq(sensors.id, excursions.sensorId)).all();
    expect(new Set(all.map((e) => e.sensor))).toEqual(new Set(["S-201", "S-205"]));
    expect(all.every((e) => e.endAt != null)).toBe(true);
    expect(getDb().select({ n: count() }).from(emailMessages).where(like(emailMessages.kind, "excursion%")).get()!.n).toBe(0);
  });
});

describe("the demo ingest key and the README example", () => {
  const readme = fs.readFileSync(path.join(process.cwd(), "README.md"), "utf8");
  const section = readme.slice(readme.indexOf("## Sending readings from a logger"), readme.indexOf("### The demo's temperatures"));
  const bodies = [...section.matchAll(/-d '([^']+)'/g)].map((m) => JSON.parse(m[1]));
  const answers = [...section.matchAll(/```json\n(.+)\n```/g)].map((m) => JSON.parse(m[1]));
  const keys = [...section.matchAll(/Authorization: Bearer (\S+)'/g)].map((m) => m[1]);

  async function post(body: unknown, key: string) {
    const response = await readingsRoute.POST(
      new Request("http://localhost:3000/api/v1/readings", { method: "POST", headers: { authorization: `Bearer ${key}`, "content-type": "application/json" }, body: JSON.stringify(body) }),
    );
    return { status: response.status, body: await response.json() };
  }

  it("stores the demo key hashed, for readings only", () => {
    const key = getDb().select().from(apiKeys).where(eq(apiKeys.name, DEMO_INGEST_KEY_NAME)).get()!;
    expect(key).toMatchObject({ prefix: "hrk_demo_cor", scopes: ["readings:write"], revokedAt: null });
    expect(key.keyHash).toMatch(/^[0-9a-f]{64}$/);
    expect(JSON.stringify(getDb().select().from(apiKeys).all())).not.toContain(DEMO_INGEST_KEY);
    expect(readme).toContain(DEMO_INGEST_KEY);
  });

  it("accepts the README's batch with the demo key (202), then counts it as duplicates, exactly as the README shows", async () => {
    expect(bodies).toHaveLength(3);
    expect(answers).toHaveLength(4);
    expect(keys).toEqual([DEMO_INGEST_KEY, DEMO_INGEST_KEY, DEMO_INGEST_KEY]);
    const before = await getDb().$count(readings, inArray(readings.sensorId, [sensorId("S-201"), sensorId("S-205")]));
    expect(await post(bodies[0], keys[0])).toEqual({ status: 202, body: answers[0] });
    expect(answers[0]).toEqual({ accepted: 2, duplicates: 0, conflicts: 0, conflictRows: [] });
    expect(await post(bodies[0], keys[0])).toEqual({ status: 202, body: answers[1] });
    expect(answers[1]).toEqual({ accepted: 0, duplicates: 2, conflicts: 0, conflictRows: [] });
    expect(await getDb().$count(readings, inArray(readings.sensorId, [sensorId("S-201"), sensorId("S-205")]))).toBe(before + 2);
  });

  it("reports the README's conflicting reading with the stored value, keeps the stored one and stores the rest", async () => {
    const before = await getDb().$count(readings);
    expect(await post(bodies[1], keys[1])).toEqual({ status: 202, body: answers[2] });
    expect(answers[2].conflictRows).toEqual([{ index: 0, sensor: "S-201", at: "2026-12-02T10:05:00+01:00", tempC: 19.9, storedTempC: 19.4 }]);
    const stored = getDb().select().from(readings).where(and(eq(readings.sensorId, sensorId("S-201")), eq(readings.at, new Date("2026-12-02T09:05:00Z")))).get()!;
    expect(stored.tempC).toBe(19.4);
    expect(await getDb().$count(readings)).toBe(before + 1);
  });

  it("rejects the README's bad batch whole (400) with the error body the README shows", async () => {
    const before = await getDb().$count(readings);
    expect(await post(bodies[2], keys[2])).toEqual({ status: 400, body: answers[3] });
    expect(answers[3].error.rows.map((r: { index: number; field: string }) => `${r.index}:${r.field}`)).toEqual(["0:sensor", "1:at", "2:at", "3:tempC", "4:tempC"]);
    expect(await getDb().$count(readings)).toBe(before);
  });
});
