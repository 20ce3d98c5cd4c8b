/**
 * The register follows the stored state: moving containers re-assesses both locations, a failed
 * refrigerator's readings raise its findings at the peak, and the what-if preview writes nothing.
 * Runs on the demo organisation (its first assessment is part of the seed).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { containers, findingEvents, findings, rooms, sensors, storageUnits, substances, users, type User } from "@/db/schema";
import * as previewRoute from "@/app/api/v1/assessments/preview/route";
import { moveContainer } from "@/lib/inventory/service";
import { ingestReadings } from "@/lib/temperatures/ingest";
import { reassessRooms } from "@/lib/assessment/service";
import { lastAssessedAt } from "@/lib/register/store";
import { call, sessionCookieFor } from "./helpers/world";

let safety: User;
const unitId = (code: string) => getDb().select().from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
const substanceId = (cas: string) => getDb().select().from(substances).where(eq(substances.cas, cas)).get()!.id;
const ETHER = "60-29-7";

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  safety = getDb().select().from(users).where(eq(users.role, "safety_officer")).get()!;
});

describe("the demo's first assessment", () => {
  it("has the domestic refrigerator's ether finding, the failed refrigerator's and the heat wave's", () => {
    const all = getDb().select().from(findings).all();
    const fr1 = all.find((f) => f.rule === "ignition-source-unit" && f.storageUnitId === unitId("FR-1") && f.substanceId === substanceId(ETHER))!;
    expect(fr1).toMatchObject({ severity: "critical", status: "open" });
    const fsr1 = all.filter((f) => f.storageUnitId === unitId("FSR-1") && f.scenario === "in_control");
    // The weekend failure of FSR-1 (peak about 21.7 °C) is its in-control worst case for a year.
    expect(fsr1.some((f) => f.worstCaseSource?.includes("from sensor S-205"))).toBe(true);
    const b014 = getDb().select().from(rooms).where(eq(rooms.code, "B-014")).get()!;
    const heat = all.filter((f) => f.roomId === b014.id && f.worstCaseSource?.includes("sensor S-201"));
    expect(heat.length).toBeGreaterThan(0);
    expect(heat[0].worstCaseTempC).toBeGreaterThan(31);
  });
});

describe("moving containers", () => {
  it("resolves the finding where they were, with the move as the reason, and assesses where they went", () => {
    const fr1 = unitId("FR-1");
    const ethers = getDb().select().from(containers).where(and(eq(containers.storageUnitId, fr1), eq(containers.substanceId, substanceId(ETHER)))).all();
    expect(ethers.length).toBe(2);
    const finding = () => getDb().select().from(findings).where(and(eq(findings.rule, "ignition-source-unit"), eq(findings.storageUnitId, fr1), eq(findings.substanceId, substanceId(ETHER)))).get()!;
    const actor = { id: safety.id, email: safety.email, name: safety.name, role: safety.role };
    moveContainer(actor, "all", ethers[0].id, unitId("FSR-1"));
    expect(finding().status).toBe("open"); // one bottle is still there
    moveContainer(actor, "all", ethers[1].id, unitId("FSR-1"));
    expect(finding()).toMatchObject({ status: "resolved", conditionHolds: false });
    const last = getDb().select().from(findingEvents).where(eq(findingEvents.findingId, finding().id)).all().at(-1)!;
    expect(last.kind).toBe("auto_resolved");
    expect(last.note).toMatch(/moved from .*FR-1.* to .*FSR-1/);
    // FSR-1 is rated for flammables: no ignition-source finding there, but its enclosure finding now counts the extra ether.
    expect(getDb().select().from(findings).where(and(eq(findings.rule, "ignition-source-unit"), eq(findings.storageUnitId, unitId("FSR-1")))).all()).toHaveLength(0);
    // Both rooms were assessed by the move: FSR-1's findings, changed or not, count as assessed then.
    const resolvedAt = finding().lastEvaluatedAt.getTime();
    const fsrRoom = getDb().select({ assessedAt: rooms.assessedAt }).from(storageUnits).innerJoin(rooms, eq(rooms.id, storageUnits.roomId)).where(eq(storageUnits.id, unitId("FSR-1"))).get()!;
    const evaluated = getDb().select().from(findings).where(eq(findings.storageUnitId, unitId("FSR-1"))).all();
    expect(evaluated.length).toBeGreaterThan(0);
    expect(evaluated.every((f) => lastAssessedAt(f, fsrRoom.assessedAt).getTime() >= resolvedAt - 1)).toBe(true);
  });
});

describe("re-assessing rooms whose inputs have not changed", () => {
  it("leaves them be, unless a person changed a finding, the inputs changed, or it is forced", () => {
    const room = getDb().select().from(rooms).where(eq(rooms.code, "B-014")).get()!;
    const run = (opts: { nowMs?: number; force?: boolean } = {}) => getDb().transaction((tx) => reassessRooms(tx, [room.id], { notify: false, ...opts }));
    run();
    const again = run();
    expect(again).toMatchObject({ roomsUnchanged: 1, raised: 0, updated: 0, resolved: 0, reopened: 0 });
    // A person marks a finding resolved while its condition holds: the room is assessed, the finding re-opens.
    const held = getDb().select().from(findings).where(and(eq(findings.roomId, room.id), eq(findings.status, "open"), eq(findings.conditionHolds, true))).get()!;
    const later = Date.now() + 1000;
    getDb().update(findings).set({ status: "resolved", resolvedAt: new Date(later), updatedAt: new Date(later) }).where(eq(findings.id, held.id)).run();
    const afterPerson = run({ nowMs: later + 1000 });
    expect(afterPerson).toMatchObject({ roomsUnchanged: 0, reopened: 1 });
    expect(getDb().select().from(findings).where(eq(findings.id, held.id)).get()!.status).toBe("open");
    // More liquid in one of its containers: a different input, assessed again.
    const unitIds = getDb().select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.roomId, room.id)).all().map((u) => u.id);
    const bottle = getDb().select().from(containers).all().find((c) => unitIds.includes(c.storageUnitId) && c.state !== "disposed" && c.state !== "empty")!;
    getDb().update(containers).set({ amount: bottle.amount * 2 }).where(eq(containers.id, bottle.id)).run();
    expect(run({ nowMs: later + 2000 }).roomsUnchanged).toBe(0);
    // Only the bottle's unit (and the room's own rules) were assessed again; the other units were left as they were.
    const assessedAt = new Map(getDb().select({ id: storageUnits.id, at: storageUnits.assessedAt }).from(storageUnits).where(eq(storageUnits.roomId, room.id)).all().map((u) => [u.id, u.at?.getTime()]));
    expect(assessedAt.get(bottle.storageUnitId)).toBe(later + 2000);
    expect(unitIds.filter((id) => id !== bottle.storageUnitId).every((id) => (assessedAt.get(id) ?? 0) < later + 2000)).toBe(true);
    expect(getDb().select({ at: rooms.assessedAt }).from(rooms).where(eq(rooms.id, room.id)).get()!.at?.getTime()).toBe(later + 2000);
    expect(run({ nowMs: later + 3000 }).roomsUnchanged).toBe(1);
    expect(run({ nowMs: later + 4000, force: true }).roomsUnchanged).toBe(0);
    getDb().update(containers).set({ amount: bottle.amount }).where(eq(containers.id, bottle.id)).run();
    run({ nowMs: later + 5000 });
    // Retired, its findings resolve; back in use with the same inputs, they re-open.
    const roomFinding = getDb().select().from(findings).where(and(eq(findings.roomId, room.id), isNull(findings.storageUnitId), eq(findings.status, "open"))).get();
    getDb().update(rooms).set({ retiredAt: new Date(later + 5500) }).where(eq(rooms.id, room.id)).run();
    expect(run({ nowMs: later + 6000 }).resolved).toBeGreaterThan(0);
    getDb().update(rooms).set({ retiredAt: null }).where(eq(rooms.id, room.id)).run();
    const back = run({ nowMs: later + 7000 });
    expect(back.roomsUnchanged).toBe(0);
    expect(back.reopened).toBeGreaterThan(0);
    expect(roomFinding).toBeDefined();
    expect(getDb().select().from(findings).where(eq(findings.id, roomFinding!.id)).get()!.status).toBe("open");
  });
});

describe("a refrigerator that fails", () => {
  it("keeps its in-control findings out of the excursion and raises its control-lost findings to the peak as the readings arrive", () => {
    const xr1 = unitId("XR-1");
    const sensor = getDb().select().from(sensors).where(eq(sensors.storageUnitId, xr1)).get()!;
    const ofScenario = (scenario: "in_control" | "control_lost") =>
      getDb().select().from(findings).where(and(eq(findings.storageUnitId, xr1), eq(findings.scenario, scenario), eq(findings.rule, "enclosure-lfl"))).all();
    const before = new Map(ofScenario("in_control").map((f) => [f.fingerprint, f.worstCaseTempC]));
    // After the demo's readings (which run up to now): the server's clock is set four hours on.
    const start = Date.now() + 60_000;
    const batch = Array.from({ length: 24 }, (_, i) => ({ sensor: sensor.externalId, at: new Date(start + i * 10 * 60_000).toISOString(), tempC: Math.min(34, 5 + i * 1.5) }));
    const result = ingestReadings(batch, { nowMs: start + 24 * 10 * 60_000 });
    expect(result.excursions.opened).toBe(1);
    const inControl = ofScenario("in_control");
    for (const f of inControl) {
      expect(f.worstCaseTempC).toBe(before.get(f.fingerprint));
      expect(f.worstCaseSource).toMatch(/excluded: they count as control lost|are excluded \(they count as control lost\)/);
    }
    const lost = ofScenario("control_lost");
    expect(lost.length).toBeGreaterThan(0);
    for (const f of lost) {
      expect(f.worstCaseTempC).toBe(34); // the open excursion's peak, above the room's worst case
      expect(f.worstCaseSource).toMatch(new RegExp(`^34.0 °C, peak of the open excursion on sensor ${sensor.externalId}`));
    }
  });
});

describe("POST /api/v1/assessments/preview", () => {
  it("tells what 4 L of diethyl ether in FR-1 would raise, and writes nothing", async () => {
    const count = () => [getDb().$client.prepare("select count(*) n from findings").get(), getDb().$client.prepare("select count(*) n from finding_events").get(), getDb().$client.prepare("select count(*) n from containers").get()];
    const before = JSON.stringify(count());
    const cookie = await sessionCookieFor(getDb().select().from(users).where(eq(users.role, "researcher")).get()!);
    const response = await call(previewRoute.POST, { method: "POST", body: { storageUnitId: unitId("FR-1"), substanceId: substanceId(ETHER), amount: 4, amountUnit: "L" }, cookie });
    expect(response.status).toBe(200);
    const titles = response.body.data.findings.map((f: { title: string }) => f.title);
    expect(titles.some((t: string) => /Diethyl ether .*FR-1.*if the refrigerator fails/i.test(t))).toBe(true);
    expect(response.body.data.findings.some((f: { rule: string; isNew: boolean }) => f.rule === "ignition-source-unit" && f.isNew)).toBe(true);
    expect(JSON.stringify(count())).toBe(before);
    const bad = await call(previewRoute.POST, { method: "POST", body: { storageUnitId: unitId("FR-1"), amount: -1, amountUnit: "gal" }, cookie });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["amount", "amountUnit"]);
    const neither = await call(previewRoute.POST, { method: "POST", body: { storageUnitId: unitId("FR-1"), amount: 1, amountUnit: "L" }, cookie });
    expect(neither.body.error.fields.substanceId[0]).toBe("Give a substanceId or a mixtureId (one of them).");
  });
});

describe("POST /api/v1/assessments/preview for an edited container", () => {
  it("replaces the stored container by its edited version: unchanged raises nothing, emptied raises nothing, an unknown id is refused", async () => {
    const cookie = await sessionCookieFor(safety);
    const stored = getDb()
      .select()
      .from(containers)
      .where(and(eq(containers.substanceId, substanceId(ETHER)), eq(containers.state, "opened")))
      .get()!;
    const as = (overrides: Record<string, unknown>) =>
      call(previewRoute.POST, { method: "POST", cookie, body: { storageUnitId: stored.storageUnitId, substanceId: stored.substanceId, amount: stored.amount, amountUnit: stored.amountUnit, containerId: stored.id, state: stored.state, ...overrides } });
    const same = await as({});
    expect(same.status).toBe(200);
    expect(same.body.data.findings).toEqual([]);
    expect((await as({ state: "empty" })).body.data.findings).toEqual([]);
    const unknown = await as({ containerId: 9_999_999 });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.containerId).toEqual(["No such container."]);
  });
});

describe("settings that touch everything", () => {
  it("re-assesses every location in a background job with progress when a safety officer changes the LFL thresholds", async () => {
    const settingsRoute = await import("@/app/api/v1/settings/assessment/route");
    const { runReassessmentJob } = await import("@/lib/assessment/jobs");
    const { jobs } = await import("@/db/schema");
    const cookie = await sessionCookieFor(safety);
    const current = (await call(settingsRoute.GET, { cookie })).body.data;
    expect(current.lfl).toMatchObject({ moderate: 0.1, high: 0.25, critical: 1 });
    const refused = await call(settingsRoute.PUT, { method: "PUT", body: current, cookie: await sessionCookieFor(getDb().select().from(users).where(eq(users.role, "facilities")).get()!) });
    expect(refused.status).toBe(403);
    const bad = await call(settingsRoute.PUT, { method: "PUT", body: { ...current, lfl: { ...current.lfl, moderate: "ten" } }, cookie });
    expect(bad.status).toBe(400);
    const tooHigh = await call(settingsRoute.PUT, { method: "PUT", body: { ...current, lfl: { ...current.lfl, critical: 100 } }, cookie });
    expect(tooHigh.body.error.fields["lfl.critical"][0]).toBe("The critical LFL fraction must be at most 10 (1000 %).");
    // Critical only from 10 × the LFL: the enclosure findings between 1× and 10× drop to high.
    const saved = await call(settingsRoute.PUT, { method: "PUT", body: { ...current, lfl: { ...current.lfl, critical: 10 } }, cookie });
    expect(saved.status).toBe(202);
    // The change started the job in the background; running it here too is harmless (it is claimed once).
    await runReassessmentJob(saved.body.data.jobId, { yieldBetweenBatches: false });
    const jobRow = () => getDb().select().from(jobs).where(eq(jobs.id, saved.body.data.jobId)).get()!;
    for (let i = 0; i < 500 && jobRow().status !== "done"; i += 1) await new Promise((resolve) => setTimeout(resolve, 10));
    const job = jobRow();
    expect(job).toMatchObject({ status: "done", progress: job.total });
    expect(job.total).toBe(getDb().select().from(rooms).all().length);
    const stored = getDb().select().from(jobs).where(eq(jobs.id, job.id)).get()!;
    expect(stored.status).toBe("done");
    const enclosure = getDb().select().from(findings).where(and(eq(findings.rule, "enclosure-lfl"), eq(findings.status, "open"))).all();
    expect(enclosure.some((f) => f.ratio! > 1 && f.ratio! < 10 && f.severity === "high")).toBe(true);
    expect(enclosure.every((f) => !(f.ratio! < 10 && f.severity === "critical"))).toBe(true);
  });
});
