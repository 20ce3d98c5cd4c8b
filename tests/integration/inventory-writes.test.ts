/**
 * Roles and ownership on every write endpoint of inventory and locations: a refused write answers
 * 403 (or 400/409) and changes nothing; moves keep history and are audited.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { auditEvents, containerMoves, containers, rooms, storageUnits, substances, users, type Role } from "@/db/schema";
import * as containersRoute from "@/app/api/v1/containers/route";
import * as containerRoute from "@/app/api/v1/containers/[id]/route";
import * as moveRoute from "@/app/api/v1/containers/[id]/move/route";
import * as stateRoute from "@/app/api/v1/containers/[id]/state/route";
import * as roomsRoute from "@/app/api/v1/rooms/route";
import * as roomRoute from "@/app/api/v1/rooms/[id]/route";
import * as unitsRoute from "@/app/api/v1/storage-units/route";
import * as sitesRoute from "@/app/api/v1/sites/route";
import * as mixturesRoute from "@/app/api/v1/mixtures/route";
import * as substanceRoute from "@/app/api/v1/substances/[id]/route";
import { call, sessionCookieFor } from "./helpers/world";

const cookies = {} as Record<Role, string>;
const userIds = {} as Record<Role, number>;
let unit: Record<string, number>;
let acetoneId: number;
let ethanolId: number;

function unitId(code: string): number {
  return unit[code];
}

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  for (const role of ["admin", "safety_officer", "researcher", "facilities", "auditor"] as Role[]) {
    const row = getDb().select().from(users).where(eq(users.role, role)).get()!;
    userIds[role] = row.id;
    cookies[role] = await sessionCookieFor(row);
  }
  unit = Object.fromEntries(getDb().select({ id: storageUnits.id, code: storageUnits.code }).from(storageUnits).all().map((u) => [u.code, u.id]));
  acetoneId = getDb().select().from(substances).where(eq(substances.cas, "67-64-1")).get()!.id;
  ethanolId = getDb().select().from(substances).where(eq(substances.cas, "64-17-5")).get()!.id;
});

let labelCounter = 0;
function newContainer(overrides: Record<string, unknown> = {}) {
  labelCounter += 1;
  return { label: `T-${labelCounter.toString().padStart(5, "0")}`, substanceId: acetoneId, amount: 2.5, amountUnit: "L", storageUnitId: unitId("FC-1"), ...overrides };
}

async function create(role: Role, body: Record<string, unknown>) {
  return call(containersRoute.POST, { method: "POST", body, cookie: cookies[role] });
}

function containerRow(id: number) {
  return getDb().select().from(containers).where(eq(containers.id, id)).get()!;
}

describe("containers: create", () => {
  it("a researcher logs a container and owns it; the first placement is history and the creation is audited", async () => {
    const response = await create("researcher", newContainer({ capacity: 4, capacityUnit: "L", state: "opened" }));
    expect(response.status).toBe(201);
    expect(response.body.data).toMatchObject({ ownerId: userIds.researcher, unitCode: "FC-1", roomCode: "B-014", substanceName: "acetone", state: "opened" });
    expect(response.body.data.openedAt).not.toBeNull();
    expect(response.body.data.moves).toHaveLength(1);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "container"), eq(auditEvents.entityId, String(response.body.data.id)))).all();
    expect(audit.map((a) => a.action)).toEqual(["create"]);
    expect(audit[0].actorId).toBe(userIds.researcher);
  });

  it("a researcher cannot log a container in someone else's name (403, nothing written)", async () => {
    const before = await getDb().$count(containers);
    const response = await create("researcher", newContainer({ ownerId: userIds.safety_officer }));
    expect(response.status).toBe(403);
    expect(await getDb().$count(containers)).toBe(before);
  });

  it.each(["facilities", "auditor"] as Role[])("the %s role may not log containers (403)", async (role) => {
    const before = await getDb().$count(containers);
    expect((await create(role, newContainer())).status).toBe(403);
    expect(await getDb().$count(containers)).toBe(before);
  });

  it("rejects bad input field by field and changes nothing", async () => {
    const before = await getDb().$count(containers);
    const response = await create("safety_officer", { label: "", amount: -1, amountUnit: "gallon", storageUnitId: "x" });
    expect(response.status).toBe(400);
    expect(Object.keys(response.body.error.fields).sort()).toEqual(["amount", "amountUnit", "label", "storageUnitId"]);
    const both = await create("safety_officer", newContainer({ mixtureId: 1 }));
    expect(both.status).toBe(400);
    expect(both.body.error.fields.substanceId[0]).toMatch(/not both/);
    const over = await create("safety_officer", newContainer({ amount: 5, capacity: 4, capacityUnit: "L" }));
    expect(over.body.error.fields.amount[0]).toMatch(/more than the container's capacity/);
    const units = await create("safety_officer", newContainer({ capacity: 4, capacityUnit: "kg" }));
    expect(units.body.error.fields.capacityUnit[0]).toMatch(/both as volumes/);
    const date = await create("safety_officer", newContainer({ receivedAt: "2026-02-30" }));
    expect(date.body.error.fields.receivedAt[0]).toMatch(/date like/);
    const unknownUnit = await create("safety_officer", newContainer({ storageUnitId: 99999 }));
    expect(unknownUnit.status).toBe(400);
    expect(unknownUnit.body.error.fields.storageUnitId).toBeDefined();
    expect(await getDb().$count(containers)).toBe(before);
  });

  it("answers 409 for a label that exists already", async () => {
    const first = newContainer();
    expect((await create("safety_officer", first)).status).toBe(201);
    const again = await create("safety_officer", { ...first });
    expect(again.status).toBe(409);
    expect(again.body.error.fields.label[0]).toMatch(/already exists/);
  });
});

describe("containers: ownership on change", () => {
  let theirs: number;
  let mine: number;

  beforeAll(async () => {
    theirs = (await create("safety_officer", newContainer())).body.data.id;
    mine = (await create("researcher", newContainer())).body.data.id;
  });

  it("a researcher changing someone else's container gets 403 and nothing changes", async () => {
    const before = containerRow(theirs);
    const patch = await call(containerRoute.PATCH, { method: "PATCH", body: { amount: 0.1 }, cookie: cookies.researcher, params: { id: String(theirs) } });
    expect(patch.status).toBe(403);
    const move = await call(moveRoute.POST, { method: "POST", body: { storageUnitId: unitId("FC-2") }, cookie: cookies.researcher, params: { id: String(theirs) } });
    expect(move.status).toBe(403);
    const state = await call(stateRoute.POST, { method: "POST", body: { state: "disposed" }, cookie: cookies.researcher, params: { id: String(theirs) } });
    expect(state.status).toBe(403);
    expect(containerRow(theirs)).toEqual(before);
  });

  it("a researcher edits their own container but cannot hand it to someone else", async () => {
    const ok = await call(containerRoute.PATCH, { method: "PATCH", body: { amount: 1.2, notes: "topped up" }, cookie: cookies.researcher, params: { id: String(mine) } });
    expect(ok.status).toBe(200);
    expect(ok.body.data).toMatchObject({ amount: 1.2, notes: "topped up" });
    const handOver = await call(containerRoute.PATCH, { method: "PATCH", body: { ownerId: userIds.admin }, cookie: cookies.researcher, params: { id: String(mine) } });
    expect(handOver.status).toBe(403);
    expect(containerRow(mine).ownerId).toBe(userIds.researcher);
  });

  it("a safety officer may change anyone's container", async () => {
    const response = await call(containerRoute.PATCH, { method: "PATCH", body: { ownerId: userIds.admin }, cookie: cookies.safety_officer, params: { id: String(mine) } });
    expect(response.status).toBe(200);
    expect(containerRow(mine).ownerId).toBe(userIds.admin);
  });

  it("answers 404 for an unknown container", async () => {
    const response = await call(containerRoute.PATCH, { method: "PATCH", body: { amount: 1 }, cookie: cookies.safety_officer, params: { id: "987654" } });
    expect(response.status).toBe(404);
  });
});

describe("containers: moves and states", () => {
  it("a move keeps history and is audited with where from and where to", async () => {
    const id = (await create("researcher", newContainer({ storageUnitId: unitId("FSR-1") }))).body.data.id;
    const response = await call(moveRoute.POST, { method: "POST", body: { storageUnitId: unitId("FC-4") }, cookie: cookies.researcher, params: { id: String(id) } });
    expect(response.status).toBe(200);
    expect(response.body.data.unitCode).toBe("FC-4");
    expect(response.body.data.moves.map((m: { toUnitCode: string; fromUnitCode: string | null }) => [m.fromUnitCode, m.toUnitCode])).toEqual([
      ["FSR-1", "FC-4"],
      [null, "FSR-1"],
    ]);
    const history = getDb().select().from(containerMoves).where(eq(containerMoves.containerId, id)).all();
    expect(history).toHaveLength(2);
    const move = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityId, String(id)), eq(auditEvents.action, "move"))).get()!;
    expect(move.summary).toMatch(/from 2.115 \/ FSR-1 to 2.115 \/ FC-4/);
    expect(move.before).toMatchObject({ storageUnitId: unitId("FSR-1") });
    expect(move.after).toMatchObject({ storageUnitId: unitId("FC-4") });
    const same = await call(moveRoute.POST, { method: "POST", body: { storageUnitId: unitId("FC-4") }, cookie: cookies.researcher, params: { id: String(id) } });
    expect(same.status).toBe(400);
  });

  it("marking a container empty or disposed sets its amount to zero; a disposed container is then kept unchanged", async () => {
    const id = (await create("researcher", newContainer())).body.data.id;
    const empty = await call(stateRoute.POST, { method: "POST", body: { state: "empty" }, cookie: cookies.researcher, params: { id: String(id) } });
    expect(empty.body.data).toMatchObject({ state: "empty", amount: 0 });
    await call(stateRoute.POST, { method: "POST", body: { state: "disposed" }, cookie: cookies.researcher, params: { id: String(id) } });
    const again = await call(containerRoute.PATCH, { method: "PATCH", body: { notes: "x" }, cookie: cookies.safety_officer, params: { id: String(id) } });
    expect(again.status).toBe(409);
  });
});

describe("locations", () => {
  it("facilities staff create rooms and units; researchers and auditors may not", async () => {
    const siteId = getDb().select().from(rooms).get()!.siteId;
    const body = { siteId, code: "T-100", name: "Test store", kind: "storeroom", floorAreaM2: 10, heightM: 2.5, airChangesPerHour: 4, designMaxTempC: 30, sprinklered: true };
    for (const role of ["researcher", "auditor"] as Role[]) {
      expect((await call(roomsRoute.POST, { method: "POST", body, cookie: cookies[role] })).status).toBe(403);
    }
    const created = await call(roomsRoute.POST, { method: "POST", body, cookie: cookies.facilities });
    expect(created.status).toBe(201);
    expect(created.body.data.volumeM3).toBe(25);
    const duplicate = await call(roomsRoute.POST, { method: "POST", body, cookie: cookies.facilities });
    expect(duplicate.status).toBe(409);
    expect(duplicate.body.error.fields.code[0]).toMatch(/already has a room with that code/);
    const unitResponse = await call(unitsRoute.POST, {
      method: "POST",
      body: { roomId: created.body.data.id, code: "FR-9", name: "Test fridge", kind: "domestic_refrigerator", setMinC: 8, setMaxC: 2 },
      cookie: cookies.facilities,
    });
    expect(unitResponse.status).toBe(400);
    expect(unitResponse.body.error.fields.setMaxC[0]).toMatch(/must not be below/);
    const badRoom = await call(roomsRoute.POST, { method: "POST", body: { ...body, code: "T-101", heightM: 0.5, mixingFactor: 2 }, cookie: cookies.facilities });
    expect(Object.keys(badRoom.body.error.fields).sort()).toEqual(["heightM", "mixingFactor"]);
  });

  it("a room that still holds containers cannot be retired", async () => {
    const roomId = getDb().select().from(rooms).where(eq(rooms.code, "B-014")).get()!.id;
    const response = await call(roomRoute.DELETE, { method: "DELETE", cookie: cookies.safety_officer, params: { id: String(roomId) } });
    expect(response.status).toBe(409);
    expect(getDb().select().from(rooms).where(eq(rooms.id, roomId)).get()!.retiredAt).toBeNull();
  });

  it("updates are audited with the values before and after", async () => {
    const roomId = getDb().select().from(rooms).where(eq(rooms.code, "2.107")).get()!.id;
    const response = await call(roomRoute.PATCH, { method: "PATCH", body: { designMaxTempC: 30.5 }, cookie: cookies.facilities, params: { id: String(roomId) } });
    expect(response.status).toBe(200);
    const event = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "room"), eq(auditEvents.entityId, String(roomId)), eq(auditEvents.action, "update"))).get()!;
    expect(event.before).toEqual({ designMaxTempC: 28 });
    expect(event.after).toEqual({ designMaxTempC: 30.5 });
  });

  it("sites: only location staff create them; names are unique", async () => {
    expect((await call(sitesRoute.POST, { method: "POST", body: { name: "Hill Station" }, cookie: cookies.researcher })).status).toBe(403);
    const created = await call(sitesRoute.POST, { method: "POST", body: { name: "Hill Station", elevationM: 1200 }, cookie: cookies.safety_officer });
    expect(created.status).toBe(201);
    expect(created.body.data.atmosphericPressureKPa).toBe(101.325);
    expect((await call(sitesRoute.POST, { method: "POST", body: { name: "Hill Station" }, cookie: cookies.safety_officer })).status).toBe(409);
  });
});

describe("mixtures", () => {
  it("accepts fractions that sum to 1 within the tolerance and refuses others", async () => {
    const bad = await call(mixturesRoute.POST, {
      method: "POST",
      body: { name: "Waste A", fractionBasis: "mass", components: [{ substanceId: acetoneId, fraction: 0.5 }, { substanceId: ethanolId, fraction: 0.4 }] },
      cookie: cookies.researcher,
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.components[0]).toMatch(/add up to 0.9/);
    const good = await call(mixturesRoute.POST, {
      method: "POST",
      body: { name: "Waste A", fractionBasis: "mass", components: [{ substanceId: acetoneId, fraction: 0.333 }, { substanceId: ethanolId, fraction: 0.667 }] },
      cookie: cookies.researcher,
    });
    expect(good.status).toBe(201);
    expect(good.body.data.components.map((c: { name: string }) => c.name)).toEqual(["acetone", "ethanol"]);
    expect((await call(mixturesRoute.POST, { method: "POST", body: { name: "Waste B", fractionBasis: "mole", components: [{ substanceId: acetoneId, fraction: 1 }] }, cookie: cookies.facilities })).status).toBe(403);
  });
});

describe("substances: corrections", () => {
  async function acetone() {
    const { GET } = await import("@/app/api/v1/substances/[id]/route");
    return (await call(GET, { cookie: cookies.safety_officer, params: { id: String(acetoneId) } })).body.data;
  }

  function editable(detail: Record<string, unknown>) {
    const keys = ["cas", "name", "synonyms", "formula", "physicalState", "molarMassGPerMol", "normalBoilingPointC", "meltingPointC", "enthalpyOfVaporizationKJPerMol", "enthalpyOfSublimationKJPerMol", "liquidDensityKgPerM3", "flashPointC", "lflVolPercent", "uflVolPercent", "autoignitionTempC", "correlations", "sources", "exposureLimits", "notes"];
    return Object.fromEntries(keys.map((k) => [k, detail[k]]));
  }

  it("a safety officer corrects a value with its source; the audit keeps before and after", async () => {
    const body = editable(await acetone());
    const response = await call(substanceRoute.PATCH, {
      method: "PATCH",
      body: { ...body, uflVolPercent: 12.8, sources: { ...(body.sources as object), uflVolPercent: "NFPA 497 (2008)" } },
      cookie: cookies.safety_officer,
      params: { id: String(acetoneId) },
    });
    expect(response.body.error).toBeUndefined();
    expect(response.status).toBe(200);
    expect(response.body.data.uflVolPercent).toBe(12.8);
    const event = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "substance"), eq(auditEvents.action, "update"))).get()!;
    expect(event.before).toMatchObject({ uflVolPercent: 14.3 });
    expect(event.after).toMatchObject({ uflVolPercent: 12.8 });
  });

  it("refuses a value without a source, and refuses other roles", async () => {
    const body = editable(await acetone());
    const sources = { ...(body.sources as Record<string, string>) };
    delete sources.flashPointC;
    const missing = await call(substanceRoute.PATCH, { method: "PATCH", body: { ...body, sources }, cookie: cookies.safety_officer, params: { id: String(acetoneId) } });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields["sources.flashPointC"][0]).toBe("Give the source of this value.");
    expect((await call(substanceRoute.PATCH, { method: "PATCH", body, cookie: cookies.researcher, params: { id: String(acetoneId) } })).status).toBe(403);
  });

  it("refuses correlations the engine cannot use", async () => {
    const body = editable(await acetone());
    const response = await call(substanceRoute.PATCH, {
      method: "PATCH",
      body: { ...body, correlations: [{ kind: "antoine", log: "log10", pressureUnit: "bar", temperatureUnit: "K", a: 4.2, b: 1197, c: -45, tMinC: 80, tMaxC: 20, source: "typo" }] },
      cookie: cookies.safety_officer,
      params: { id: String(acetoneId) },
    });
    expect(response.status).toBe(400);
    expect(response.body.error.fields).toHaveProperty("correlations");
  });

  it("accepts a Wagner set as published and refuses one without its exponents, naming what is missing and changing nothing", async () => {
    // VDI Heat Atlas 2nd ed. (2010), D3.1: acetone, Wagner 2.5-5 form (Tc 508.1 K, Pc 4692 kPa).
    const wagner = { kind: "wagner", reducingTempK: 508.1, reducingPressureKPa: 4692, coefficients: [-7.67033, 1.96469, -2.4438, -2.90162], exponents: [1, 1.5, 2.5, 5], tMinC: -94.8, tMaxC: 234.95, source: "VDI Heat Atlas, 2nd ed. (2010), D3.1" };
    const before = await acetone();
    const bad = await call(substanceRoute.PATCH, {
      method: "PATCH",
      body: { ...editable(before), correlations: [{ ...wagner, exponents: [1, 1.5] }] },
      cookie: cookies.safety_officer,
      params: { id: String(acetoneId) },
    });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body.error)).toMatch(/one positive number per coefficient \(4\)/);
    expect((await acetone()).correlations).toEqual(before.correlations);
    const good = await call(substanceRoute.PATCH, {
      method: "PATCH",
      body: { ...editable(before), correlations: [wagner] },
      cookie: cookies.safety_officer,
      params: { id: String(acetoneId) },
    });
    expect(good.body.error).toBeUndefined();
    expect(good.status).toBe(200);
    expect(good.body.data.correlations[0]).toMatchObject({ kind: "wagner", exponents: [1, 1.5, 2.5, 5] });
  });
});
