/**
 * The register people act on, against the seeded demo organisation (invented data): one line per
 * problem, the by-location view, the list filters and search, and one step on many findings.
 * Check values come from the demo inventory (db/seed/demo.ts) as the rules assess it.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, count, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { containers, findingEvents, findings, rooms, storageUnits, substances, users, type User } from "@/db/schema";
import { countFindingsBySeverity, listFindingLinesPage, listFindingLocations, type FindingListRow } from "@/db/queries/findings";
import * as listRoute from "@/app/api/v1/findings/route";
import * as bulkRoute from "@/app/api/v1/findings/events/route";
import { findingListQuerySchema } from "@/lib/register/schemas";
import { lineValues } from "@/lib/register/grouping";
import { call, sessionCookieFor } from "./helpers/world";

const SEEDED_AT = Date.parse("2026-12-02T09:07:00Z");
let officer: User, researcher: User;

const user = (email: string) => getDb().select().from(users).where(eq(users.email, email)).get()!;
const unitId = (code: string) => getDb().select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
const roomId = (code: string) => getDb().select({ id: rooms.id }).from(rooms).where(eq(rooms.code, code)).get()!.id;
const substanceId = (name: string) => getDb().select({ id: substances.id }).from(substances).where(eq(substances.name, name)).get()!.id;
const openCount = () => getDb().select({ n: count() }).from(findings).where(eq(findings.status, "open")).get()!.n;
const query = (raw: Record<string, string>) => findingListQuerySchema.parse(raw);

async function list(who: User, params: Record<string, string>): Promise<{ total: number; data: FindingListRow[] }> {
  const all: FindingListRow[] = [];
  let total = 0;
  for (let page = 1; ; page++) {
    const search = new URLSearchParams({ ...params, pageSize: "100", page: String(page) });
    const res = await call(listRoute.GET, { path: `/api/v1/findings?${search}`, cookie: await sessionCookieFor(who) });
    expect(res.status).toBe(200);
    total = res.body.total;
    all.push(...res.body.data);
    if (all.length >= total) break;
  }
  return { total, data: all };
}

beforeAll(async () => {
  expect(await seedDemo(getDb(), { bcryptCost: 4, nowMs: SEEDED_AT })).toBe(true);
  officer = user("safety@example.org");
  researcher = user("researcher@example.org");
}, 120_000);

describe("one line per problem", () => {
  it("puts every open finding on exactly one line, headed by its worst scenario", () => {
    const open = openCount();
    expect(open).toBeGreaterThan(100);
    const seen: number[] = [];
    let lines = 0;
    for (let page = 1; ; page++) {
      const result = listFindingLinesPage(officer, "all", query({ status: "open", page: String(page), pageSize: "100" }));
      expect(result.findings).toBe(open);
      lines += result.lines.length;
      for (const line of result.lines) seen.push(...line.findingIds);
      if (page * 100 >= result.total) {
        expect(lines).toBe(result.total);
        break;
      }
    }
    expect(seen.length).toBe(open);
    expect(new Set(seen).size).toBe(open);
    // Fewer lines than findings: the scenarios of one problem share a line.
    expect(lines).toBeLessThan(open);
  });

  it("shows diethyl ether in FR-1 as one line: control lost above in control, with both values", () => {
    const { lines } = listFindingLinesPage(officer, "all", query({ status: "open", storageUnitId: String(unitId("FR-1")), rule: "enclosure-lfl", pageSize: "100" }));
    const ether = lines.find((l) => l.lead.substance?.name === "diethyl ether")!;
    expect(ether.lead.scenario).toBe("control_lost");
    expect(ether.others.map((f) => f.scenario)).toEqual(["in_control"]);
    expect(ether.lead.severity).toBe("critical");
    // The demo's FR-1 (9.6 °C worst case in control, 28 °C with the refrigerator off).
    expect(lineValues(ether)).toMatch(/^4,6\d0 % LFL if control is lost · 2,2\d0 % LFL in control$/);
    // Three enclosure lines in FR-1: acetone, diethyl ether and the open containers together (six findings).
    expect(lines).toHaveLength(3);
    expect(lines.reduce((n, l) => n + l.findingIds.length, 0)).toBe(6);
  });

  it("grades a liquid above its flash point in a flammable-storage refrigerator or a closed cabinet as information (low)", () => {
    const ignitionFree = getDb().select({ id: storageUnits.id }).from(storageUnits).where(and(eq(storageUnits.ignitionSourceFree, true), eq(storageUnits.ventilated, false))).all().map((u) => u.id);
    const flash = getDb().select({ severity: findings.severity }).from(findings).where(and(eq(findings.rule, "flash-point"), inArray(findings.storageUnitId, ignitionFree))).all();
    expect(flash.length).toBeGreaterThan(0);
    expect(new Set(flash.map((f) => f.severity))).toEqual(new Set(["low"]));
    // A domestic refrigerator (FR-1) keeps its ignition sources: still moderate there.
    const fr1 = getDb().select({ severity: findings.severity }).from(findings).where(and(eq(findings.rule, "flash-point"), eq(findings.storageUnitId, unitId("FR-1")))).all();
    expect(new Set(fr1.map((f) => f.severity))).toEqual(new Set(["moderate"]));
  });
});

describe("the register by location", () => {
  it("gives each room and unit its worst severity and counts that add up to the open findings", () => {
    const locations = listFindingLocations(officer, "all", query({ status: "open" }));
    const sum = locations.reduce((n, l) => n + l.total, 0);
    expect(sum).toBe(openCount());
    for (const l of locations) expect(l.counts.critical + l.counts.high + l.counts.moderate + l.counts.low).toBe(l.total);
    const bySeverity = countFindingsBySeverity(officer, "all", query({ status: "open" }));
    for (const severity of ["critical", "high", "moderate", "low"] as const) {
      expect(locations.reduce((n, l) => n + l.counts[severity], 0)).toBe(bySeverity[severity]);
    }
    const fr1 = locations.find((l) => l.label === "2.107 › FR-1")!;
    expect(fr1.worst).toBe("critical");
    expect(fr1.top.severity).toBe("critical");
    expect(fr1.top.title).toMatch(/^Open containers in FR-1 could reach 5,?2\d0 % LFL together/);
    // Worst locations first.
    expect(locations[0].worst).toBe("critical");
  });
});

describe("register filters and search", () => {
  it("a room's filter includes its units' findings, and searching the room's code finds them all", async () => {
    const b014 = roomId("B-014");
    const byRoom = await list(officer, { status: "open", roomId: String(b014) });
    const inDb = getDb().select({ n: count() }).from(findings).where(and(eq(findings.status, "open"), eq(findings.roomId, b014))).get()!.n;
    expect(byRoom.total).toBe(inDb);
    const cabinets = byRoom.data.filter((f) => f.location.unitCode !== null);
    expect(cabinets.length).toBeGreaterThan(0);
    expect(new Set(cabinets.map((f) => f.location.unitCode))).toContain("FC-1");
    const searched = await list(officer, { status: "open", q: "B-014" });
    expect(searched.total).toBe(byRoom.total);
    expect(new Set(searched.data.map((f) => f.id))).toEqual(new Set(byRoom.data.map((f) => f.id)));
    // A unit's code finds that unit's findings.
    const fc1 = await list(officer, { status: "open", q: "fc-1" });
    expect(fc1.data.every((f) => f.location.unitCode === "FC-1" || f.title.toLowerCase().includes("fc-1"))).toBe(true);
    expect(fc1.total).toBe((await list(officer, { status: "open", storageUnitId: String(unitId("FC-1")) })).total);
  });

  it("filters by substance, by container (the findings it contributes to) and by the user's own containers", async () => {
    const ether = substanceId("diethyl ether");
    const bySubstance = await list(officer, { status: "open", substanceId: String(ether) });
    expect(bySubstance.total).toBeGreaterThan(0);
    expect(bySubstance.data.every((f) => f.substance?.id === ether)).toBe(true);
    // An ether bottle in FR-1: its substance's findings there, the open containers together if
    // it is open, and the room's own ether findings (spills).
    const bottle = getDb().select().from(containers).where(and(eq(containers.storageUnitId, unitId("FR-1")), eq(containers.substanceId, ether))).get()!;
    const byContainer = await list(officer, { status: "open", containerId: String(bottle.id) });
    const fr1 = unitId("FR-1");
    for (const f of byContainer.data) {
      const here = f.location.storageUnitId === fr1 || (f.location.storageUnitId === null && f.location.roomId === roomId("2.107"));
      expect(here).toBe(true);
      expect(f.substance === null || f.substance.id === ether).toBe(true);
    }
    expect(byContainer.data.filter((f) => f.substance?.id === ether && f.location.storageUnitId === fr1).map((f) => `${f.rule} ${f.scenario}`).sort()).toEqual([
      "enclosure-lfl control_lost",
      "enclosure-lfl in_control",
      "flash-point control_lost",
      "flash-point in_control",
      "ignition-source-unit in_control",
    ]);
    // mine=true: the researcher's own containers only (the demo's researcher owns 118 of them).
    const mine = await list(researcher, { status: "open", mine: "true" });
    expect(mine.total).toBeGreaterThan(0);
    const owned = getDb().select().from(containers).where(eq(containers.ownerId, researcher.id)).all().filter((c) => c.state !== "empty" && c.state !== "disposed");
    const unitRoom = new Map(getDb().select({ id: storageUnits.id, roomId: storageUnits.roomId }).from(storageUnits).all().map((u) => [u.id, u.roomId]));
    for (const f of mine.data) {
      const touches = owned.some(
        (c) =>
          c.id === f.containerId ||
          ((c.storageUnitId === f.location.storageUnitId || (f.location.storageUnitId === null && unitRoom.get(c.storageUnitId) === f.location.roomId)) &&
            (f.substance === null || f.substance.id === c.substanceId || f.mixture?.id === c.mixtureId)),
      );
      expect(touches).toBe(true);
    }
    // Not every finding: others' containers stay out (the officer owns the rest of the demo's containers).
    expect(mine.total).toBeLessThan(openCount());
    expect((await call(listRoute.GET, { path: "/api/v1/findings?mine=yes", cookie: await sessionCookieFor(researcher) })).status).toBe(400);
  });
});

describe("POST /api/v1/findings/events", () => {
  const post = async (who: User, body: unknown) => call(bulkRoute.POST, { method: "POST", path: "/api/v1/findings/events", body, cookie: await sessionCookieFor(who) });
  const statusOf = (id: number) => getDb().select({ status: findings.status }).from(findings).where(eq(findings.id, id)).get()!.status;
  const eventsOf = (id: number) => getDb().select().from(findingEvents).where(eq(findingEvents.findingId, id)).all();

  it("lets a researcher acknowledge their own findings and refuses the others' one by one, keeping nothing of a refused one", async () => {
    const own = (await list(researcher, { status: "open" })).data.slice(0, 3).map((f) => f.id);
    expect(own).toHaveLength(3);
    const ownSet = new Set((await list(researcher, { status: "all" })).data.map((f) => f.id));
    const others = getDb().select({ id: findings.id }).from(findings).where(eq(findings.status, "open")).all().map((f) => f.id).filter((id) => !ownSet.has(id)).slice(0, 2);
    expect(others).toHaveLength(2);
    const eventsBefore = others.map((id) => eventsOf(id).length);
    const res = await post(researcher, { findingIds: [own[0], others[0], own[1], others[1], own[2]], kind: "acknowledge", note: "Seen in the weekly walk-round." });
    expect(res.status).toBe(200);
    expect(res.body.data.map((r: { findingId: number; ok: boolean }) => [r.findingId, r.ok])).toEqual([
      [own[0], true],
      [others[0], false],
      [own[1], true],
      [others[1], false],
      [own[2], true],
    ]);
    expect(res.body.data[1].error).toEqual({ code: "not_found", message: "No such finding, or it is not on a location you look after." });
    for (const id of own) expect(statusOf(id)).toBe("acknowledged");
    for (const [i, id] of others.entries()) {
      expect(statusOf(id)).toBe("open");
      expect(eventsOf(id)).toHaveLength(eventsBefore[i]);
    }
    // Again: the acknowledged ones are refused with a conflict of their own, nothing else changes.
    const again = await post(researcher, { findingIds: own, kind: "acknowledge" });
    expect(again.status).toBe(200);
    expect(again.body.data.every((r: { ok: boolean; error?: { code: string } }) => !r.ok && r.error?.code === "conflict")).toBe(true);
    expect(own.map((id) => eventsOf(id).filter((e) => e.kind === "acknowledged").length)).toEqual([1, 1, 1]);
  });

  it("takes a step on a whole page of the flat list (every finding), each finding once, and on nothing else", async () => {
    // The flat view's page box selects the ids of the page it shows: page 2 of the researcher's findings, worst first.
    const page = async (n: number) => {
      const res = await call(listRoute.GET, { path: `/api/v1/findings?status=all&sort=severity&dir=desc&pageSize=10&page=${n}`, cookie: await sessionCookieFor(researcher) });
      expect(res.status).toBe(200);
      return (res.body.data as FindingListRow[]).map((f) => f.id);
    };
    const [first, second] = [await page(1), await page(2)];
    expect(second).toHaveLength(10);
    expect(second.filter((id) => first.includes(id))).toEqual([]);
    const note = "Checked on the walk-round of 2026-12-03.";
    const commentsWith = (id: number) => eventsOf(id).filter((e) => e.kind === "comment" && e.note === note).length;
    const res = await post(researcher, { findingIds: second, kind: "comment", note });
    expect(res.status).toBe(200);
    expect(res.body.data.map((r: { findingId: number; ok: boolean }) => [r.findingId, r.ok])).toEqual(second.map((id) => [id, true]));
    expect(second.map(commentsWith)).toEqual(Array(10).fill(1));
    expect(first.map(commentsWith)).toEqual(Array(first.length).fill(0));
  });

  it("refuses a step the role may not take (403), bad input (400), and writes nothing", async () => {
    const ids = (await list(officer, { status: "open" })).data.slice(0, 2).map((f) => f.id);
    const before = ids.map(statusOf);
    expect((await post(researcher, { findingIds: ids, kind: "accept_risk", justification: "x", reviewDate: "2027-06-01" })).status).toBe(403);
    expect((await post(researcher, { findingIds: ids, kind: "start_mitigation", plan: "Move", assigneeId: researcher.id })).status).toBe(403);
    const empty = await post(officer, { findingIds: [], kind: "comment", note: "x" });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields.findingIds).toEqual(["Choose at least one finding."]);
    const tooMany = await post(officer, { findingIds: Array.from({ length: 501 }, (_, i) => i + 1), kind: "comment", note: "x" });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.fields.findingIds).toEqual(["At most 500 findings at once."]);
    expect((await post(officer, { findingIds: [ids[0], ids[0]], kind: "comment", note: "x" })).status).toBe(400);
    expect((await post(officer, { findingIds: ids, kind: "resolve", note: "x" })).status).toBe(400);
    // A review date in the past is wrong for every finding: 400, and none is touched.
    const past = await post(officer, { findingIds: ids, kind: "accept_risk", justification: "Kept for the week's synthesis.", reviewDate: "2020-01-01" });
    expect(past.status).toBe(400);
    expect(ids.map(statusOf)).toEqual(before);
  });

  it("lets a safety officer accept the risk of a whole line with one justification and review date", async () => {
    const { lines } = listFindingLinesPage(officer, "all", query({ status: "open", storageUnitId: String(unitId("FSR-1")), pageSize: "100" }));
    const line = lines.find((l) => l.findingIds.length > 1)!;
    const res = await post(officer, { findingIds: line.findingIds, kind: "accept_risk", justification: "Rated unit; quantities reviewed with the lab head.", reviewDate: "2027-06-01" });
    expect(res.status).toBe(200);
    expect(res.body.data.every((r: { ok: boolean }) => r.ok)).toBe(true);
    for (const id of line.findingIds) {
      expect(statusOf(id)).toBe("risk_accepted");
      const last = eventsOf(id).at(-1)!;
      expect(last).toMatchObject({ kind: "risk_accepted", note: "Rated unit; quantities reviewed with the lab head.", actorId: officer.id });
      expect(last.data).toEqual({ reviewDate: "2027-06-01" });
    }
  });
});
