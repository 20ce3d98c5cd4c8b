/**
 * Resolving a finding re-assesses its location in the same request: a finding whose condition
 * still holds is not resolved and the person is told why; one whose condition is gone is resolved
 * and stays so. And a finding lists every container that contributes to it. Runs on the invented
 * demo organisation (its first assessment is part of the seed): two bottles of diethyl ether in
 * FR-1, a domestic-type refrigerator whose interior has ignition sources.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { containers, findingEvents, findings, findingTraces, storageUnits, substances, users, type User } from "@/db/schema";
import * as eventsRoute from "@/app/api/v1/findings/[id]/events/route";
import { reassessRooms } from "@/lib/assessment/service";
import type { SessionUser } from "@/lib/auth/session";
import { contributingContainers } from "@/lib/register/finding-containers";
import { STILL_HOLDS_PREFIX } from "@/lib/register/resolve-text";
import { formatTraceNumber } from "@/lib/register/trace-steps";
import { applyFindingStep } from "@/lib/register/workflow";
import { call, sessionCookieFor } from "./helpers/world";

const ETHER = "60-29-7";
let officer: User;
let actor: SessionUser;
const unitId = (code: string) => getDb().select().from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
const etherId = () => getDb().select().from(substances).where(eq(substances.cas, ETHER)).get()!.id;
const fr1Ether = () =>
  getDb()
    .select()
    .from(findings)
    .where(and(eq(findings.rule, "ignition-source-unit"), eq(findings.storageUnitId, unitId("FR-1")), eq(findings.substanceId, etherId())))
    .get()!;
const eventsOf = (id: number) => getDb().select().from(findingEvents).where(eq(findingEvents.findingId, id)).orderBy(findingEvents.id).all();

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  officer = getDb().select().from(users).where(eq(users.role, "safety_officer")).get()!;
  actor = { id: officer.id, email: officer.email, name: officer.name, role: officer.role };
});

describe("the contributing containers of a finding", () => {
  it("lists both ether bottles in FR-1 from the assessment's record, with owner, amount, state and a link", () => {
    const finding = fr1Ether();
    const trace = getDb().select({ trace: findingTraces.trace }).from(findingTraces).where(eq(findingTraces.findingId, finding.id)).get()!.trace;
    const bottles = getDb()
      .select({ id: containers.id, label: containers.label, amount: containers.amount, amountUnit: containers.amountUnit, ownerId: containers.ownerId })
      .from(containers)
      .where(and(eq(containers.storageUnitId, unitId("FR-1")), eq(containers.substanceId, etherId())))
      .orderBy(containers.id)
      .all();
    expect(bottles).toHaveLength(2);
    const list = contributingContainers({ ...finding, trace });
    expect(list.basis).toBe("assessment");
    expect(list.rows.map((r) => r.id).sort((a, b) => a - b)).toEqual(bottles.map((b) => b.id));
    for (const row of list.rows) {
      const bottle = bottles.find((b) => b.id === row.id)!;
      const owner = bottle.ownerId == null ? null : getDb().select({ name: users.name }).from(users).where(eq(users.id, bottle.ownerId)).get()!.name;
      expect(row).toMatchObject({ label: bottle.label, content: "diethyl ether", amountText: `${formatTraceNumber(bottle.amount)} ${bottle.amountUnit}`, ownerName: owner, since: null, href: `/inventory/${bottle.id}` });
      expect(["sealed", "open", "in use"]).toContain(row.state);
    }
  });

  it("derives the list from what the location holds now for a trace stored without it", () => {
    const finding = fr1Ether();
    const list = contributingContainers({ ...finding, trace: { method: "stored before the list was kept", steps: [] } });
    expect(list.basis).toBe("inventory");
    expect(list.rows.map((r) => r.content)).toEqual(["diethyl ether", "diethyl ether"]);
  });
});

describe("resolving re-assesses at once", () => {
  it("does not resolve a finding whose condition still holds, keeps it open and says why", async () => {
    const before = fr1Ether();
    expect(before.status).toBe("open");
    const result = applyFindingStep(actor, before.id, { kind: "resolve", note: "Told the group to keep ether elsewhere." });
    expect(result.status).toBe("open");
    expect(result.message).toBe(
      `${STILL_HOLDS_PREFIX} ${before.title}, so the finding stays open. Record what changed in Headroom first (move, use up or dispose of the container, or correct the location's data), then resolve it again; if it is to stay as it is, accept the risk with a justification and a review date.`,
    );
    expect(fr1Ether()).toMatchObject({ status: "open", conditionHolds: true, resolvedAt: null });
    const last = eventsOf(before.id).at(-1)!;
    expect(last).toMatchObject({ kind: "comment", fromStatus: "open", toStatus: "open", actorId: officer.id });
    expect(last.note).toBe(`Not resolved. ${result.message}\nResolution note: Told the group to keep ether elsewhere.`);
    // Through the API too: 201 with the finding still open.
    const response = await call(eventsRoute.POST, { method: "POST", params: { id: String(before.id) }, body: { kind: "resolve", note: "Again." }, cookie: await sessionCookieFor(officer) });
    expect(response.status).toBe(201);
    expect(response.body.data.status).toBe("open");
    expect(response.body.data.message).toMatch(/^The condition still holds: .*, so the finding stays open\./);
    expect(response.body.data.events.at(-1).note).toMatch(/^Not resolved\. The condition still holds: /);
  });

  it("keeps a finding being mitigated in mitigation, with its plan and owner", () => {
    const id = fr1Ether().id;
    applyFindingStep(actor, id, { kind: "start_mitigation", plan: "Move both bottles to FSR-1.", assigneeId: officer.id });
    const result = applyFindingStep(actor, id, { kind: "resolve", note: "Done, I think." });
    expect(result.message).toContain("so the finding stays open (being mitigated).");
    expect(fr1Ether()).toMatchObject({ status: "mitigating", mitigationPlan: "Move both bottles to FSR-1.", assigneeId: officer.id });
  });

  it("resolves a finding whose condition is gone, and it stays resolved on the next assessment", () => {
    const finding = fr1Ether();
    // The bottles went to the rated refrigerator without a re-assessment (stored straight, as an
    // import or another system might): the finding still reads open.
    getDb().update(containers).set({ storageUnitId: unitId("FSR-1") }).where(and(eq(containers.storageUnitId, unitId("FR-1")), eq(containers.substanceId, etherId()))).run();
    expect(fr1Ether().status).toBe("mitigating");
    const result = applyFindingStep(actor, finding.id, { kind: "resolve", note: "Both bottles moved to FSR-1." });
    expect(result.message).toBe("Resolved. Re-assessed now: the condition no longer holds.");
    expect(fr1Ether()).toMatchObject({ status: "resolved", conditionHolds: false });
    const after = eventsOf(finding.id).filter((e) => e.id > eventsOf(finding.id).at(-2)!.id);
    expect(after).toHaveLength(1);
    expect(after[0]).toMatchObject({ kind: "resolved", fromStatus: "mitigating", toStatus: "resolved", note: "Both bottles moved to FSR-1.", actorId: officer.id });
    // A full re-assessment later agrees: no re-opening.
    const roomId = getDb().select({ roomId: storageUnits.roomId }).from(storageUnits).where(eq(storageUnits.id, unitId("FR-1"))).get()!.roomId;
    getDb().transaction((tx) => reassessRooms(tx, [roomId], { force: true, notify: false, nowMs: Date.now() + 5000 }));
    expect(fr1Ether()).toMatchObject({ status: "resolved", conditionHolds: false });
    expect(eventsOf(finding.id).at(-1)!.kind).toBe("resolved");
    // The list of contributing containers now says where the bottles went.
    const trace = getDb().select({ trace: findingTraces.trace }).from(findingTraces).where(eq(findingTraces.findingId, finding.id)).get()!.trace;
    expect(contributingContainers({ ...fr1Ether(), trace }).rows.map((r) => r.since)).toEqual(["now in FSR-1", "now in FSR-1"]);
  });
});
