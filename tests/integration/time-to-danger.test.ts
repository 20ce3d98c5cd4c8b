/**
 * Time to danger in the register: control-lost findings carry `timeToDanger` in the API, computed
 * from the unit's warm-up (Newton's law of heating towards its room's worst case), and the register
 * sorts by it. Runs on the invented demo organisation (its −20 °C freezer FZ-1 in room 2.107 holds
 * methanol and ethanol; its domestic-type refrigerator FR-1 is already critical in control).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { findings, storageUnits, substances, users, type User } from "@/db/schema";
import * as findingsRoute from "@/app/api/v1/findings/route";
import * as findingRoute from "@/app/api/v1/findings/[id]/route";
import * as planRoute from "@/app/api/v1/storage-plan/route";
import { warmUpsOfUnits } from "@/lib/temperatures/warm-up";
import { call, sessionCookieFor } from "./helpers/world";

let officer: User;
const unitId = (code: string) => getDb().select().from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
const substanceId = (cas: string) => getDb().select().from(substances).where(eq(substances.cas, cas)).get()!.id;
type Ttd = { minutes: number; threshold: string; tempC: number } | null;

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  officer = getDb().select().from(users).where(eq(users.email, "safety@example.org")).get()!;
});

describe("time to danger of control-lost findings", () => {
  it("FZ-1's methanol reaches its LFL after the warm-up the unit's τ gives, as the API says", async () => {
    const fz1 = unitId("FZ-1");
    const row = getDb()
      .select()
      .from(findings)
      .where(and(eq(findings.storageUnitId, fz1), eq(findings.rule, "enclosure-lfl"), eq(findings.scenario, "control_lost"), eq(findings.substanceId, substanceId("67-56-1"))))
      .get()!;
    const response = await call(findingRoute.GET, { cookie: await sessionCookieFor(officer), params: { id: String(row.id) } });
    expect(response.status).toBe(200);
    const ttd = response.body.data.timeToDanger as Ttd;
    expect(ttd?.threshold).toBe("LFL");
    // Methanol's LFL 6.0 % → Psat 6.08 kPa at about 6.6 °C (VDI Heat Atlas 2nd ed.: 6,177 Pa at 280 K).
    expect(ttd!.tempC).toBeGreaterThan(6.4);
    expect(ttd!.tempC).toBeLessThan(6.9);
    // t = −τ·ln((T_room − T*)/(T_room − T_start)) with FZ-1's own τ, its in-control worst case and its room's worst case.
    const tau = warmUpsOfUnits(getDb(), [fz1]).get(fz1)!.tauMin;
    const trace = response.body.data.trace as { inputs: { symbol: string; value: number }[] };
    const start = trace.inputs.find((i) => i.symbol === "T_start")!.value;
    const room = trace.inputs.find((i) => i.symbol === "T_room")!.value;
    expect(ttd!.minutes).toBeCloseTo(-tau * Math.log((room - ttd!.tempC) / (room - start)), 0);
  });

  it("already critical at the set temperature: 0 minutes (FR-1's diethyl ether)", async () => {
    const response = await call(findingsRoute.GET, { cookie: await sessionCookieFor(officer), path: `/api/v1/findings?storageUnitId=${unitId("FR-1")}&pageSize=100` });
    expect(response.status).toBe(200);
    const lost = (response.body.data as { scenario: string; rule: string; title: string; timeToDanger: Ttd }[]).filter((f) => f.scenario === "control_lost" && f.rule === "enclosure-lfl");
    expect(lost.length).toBeGreaterThan(0);
    for (const f of lost) expect(f.timeToDanger).toMatchObject({ minutes: 0, threshold: "LFL" });
  });

  it("the register sorts by time to danger, soonest first, findings without one last", async () => {
    const response = await call(findingsRoute.GET, { cookie: await sessionCookieFor(officer), path: "/api/v1/findings?sort=timeToDanger&dir=asc&pageSize=100" });
    expect(response.status).toBe(200);
    const minutes = (response.body.data as { timeToDanger: Ttd }[]).map((f) => f.timeToDanger?.minutes ?? null);
    const known = minutes.filter((m): m is number => m !== null);
    expect(known.length).toBeGreaterThan(5);
    expect(known).toEqual([...known].sort((a, b) => a - b));
    expect(minutes.indexOf(null)).toBe(known.length === minutes.length ? -1 : known.length);
  });
});

describe("the storage planner reads the time to danger", () => {
  it("a litre of methanol: places where it would be flagged after a failure carry when, and rank after those where it would not", async () => {
    const response = await call(planRoute.GET, { path: `/api/v1/storage-plan?substanceId=${substanceId("67-56-1")}&amount=1&amountUnit=L&limit=50`, cookie: await sessionCookieFor(officer) });
    expect(response.status).toBe(200);
    const items = response.body.data as { code: string; verdict: string; worstSeverity: string | null; timeToDanger: Ttd }[];
    const freezer = items.find((i) => i.code === "FZ-1");
    // FZ-1 already holds methanol: its LFL after a failure, from the unit's own warm-up.
    expect(freezer?.timeToDanger?.threshold).toBe("LFL");
    expect(freezer!.timeToDanger!.minutes).toBeGreaterThan(0);
  });
});

