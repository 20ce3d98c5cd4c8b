/** List endpoints: { data, page, pageSize, total }, server-side filters and sorts, 400 for bad parameters. */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { containerMoves, containers, storageUnits, substances, users, type Role } from "@/db/schema";
import * as containersRoute from "@/app/api/v1/containers/route";
import * as roomsRoute from "@/app/api/v1/rooms/route";
import * as unitsRoute from "@/app/api/v1/storage-units/route";
import * as auditRoute from "@/app/api/v1/audit-events/route";
import { call, sessionCookieFor } from "./helpers/world";

const cookie = {} as Record<Role, string>;

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  // A controlled set of containers instead of the demo's few hundred.
  getDb().delete(containerMoves).run();
  getDb().delete(containers).run();
  for (const role of ["safety_officer", "researcher", "auditor"] as Role[]) {
    cookie[role] = await sessionCookieFor(getDb().select().from(users).where(eq(users.role, role)).get()!);
  }
  const unit = (code: string) => getDb().select().from(storageUnits).where(eq(storageUnits.code, code)).get()!.id;
  const cas = (n: string) => getDb().select().from(substances).where(eq(substances.cas, n)).get()!.id;
  const rows: [string, string, number, string, number, Role][] = [
    ["HR-000001", "67-64-1", 2.5, "L", unit("FC-1"), "safety_officer"],
    ["HR-000002", "64-17-5", 1, "L", unit("FC-1"), "researcher"],
    ["HR-000003", "60-29-7", 500, "mL", unit("FSR-1"), "researcher"],
    ["HR-000004", "67-56-1", 4, "L", unit("FC-5"), "safety_officer"],
    ["QA-9", "67-64-1", 0.25, "L", unit("SH-2"), "researcher"],
  ];
  for (const [label, casNumber, amount, amountUnit, storageUnitId, role] of rows) {
    const response = await call(containersRoute.POST, {
      method: "POST",
      cookie: cookie[role],
      body: { label, substanceId: cas(casNumber), amount, amountUnit, storageUnitId },
    });
    expect(response.status).toBe(201);
  }
});

async function list(query: string, role: Role = "safety_officer") {
  return call(containersRoute.GET, { path: `/api/v1/containers?${query}`, cookie: cookie[role] });
}

describe("GET /api/v1/containers", () => {
  it("pages with a total", async () => {
    const response = await list("pageSize=2&page=2&sort=label&dir=asc");
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({ page: 2, pageSize: 2, total: 5 });
    expect(response.body.data.map((c: { label: string }) => c.label)).toEqual(["HR-000003", "HR-000004"]);
  });

  it("finds by label prefix, substance name and CAS number", async () => {
    expect((await list("q=HR-00000")).body.total).toBe(4);
    expect((await list("q=acetone")).body.data.map((c: { label: string }) => c.label).sort()).toEqual(["HR-000001", "QA-9"]);
    expect((await list("q=60-29-7")).body.data[0].label).toBe("HR-000003");
  });

  it("filters by site, room, unit, owner and 'mine'", async () => {
    const riverside = (await call(roomsRoute.GET, { path: "/api/v1/rooms?q=R-1.02", cookie: cookie.auditor })).body.data[0];
    expect((await list(`siteId=${riverside.siteId}`)).body.data.map((c: { label: string }) => c.label)).toEqual(["HR-000004"]);
    expect((await list(`roomId=${riverside.id}`)).body.total).toBe(1);
    const mine = await list("mine=1", "researcher");
    expect(mine.body.data.map((c: { label: string }) => c.label).sort()).toEqual(["HR-000002", "HR-000003", "QA-9"]);
  });

  it("sorts by location, substance and amount in both directions", async () => {
    const byLocation = (await list("sort=location&dir=asc")).body.data.map((c: { siteName: string; roomCode: string; unitCode: string }) => `${c.siteName} ${c.roomCode} ${c.unitCode}`);
    expect(byLocation).toEqual([...byLocation].sort());
    const bySubstance = (await list("sort=substance&dir=desc")).body.data.map((c: { substanceName: string }) => c.substanceName);
    expect(bySubstance).toEqual([...bySubstance].sort().reverse());
  });

  it("answers 400 with field errors for an unknown sort or state", async () => {
    const response = await list("sort=colour&state=melted&pageSize=1000");
    expect(response.status).toBe(400);
    expect(Object.keys(response.body.error.fields).sort()).toEqual(["pageSize", "sort", "state"]);
  });
});

describe("other lists", () => {
  it("lists storage units of a room in code order", async () => {
    const room = (await call(roomsRoute.GET, { path: "/api/v1/rooms?q=2.115", cookie: cookie.auditor })).body.data[0];
    const units = await call(unitsRoute.GET, { path: `/api/v1/storage-units?roomId=${room.id}&sort=code`, cookie: cookie.auditor });
    expect(units.body.data.map((u: { code: string }) => u.code)).toEqual(["FC-4", "FSR-1", "FZ-1", "FZ-2"]);
  });

  it("filters the audit log by record type and text, newest first", async () => {
    const response = await call(auditRoute.GET, { path: "/api/v1/audit-events?entityType=container&q=HR-000003", cookie: cookie.auditor });
    expect(response.status).toBe(200);
    expect(response.body.total).toBe(1);
    expect(response.body.data[0]).toMatchObject({ action: "create", entityType: "container" });
    const researcher = await call(auditRoute.GET, { path: "/api/v1/audit-events", cookie: cookie.researcher });
    expect(researcher.status).toBe(403);
  });
});
