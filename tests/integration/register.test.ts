/**
 * The register's storage and workflow with hand-made candidates (the rules are unit-tested on
 * their own): raise, update, resolve itself, re-open, risk acceptance and review dates, the
 * workflow steps with their permissions, the list API's filters, and the finding alerts.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { emailMessages, findingEvents, findings, rooms, sites, storageUnits, type User } from "@/db/schema";
import * as listRoute from "@/app/api/v1/findings/route";
import * as oneRoute from "@/app/api/v1/findings/[id]/route";
import * as eventsRoute from "@/app/api/v1/findings/[id]/events/route";
import { queueFindingAlerts } from "@/lib/alerts/finding-alerts";
import { lastAssessedAt, reconcileFindings, type FindingCandidate } from "@/lib/register/store";
import { call, makeUser, sessionCookieFor } from "./helpers/world";

let officer: User, admin: User, owner: User, stranger: User, contact: User, auditor: User;
let roomId: number, unitId: number, otherUnitId: number, siteId: number;
const DAY = 86_400_000;
const T0 = Date.parse("2026-08-01T09:00:00Z");

beforeAll(() => {
  const db = getDb();
  officer = makeUser("safety_officer");
  admin = makeUser("admin");
  owner = makeUser("researcher");
  stranger = makeUser("researcher");
  contact = makeUser("facilities");
  auditor = makeUser("auditor");
  siteId = db.insert(sites).values({ name: "Register campus" }).returning().get().id;
  roomId = db.insert(rooms).values({ siteId, code: "R-9", name: "Solvent store", facilitiesContactId: contact.id }).returning().get().id;
  unitId = db.insert(storageUnits).values({ roomId, code: "FR-9", name: "Fridge", kind: "domestic_refrigerator", setMaxC: 8, ownerId: owner.id }).returning().get().id;
  otherUnitId = db.insert(storageUnits).values({ roomId, code: "SH-9", name: "Shelf", kind: "open_shelving" }).returning().get().id;
});

function candidate(overrides: Partial<FindingCandidate> = {}): FindingCandidate {
  return {
    fingerprint: `enclosure-lfl|unit:${unitId}|substance:1|control_lost`,
    rule: "enclosure-lfl",
    severity: "critical",
    scenario: "control_lost",
    title: "Diethyl ether in FR-9 could reach 210 % LFL if the refrigerator fails",
    siteId,
    roomId,
    storageUnitId: unitId,
    containerId: null,
    substanceId: null,
    mixtureId: null,
    value: 210,
    limitValue: 100,
    ratio: 2.1,
    unit: "% LFL",
    worstCaseTempC: 28,
    worstCaseSource: "28.0 °C, design maximum (the room's worst case, as if the unit had failed)",
    trace: { steps: [{ label: "Psat", value: 58.7, unit: "kPa" }] },
    ...overrides,
  };
}

const scope = () => ({ roomIds: [roomId], storageUnitIds: [unitId, otherUnitId] });
const reconcile = (list: FindingCandidate[], nowMs: number, reason?: string) => getDb().transaction((tx) => reconcileFindings(tx, scope(), list, { nowMs, reason }));
const only = () => getDb().select().from(findings).where(eq(findings.storageUnitId, unitId)).get()!;
const eventsOf = (id: number) => getDb().select().from(findingEvents).where(eq(findingEvents.findingId, id)).orderBy(findingEvents.id).all();

describe("reconciling findings by fingerprint", () => {
  it("raises a new finding once, and a second identical assessment changes nothing", () => {
    const first = reconcile([candidate()], T0);
    expect(first).toMatchObject({ raised: 1, updated: 0, resolved: 0 });
    expect(reconcile([candidate()], T0 + 1000)).toMatchObject({ raised: 0, unchanged: 1 });
    expect(eventsOf(only().id).map((e) => e.kind)).toEqual(["raised"]);
    // Unchanged, the finding's row is not written; its room records the assessment, and the
    // finding counts as assessed then.
    expect(only().lastEvaluatedAt.getTime()).toBe(T0);
    const room = getDb().select({ assessedAt: rooms.assessedAt }).from(rooms).where(eq(rooms.id, roomId)).get()!;
    expect(room.assessedAt?.getTime()).toBe(T0 + 1000);
    expect(lastAssessedAt(only(), room.assessedAt).getTime()).toBe(T0 + 1000);
    expect(lastAssessedAt({ ...only(), conditionHolds: false }, room.assessedAt).getTime()).toBe(T0);
  });

  it("updates values in place, with an event only when severity or value moves by more than 1 %", () => {
    reconcile([candidate({ value: 211, ratio: 2.11 })], T0 + 2000); // 0.5 %: no event
    expect(eventsOf(only().id)).toHaveLength(1);
    const result = reconcile([candidate({ severity: "high", value: 90, ratio: 0.9, title: "… 90 % LFL" })], T0 + 3000);
    expect(result.updated).toBe(1);
    const last = eventsOf(only().id).at(-1)!;
    expect(last.note).toBe("Severity critical → high: … 90 % LFL");
    expect(only()).toMatchObject({ value: 90, severity: "high", status: "open" });
  });

  it("resolves itself with a reason when the condition no longer holds and re-opens when it returns", () => {
    const gone = reconcile([], T0 + DAY, "container DE-1 moved to FSR-1");
    expect(gone.resolved).toBe(1);
    expect(only()).toMatchObject({ status: "resolved", conditionHolds: false });
    expect(eventsOf(only().id).at(-1)!.note).toBe("Resolved by re-assessment: the condition no longer holds after container DE-1 moved to FSR-1.");
    const back = reconcile([candidate()], T0 + 2 * DAY);
    expect(back.reopened).toBe(1);
    expect(back.changes[0].kind).toBe("reopened");
    expect(only()).toMatchObject({ status: "open", conditionHolds: true, resolvedAt: null });
    expect(getDb().select().from(findings).all()).toHaveLength(1); // never a second row, never deleted
  });
});

describe("the workflow through POST /api/v1/findings/{id}/events", () => {
  const step = async (user: User, body: unknown) => call(eventsRoute.POST, { method: "POST", params: { id: String(only().id) }, body, cookie: await sessionCookieFor(user) });

  it("lets the unit's owner acknowledge but not a stranger, and nobody but safety officers accept a risk", async () => {
    expect((await step(stranger, { kind: "acknowledge" })).status).toBe(404);
    expect((await step(auditor, { kind: "comment", note: "x" })).status).toBe(403);
    const ack = await step(owner, { kind: "acknowledge", note: "Seen; moving it today." });
    expect(ack.status).toBe(201);
    expect(ack.body.data.status).toBe("acknowledged");
    expect((await step(owner, { kind: "start_mitigation", plan: "Move", assigneeId: owner.id })).status).toBe(403);
    const byAdmin = await step(admin, { kind: "accept_risk", justification: "Low use", reviewDate: "2026-12-01" });
    expect(byAdmin.status).toBe(403);
    expect(only().status).toBe("acknowledged");
  });

  it("starts mitigation with a plan and an owner, refuses a bad step with a clear error, and records who did what", async () => {
    const noPlan = await step(officer, { kind: "start_mitigation", plan: "", assigneeId: owner.id });
    expect(noPlan.status).toBe(400);
    expect(noPlan.body.error.fields.plan[0]).toBe("Mitigation plan is required.");
    const toAuditor = await step(officer, { kind: "start_mitigation", plan: "Move to the rated fridge", assigneeId: auditor.id });
    expect(toAuditor.status).toBe(400);
    const started = await step(officer, { kind: "start_mitigation", plan: "Move the ether to FSR-1 (rated for flammables).", assigneeId: owner.id });
    expect(started.status).toBe(201);
    expect(only()).toMatchObject({ status: "mitigating", assigneeId: owner.id, mitigationPlan: "Move the ether to FSR-1 (rated for flammables)." });
    const again = await step(officer, { kind: "acknowledge" });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/being mitigated/);
    const detail = await call(oneRoute.GET, { params: { id: String(only().id) }, cookie: await sessionCookieFor(auditor) });
    expect(detail.status).toBe(200);
    expect(detail.body.data.trace.steps[0]).toEqual({ label: "Psat", value: 58.7, unit: "kPa" });
    expect(detail.body.data.events.map((e: { kind: string; actor: { name: string } | null }) => [e.kind, e.actor?.name ?? null])).toEqual([
      ["raised", null],
      ["updated", null],
      ["auto_resolved", null],
      ["reopened", null],
      ["acknowledged", owner.name],
      ["mitigation_started", officer.name],
    ]);
  });

  it("accepts a risk only with a justification and a future review date, and re-opens it when the date has passed", async () => {
    const noDate = await step(officer, { kind: "accept_risk", justification: "Used weekly, small bottle" });
    expect(noDate.status).toBe(400);
    expect(noDate.body.error.fields.reviewDate[0]).toMatch(/review date is required/);
    const past = await step(officer, { kind: "accept_risk", justification: "x", reviewDate: "2020-01-01" });
    expect(past.status).toBe(400);
    const until = new Date(Date.now() + 30 * DAY).toISOString().slice(0, 10);
    const accepted = await step(officer, { kind: "accept_risk", justification: "Small bottle, used weekly; rated fridge on order.", reviewDate: until });
    expect(accepted.status).toBe(201);
    expect(only().status).toBe("risk_accepted");
    reconcile([candidate()], Date.now() + DAY);
    expect(only().status).toBe("risk_accepted");
    const review = reconcile([candidate()], Date.now() + 31 * DAY);
    expect(review.reopened).toBe(1);
    expect(only().status).toBe("open");
    expect(eventsOf(only().id).at(-1)!.note).toMatch(/^Re-opened for review: the risk was accepted until/);
  });
});

describe("GET /api/v1/findings", () => {
  it("filters by severity, status and location, pages, and hides other people's findings", async () => {
    reconcile([candidate(), candidate({ fingerprint: `quantity-limit|unit:${otherUnitId}|IB|in_control`, rule: "quantity-limit", severity: "moderate", storageUnitId: otherUnitId, scenario: "in_control", title: "Class IB liquids on SH-9 above the limit", value: 30, limitValue: 25, ratio: 1.2, unit: "L" })], Date.now() + 32 * DAY);
    const cookie = await sessionCookieFor(officer);
    const all = await call(listRoute.GET, { path: `/api/v1/findings?roomId=${roomId}`, cookie });
    expect(all.body).toMatchObject({ page: 1, pageSize: 25, total: 2 });
    expect(all.body.data[0]).toMatchObject({ rule: "enclosure-lfl", severity: "critical", status: "open", scenario: "control_lost", value: 210, limit: 100, ratio: 2.1, unit: "% LFL", worstCaseTempC: 28 });
    expect(all.body.data[0].location).toMatchObject({ roomCode: "R-9", unitCode: "FR-9", label: "R-9 › FR-9" });
    const moderate = await call(listRoute.GET, { path: "/api/v1/findings?severity=moderate,low&status=open", cookie });
    expect(moderate.body.data.map((f: { rule: string }) => f.rule)).toEqual(["quantity-limit"]);
    const bad = await call(listRoute.GET, { path: "/api/v1/findings?severity=urgent", cookie });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.severity[0]).toMatch(/one or more of: critical, high, moderate, low/);
    const ownerView = await call(listRoute.GET, { path: "/api/v1/findings", cookie: await sessionCookieFor(owner) });
    expect(ownerView.body.data.map((f: { rule: string }) => f.rule)).toEqual(["enclosure-lfl"]); // only the unit they own
    const strangerView = await call(listRoute.GET, { path: "/api/v1/findings", cookie: await sessionCookieFor(stranger) });
    expect(strangerView.body.total).toBe(0);
  });
});

describe("finding alerts", () => {
  it("e-mails a critical finding to the unit owner, the facilities contact and safety officers, and a moderate one to nobody", () => {
    const changes = reconcile([], Date.now() + 40 * DAY).changes; // resolve both
    expect(changes).toHaveLength(0);
    const raised = getDb().transaction((tx) => {
      const result = reconcileFindings(tx, scope(), [candidate(), candidate({ fingerprint: "x|moderate", storageUnitId: otherUnitId, severity: "moderate" })], { nowMs: Date.now() + 41 * DAY });
      return { result, queued: queueFindingAlerts(tx, result.changes) };
    });
    expect(raised.result.changes.map((c) => c.kind)).toEqual(["reopened", "raised"]);
    const to = (user: User) => getDb().select().from(emailMessages).where(eq(emailMessages.recipientUserId, user.id)).all();
    for (const user of [owner, contact, officer]) {
      const [message] = to(user);
      expect(message.subject).toBe("CRITICAL finding: Diethyl ether in FR-9 could reach 210 % LFL if the refrigerator fails");
      expect(message.text).toContain("Computed 210 % LFL against a limit of 100 % LFL (210 % of the limit).");
      expect(message.text).toContain("/register/");
      expect(message.text).toContain("not air monitoring");
    }
    expect(raised.queued).toBe(3);
    expect(to(stranger)).toHaveLength(0);
  });
});
