/**
 * The storage planner ranks the live units where something could go: nothing raised first, then
 * already flagged, then what would raise findings; within those the lowest worst severity, then
 * nearness. It leaves out units too small for the amount and says so when nothing fits; it plans a
 * researcher's own containers only; the what-if offers its safer places. Runs on the invented demo
 * organisation (its domestic-type refrigerator FR-1 in room 2.107 holds diethyl ether, its
 * flammable-storage refrigerator FSR-1 is in room 2.115 of the same site).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { containers, findings, rooms, sites, storageUnits, substances, users, type User } from "@/db/schema";
import * as planRoute from "@/app/api/v1/storage-plan/route";
import * as previewRoute from "@/app/api/v1/assessments/preview/route";
import { moveSuggestionsForFinding } from "@/lib/assessment/move-suggestions";
import { severityRank } from "@/lib/assessment/rules";
import { containerCreateSchema } from "@/lib/inventory/schemas";
import { createContainer } from "@/lib/inventory/service";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

const ETHER = "60-29-7";
const DMF = "68-12-2";
const WATER = "7732-18-5";

type Item = {
  storageUnitId: number;
  code: string;
  roomCode: string;
  verdict: "no_findings" | "already_flagged" | "raises";
  worstSeverity: "critical" | "high" | "moderate" | "low" | null;
  maxRatio: number | null;
  timeToDanger: { minutes: number; threshold: string; tempC: number } | null;
  nearness: "same_room" | "same_site" | "other_site";
  reason: string;
  raised: number;
};

let researcher: User;
const unitId = (code: string) => getDb().select().from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
const roomId = (code: string) => getDb().select().from(rooms).where(eq(rooms.code, code)).get()!.id;
const substanceId = (cas: string) => getDb().select().from(substances).where(eq(substances.cas, cas)).get()!.id;
const plan = async (user: User, query: Record<string, string | number>) =>
  call(planRoute.GET, { method: "GET", path: `/api/v1/storage-plan?${new URLSearchParams(Object.entries(query).map(([k, v]) => [k, String(v)]))}`, cookie: await sessionCookieFor(user) });
const preview = async (user: User, body: Record<string, unknown>) => call(previewRoute.POST, { method: "POST", cookie: await sessionCookieFor(user), body });
const counts = () => JSON.stringify(["findings", "finding_events", "containers", "container_moves", "audit_events"].map((table) => getDb().$client.prepare(`select count(*) n from ${table}`).get()));
const VERDICT_ORDER = { no_findings: 0, already_flagged: 1, raises: 2 } as const;
const NEARNESS_ORDER = { same_room: 0, same_site: 1, other_site: 2 } as const;
const severityOf = (item: Item) => (item.worstSeverity ? severityRank(item.worstSeverity) : -1);

/** The ranking rules, pair by pair: verdict, then worst severity, then time to danger (none best), then nearness. */
function expectRanked(items: Item[]) {
  for (let i = 1; i < items.length; i++) {
    const [a, b] = [items[i - 1], items[i]];
    const key = (item: Item) => [VERDICT_ORDER[item.verdict], severityOf(item), -(item.timeToDanger?.minutes ?? Number.POSITIVE_INFINITY), NEARNESS_ORDER[item.nearness]];
    const [ka, kb] = [key(a), key(b)];
    const first = ka.findIndex((v, k) => v !== kb[k]);
    if (first >= 0) expect(ka[first], `${a.code} before ${b.code}`).toBeLessThan(kb[first]);
  }
}

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  researcher = getDb().select().from(users).where(eq(users.email, "researcher@example.org")).get()!;
});

describe("GET /api/v1/storage-plan: a flagged placement", () => {
  it("moves a researcher's N,N-dimethylformamide out of FR-1 to a unit in the same room where nothing would be raised, and writes nothing", async () => {
    const actor = { id: researcher.id, email: researcher.email, name: researcher.name, role: researcher.role };
    const bottle = createContainer(actor, "own", containerCreateSchema.parse({ label: "SP-DMF-1", substanceId: substanceId(DMF), amount: 1, amountUnit: "L", storageUnitId: unitId("FR-1"), state: "sealed" }));
    const before = counts();
    const response = await plan(researcher, { substanceId: substanceId(DMF), amount: 1, amountUnit: "L", containerId: bottle.id });
    expect(response.status).toBe(200);
    const items = response.body.data as Item[];
    // FR-1 is where it stands: left out. The demo has 17 live units.
    expect(items.map((i) => i.code)).not.toContain("FR-1");
    expect(items).toHaveLength(16);
    // Flash point 58 °C (the demo library's closed-cup value) stays more than the 10 °C margin above room 2.107's 28.0 °C design maximum, and FC-3 and SH-2 hold no DMF yet.
    expect(items.slice(0, 2)).toEqual([
      expect.objectContaining({ code: "FC-3", roomCode: "2.107", verdict: "no_findings", worstSeverity: null, maxRatio: null, timeToDanger: null, raised: 0, nearness: "same_room", reason: "Nothing would be raised here." }),
      expect.objectContaining({ code: "SH-2", roomCode: "2.107", verdict: "no_findings", worstSeverity: null, nearness: "same_room", reason: "Nothing would be raised here." }),
    ]);
    // Open containers of flammable liquids in FC-4 stand flagged already: storing DMF there keeps them so.
    expect(items[2]).toMatchObject({ code: "FC-4", roomCode: "2.115", verdict: "already_flagged", worstSeverity: "high", nearness: "same_site" });
    expect(items[2].reason).toMatch(/^Already flagged here: open containers in FC-4 could reach .* % LFL together at its worst case \(27\.0 °C\); storing it keeps it so\.$/);
    expect(items.filter((i) => i.verdict === "raises").every((i) => i.reason.startsWith("Would raise: ") && i.raised > 0)).toBe(true);
    expectRanked(items);
    expect(counts()).toBe(before);
  });

  it("offers FSR-1 first for diethyl ether, whose findings in FR-1 are critical", async () => {
    const response = await plan(researcher, { substanceId: substanceId(ETHER), amount: 1, amountUnit: "L", roomId: roomId("2.107") });
    expect(response.status).toBe(200);
    const items = response.body.data as Item[];
    // No unit of the demo is free of findings for diethyl ether (flash point −45 °C): every place keeps or raises one.
    expect(items.some((i) => i.verdict === "no_findings")).toBe(false);
    expect(items[0]).toMatchObject({ code: "FSR-1", verdict: "already_flagged", worstSeverity: "high", nearness: "same_site" });
    const fr1 = items.find((i) => i.code === "FR-1")!;
    expect(fr1).toMatchObject({ verdict: "already_flagged", worstSeverity: "critical", nearness: "same_room" });
    expect(items.indexOf(fr1)).toBe(1);
    expectRanked(items);
  });

  it("ranks nearness last: among places where nothing would be raised, the same room, then the same site, then others", async () => {
    const response = await plan(researcher, { substanceId: substanceId(WATER), amount: 0.5, amountUnit: "L", roomId: roomId("2.115"), limit: 50 });
    expect(response.status).toBe(200);
    const items = response.body.data as Item[];
    expect(items).toHaveLength(17);
    expect(items.every((i) => i.verdict === "no_findings")).toBe(true);
    expect(items.slice(0, 4).map((i) => `${i.roomCode}/${i.code}`)).toEqual(["2.115/FC-4", "2.115/FSR-1", "2.115/FZ-1", "2.115/FZ-2"]);
    expect(items.map((i) => i.nearness)).toEqual([...Array(4).fill("same_room"), ...Array(8).fill("same_site"), ...Array(5).fill("other_site")]);
    // limit: at most that many.
    expect(((await plan(researcher, { substanceId: substanceId(WATER), amount: 0.5, amountUnit: "L", limit: 3 })).body.data as Item[]).length).toBe(3);
    // siteId: only that site's units (Riverside Annex: ).
    const annex = getDb().select().from(sites).where(eq(sites.name, "Riverside Annex")).get()!;
    const there = (await plan(researcher, { substanceId: substanceId(WATER), amount: 0.5, amountUnit: "L", siteId: annex.id })).body.data as Item[];
    expect(there.map((i) => i.code).sort()).toEqual(["CA-1", "FC-5", "FC-6", "SH-4", "XR-1"]);
  });
});

describe("GET /api/v1/storage-plan: capacity", () => {
  it("leaves out units whose internal volume cannot hold what they hold plus the amount, and says so when nothing fits", async () => {
    const response = await plan(researcher, { substanceId: substanceId(WATER), amount: 200, amountUnit: "L", limit: 50 });
    expect(response.status).toBe(200);
    const codes = (response.body.data as Item[]).map((i) => i.code).sort();
    // The demo's litres already stored (sealed, open and in use), plus 200 L, against each unit's internal volume:
    // FR-1 4.7 + 200 > 150 L, FC-3 17.9 + 200 > 110 L, FC-4 16.9 + 200 > 90 L, FZ-1 1.7 + 200 > 200 L, FC-2 51.6 + 200 > 200 L, FC-5 48.8 + 200 > 200 L.
    expect(codes).toEqual(["CA-1", "CC-1", "FC-1", "FC-6", "FSR-1", "FZ-2", "SH-1", "SH-2", "SH-3", "SH-4", "XR-1"]);
    expect(response.body.message).toBeUndefined();

    // A site of its own with one small cabinet: nothing there holds 20 L.
    const site = getDb().insert(sites).values({ name: "Test outstation" }).returning().get();
    const room = getDb().insert(rooms).values({ siteId: site.id, code: "T-1", name: "Test store", kind: "storeroom", floorAreaM2: 10, heightM: 3, airChangesPerHour: 6 }).returning().get();
    getDb().insert(storageUnits).values({ roomId: room.id, code: "TC-1", name: "Small cabinet, test", kind: "flammable_cabinet", internalVolumeL: 10, ventilated: false, ignitionSourceFree: true }).run();
    const none = await plan(researcher, { substanceId: substanceId(WATER), amount: 20, amountUnit: "L", siteId: site.id });
    expect(none.status).toBe(200);
    expect(none.body).toEqual({ data: [], message: "No storage unit has room for 20 L more: every live unit's internal volume is already too full for it." });
    const fits = await plan(researcher, { substanceId: substanceId(WATER), amount: 5000, amountUnit: "mL", siteId: site.id });
    expect((fits.body.data as Item[]).map((i) => i.code)).toEqual(["TC-1"]);
  });

  it("lists live units only", async () => {
    const room = getDb().select().from(rooms).where(eq(rooms.code, "2.107")).get()!;
    const retired = getDb().insert(storageUnits).values({ roomId: room.id, code: "OLD-1", name: "Retired shelf, test", kind: "open_shelving", ventilated: true, ignitionSourceFree: false, retiredAt: new Date() }).returning().get();
    const items = (await plan(researcher, { substanceId: substanceId(WATER), amount: 1, amountUnit: "L", limit: 50 })).body.data as Item[];
    expect(items.map((i) => i.storageUnitId)).not.toContain(retired.id);
  });
});

describe("GET /api/v1/storage-plan: who may ask, and bad input", () => {
  it("plans moves of a researcher's own containers only, and refuses roles that log no containers", async () => {
    const actor = { id: researcher.id, email: researcher.email, name: researcher.name, role: researcher.role };
    const bottle = createContainer(actor, "own", containerCreateSchema.parse({ label: "SP-W-1", substanceId: substanceId(WATER), amount: 1, amountUnit: "L", storageUnitId: unitId("SH-2"), state: "sealed" }));
    const query = { substanceId: substanceId(WATER), amount: 1, amountUnit: "L", containerId: bottle.id };
    const other = await plan(makeUser("researcher"), query);
    expect(other.status).toBe(403);
    expect(other.body).toEqual({ error: { code: "forbidden", message: "You can plan moves of your own containers only." } });
    // A safety officer may plan anyone's move.
    expect((await plan(makeUser("safety_officer"), query)).status).toBe(200);
    for (const role of ["facilities", "auditor"] as const) {
      const refused = await plan(makeUser(role), query);
      expect(refused.status).toBe(403);
      expect(refused.body.error.code).toBe("forbidden");
    }
    // The owner's own unit is left out, its room counts as near.
    const own = (await plan(researcher, query)).body.data as Item[];
    expect(own.map((i) => i.code)).not.toContain("SH-2");
    expect(own.slice(0, 2).map((i) => `${i.code} ${i.nearness}`)).toEqual(["FC-3 same_room", "FR-1 same_room"]);
  });

  it("answers 400 with field errors and 404 for what does not exist", async () => {
    const both = await plan(researcher, { substanceId: substanceId(WATER), mixtureId: 1, amount: 1, amountUnit: "L" });
    expect(both.status).toBe(400);
    expect(both.body.error.fields).toEqual({ substanceId: ["Give a substanceId or a mixtureId (one of them)."] });
    const neither = await plan(researcher, { amount: 1, amountUnit: "L" });
    expect(neither.body.error.fields).toEqual({ substanceId: ["Give a substanceId or a mixtureId (one of them)."] });
    const bad = await plan(researcher, { substanceId: substanceId(WATER), amount: 0, amountUnit: "gallon", limit: 51 });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["amount", "amountUnit", "limit"]);
    expect(bad.body.error.fields.amountUnit).toEqual(["amountUnit must be one of: mL, L, g, kg."]);

    const unknown = await plan(researcher, { substanceId: 9_999_999, amount: 1, amountUnit: "L" });
    expect(unknown.status).toBe(404);
    expect(unknown.body).toEqual({ error: { code: "not_found", message: "No substance with id 9999999." } });
    const noMixture = await plan(researcher, { mixtureId: 9_999_999, amount: 1, amountUnit: "L" });
    expect(noMixture.body).toEqual({ error: { code: "not_found", message: "No mixture with id 9999999." } });
    const noContainer = await plan(researcher, { substanceId: substanceId(WATER), amount: 1, amountUnit: "L", containerId: 9_999_999 });
    expect(noContainer.status).toBe(404);
    expect(noContainer.body.error.message).toBe("No container with id 9999999.");
  });
});

describe("POST /api/v1/assessments/preview: safer places", () => {
  it("offers up to five places safer than the unit looked at, best first, computed in the same request", async () => {
    const response = await preview(researcher, { storageUnitId: unitId("FR-1"), substanceId: substanceId(DMF), amount: 1, amountUnit: "L" });
    expect(response.status).toBe(200);
    const data = response.body.data;
    // The litre of N,N-dimethylformamide logged in FR-1 above stands there, flagged.
    expect(data.verdict).toBe("already_flagged");
    const alternatives = data.alternatives as Item[];
    expect(alternatives.length).toBeGreaterThan(0);
    expect(alternatives.length).toBeLessThanOrEqual(5);
    expect(alternatives[0]).toMatchObject({ code: "FC-3", roomCode: "2.107", verdict: "no_findings", nearness: "same_room", reason: "Nothing would be raised here." });
    expect(alternatives.map((a) => a.code)).not.toContain("FR-1");
    expectRanked(alternatives);
  });

  it("offers FSR-1 for diethyl ether in FR-1, and nothing when nothing is flagged", async () => {
    const ether = await preview(researcher, { storageUnitId: unitId("FR-1"), substanceId: substanceId(ETHER), amount: 1, amountUnit: "L" });
    expect(ether.body.data.verdict).toBe("already_flagged");
    // Already critical in FR-1; only places flagged less than that are safer.
    expect((ether.body.data.alternatives as Item[])[0]).toMatchObject({ code: "FSR-1", verdict: "already_flagged", worstSeverity: "high" });
    expect((ether.body.data.alternatives as Item[]).every((a) => a.worstSeverity !== "critical")).toBe(true);

    const water = await preview(researcher, { storageUnitId: unitId("FC-3"), substanceId: substanceId(WATER), amount: 0.5, amountUnit: "L" });
    expect(water.body.data).toMatchObject({ verdict: "no_findings", alternatives: [] });
  });
});

describe("the finding page's moves", () => {
  it("offers the largest contributing containers a safer unit, to the people who may move them", async () => {
    const finding = getDb()
      .select()
      .from(findings)
      .where(and(eq(findings.storageUnitId, unitId("FR-1")), eq(findings.rule, "enclosure-lfl"), eq(findings.scenario, "control_lost"), eq(findings.substanceId, substanceId(ETHER))))
      .get()!;
    const ether = getDb().select().from(containers).where(and(eq(containers.storageUnitId, unitId("FR-1")), eq(containers.substanceId, substanceId(ETHER)))).all();
    const ids = ether.map((c) => c.id);
    const asUser = (user: User) => ({ id: user.id, email: user.email, name: user.name, role: user.role });
    const before = counts();
    const moves = moveSuggestionsForFinding(asUser(makeUser("safety_officer")), finding, ids);
    // The demo's two diethyl ether bottles in FR-1, largest first (0.5 L sealed, 0.444 L opened); FR-1 is critical for them, FSR-1 high.
    expect(moves.map((m) => m.label)).toEqual(["CV-00095", "CV-00094"]);
    expect(moves[0]).toMatchObject({ place: { code: "FSR-1", roomCode: "2.115", worstSeverity: "high" }, summary: "already high there" });
    expect(moves[0].href).toBe(`/inventory/${moves[0].containerId}?moveTo=${unitId("FSR-1")}`);
    expect(moves.every((m) => m.place.worstSeverity !== "critical")).toBe(true);
    // The owner may move them; another researcher and facilities staff get no suggestion.
    expect(moveSuggestionsForFinding(asUser(researcher), finding, ids).map((m) => m.label)).toEqual(["CV-00095", "CV-00094"]);
    expect(moveSuggestionsForFinding(asUser(makeUser("researcher")), finding, ids)).toEqual([]);
    expect(moveSuggestionsForFinding(asUser(makeUser("facilities")), finding, ids)).toEqual([]);
    expect(counts()).toBe(before);
  });
});
