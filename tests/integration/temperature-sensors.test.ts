/**
 * Sensors in the app: the paged list, renaming / moving / switching off through PATCH, and the
 * readings series behind the chart (raw readings when few, clock-aligned buckets otherwise).
 * The rooms, units and readings are invented for these tests.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, excursions, readings, rooms, sensors, sites, storageUnits, type Role } from "@/db/schema";
import * as sensorsRoute from "@/app/api/v1/sensors/route";
import * as sensorRoute from "@/app/api/v1/sensors/[id]/route";
import * as seriesRoute from "@/app/api/v1/sensors/[id]/readings/route";
import { bucketWidthMs, MAX_SERIES_POINTS, readingSeries } from "@/lib/temperatures/series";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

const MIN = 60_000;
const HOUR = 60 * MIN;
const DAY = 24 * HOUR;
/** 2026-07-01T00:00:00Z, a whole hour, so 5-minute buckets start exactly on it. */
const T0 = Date.UTC(2026, 6, 1);

const cookie = {} as Record<Role, string>;
const ids = { room: 0, coldRoom: 0, fridge: 0, freezer: 0, retiredUnit: 0, dense: 0, sparse: 0, year: 0, empty: 0 };

function insertReadings(sensorId: number, rows: [number, number][]) {
  const statement = getDb().$client.prepare("insert into readings (sensor_id, at, temp_c) values (?, ?, ?)");
  getDb().$client.transaction(() => {
    for (const [atMs, tempC] of rows) statement.run(sensorId, atMs, tempC);
  })();
}

beforeAll(async () => {
  for (const role of ["facilities", "researcher", "auditor"] as Role[]) cookie[role] = await sessionCookieFor(makeUser(role));
  const db = getDb();
  const site = db.insert(sites).values({ name: "Corvane Test Site" }).returning().get();
  ids.room = db.insert(rooms).values({ siteId: site.id, code: "B-101", name: "Teaching lab", designMaxTempC: 26 }).returning().get().id;
  ids.coldRoom = db
    .insert(rooms)
    .values({ siteId: site.id, code: "C-001", name: "Walk-in cold room", kind: "cold_room", setMinC: 2, setMaxC: 8, excursionThresholdC: 10, excursionMinDurationMin: 30 })
    .returning()
    .get().id;
  const unit = (code: string, extra: Partial<typeof storageUnits.$inferInsert> = {}) =>
    db.insert(storageUnits).values({ roomId: ids.room, code, name: `Unit ${code}`, kind: "flammable_storage_refrigerator", ...extra }).returning().get().id;
  ids.fridge = unit("FR-9", { setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 15 });
  ids.freezer = unit("FZ-9", { kind: "freezer_minus_20", setMinC: -25, setMaxC: -15, excursionThresholdC: -10 });
  ids.retiredUnit = unit("OLD-9", { retiredAt: new Date(T0) });

  const sensor = (externalId: string, location: { roomId?: number; storageUnitId?: number }, active = true) =>
    db.insert(sensors).values({ externalId, name: `Logger ${externalId}`, active, ...location }).returning().get().id;
  ids.dense = sensor("S-DENSE", { storageUnitId: ids.fridge });
  ids.sparse = sensor("S-SPARSE", { roomId: ids.coldRoom });
  ids.year = sensor("S-YEAR", { storageUnitId: ids.freezer });
  ids.empty = sensor("S-EMPTY", { roomId: ids.room }, false);

  // 3,000 one-minute readings cycling 4, 5, 6, 7, 8 °C, with one spike of 14.2 °C at minute 1234.
  insertReadings(ids.dense, Array.from({ length: 3000 }, (_, i) => [T0 + i * MIN, i === 1234 ? 14.2 : 4 + (i % 5)]));
  // Six readings an hour apart in the cold room.
  insertReadings(ids.sparse, [3.1, 3.4, 9.8, 11.5, 10.2, 4.0].map((t, i) => [T0 + i * HOUR, t]));
  // A year of five-minute readings (105,120) on the freezer, −20 °C with a daily swing of ±2 °C.
  insertReadings(ids.year, Array.from({ length: 365 * 288 }, (_, i) => [T0 + i * 5 * MIN, -20 + 2 * Math.sin((2 * Math.PI * (i % 288)) / 288)]));

  db.insert(excursions)
    .values([
      // Ended before the dense sensor's one-day window below; overlaps the whole-data window.
      { sensorId: ids.dense, storageUnitId: ids.fridge, thresholdC: 8, startAt: new Date(T0 - 2 * HOUR), endAt: new Date(T0 - HOUR), peakTempC: 9.1, peakAt: new Date(T0 - 90 * MIN) },
      // Inside the first day.
      { sensorId: ids.dense, storageUnitId: ids.fridge, thresholdC: 8, startAt: new Date(T0 + 1234 * MIN), endAt: new Date(T0 + 1235 * MIN), peakTempC: 14.2, peakAt: new Date(T0 + 1234 * MIN) },
      // Still open on the cold room's sensor.
      { sensorId: ids.sparse, roomId: ids.coldRoom, thresholdC: 10, startAt: new Date(T0 + 3 * HOUR), endAt: null, peakTempC: 11.5, peakAt: new Date(T0 + 3 * HOUR) },
    ])
    .run();
});

const iso = (ms: number) => new Date(ms).toISOString();

async function series(sensorId: number, query = "", role: Role = "auditor") {
  return call(seriesRoute.GET, { path: `/api/v1/sensors/${sensorId}/readings${query}`, params: { id: String(sensorId) }, cookie: cookie[role] });
}

describe("bucketWidthMs", () => {
  it("picks the smallest clock-aligned width that keeps a window within 1,500 buckets", () => {
    expect(bucketWidthMs(2999 * MIN)).toBe(5 * MIN); // 2,999 min / 1,499 = 2.0 min → 5 min
    expect(bucketWidthMs(365 * DAY)).toBe(6 * HOUR); // 5.84 h → 6 h
    expect(bucketWidthMs(30 * DAY)).toBe(30 * MIN); // 28.8 min → 30 min
    expect(bucketWidthMs(5 * 366 * DAY)).toBe(2 * DAY); // 29.3 h → 2 days
  });
});

describe("GET /api/v1/sensors/{id}/readings", () => {
  it("returns every reading when the window holds at most 1,500", async () => {
    const response = await series(ids.dense, `?from=${iso(T0)}&to=${iso(T0 + 1439 * MIN)}`);
    expect(response.status).toBe(200);
    const data = response.body.data;
    expect(data.resolution).toBe("raw");
    expect(data.bucketMs).toBeNull();
    expect(data.points).toHaveLength(1440);
    expect(data.points[0]).toEqual({ atMs: T0, tempC: 4, minC: 4, maxC: 4, count: 1 });
    expect(data.points[1439]).toEqual({ atMs: T0 + 1439 * MIN, tempC: 8, minC: 8, maxC: 8, count: 1 });
    expect(data.summary).toEqual({ count: 1440, minC: 4, minAtMs: T0, maxC: 14.2, maxAtMs: T0 + 1234 * MIN, last: { atMs: T0 + 1439 * MIN, tempC: 8 } });
    // The unit's set range and threshold, and only the excursion inside the window.
    expect(data.location).toEqual({ kind: "unit", id: ids.fridge, code: "FR-9", name: "Unit FR-9", setMinC: 2, setMaxC: 8, thresholdC: 8, minDurationMin: 15 });
    expect(data.excursions.map((e: { peakTempC: number }) => e.peakTempC)).toEqual([14.2]);
  });

  it("summarises more than 1,500 readings in 5-minute buckets with each bucket's min, max and mean", async () => {
    const response = await series(ids.dense, `?from=${iso(T0)}&to=${iso(T0 + 2999 * MIN)}`);
    const data = response.body.data;
    expect(data.resolution).toBe("bucket");
    expect(data.bucketMs).toBe(5 * MIN);
    expect(data.points).toHaveLength(600); // 3,000 readings / 5 per bucket
    expect(data.points.every((p: { count: number }) => p.count === 5)).toBe(true);
    expect(data.points[0]).toEqual({ atMs: T0, tempC: 6, minC: 4, maxC: 8, count: 5 });
    // Minutes 1230–1234: 4, 5, 6, 7 and the 14.2 °C spike in place of 8.
    const spike = data.points[246];
    expect(spike.atMs).toBe(T0 + 1230 * MIN);
    expect(spike.minC).toBe(4);
    expect(spike.maxC).toBe(14.2);
    expect(spike.tempC).toBeCloseTo((4 + 5 + 6 + 7 + 14.2) / 5, 10);
    expect(data.summary).toMatchObject({ count: 3000, minC: 4, maxC: 14.2, maxAtMs: T0 + 1234 * MIN, last: { atMs: T0 + 2999 * MIN, tempC: 8 } });
  });

  it("keeps a year of five-minute readings within 1,500 points, losing no reading", async () => {
    const data = (await series(ids.year, `?from=${iso(T0)}&to=${iso(T0 + 365 * DAY)}`)).body.data;
    expect(data.bucketMs).toBe(6 * HOUR);
    expect(data.points.length).toBeLessThanOrEqual(MAX_SERIES_POINTS);
    expect(data.points).toHaveLength(365 * 4);
    expect(data.points.reduce((sum: number, p: { count: number }) => sum + p.count, 0)).toBe(365 * 288);
    expect(data.summary.count).toBe(365 * 288);
    expect(data.summary.maxC).toBe(-18); // −20 + 2 sin(π/2), reached every day at 06:00
    expect(data.summary.maxAtMs).toBe(T0 + 364 * DAY + 6 * HOUR); // a tie: the latest day's, as the worst case reports it
    expect(data.summary.minC).toBeCloseTo(-22, 6);
    // The first 6-hour bucket holds the rising quarter of the daily swing: −20 °C up to just under −18 °C.
    expect(data.points[0].minC).toBe(-20);
    expect(data.points[0].maxC).toBeCloseTo(-18, 3);
  });

  it("opens on the data by default: up to the latest reading, back to the first, at least a day and at most a year", () => {
    const dense = readingSeries(ids.dense);
    expect([dense.fromMs, dense.toMs]).toEqual([T0, T0 + 2999 * MIN]); // 2.1 days of readings
    const year = readingSeries(ids.year);
    expect([year.fromMs, year.toMs]).toEqual([T0, T0 + 365 * DAY - 5 * MIN]);
    const data = readingSeries(ids.sparse);
    expect(data.toMs).toBe(T0 + 5 * HOUR);
    expect(data.fromMs).toBe(T0 + 5 * HOUR - DAY); // five hours of readings: a whole day is shown
    expect(data.extent).toEqual({ firstAtMs: T0, lastAtMs: T0 + 5 * HOUR });
    expect(data.points.map((p) => p.tempC)).toEqual([3.1, 3.4, 9.8, 11.5, 10.2, 4.0]);
    // A room sensor takes the room's set range and threshold; the open excursion overlaps.
    expect(data.location).toMatchObject({ kind: "room", code: "C-001", setMinC: 2, setMaxC: 8, thresholdC: 10, minDurationMin: 30 });
    expect(data.excursions).toEqual([expect.objectContaining({ peakTempC: 11.5, endAtMs: null, acknowledged: false })]);
  });

  it("answers an empty series for a sensor without readings", async () => {
    const data = (await series(ids.empty)).body.data;
    expect(data.points).toEqual([]);
    expect(data.extent).toBeNull();
    expect(data.summary).toEqual({ count: 0, minC: null, minAtMs: null, maxC: null, maxAtMs: null, last: null });
  });

  it("answers 400 for a window that does not parse and 404 for an unknown sensor", async () => {
    const noOffset = await series(ids.dense, "?from=2026-07-01T00:00:00&to=2026-07-02T00:00:00Z");
    expect(noOffset.status).toBe(400);
    expect(noOffset.body.error.fields.from[0]).toMatch(/with an offset/);
    const backwards = await series(ids.dense, `?from=${iso(T0 + DAY)}&to=${iso(T0)}`);
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields.to[0]).toMatch(/at least a minute after/);
    const tooLong = await series(ids.dense, `?from=${iso(T0 - 6 * 366 * DAY)}&to=${iso(T0)}`);
    expect(tooLong.status).toBe(400);
    const noSuchDay = await series(ids.dense, "?from=2026-02-30T00:00:00Z&to=2026-03-05T00:00:00Z");
    expect(noSuchDay.status).toBe(400);
    expect(noSuchDay.body.error.fields.from).toEqual(["from is not a real date: 2026-02 has no day 30."]);
    expect((await series(99999)).status).toBe(404);
  });
});

describe("GET /api/v1/sensors", () => {
  const list = (query: string) => call(sensorsRoute.GET, { path: `/api/v1/sensors?${query}`, cookie: cookie.auditor });

  it("pages with a total and carries location, latest reading and open excursions", async () => {
    const response = await list("pageSize=2&page=1&sort=externalId");
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ page: 1, pageSize: 2, total: 4 });
    expect(response.body.data.map((s: { externalId: string }) => s.externalId)).toEqual(["S-DENSE", "S-EMPTY"]);
    const dense = response.body.data[0];
    expect(dense).toMatchObject({ roomCode: "B-101", unitCode: "FR-9", storageUnitId: ids.fridge, roomId: ids.room, lastReadingAt: T0 + 2999 * MIN, lastReadingTempC: 8, openExcursions: 0, active: true });
  });

  it("filters by text, status and open excursions, and sorts by the latest reading", async () => {
    expect((await list("q=sparse")).body.data.map((s: { externalId: string }) => s.externalId)).toEqual(["S-SPARSE"]);
    expect((await list("status=off")).body.data.map((s: { externalId: string }) => s.externalId)).toEqual(["S-EMPTY"]);
    const open = (await list("excursion=open")).body.data;
    expect(open.map((s: { externalId: string; openExcursions: number }) => [s.externalId, s.openExcursions])).toEqual([["S-SPARSE", 1]]);
    const latestFirst = (await list("sort=lastReadingAt&dir=desc")).body.data.map((s: { externalId: string }) => s.externalId);
    expect(latestFirst).toEqual(["S-YEAR", "S-DENSE", "S-SPARSE", "S-EMPTY"]); // no readings last
    expect((await list("sort=colour")).status).toBe(400);
  });
});

describe("PATCH /api/v1/sensors/{id}", () => {
  const patch = (id: number, body: unknown, role: Role = "facilities") =>
    call(sensorRoute.PATCH, { method: "PATCH", path: `/api/v1/sensors/${id}`, params: { id: String(id) }, body, cookie: cookie[role] });
  const stored = (id: number) => getDb().select().from(sensors).where(eq(sensors.id, id)).get()!;

  it("renames and switches off, with an audit event naming what changed", async () => {
    const response = await patch(ids.sparse, { name: "Cold room door logger", active: false });
    expect(response.status).toBe(200);
    expect(response.body.data).toMatchObject({ id: ids.sparse, name: "Cold room door logger", active: false, roomCode: "C-001" });
    const event = getDb().select().from(auditEvents).where(eq(auditEvents.entityType, "sensor")).all().at(-1)!;
    expect(event.summary).toBe("Updated sensor S-SPARSE (name, switched off)");
    expect(event.before).toEqual({ name: "Logger S-SPARSE", active: true });
    expect((await patch(ids.sparse, { active: true })).body.data.active).toBe(true);
  });

  it("moves a room sensor to a unit and back, keeping exactly one location", async () => {
    const toUnit = await patch(ids.sparse, { storageUnitId: ids.fridge });
    expect(toUnit.status).toBe(200);
    expect(stored(ids.sparse)).toMatchObject({ roomId: null, storageUnitId: ids.fridge });
    const toRoom = await patch(ids.sparse, { roomId: String(ids.coldRoom) });
    expect(toRoom.status).toBe(200);
    expect(stored(ids.sparse)).toMatchObject({ roomId: ids.coldRoom, storageUnitId: null });
    // Readings stay with the sensor.
    expect(await getDb().$count(readings, eq(readings.sensorId, ids.sparse))).toBe(6);
  });

  it("refuses a retired or unknown location, both locations, or none, and changes nothing", async () => {
    const retired = await patch(ids.sparse, { storageUnitId: ids.retiredUnit });
    expect(retired.status).toBe(400);
    expect(retired.body.error.fields).toEqual({ storageUnitId: ["Choose an existing storage unit."] });
    expect((await patch(ids.sparse, { roomId: 99999 })).body.error.fields).toEqual({ roomId: ["Choose an existing room."] });
    const both = await patch(ids.sparse, { roomId: ids.room, storageUnitId: ids.fridge });
    expect(both.status).toBe(400);
    expect(both.body.error.fields.storageUnitId[0]).toMatch(/not both/);
    const none = await patch(ids.sparse, { roomId: null });
    expect(none.status).toBe(400);
    expect(none.body.error.fields.storageUnitId[0]).toMatch(/must stay attached/);
    expect(stored(ids.sparse)).toMatchObject({ roomId: ids.coldRoom, storageUnitId: null });
  });

  it("answers 400 for bad fields, 409 for a device id in use and 404 for an unknown sensor", async () => {
    const bad = await patch(ids.sparse, { name: "  ", externalId: "has space", active: "maybe" });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["active", "externalId", "name"]);
    const taken = await patch(ids.sparse, { externalId: "S-DENSE" });
    expect(taken.status).toBe(409);
    expect(taken.body.error.fields.externalId).toEqual(["Another sensor already has this device id."]);
    expect(stored(ids.sparse).externalId).toBe("S-SPARSE");
    expect((await patch(99999, { name: "Ghost" })).status).toBe(404);
  });

  it("is refused to a researcher", async () => {
    expect((await patch(ids.sparse, { name: "Mine now" }, "researcher")).status).toBe(403);
  });
});

describe("GET /api/v1/sensors/{id}", () => {
  it("answers the sensor with its site and location", async () => {
    const response = await call(sensorRoute.GET, { path: `/api/v1/sensors/${ids.dense}`, params: { id: String(ids.dense) }, cookie: cookie.auditor });
    expect(response.status).toBe(200);
    expect(response.body.data).toMatchObject({ externalId: "S-DENSE", siteName: "Corvane Test Site", unitCode: "FR-9", roomCode: "B-101" });
  });
});
