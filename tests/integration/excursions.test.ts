/**
 * Stored excursions: detection after every ingest, closing, merging, acknowledgement, the alert
 * e-mails (who gets them, preferences, idempotency) and the worst-case temperature queries.
 */
import { beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, emailMessages, excursions, rooms, sensors, sites, storageUnits, type User } from "@/db/schema";
import * as listRoute from "@/app/api/v1/excursions/route";
import * as acknowledgeRoute from "@/app/api/v1/excursions/[id]/acknowledge/route";
import { ingestReadings } from "@/lib/temperatures/ingest";
import { worstCaseForRoom, worstCaseForUnit } from "@/lib/temperatures/queries";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

const MIN = 60_000;
const T0 = Date.parse("2026-03-06T17:00:00Z"); // a Friday evening

let owner: User, contact: User, officer: User, digestOfficer: User, quietOfficer: User, researcher: User;
let roomId: number, unitId: number, roomSensorId: number;

beforeAll(() => {
  const db = getDb();
  owner = makeUser("researcher");
  researcher = makeUser("researcher");
  contact = makeUser("facilities");
  officer = makeUser("safety_officer");
  digestOfficer = makeUser("safety_officer", { alertExcursions: "digest" });
  quietOfficer = makeUser("safety_officer", { alertExcursions: "off" });
  makeUser("safety_officer", { active: false });
  const site = db.insert(sites).values({ name: "Test campus" }).returning().get();
  const room = db.insert(rooms).values({ siteId: site.id, code: "T-1", name: "Test lab", designMaxTempC: 27, facilitiesContactId: contact.id }).returning().get();
  roomId = room.id;
  unitId = db
    .insert(storageUnits)
    .values({ roomId, code: "FR-T", name: "Test refrigerator", kind: "flammable_storage_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30, ownerId: owner.id })
    .returning()
    .get().id;
  db.insert(sensors).values({ externalId: "T-FR", name: "Fridge logger", storageUnitId: unitId }).run();
  roomSensorId = db.insert(sensors).values({ externalId: "T-AMB", name: "Room logger", roomId }).returning().get().id;
});

const at = (minutes: number) => new Date(T0 + minutes * MIN).toISOString();
/** Readings every 5 minutes from `fromMin` with the given temperatures. */
const series = (sensor: string, fromMin: number, temps: number[]) => temps.map((tempC, i) => ({ sensor, at: at(fromMin + 5 * i), tempC }));
const alertsTo = (user: User) => getDb().select().from(emailMessages).where(eq(emailMessages.recipientUserId, user.id)).all();
const unitExcursions = () => getDb().select().from(excursions).where(eq(excursions.storageUnitId, unitId)).orderBy(excursions.startAt).all();

describe("excursions stored from ingested readings", () => {
  it("ignores a door-opening spike shorter than the minimum duration and a reading exactly at the threshold", () => {
    // 5 °C, a 10-minute spike to 11 °C (shorter than 30 min), then 8.0 °C for 40 min: at, not above.
    ingestReadings(series("T-FR", 0, [5, 5, 11, 11, 5, 8, 8, 8, 8, 8, 8, 8, 8, 5]));
    expect(unitExcursions()).toHaveLength(0);
    expect(alertsTo(officer)).toHaveLength(0);
  });

  it("opens an excursion once it has lasted the minimum duration and tells the people responsible who chose 'as it happens'", () => {
    // Fails at 120 min: 9, 10.5, 12, 13.4, 14.2, 14.8, 15.1 °C every 5 min → 30 min above by the 7th reading.
    const result = ingestReadings(series("T-FR", 120, [9, 10.5, 12, 13.4, 14.2, 14.8, 15.1]));
    expect(result.excursions).toEqual({ opened: 1, closed: 0, updated: 0 });
    const [open] = unitExcursions();
    expect(open).toMatchObject({ endAt: null, peakTempC: 15.1, thresholdC: 8, roomId: null });
    expect(open.startAt.toISOString()).toBe(at(120));
    for (const user of [owner, contact, officer]) {
      const [message] = alertsTo(user);
      expect(message.kind).toBe("excursion_started");
      expect(message.subject).toBe("Excursion started: FR-T Test refrigerator, room T-1 Test lab, Test campus above 8.0 °C");
      expect(message.text).toContain("Highest reading so far: 15.1 °C at 2026-03-06 19:30 UTC.");
      expect(message.text).toContain(`/locations/units/${unitId}`);
    }
    expect(alertsTo(digestOfficer)).toHaveLength(0);
    expect(alertsTo(quietOfficer)).toHaveLength(0);
    expect(alertsTo(researcher)).toHaveLength(0);
  });

  it("keeps it open and raises the peak while it lasts, then closes it with an 'ended' message", () => {
    ingestReadings(series("T-FR", 155, [16.2, 17.0]));
    expect(unitExcursions()[0]).toMatchObject({ endAt: null, peakTempC: 17 });
    const result = ingestReadings(series("T-FR", 165, [12, 8.5, 7.9, 5]));
    expect(result.excursions.closed).toBe(1);
    const [closed] = unitExcursions();
    expect(closed.endAt!.toISOString()).toBe(at(175)); // the first reading back at or below 8 °C
    expect(closed.peakAt.toISOString()).toBe(at(160));
    const ended = alertsTo(officer).find((m) => m.kind === "excursion_ended")!;
    expect(ended.text).toContain("lasted from 2026-03-06 19:00 UTC to 2026-03-06 19:55 UTC (55 min)");
    expect(ended.text).toContain("Peak: 17.0 °C at 2026-03-06 19:40 UTC.");
  });

  it("stores a batch sent twice once and queues no second message", () => {
    const before = getDb().select().from(emailMessages).all().length;
    const again = ingestReadings(series("T-FR", 165, [12, 8.5, 7.9, 5]));
    expect(again).toMatchObject({ accepted: 0, duplicates: 4 });
    expect(getDb().select().from(emailMessages).all().length).toBe(before);
    expect(unitExcursions()).toHaveLength(1);
  });

  it("moves an excursion's start earlier when back-filled readings show it began sooner, keeping its acknowledgement and sending no second 'started'", async () => {
    // A second failure 400–435 min above (back at 5 °C at 440), with readings 295–395 arriving later.
    ingestReadings(series("T-FR", 290, [5]));
    ingestReadings(series("T-FR", 400, [9, 9.5, 10, 10, 9.8, 9.1, 9, 9.2, 5]));
    expect(unitExcursions()).toHaveLength(2);
    const second = unitExcursions()[1];
    const cookie = await sessionCookieFor(contact);
    const ack = await call(acknowledgeRoute.POST, { method: "POST", params: { id: String(second.id) }, body: { comment: "Door found ajar; closed it." }, cookie });
    expect(ack.status).toBe(200);
    const startedBefore = alertsTo(officer).filter((m) => m.kind !== "excursion_ended").length;
    ingestReadings(series("T-FR", 295, Array.from({ length: 21 }, () => 9.9)));
    const [, moved] = unitExcursions();
    expect(moved.id).toBe(second.id);
    expect(moved.startAt.toISOString()).toBe(at(295));
    expect(moved.endAt!.toISOString()).toBe(at(440));
    expect(moved.peakTempC).toBe(10);
    expect(moved.acknowledgeComment).toBe("Door found ajar; closed it.");
    expect(alertsTo(officer).filter((m) => m.kind !== "excursion_ended")).toHaveLength(startedBefore);
  });

  it("never opens an excursion where no threshold is set", () => {
    // Room threshold: none on T-1, so the room sensor never has excursions.
    ingestReadings(series("T-AMB", 0, [31, 32, 33]));
    expect(getDb().select().from(excursions).where(eq(excursions.sensorId, roomSensorId)).all()).toHaveLength(0);
  });
});

describe("GET /api/v1/excursions and POST …/acknowledge", () => {
  it("lists a unit's excursions with duration and who acknowledged", async () => {
    const cookie = await sessionCookieFor(makeUser("auditor"));
    const list = await call(listRoute.GET, { path: `/api/v1/excursions?storageUnitId=${unitId}`, cookie });
    expect(list.status).toBe(200);
    expect(list.body.data).toHaveLength(2);
    const [latest, first] = list.body.data;
    expect(latest).toMatchObject({ sensorExternalId: "T-FR", unitCode: "FR-T", roomCode: "T-1", peakTempC: 10, durationMin: 145, acknowledgedByName: contact.name });
    expect(first).toMatchObject({ peakTempC: 17, durationMin: 55, acknowledgedAt: null });
    const bad = await call(listRoute.GET, { path: "/api/v1/excursions?limit=0", cookie });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.limit[0]).toMatch(/1 to 1000/);
  });

  it("refuses researchers and auditors, needs a comment, and acknowledges once", async () => {
    const [first] = unitExcursions();
    const params = { id: String(first.id) };
    for (const user of [researcher, makeUser("auditor")]) {
      const refused = await call(acknowledgeRoute.POST, { method: "POST", params, body: { comment: "x" }, cookie: await sessionCookieFor(user) });
      expect(refused.status).toBe(403);
    }
    const cookie = await sessionCookieFor(officer);
    const empty = await call(acknowledgeRoute.POST, { method: "POST", params, body: { comment: "  " }, cookie });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.comment[0]).toBe("Comment is required.");
    expect(unitExcursions()[0].acknowledgedAt).toBeNull();
    const missing = await call(acknowledgeRoute.POST, { method: "POST", params: { id: "99999" }, body: { comment: "x" }, cookie });
    expect(missing.status).toBe(404);
    const done = await call(acknowledgeRoute.POST, { method: "POST", params, body: { comment: "Compressor relay replaced; contents checked." }, cookie });
    expect(done.status).toBe(200);
    expect(done.body.data.acknowledgeComment).toBe("Compressor relay replaced; contents checked.");
    const twice = await call(acknowledgeRoute.POST, { method: "POST", params, body: { comment: "again" }, cookie });
    expect(twice.status).toBe(409);
    expect(twice.body.error.message).toMatch(`already acknowledged by ${officer.name}`);
    const audit = getDb().select().from(auditEvents).where(eq(auditEvents.entityType, "excursion")).all();
    expect(audit.map((a) => a.summary)).toContain("Acknowledged the excursion on sensor T-FR from 2026-03-06 19:00 UTC: Compressor relay replaced; contents checked.");
  });
});

describe("worst-case temperatures", () => {
  const now = T0 + 2 * 86_400_000;
  it("takes a room's highest reading over its design maximum, with the source", () => {
    const room = worstCaseForRoom(roomId, now)!;
    expect(room.tempC).toBe(33);
    expect(room.description).toBe("33.0 °C, reading of 2026-03-06 17:10 UTC from sensor T-AMB");
  });

  it("assesses a refrigerator in control at its highest reading outside its excursions and control lost at the room's worst case", () => {
    const unit = worstCaseForUnit(unitId, now);
    expect(unit.controlled).toBe(true);
    // 17.0 °C (19:40) and 10 °C fell inside the two excursions; the 10-minute door spike to 11 °C was no excursion.
    expect(unit.inControl!.tempC).toBe(11);
    expect(unit.inControl!.description).toBe(
      "11.0 °C, highest reading in the last 365 days outside 2 excursions (excluded: they count as control lost), 2026-03-06 17:15 UTC from sensor T-FR",
    );
    expect(unit.controlLost!.tempC).toBe(33); // the room's 33 °C is above both peaks (17 °C, 10 °C)
    expect(unit.controlLost!.description).toMatch(/room's worst case, as if the unit had failed/);
  });

  it("after an acknowledged, ended excursion: in control leaves its readings out, control lost takes its peak", async () => {
    const db = getDb();
    const coolRoom = db.insert(rooms).values({ siteId: db.select().from(sites).get()!.id, code: "T-2", name: "Test store", designMaxTempC: 20 }).returning().get();
    const fsr = db
      .insert(storageUnits)
      .values({ roomId: coolRoom.id, code: "FSR-T", name: "Test flammable-storage refrigerator", kind: "flammable_storage_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30 })
      .returning()
      .get();
    db.insert(sensors).values({ externalId: "T-FSR", name: "Store fridge logger", storageUnitId: fsr.id }).run();
    // Thirty days before T0 (outside the digest's day): 4–7.9 °C, a 35-minute failure peaking at 21.7 °C, back to 4 °C.
    ingestReadings(series("T-FSR", -30 * 1440, [4, 4.2, 7.9, 5, 9, 14, 18.5, 21.7, 20.2, 15, 9, 5, 4.1]));
    const [weekend] = getDb().select().from(excursions).where(eq(excursions.storageUnitId, fsr.id)).all();
    expect(weekend).toMatchObject({ peakTempC: 21.7 });
    expect(weekend.endAt!.toISOString()).toBe(at(-30 * 1440 + 55));
    const cookie = await sessionCookieFor(contact);
    const ack = await call(acknowledgeRoute.POST, { method: "POST", params: { id: String(weekend.id) }, body: { comment: "Compressor replaced." }, cookie });
    expect(ack.status).toBe(200);

    const unit = worstCaseForUnit(fsr.id, now);
    expect(unit.inControl!.tempC).toBe(8); // the set range's upper end is above the 7.9 °C reading outside the excursion
    expect(unit.inControl!.description).toBe(
      "8.0 °C, upper end of the set range; the readings inside 1 excursion in the last 365 days are excluded (they count as control lost)",
    );
    expect(unit.controlLost!.tempC).toBe(21.7);
    expect(unit.controlLost!.description).toBe(
      "21.7 °C, peak of the excursion on sensor T-FSR (2026-02-04 17:35 UTC, ended), the highest of the unit's excursions in the last 365 days; above the room's worst case of 20.0 °C",
    );
    // A set range below the reading: the 7.9 °C reading outside the excursion is in control, 21.7 °C never is.
    db.update(storageUnits).set({ setMaxC: 6 }).where(eq(storageUnits.id, fsr.id)).run();
    const lower = worstCaseForUnit(fsr.id, now);
    expect(lower.inControl!.description).toBe(
      "7.9 °C, highest reading in the last 365 days outside 1 excursion (excluded: they count as control lost), 2026-02-04 17:10 UTC from sensor T-FSR",
    );
    db.update(storageUnits).set({ setMaxC: 8 }).where(eq(storageUnits.id, fsr.id)).run();
  });

  it("drops readings older than the look-back window and falls back to the upper end of the set range", () => {
    const unit = worstCaseForUnit(unitId, T0 + 400 * 86_400_000);
    expect(unit.inControl!.description).toBe("8.0 °C, upper end of the set range");
    expect(worstCaseForRoom(roomId, T0 + 400 * 86_400_000)!.description).toBe("27.0 °C, design maximum");
  });
});

describe("daily digest", () => {
  it("queues one digest per person and day at 07:00 UTC, with the excursions of their locations, and none for those who switched excursions off", async () => {
    const { queueDailyDigests } = await import("@/lib/alerts/digest");
    expect(queueDailyDigests(Date.parse("2026-03-07T06:59:00Z"))).toBe(0);
    expect(queueDailyDigests(Date.parse("2026-03-07T07:02:01Z"))).toBe(0); // more than two minutes late: not under the 07:00 label
    queueDailyDigests(Date.parse("2026-03-07T07:00:30Z"));
    const digestOf = (user: User) => alertsTo(user).filter((m) => m.kind === "daily_digest");
    for (const user of [officer, digestOfficer, contact, owner]) {
      const [digest] = digestOf(user);
      expect(digest.subject).toBe("Headroom daily digest, 2026-03-07 07:00 UTC");
      expect(digest.text).toContain("Unit FR-T, sensor T-FR: above 8.0 °C 2026-03-06 19:00 UTC – 2026-03-06 19:55 UTC (55 min), peak 17.0 °C");
    }
    expect(digestOf(quietOfficer)).toHaveLength(0);
    expect(digestOf(researcher)).toHaveLength(0); // responsible for nothing
    expect(queueDailyDigests(Date.parse("2026-03-07T07:01:00Z"))).toBe(0); // once a day
    expect(queueDailyDigests(Date.parse("2026-03-07T12:00:00Z"))).toBe(0);
    expect(digestOf(officer)).toHaveLength(1);
  });

  it("sends each digest at its hour by the timer: not on a start at 12:19, at 07:00 the next day, once; a restart at 07:01 catches up", async () => {
    const { startDigestJob, stopDigestJob } = await import("@/lib/alerts/digest");
    const sensorId = getDb().select().from(sensors).where(eq(sensors.externalId, "T-FR")).get()!.id;
    // An open, unacknowledged excursion: every day's digest has something to say.
    getDb()
      .insert(excursions)
      .values({ sensorId, storageUnitId: unitId, thresholdC: 8, startAt: new Date("2026-03-08T10:00:00Z"), peakTempC: 12.5, peakAt: new Date("2026-03-08T10:40:00Z") })
      .run();
    const digestsOf = (user: User) => alertsTo(user).filter((m) => m.kind === "daily_digest");
    vi.useFakeTimers({ toFake: ["setTimeout", "clearTimeout", "setInterval", "clearInterval", "Date"] });
    try {
      vi.setSystemTime(new Date("2026-03-08T12:19:00Z"));
      startDigestJob();
      expect(digestsOf(officer).map((m) => m.subject)).toEqual(["Headroom daily digest, 2026-03-07 07:00 UTC"]);
      await vi.advanceTimersByTimeAsync(Date.parse("2026-03-09T06:59:59Z") - Date.now());
      expect(digestsOf(officer)).toHaveLength(1);
      await vi.advanceTimersByTimeAsync(1_000); // 07:00:00
      const sent = digestsOf(officer);
      expect(sent.map((m) => m.subject)).toEqual(["Headroom daily digest, 2026-03-07 07:00 UTC", "Headroom daily digest, 2026-03-09 07:00 UTC"]);
      expect(sent[1].text).toContain("open since 2026-03-08 10:00 UTC, not acknowledged, peak 12.5 °C");
      await vi.advanceTimersByTimeAsync(6 * 3_600_000);
      expect(digestsOf(officer)).toHaveLength(2);
      stopDigestJob();
      vi.setSystemTime(new Date("2026-03-10T07:01:00Z"));
      startDigestJob();
      startDigestJob(); // started twice: one timer, one digest
      expect(digestsOf(officer).map((m) => m.subject).at(-1)).toBe("Headroom daily digest, 2026-03-10 07:00 UTC");
      expect(digestsOf(officer)).toHaveLength(3);
      await vi.advanceTimersByTimeAsync(10 * 60_000);
      expect(digestsOf(officer)).toHaveLength(3);
    } finally {
      stopDigestJob();
      vi.useRealTimers();
    }
  });
});

describe("PATCH /api/v1/me (alert choices)", () => {
  it("stores one's own choices and rejects an unknown one without changing anything", async () => {
    const meRoute = await import("@/app/api/v1/me/route");
    const person = makeUser("facilities");
    const cookie = await sessionCookieFor(person);
    const bad = await call(meRoute.PATCH, { method: "PATCH", body: { alertExcursions: "hourly", alertFindings: "off", dailyDigest: false }, cookie });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.alertExcursions[0]).toMatch(/as they happen, in the daily digest, or off/);
    const ok = await call(meRoute.PATCH, { method: "PATCH", body: { alertExcursions: "digest", alertFindings: "off", dailyDigest: false }, cookie });
    expect(ok.status).toBe(200);
    expect(ok.body.user.alerts).toEqual({ alertExcursions: "digest", alertFindings: "off", dailyDigest: false });
  });
});
