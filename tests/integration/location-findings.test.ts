/**
 * Open findings where people work: a room's panel with its units' findings, a unit's, the findings
 * a container contributes to, the reader's scope, the inventory marker, and the query plans.
 * Demo data, invented.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { containers, excursions, findings, rooms, sensors, sites, storageUnits, substances, type NewFinding, type User } from "@/db/schema";
import {
  CONTAINER_FINDINGS_SQL,
  CONTRIBUTED_ELSEWHERE_SQL,
  openFindingsInRoom,
  openFindingsInUnit,
  openFindingsOfContainer,
  ROOM_FINDINGS_SQL,
  UNIT_FINDINGS_SQL,
  openFindingsContributedElsewhere,
  worstOpenSeverityByContainer,
} from "@/db/queries/location-findings";
import { overviewCounts } from "@/db/queries/overview";
import { explainStatements } from "@/bench/lib/query-plan";
import * as containersRoute from "@/app/api/v1/containers/route";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

let officer: User, owner: User, neighbour: User, contact: User, auditor: User;
let siteId: number, roomId: number, otherRoomId: number, fridgeId: number, shelfId: number, otherUnitId: number;
let etherId: number, acetoneId: number;
let smallEther: number, largeEther: number, acetone: number, emptyEther: number, elsewhereEther: number;
const ids: Record<string, number> = {};

function finding(key: string, values: Partial<NewFinding> & Pick<NewFinding, "severity" | "title">) {
  ids[key] = getDb()
    .insert(findings)
    .values({ fingerprint: `test|${key}`, rule: "enclosure-lfl", scenario: "control_lost", siteId, roomId, ...values })
    .returning({ id: findings.id })
    .get().id;
}

beforeAll(() => {
  const db = getDb();
  officer = makeUser("safety_officer");
  owner = makeUser("researcher");
  neighbour = makeUser("researcher");
  contact = makeUser("facilities");
  auditor = makeUser("auditor");
  siteId = db.insert(sites).values({ name: "Panel campus" }).returning().get().id;
  roomId = db.insert(rooms).values({ siteId, code: "P-1", name: "Solvent store", facilitiesContactId: contact.id }).returning().get().id;
  otherRoomId = db.insert(rooms).values({ siteId, code: "P-2", name: "Teaching lab" }).returning().get().id;
  fridgeId = db.insert(storageUnits).values({ roomId, code: "FR-1", name: "Fridge", kind: "domestic_refrigerator", setMaxC: 8 }).returning().get().id;
  shelfId = db.insert(storageUnits).values({ roomId, code: "SH-1", name: "Shelf", kind: "open_shelving", ownerId: neighbour.id }).returning().get().id;
  otherUnitId = db.insert(storageUnits).values({ roomId: otherRoomId, code: "SH-2", name: "Shelf", kind: "open_shelving" }).returning().get().id;
  const substance = (cas: string, name: string) =>
    db.insert(substances).values({ cas, name, molarMassGPerMol: 74.12 }).returning({ id: substances.id }).get().id;
  etherId = substance("9999-10-1", "panel ether (invented)");
  acetoneId = substance("9999-10-2", "panel ketone (invented)");
  const container = (label: string, values: Partial<typeof containers.$inferInsert>) =>
    db.insert(containers).values({ label, amount: 500, amountUnit: "mL", storageUnitId: fridgeId, substanceId: etherId, ...values }).returning({ id: containers.id }).get().id;
  smallEther = container("PNL-SMALL", { ownerId: owner.id, amount: 250 });
  largeEther = container("PNL-LARGE", { ownerId: neighbour.id, amount: 2500 });
  acetone = container("PNL-KET", { ownerId: owner.id, substanceId: acetoneId, storageUnitId: shelfId });
  emptyEther = container("PNL-EMPTY", { ownerId: owner.id, amount: 0, state: "empty" });
  elsewhereEther = container("PNL-ELSE", { ownerId: owner.id, storageUnitId: otherUnitId });

  // The fridge's ether finding records the largest container; the room's spill finding of ether too.
  finding("fridgeEther", { severity: "critical", title: "Ether in FR-1 could reach 210 % LFL", storageUnitId: fridgeId, containerId: largeEther, substanceId: etherId, value: 210, limitValue: 100, ratio: 2.1, unit: "% LFL" });
  finding("roomSpill", { severity: "high", scenario: "spill", rule: "spill-exposure", title: "A spill of ether in P-1 could exceed its STEL", containerId: largeEther, substanceId: etherId, value: 900, limitValue: 500, ratio: 1.8, unit: "ppm" });
  finding("shelfKetone", { severity: "moderate", scenario: "in_control", title: "Ketone on SH-1 within 5 °C of its flash point", storageUnitId: shelfId, containerId: acetone, substanceId: acetoneId, value: 20, limitValue: 23, unit: "°C" });
  finding("roomQuantity", { severity: "low", scenario: "room_worst_case", rule: "quantity-limit", title: "P-1 holds 85 % of its class IB limit", value: 85, limitValue: 100, ratio: 0.85, unit: "L" });
  finding("resolvedFridge", { severity: "critical", title: "Ether in FR-1 (resolved)", storageUnitId: fridgeId, containerId: smallEther, substanceId: etherId, status: "resolved", resolvedAt: new Date() });
  finding("accepted", { severity: "moderate", title: "Ether in FR-1 in control", scenario: "in_control", storageUnitId: fridgeId, substanceId: etherId, status: "risk_accepted", ratio: 0.3 });
  finding("elsewhere", { severity: "high", title: "Ether on SH-2", roomId: otherRoomId, storageUnitId: otherUnitId, containerId: elsewhereEther, substanceId: etherId });

  // One open excursion in the contact's room, one on a shelf in the other room, one over and acknowledged.
  const roomSensor = db.insert(sensors).values({ externalId: "PNL-LOG-1", name: "Store logger", roomId }).returning().get().id;
  const shelfSensor = db.insert(sensors).values({ externalId: "PNL-LOG-2", name: "Shelf logger", storageUnitId: otherUnitId }).returning().get().id;
  const at = (iso: string) => new Date(iso);
  db.insert(excursions)
    .values([
      { sensorId: roomSensor, roomId, thresholdC: 25, startAt: at("2026-07-01T10:00:00Z"), peakTempC: 29, peakAt: at("2026-07-01T12:00:00Z") },
      { sensorId: shelfSensor, storageUnitId: otherUnitId, thresholdC: 25, startAt: at("2026-07-02T10:00:00Z"), peakTempC: 27, peakAt: at("2026-07-02T11:00:00Z") },
      { sensorId: roomSensor, roomId, thresholdC: 25, startAt: at("2026-06-01T10:00:00Z"), endAt: at("2026-06-01T11:00:00Z"), peakTempC: 26, peakAt: at("2026-06-01T10:30:00Z"), acknowledgedAt: at("2026-06-02T08:00:00Z") },
    ])
    .run();
});

const titles = (here: { items: { id: number }[] }) => here.items.map((item) => Object.entries(ids).find(([, id]) => id === item.id)?.[0]);

describe("a room's open findings", () => {
  it("include its units' findings, worst first, each with its unit, and leave resolved findings out", () => {
    const here = openFindingsInRoom(officer, "all", roomId);
    // Two moderate findings: the one with a ratio to its limit before the one without.
    expect(titles(here)).toEqual(["fridgeEther", "roomSpill", "accepted", "shelfKetone", "roomQuantity"]);
    expect(here.items.map((item) => item.unitCode)).toEqual(["FR-1", null, "FR-1", "SH-1", null]);
    expect(here.items[0]).toMatchObject({ severity: "critical", value: 210, limit: 100, ratio: 2.1, unit: "% LFL", scenario: "control_lost", storageUnitId: fridgeId });
    expect(here.hidden).toEqual({ count: 0, worst: null });
  });

  it("list for facilities staff only the findings of the rooms they are the contact for, and count the rest", () => {
    expect(titles(openFindingsInRoom(contact, "own", roomId))).toHaveLength(5);
    const elsewhere = openFindingsInRoom(contact, "own", otherRoomId);
    expect(elsewhere.items).toEqual([]);
    expect(elsewhere.hidden).toEqual({ count: 1, worst: "high" });
  });

  it("list for a researcher the findings their containers contribute to and those of their units", () => {
    // The owner's small ether bottle adds to the fridge's and the room's ether findings (recorded on
    // the neighbour's large bottle) and to the room's quantity; their ketone is on the shelf.
    const here = openFindingsInRoom(owner, "own", roomId);
    expect(titles(here)).toEqual(["fridgeEther", "roomSpill", "accepted", "shelfKetone", "roomQuantity"]);
    expect(here.hidden).toEqual({ count: 0, worst: null });
    // The neighbour owns the shelf and the large bottle.
    expect(titles(openFindingsInRoom(neighbour, "own", roomId))).toEqual(["fridgeEther", "roomSpill", "accepted", "shelfKetone", "roomQuantity"]);
    // Nobody's container in the other room but the owner's: the neighbour sees nothing there and is told so.
    expect(openFindingsInRoom(neighbour, "own", otherRoomId).hidden).toEqual({ count: 1, worst: "high" });
  });
});

describe("a storage unit's open findings", () => {
  it("are the unit's own, not the room's or another unit's, and not resolved ones", () => {
    expect(titles(openFindingsInUnit(officer, "all", fridgeId))).toEqual(["fridgeEther", "accepted"]);
    expect(titles(openFindingsInUnit(officer, "all", shelfId))).toEqual(["shelfKetone"]);
  });
});

describe("the findings a container contributes to", () => {
  it("match the finding that records it and the findings of its contents in its unit and its room", () => {
    // The small bottle is recorded by none (the resolved one aside), yet it adds to the fridge's ether.
    expect(titles(openFindingsOfContainer(officer, "all", smallEther)!)).toEqual(["fridgeEther", "roomSpill", "accepted"]);
    expect(titles(openFindingsOfContainer(officer, "all", largeEther)!)).toEqual(["fridgeEther", "roomSpill", "accepted"]);
    expect(titles(openFindingsOfContainer(officer, "all", acetone)!)).toEqual(["shelfKetone"]);
    expect(titles(openFindingsOfContainer(officer, "all", elsewhereEther)!)).toEqual(["elsewhere"]);
  });

  it("leave out an empty container, which assessments do not count", () => {
    expect(openFindingsOfContainer(officer, "all", emptyEther)!.items).toEqual([]);
  });

  it("are in the scope of the container's owner, and counted, not described, for another researcher", () => {
    const mine = openFindingsOfContainer(owner, "own", smallEther)!;
    expect(titles(mine)).toEqual(["fridgeEther", "roomSpill", "accepted"]);
    expect(mine.hidden).toEqual({ count: 0, worst: null });
    const stranger = openFindingsOfContainer(makeUser("researcher"), "own", smallEther)!;
    expect(stranger.items).toEqual([]);
    expect(stranger.hidden).toEqual({ count: 3, worst: "critical" });
  });

  it("answer null for a container that does not exist", () => {
    expect(openFindingsOfContainer(officer, "all", 999_999)).toBeNull();
  });
});

describe("the inventory's marker", () => {
  it("is the worst open finding a container contributes to; for others' containers only what the reader may open", () => {
    const all = worstOpenSeverityByContainer(officer, "all", [smallEther, acetone, emptyEther, elsewhereEther]);
    expect(Object.fromEntries(all)).toEqual({ [smallEther]: "critical", [acetone]: "moderate", [elsewhereEther]: "high" });
    // The owner's own small bottle counts the fridge's critical finding; the neighbour's large one
    // shows it too, since the owner's bottle adds to it; a stranger's view of it shows nothing.
    const mine = worstOpenSeverityByContainer(owner, "own", [smallEther, largeEther, acetone]);
    expect(Object.fromEntries(mine)).toEqual({ [smallEther]: "critical", [largeEther]: "critical", [acetone]: "moderate" });
    expect(worstOpenSeverityByContainer(makeUser("researcher"), "own", [largeEther]).size).toBe(0);
    expect(worstOpenSeverityByContainer(owner, null, [smallEther]).size).toBe(0);
  });
});

describe("the container list", () => {
  it("filters to the reader's own containers and marks each with the worst open finding it contributes to", async () => {
    const cookie = await sessionCookieFor(owner);
    const mine = await call(containersRoute.GET, { path: "/api/v1/containers?mine=1&sort=label&dir=asc&q=PNL", cookie });
    expect(mine.status).toBe(200);
    expect(mine.body.data.map((row: { label: string; openFindingSeverity: string | null }) => [row.label, row.openFindingSeverity])).toEqual([
      ["PNL-ELSE", "high"],
      ["PNL-EMPTY", null],
      ["PNL-KET", "moderate"],
      ["PNL-SMALL", "critical"],
    ]);
    const everyone = await call(containersRoute.GET, { path: "/api/v1/containers?sort=label&dir=asc&q=PNL-LARGE", cookie });
    // The neighbour's bottle: its findings are in this reader's view, since their small bottle adds to them.
    expect(everyone.body.data.map((row: { label: string; openFindingSeverity: string | null }) => [row.label, row.openFindingSeverity])).toEqual([["PNL-LARGE", "critical"]]);
  });
});

describe("query plans", () => {
  it("start every panel query from an index of findings", () => {
    const sqlite = getDb().$client;
    const plans = explainStatements(sqlite, () => {
      sqlite.prepare(ROOM_FINDINGS_SQL).all({ mode: "all", userId: officer.id, roomId });
      sqlite.prepare(UNIT_FINDINGS_SQL).all({ mode: "all", userId: officer.id, storageUnitId: fridgeId });
      sqlite
        .prepare(CONTAINER_FINDINGS_SQL)
        .all({ mode: "researcher", userId: owner.id, containerId: smallEther, storageUnitId: fridgeId, roomId, substanceId: etherId, mixtureId: null, live: 1 });
    });
    const [room, unit, container] = plans.map((p) => p.plan.join("\n"));
    expect(room).toMatch(/SEARCH f USING INDEX findings_room_unit_idx \(room_id=\?\)/);
    expect(unit).toMatch(/SEARCH f USING (COVERING )?INDEX findings_unit_subject_rule_idx \(storage_unit_id=\?/);
    expect(container).toMatch(/SEARCH findings USING (COVERING )?INDEX findings_container_idx \(container_id=\?\)/);
    expect(container).toMatch(/SEARCH findings USING (COVERING )?INDEX findings_unit_subject_rule_idx \(storage_unit_id=\?/);
    expect(container).toMatch(/SEARCH findings USING INDEX findings_room_unit_idx \(room_id=\? AND storage_unit_id=\?\)/);
    for (const plan of [room, unit, container]) expect(plan).not.toMatch(/SCAN f\b|SCAN findings/);
  });

  it("reach the findings of a researcher's containers through their owner index and the findings indexes", () => {
    const sqlite = getDb().$client;
    const [elsewhere] = explainStatements(sqlite, () => {
      sqlite.prepare(CONTRIBUTED_ELSEWHERE_SQL).all({ mode: "researcher", userId: owner.id });
    }).map((p) => p.plan.join("\n"));
    expect(elsewhere).toMatch(/SEARCH c USING INDEX containers_owner\w*_idx \(owner_id=\?\)/);
    expect(elsewhere).toMatch(/SEARCH f USING (COVERING )?INDEX findings_unit_subject_rule_idx \(storage_unit_id=\?/);
    expect(elsewhere).toMatch(/SEARCH f USING INDEX findings_room_unit_idx \(room_id=\? AND storage_unit_id=\?\)/);
    expect(elsewhere).not.toMatch(/SCAN f\b|SCAN findings|SCAN c\b/);
  });
});

describe("the Overview's counts in each reader's scope", () => {
  it("count for a researcher the findings their containers contribute to, and no excursions", async () => {
    const counts = await overviewCounts(owner, "own");
    // The fridge's ether (critical), the room's spill (high), the ketone (moderate), the room's
    // quantity (low) and their bottle on SH-2 (high); risk accepted and resolved are not counted.
    expect(counts.openFindings).toEqual({ critical: 1, high: 2, moderate: 1, low: 1 });
    expect(counts).toMatchObject({ openExcursions: 0, unacknowledgedExcursions: 0, allOpenExcursions: 0, myContainers: 4, myUnits: 0, myRooms: 0 });
  });

  it("count for a safety officer and an auditor the whole register and every excursion", async () => {
    // Risk accepted is not counted as needing attention.
    for (const reader of [officer, auditor]) {
      const counts = await overviewCounts(reader, "all");
      expect(counts.openFindings).toEqual({ critical: 1, high: 2, moderate: 1, low: 1 });
      expect(counts).toMatchObject({ openExcursions: 2, unacknowledgedExcursions: 2, allOpenExcursions: 2 });
    }
  });

  it("count for facilities staff the findings and excursions of the rooms they are the contact for", async () => {
    const counts = await overviewCounts(contact, "own");
    expect(counts.openFindings).toEqual({ critical: 1, high: 1, moderate: 1, low: 1 });
    expect(counts).toMatchObject({ openExcursions: 1, unacknowledgedExcursions: 1, allOpenExcursions: 2, myRooms: 1, myUnits: 0 });
  });

  it("leave nothing a researcher's containers add to outside their scope", () => {
    // The fridge's ether and the room's spill name the neighbour's large bottle, and are in the owner's scope.
    expect(openFindingsContributedElsewhere(owner)).toEqual({ count: 0, worst: null });
    expect(openFindingsContributedElsewhere(neighbour)).toEqual({ count: 0, worst: null });
  });
});
