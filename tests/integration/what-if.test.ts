/**
 * The what-if says where things stand: a place already flagged for a substance answers
 * "already_flagged" with the findings standing there, a new hazard "raises", a harmless amount in
 * an unflagged unit "no_findings"; a move by containerId takes the container out of its old place,
 * and only someone who may move the container may preview moving it. Runs on the invented demo
 * organisation (its domestic-type refrigerator FR-1 in room 2.107 holds diethyl ether).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { containers, findings, rooms, storageUnits, substances, users, type User } from "@/db/schema";
import * as previewRoute from "@/app/api/v1/assessments/preview/route";
import { containerCreateSchema } from "@/lib/inventory/schemas";
import { createContainer } from "@/lib/inventory/service";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

const ETHER = "60-29-7";
const WATER = "7732-18-5";
const HEXANE = "110-54-3";

let researcher: User;
const unitId = (code: string) => getDb().select().from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
const substanceId = (cas: string) => getDb().select().from(substances).where(eq(substances.cas, cas)).get()!.id;
const preview = async (user: User, body: Record<string, unknown>) => call(previewRoute.POST, { method: "POST", cookie: await sessionCookieFor(user), body });
const counts = () =>
  JSON.stringify(["findings", "finding_events", "containers", "container_moves", "audit_events"].map((table) => getDb().$client.prepare(`select count(*) n from ${table}`).get()));

type Current = { id: number; rule: string; severity: string; status: string; scenario: string; title: string; value: number; limit: number; ratio: number | null; unit: string; about: string; outcome: string; canOpen: boolean };

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  researcher = getDb().select().from(users).where(eq(users.email, "researcher@example.org")).get()!;
});

describe("POST /api/v1/assessments/preview: a unit already flagged", () => {
  it("answers already_flagged for 1 L of diethyl ether in FR-1, with the critical findings standing there, and writes nothing", async () => {
    const before = counts();
    const response = await preview(researcher, { storageUnitId: unitId("FR-1"), substanceId: substanceId(ETHER), amount: 1, amountUnit: "L" });
    expect(response.status).toBe(200);
    const data = response.body.data;
    expect(data.storageUnitId).toBe(unitId("FR-1"));
    // The ether already saturates FR-1's air at its worst case: one more litre changes no value.
    expect(data.findings).toEqual([]);
    expect(data.verdict).toBe("already_flagged");
    const current = data.current as Current[];
    // The register's own rows, worst first: the control-lost enclosure finding heads them.
    const stored = getDb()
      .select()
      .from(findings)
      .where(and(eq(findings.storageUnitId, unitId("FR-1")), eq(findings.rule, "enclosure-lfl"), eq(findings.scenario, "control_lost"), eq(findings.substanceId, substanceId(ETHER))))
      .get()!;
    expect(current[0]).toMatchObject({
      id: stored.id,
      rule: "enclosure-lfl",
      severity: "critical",
      status: "open",
      scenario: "control_lost",
      title: "Diethyl ether in FR-1 could reach 4,650 % LFL if the refrigerator fails (control lost, 28.0 °C)",
      limit: 100,
      unit: "% LFL",
      about: "substance",
      outcome: "unchanged",
      canOpen: true,
    });
    // Saturated diethyl ether at the room's 28.0 °C against its LFL of 1.9 %, as the demo's first assessment stored it
    // (library 2026-12-06: VDI Heat Atlas Wagner set, 80.135 kPa at 28 °C).
    expect(current[0].value).toBeCloseTo(4652.19, 1);
    expect(current[0].ratio).toBeCloseTo(46.5219, 3);
    expect(current[0].value).toBe(stored.value);
    // Every finding about ether in FR-1, and the open-containers findings it takes part in; nothing about acetone alone.
    expect(current.map((f) => `${f.rule}|${f.scenario}|${f.severity}|${f.about}`).sort()).toEqual(
      [
        "enclosure-lfl|control_lost|critical|group",
        "enclosure-lfl|control_lost|critical|substance",
        "enclosure-lfl|in_control|critical|group",
        "enclosure-lfl|in_control|critical|substance",
        "flash-point|control_lost|moderate|substance",
        "flash-point|in_control|moderate|substance",
        "ignition-source-unit|in_control|critical|substance",
      ].sort(),
    );
    expect(current.some((f) => /^Acetone/.test(f.title))).toBe(false);
    expect(current.find((f) => f.rule === "ignition-source-unit")!.title).toBe("Diethyl ether (GHS category 1, NFPA class IA) is stored in FR-1, whose interior has ignition sources");
    expect(data.verdictSentence).toBe(
      "Already critical here: diethyl ether in FR-1 could reach 4,650 % LFL if the refrigerator fails (control lost, 28.0 °C). Storing more keeps it so. 6 other open findings here concern diethyl ether too.",
    );
    expect(data.cleared).toEqual([]);
    expect(counts()).toBe(before);
  });
});

describe("POST /api/v1/assessments/preview: nothing flagged", () => {
  it("answers no_findings for half a litre of water in an empty cabinet", async () => {
    const room = getDb().select().from(rooms).where(eq(rooms.code, "2.107")).get()!;
    // An invented empty cabinet beside the demo's units: nothing stands there.
    const cabinet = getDb().insert(storageUnits).values({ roomId: room.id, code: "FC-9", name: "Flammable-liquid cabinet, test", kind: "flammable_cabinet", internalVolumeL: 100, ventilated: false, ignitionSourceFree: true }).returning().get();
    const response = await preview(researcher, { storageUnitId: cabinet.id, substanceId: substanceId(WATER), amount: 0.5, amountUnit: "L" });
    expect(response.status).toBe(200);
    expect(response.body.data).toMatchObject({ storageUnitId: cabinet.id, findings: [], current: [], verdict: "no_findings", cleared: [] });
    // Room 2.107's one own finding (no exposure limit for dimethyl sulfoxide) is about other contents.
    expect(response.body.data.verdictSentence).toBe(
      "Storing this here would raise no finding, and none is open at FC-9 about water. 1 open finding at FC-9 or in its room concerns other contents.",
    );
  });
});

describe("POST /api/v1/assessments/preview: a new hazard", () => {
  it("answers raises for diethyl ether in the ventilated flammable cabinet FC-3, where nothing about it stands yet", async () => {
    const response = await preview(researcher, { storageUnitId: unitId("FC-3"), substanceId: substanceId(ETHER), amount: 1, amountUnit: "L" });
    expect(response.status).toBe(200);
    const data = response.body.data;
    expect(data.verdict).toBe("raises");
    expect(data.current).toEqual([]);
    expect(data.findings).toHaveLength(1);
    // Flash point −45 °C (the demo library's closed-cup value) below the laboratory's design maximum of 28 °C.
    expect(data.findings[0]).toMatchObject({
      rule: "flash-point",
      severity: "moderate",
      title: "Diethyl ether in FC-3 is above its flash point of −45.0 °C at its worst case (28.0 °C)",
      value: 28,
      limit: -45,
      unit: "°C",
      isNew: true,
      previous: null,
    });
    expect(data.verdictSentence).toBe("Storing this here would raise a new moderate finding: diethyl ether in FC-3 is above its flash point of −45.0 °C at its worst case (28.0 °C).");
  });
});

describe("POST /api/v1/assessments/preview: a move", () => {
  it("takes the container out of its old place, tells what leaves with it, and refuses someone else's container", async () => {
    const actor = { id: researcher.id, email: researcher.email, name: researcher.name, role: researcher.role };
    // The researcher's own bottle of n-hexane, the only one in FR-1: it raises hexane findings there.
    const bottle = createContainer(actor, "own", containerCreateSchema.parse({ label: "WI-HEX-1", substanceId: substanceId(HEXANE), amount: 0.5, amountUnit: "L", storageUnitId: unitId("FR-1"), state: "sealed" }));
    const hexaneAtFr1 = getDb()
      .select()
      .from(findings)
      .where(and(eq(findings.storageUnitId, unitId("FR-1")), eq(findings.substanceId, substanceId(HEXANE)), eq(findings.status, "open")))
      .all();
    expect(hexaneAtFr1.map((f) => `${f.rule}|${f.scenario}|${f.severity}`).sort()).toEqual(
      ["enclosure-lfl|control_lost|critical", "enclosure-lfl|in_control|critical", "flash-point|control_lost|moderate", "flash-point|in_control|moderate", "ignition-source-unit|in_control|critical"].sort(),
    );
    const before = counts();

    const response = await preview(researcher, { storageUnitId: unitId("FSR-1"), containerId: bottle.id });
    expect(response.status).toBe(200);
    const data = response.body.data;
    // Nothing is raised (FR-1 loses the bottle, FSR-1 is saturated with n-hexane already), and every hexane finding at FR-1 would go with it.
    expect(data.findings).toEqual([]);
    expect(data.cleared.map((f: { id: number }) => f.id).sort()).toEqual(hexaneAtFr1.map((f) => f.id).sort());
    expect(data.cleared[0]).toMatchObject({ severity: "critical", canOpen: true });
    // FSR-1 already holds n-hexane (the demo's four 0.5 L bottles): the move keeps its findings as they are.
    expect(data.verdict).toBe("already_flagged");
    // In control leaves out the readings inside FSR-1's failure weekend (8.4 °C); control lost takes its peak.
    expect(data.current.map((f: Current) => `${f.title} → ${f.outcome}`)).toEqual([
      "N-hexane in FSR-1 could reach 2,170 % LFL if the refrigerator fails (control lost, 27.0 °C) → unchanged",
      "N-hexane in FSR-1 could reach 923 % LFL at its worst case in control (8.4 °C) → unchanged",
      "Open containers in FSR-1 could reach 5,980 % LFL together if the refrigerator fails (control lost, 27.0 °C) → unchanged",
      "Open containers in FSR-1 could reach 4,490 % LFL together at its worst case in control (8.4 °C) → unchanged",
      "A 0.5 L spill of n-hexane in room 2.115 could reach 57.4 % of the NIOSH TWA at its highest (spill, 27.0 °C) → unchanged",
      "N-hexane in FSR-1 is above its flash point of −22.0 °C at its worst case in control (8.4 °C) → unchanged",
      "N-hexane in FSR-1 is above its flash point of −22.0 °C if the refrigerator fails (control lost, 27.0 °C) → unchanged",
    ]);
    expect(data.verdictSentence).toBe(
      "Already high here: n-hexane in FSR-1 could reach 2,170 % LFL if the refrigerator fails (control lost, 27.0 °C). Moving it here keeps it so. 6 other open findings here concern n-hexane too. Moving it out clears 5 findings at FR-1, the worst critical.",
    );
    expect(counts()).toBe(before);

    // The same unit is no move.
    const same = await preview(researcher, { storageUnitId: unitId("FR-1"), containerId: bottle.id });
    expect(same.status).toBe(400);
    expect(same.body.error.fields.storageUnitId).toEqual(["The container is already in that storage unit."]);

    // Another researcher may not move it, so may not preview moving it; nor may facilities staff, who change no containers.
    const other = await preview(makeUser("researcher"), { storageUnitId: unitId("FSR-1"), containerId: bottle.id });
    expect(other.status).toBe(403);
    expect(other.body.error).toMatchObject({ code: "forbidden", message: "You can change only your own containers." });
    const facilities = await preview(makeUser("facilities"), { storageUnitId: unitId("FSR-1"), containerId: bottle.id });
    expect(facilities.status).toBe(403);
    // A safety officer may.
    expect((await preview(makeUser("safety_officer"), { storageUnitId: unitId("FSR-1"), containerId: bottle.id })).status).toBe(200);
    // Nor does a researcher learn more about a container that does not exist than the edit preview tells.
    const unknown = await preview(researcher, { storageUnitId: unitId("FSR-1"), containerId: 9_999_999 });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.containerId).toEqual(["No such container."]);
    expect(counts()).toBe(before);
  });

  it("still refuses bad input with field errors and an unknown unit with 404", async () => {
    const noUnit = await preview(researcher, { storageUnitId: 9_999_999, substanceId: substanceId(ETHER), amount: 1, amountUnit: "L" });
    expect(noUnit.status).toBe(404);
    const tooMuch = await preview(researcher, { storageUnitId: unitId("FR-1"), substanceId: substanceId(ETHER), amount: 2e6, amountUnit: "L" });
    expect(tooMuch.status).toBe(400);
    expect(Object.keys(tooMuch.body.error.fields)).toEqual(["amount"]);
    const noAmount = await preview(researcher, { storageUnitId: unitId("FR-1"), substanceId: substanceId(ETHER) });
    expect(noAmount.status).toBe(400);
    expect(noAmount.body.error.fields).toEqual({ amount: ["Amount is required."], amountUnit: ["amountUnit must be one of: mL, L, g, kg."] });
    const stored = getDb().select().from(containers).where(eq(containers.storageUnitId, unitId("FR-1"))).get()!;
    const halfMove = await preview(researcher, { storageUnitId: unitId("FSR-1"), containerId: stored.id, amount: 1 });
    expect(halfMove.status).toBe(400);
    expect(Object.keys(halfMove.body.error.fields).sort()).toEqual(["amountUnit", "substanceId"]);
  });
});
