/**
 * Excursions awaiting acknowledgement (ended or not), acknowledged several at once, and one peak
 * instant — the stored peak_at — in the list, the chart's summary and the worst case.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, excursions, rooms, sensors, sites, storageUnits, type User } from "@/db/schema";
import * as bulkRoute from "@/app/api/v1/excursions/acknowledge/route";
import * as listRoute from "@/app/api/v1/excursions/route";
import * as auditRoute from "@/app/api/v1/audit-events/route";
import { ingestReadings } from "@/lib/temperatures/ingest";
import { countExcursions, worstCaseForUnit } from "@/lib/temperatures/queries";
import { readingSeries } from "@/lib/temperatures/series";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

const MIN = 60_000;
const T0 = Date.parse("2026-05-01T22:00:00Z"); // invented demo data: a Friday night
const at = (minutes: number) => new Date(T0 + minutes * MIN).toISOString();
const series = (sensor: string, fromMin: number, temps: number[]) => temps.map((tempC, i) => ({ sensor, at: at(fromMin + 30 * i), tempC }));

let facilities: User, researcher: User;
let unitId: number, sensorId: number;
const stored = () => getDb().select().from(excursions).where(eq(excursions.storageUnitId, unitId)).orderBy(excursions.startAt).all();

beforeAll(() => {
  const db = getDb();
  facilities = makeUser("facilities");
  researcher = makeUser("researcher");
  const site = db.insert(sites).values({ name: "Acknowledgement campus" }).returning().get();
  const room = db.insert(rooms).values({ siteId: site.id, code: "A-1", name: "Solvent store", designMaxTempC: 20 }).returning().get();
  unitId = db
    .insert(storageUnits)
    .values({ roomId: room.id, code: "FSR-A", name: "Flammable-storage refrigerator", kind: "flammable_storage_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: 8, excursionMinDurationMin: 30 })
    .returning()
    .get().id;
  sensorId = db.insert(sensors).values({ externalId: "FSR-A-LOG", name: "Fridge logger", storageUnitId: unitId }).returning().get().id;
  // Readings every 30 min. The weekend failure: up to 21.7 °C at 00:30 and held there until 08:00
  // (readings to 0.1 °C); back at 4.5 °C on Saturday morning. Then two shorter failures.
  ingestReadings([
    ...series("FSR-A-LOG", 0, [4.2, 6, 12.5, 18, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 21.7, 19, 12, 4.5, 4.4]),
    ...series("FSR-A-LOG", 1440, [4.1, 9.5, 10.2, 4.3]),
    ...series("FSR-A-LOG", 2880, [4.0, 11.4, 11.9, 4.2]),
  ]);
});

describe("one peak instant", () => {
  it("is the stored peak_at — the first reading at the peak — in the list, the chart's summary and control lost", async () => {
    const [weekend] = stored();
    expect(weekend.peakTempC).toBe(21.7);
    expect(weekend.peakAt.toISOString()).toBe("2026-05-02T00:00:00.000Z");
    const chart = readingSeries(sensorId, { fromMs: T0 - 60 * MIN, toMs: T0 + 3000 * MIN });
    expect(chart.summary.maxC).toBe(21.7);
    expect(chart.summary.maxAtMs).toBe(weekend.peakAt.getTime()); // not the later tie at 07:00
    const worst = worstCaseForUnit(unitId, T0 + 4000 * MIN);
    expect(worst.controlLost!.description).toBe(
      "21.7 °C, peak of the excursion on sensor FSR-A-LOG (2026-05-02 00:00 UTC, ended), the highest of the unit's excursions in the last 365 days; above the room's worst case of 20.0 °C",
    );
    // In control: the 4.5 °C after the failure and every reading outside the three excursions; the set range's 8 °C is higher.
    expect(worst.inControl!.tempC).toBe(8);
    // Without a set range the unit sits at room temperature and its highest reading counts: at the peak's instant, not the later tie.
    getDb().update(storageUnits).set({ setMaxC: null, setMinC: null }).where(eq(storageUnits.id, unitId)).run();
    try {
      expect(worstCaseForUnit(unitId, T0 + 4000 * MIN).inControl!.description).toBe("21.7 °C, reading of 2026-05-02 00:00 UTC from sensor FSR-A-LOG");
    } finally {
      getDb().update(storageUnits).set({ setMinC: 2, setMaxC: 8 }).where(eq(storageUnits.id, unitId)).run();
    }
  });
});

describe("excursions awaiting acknowledgement", () => {
  it("counts every excursion not yet acknowledged, ended or not, and lists them through the API", async () => {
    expect(stored().map((e) => e.endAt != null)).toEqual([true, true, true]);
    expect(countExcursions({ open: true })).toBe(0);
    expect(countExcursions({ awaitingAcknowledgement: true })).toBe(3);
    const cookie = await sessionCookieFor(facilities);
    const listed = await call(listRoute.GET, { path: "/api/v1/excursions?awaitingAcknowledgement=true", cookie });
    expect(listed.status).toBe(200);
    expect(listed.body.data.map((e: { peakTempC: number }) => e.peakTempC)).toEqual([11.9, 10.2, 21.7]); // newest first
  });

  it("acknowledges several at once with one note in one transaction, answering for each", async () => {
    const [weekend, second, third] = stored();
    const cookie = await sessionCookieFor(facilities);
    const refused = await call(bulkRoute.POST, { method: "POST", body: { excursionIds: [weekend.id] }, cookie: await sessionCookieFor(researcher) });
    expect(refused.status).toBe(403);
    const empty = await call(bulkRoute.POST, { method: "POST", body: { excursionIds: [] }, cookie });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.excursionIds).toEqual(["Tick at least one excursion."]);
    const bad = await call(bulkRoute.POST, { method: "POST", body: { excursionIds: [weekend.id, "x"] }, cookie });
    expect(bad.status).toBe(400);
    expect(countExcursions({ awaitingAcknowledgement: true })).toBe(3); // nothing changed

    const done = await call(bulkRoute.POST, { method: "POST", body: { excursionIds: [weekend.id, second.id, 999_999], note: "Compressor replaced 2026-05-04; stock checked." }, cookie });
    expect(done.status).toBe(200);
    expect(done.body.data).toEqual([
      { excursionId: weekend.id, ok: true },
      { excursionId: second.id, ok: true },
      { excursionId: 999_999, ok: false, error: "No such excursion." },
    ]);
    expect(countExcursions({ awaitingAcknowledgement: true })).toBe(1);
    expect(stored().map((e) => e.acknowledgeComment)).toEqual(["Compressor replaced 2026-05-04; stock checked.", "Compressor replaced 2026-05-04; stock checked.", null]);
    const summaries = getDb().select().from(auditEvents).where(eq(auditEvents.entityType, "excursion")).all().map((a) => a.summary);
    expect(summaries).toEqual([
      "Acknowledged the excursion on sensor FSR-A-LOG from 2026-05-01 23:00 UTC: Compressor replaced 2026-05-04; stock checked.",
      "Acknowledged the excursion on sensor FSR-A-LOG from 2026-05-02 22:30 UTC: Compressor replaced 2026-05-04; stock checked.",
    ]);

    const again = await call(bulkRoute.POST, { method: "POST", body: { excursionIds: [weekend.id, third.id] }, cookie });
    expect(again.body.data[0]).toEqual({ excursionId: weekend.id, ok: false, error: expect.stringMatching(/^This excursion was already acknowledged by .+ on \d{4}-\d\d-\d\d \d\d:\d\d UTC\.$/) });
    expect(again.body.data[1]).toEqual({ excursionId: third.id, ok: true });
    expect(stored()[2].acknowledgeComment).toBeNull(); // the note is optional
    expect(countExcursions({ awaitingAcknowledgement: true })).toBe(0);
  });
});

describe("the audit log of those acknowledgements", () => {
  it("filters excursions and says what changed in words: the person by name, no ids, no JSON", async () => {
    const cookie = await sessionCookieFor(makeUser("auditor"));
    const response = await call(auditRoute.GET, { path: "/api/v1/audit-events?entityType=excursion&sort=at&dir=asc", cookie });
    expect(response.status).toBe(200);
    expect(response.body.total).toBe(3);
    const [first] = response.body.data;
    expect(first.action).toBe("acknowledge");
    const changes = first.changes as { label: string; before: string; after: string }[];
    expect(changes.map((c) => c.label)).toEqual(["Acknowledged at", "Acknowledged by", "Acknowledgement note"]);
    expect(changes[0].before).toBe("—");
    expect(changes[0].after).toMatch(/^\d{4}-\d\d-\d\d \d\d:\d\d UTC$/);
    expect(changes[1].after).toBe(facilities.name);
    expect(changes[2].after).toBe("Compressor replaced 2026-05-04; stock checked.");
    const bad = await call(auditRoute.GET, { path: "/api/v1/audit-events?entityType=spaceship", cookie });
    expect(bad.status).toBe(400);
  });
});
