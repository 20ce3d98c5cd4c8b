/**
 * Container and location imports through the API: all or nothing, every bad row reported by line
 * and column, re-imports keyed by label, roles per the permission matrix. Data is invented.
 */
import fs from "node:fs";
import path from "node:path";
import ExcelJS from "exceljs";
import { and, count, eq, inArray, like } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { seedDemo } from "@/db/seed/demo";
import { auditEvents, containerMoves, containers, rooms, sites, storageUnits, users, type Role } from "@/db/schema";
import * as containerImportRoute from "@/app/api/v1/imports/containers/route";
import * as containerPreviewRoute from "@/app/api/v1/imports/containers/preview/route";
import * as locationImportRoute from "@/app/api/v1/imports/locations/route";
import * as locationPreviewRoute from "@/app/api/v1/imports/locations/preview/route";
import * as templateRoute from "@/app/api/v1/imports/templates/[file]/route";
import { call, sessionCookieFor } from "./helpers/world";

type Handler = (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;

const cookies = {} as Record<Role, string>;
const unitIds: Record<string, number> = {};

beforeAll(async () => {
  await seedDemo(getDb(), { bcryptCost: 4 });
  for (const role of ["admin", "safety_officer", "researcher", "facilities", "auditor"] as Role[]) {
    const row = getDb().select().from(users).where(eq(users.role, role)).get()!;
    cookies[role] = await sessionCookieFor(row);
  }
  for (const unit of getDb().select({ id: storageUnits.id, code: storageUnits.code }).from(storageUnits).all()) unitIds[unit.code] = unit.id;
});

async function upload(
  handler: Handler,
  role: Role | null,
  fileName: string,
  content: string | Uint8Array,
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests read arbitrary JSON bodies
): Promise<{ status: number; body: any }> {
  const form = new FormData();
  form.append("file", new File([content as BlobPart], fileName));
  const headers: Record<string, string> = role ? { cookie: cookies[role] } : {};
  const request = new Request("http://localhost:3999/api/v1/imports", { method: "POST", headers, body: form });
  const response = await handler(request, { params: Promise.resolve({}) });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null };
}

const HEADER = "label,cas,substance,amount,amount_unit,site,room,storage_unit,owner_email";

/** `n` container rows with labels prefix-00001…; `edit` may change a row by its index. */
function containerCsv(prefix: string, n: number, edit: (i: number, cells: string[]) => void = () => {}): string {
  const lines = [HEADER];
  for (let i = 0; i < n; i++) {
    const cells = [`${prefix}-${String(i + 1).padStart(5, "0")}`, "67-64-1", "", "1.5", "L", "North Campus", "B-014", "FC-1", "researcher@example.org"];
    edit(i, cells);
    lines.push(cells.join(","));
  }
  return lines.join("\n") + "\n";
}

const containerCount = () => getDb().$count(containers);
const labelsLike = (prefix: string) => getDb().select().from(containers).where(like(containers.label, `${prefix}-%`)).all();

describe("container import: all or nothing", () => {
  it("one bad row among 1,000 writes nothing; preview and commit list exactly that row", async () => {
    // Row 500 sits on spreadsheet line 501 (the header is line 1).
    const file = containerCsv("BAD", 1000, (i, cells) => {
      if (i === 499) cells[4] = "gallons";
    });
    const before = await containerCount();

    const preview = await upload(containerPreviewRoute.POST, "safety_officer", "bad.csv", file);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({ rowCount: 1000, toCreate: 999, toUpdate: 0, unchanged: 0 });
    expect(preview.body.data.issues).toEqual([
      { line: 501, column: "amount_unit", value: "gallons", message: "Unknown unit “gallons”; use mL, L, g or kg." },
    ]);

    const commit = await upload(containerImportRoute.POST, "safety_officer", "bad.csv", file);
    expect(commit.status).toBe(400);
    expect(commit.body.error).toMatchObject({ code: "import_rejected", message: "Nothing was imported: 1 problem on 1 row of 1000. Fix them in the file and import it again." });
    expect(commit.body.error.issues).toEqual(preview.body.data.issues);
    expect(await containerCount()).toBe(before);
    expect(labelsLike("BAD")).toHaveLength(0);
  });

  it("reports every bad row of the file, each by line and column", async () => {
    const file = containerCsv("MANY", 20, (i, cells) => {
      if (i === 2) cells[1] = "64-17-6"; // wrong check digit
      if (i === 7) cells[7] = "NOPE-9";
      if (i === 11) cells[8] = "nobody@example.org";
      if (i === 15) cells[0] = "MANY-00001"; // the label of line 2 again
    });
    const commit = await upload(containerImportRoute.POST, "admin", "many.csv", file);
    expect(commit.status).toBe(400);
    expect(commit.body.error.issues.map((i: { line: number; column: string }) => `${i.line}:${i.column}`)).toEqual([
      "4:cas",
      "9:storage_unit",
      "13:owner_email",
      "17:label",
    ]);
    expect(commit.body.error.issues[1].message).toBe("No storage unit NOPE-9 in room B-014 at North Campus. Check the unit code.");
    expect(labelsLike("MANY")).toHaveLength(0);
  });
});

describe("container import: writing and re-importing", () => {
  const file = containerCsv("IMP", 1000, (i, cells) => {
    if (i % 2 === 1) {
      cells[1] = "";
      cells[2] = "ethanol";
    }
  });

  it("writes all rows in one go with their first placement and one summary audit event", async () => {
    const before = await containerCount();
    const movesBefore = await getDb().$count(containerMoves);
    const response = await upload(containerImportRoute.POST, "safety_officer", "batch.csv", file);
    expect(response.status).toBe(201);
    expect(response.body).toEqual({ data: { created: 1000, updated: 0, unchanged: 0 } });
    expect(await containerCount()).toBe(before + 1000);
    expect(await getDb().$count(containerMoves)).toBe(movesBefore + 1000);

    const rows = labelsLike("IMP");
    expect(rows).toHaveLength(1000);
    const researcher = getDb().select().from(users).where(eq(users.email, "researcher@example.org")).get()!;
    expect(rows[0]).toMatchObject({ amount: 1.5, amountUnit: "L", storageUnitId: unitIds["FC-1"], ownerId: researcher.id, state: "sealed", containerKind: "glass_bottle" });
    expect(new Set(rows.map((r) => r.substanceId)).size).toBe(2);

    const summary = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "import"), eq(auditEvents.entityType, "container"))).all();
    expect(summary.map((a) => a.summary)).toEqual(["Imported 1,000 containers from batch.csv (1,000 created, 0 updated)"]);
    const perContainer = await getDb().$count(auditEvents, and(eq(auditEvents.entityType, "container"), inArray(auditEvents.entityId, rows.map((r) => String(r.id)))));
    expect(perContainer).toBe(0);
  });

  it("re-importing the same file creates no duplicates and reports every row unchanged", async () => {
    const before = await containerCount();
    const preview = await upload(containerPreviewRoute.POST, "safety_officer", "batch.csv", file);
    expect(preview.body.data).toMatchObject({ rowCount: 1000, issues: [], toCreate: 0, toUpdate: 0, unchanged: 1000 });
    const response = await upload(containerImportRoute.POST, "safety_officer", "batch.csv", file);
    expect(response.status).toBe(201);
    expect(response.body.data).toEqual({ created: 0, updated: 0, unchanged: 1000 });
    expect(await containerCount()).toBe(before);
  });

  it("a changed amount and storage unit update the container by label and record the move", async () => {
    const changed = containerCsv("IMP", 1000, (i, cells) => {
      if (i % 2 === 1) {
        cells[1] = "";
        cells[2] = "ethanol";
      }
      if (i === 41) {
        cells[3] = "0.75";
        cells[7] = "FC-2";
      }
    });
    const target = getDb().select().from(containers).where(eq(containers.label, "IMP-00042")).get()!;
    const preview = await upload(containerPreviewRoute.POST, "safety_officer", "batch-2.csv", changed);
    expect(preview.body.data).toMatchObject({ toCreate: 0, toUpdate: 1, unchanged: 999 });

    const response = await upload(containerImportRoute.POST, "safety_officer", "batch-2.csv", changed);
    expect(response.body.data).toEqual({ created: 0, updated: 1, unchanged: 999 });
    const after = getDb().select().from(containers).where(eq(containers.id, target.id)).get()!;
    expect(after).toMatchObject({ amount: 0.75, storageUnitId: unitIds["FC-2"] });

    const moves = getDb().select().from(containerMoves).where(eq(containerMoves.containerId, target.id)).orderBy(containerMoves.id).all();
    expect(moves.map((m) => [m.fromStorageUnitId, m.toStorageUnitId])).toEqual([
      [null, unitIds["FC-1"]],
      [unitIds["FC-1"], unitIds["FC-2"]],
    ]);
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "container"), eq(auditEvents.entityId, String(target.id)))).all();
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({
      action: "update",
      summary: "Updated container IMP-00042 from batch-2.csv, line 43 (amount, storageUnitId)",
      before: { amount: 1.5, storageUnitId: unitIds["FC-1"] },
      after: { amount: 0.75, storageUnitId: unitIds["FC-2"] },
    });
  });

  it("empty cells and defaulted columns keep an existing container's own values", async () => {
    const label = "IMP-00003";
    getDb().update(containers).set({ state: "opened", notes: "Kept note" }).where(eq(containers.label, label)).run();
    const file = [HEADER, `${label},67-64-1,,1.5,L,North Campus,B-014,FC-1,`].join("\n");
    const response = await upload(containerImportRoute.POST, "admin", "one.csv", file);
    expect(response.body.data).toEqual({ created: 0, updated: 0, unchanged: 1 });
    expect(getDb().select().from(containers).where(eq(containers.label, label)).get()).toMatchObject({ state: "opened", notes: "Kept note" });
  });

  it("a disposed container is reported, not changed", async () => {
    const label = "IMP-00007";
    getDb().update(containers).set({ state: "disposed", amount: 0 }).where(eq(containers.label, label)).run();
    const file = [HEADER, `${label},67-64-1,,2,L,North Campus,B-014,FC-1,`, "NEW-00001,67-64-1,,2,L,North Campus,B-014,FC-1,"].join("\n");
    const before = await containerCount();
    const response = await upload(containerImportRoute.POST, "admin", "disposed.csv", file);
    expect(response.status).toBe(400);
    expect(response.body.error.issues).toEqual([
      {
        line: 2,
        column: "label",
        value: label,
        message: `Container ${label} was disposed of; its record is kept and an import cannot change it. Remove this row, or give a new container its own label.`,
      },
    ]);
    expect(await containerCount()).toBe(before);
    expect(getDb().select().from(containers).where(eq(containers.label, label)).get()).toMatchObject({ state: "disposed", amount: 0 });
  });

  it("refuses a capacity in a mass unit for an amount in a volume unit", async () => {
    const file = ["label,cas,amount,amount_unit,capacity,capacity_unit,site,room,storage_unit", "CAP-1,67-64-1,1,L,500,g,North Campus,B-014,FC-1"].join("\n");
    const response = await upload(containerImportRoute.POST, "admin", "cap.csv", file);
    expect(response.status).toBe(400);
    expect(response.body.error.issues).toEqual([
      expect.objectContaining({ line: 2, column: "capacity_unit", value: "g", message: expect.stringContaining("give both as volumes (mL, L) or both as masses (g, kg)") }),
    ]);
  });

  it("reads a workbook as well as a CSV file", async () => {
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet("Containers");
    sheet.addRow(["label", "substance", "amount", "amount_unit", "site", "room", "storage_unit", "received_on"]);
    sheet.addRow(["XL-1", "Acetone", 250, "mL", "North Campus", "B-014", "FC-1", new Date(Date.UTC(2026, 2, 4))]);
    const bytes = new Uint8Array((await workbook.xlsx.writeBuffer()) as ArrayBuffer);
    const response = await upload(containerImportRoute.POST, "safety_officer", "stock.xlsx", bytes);
    expect(response.status).toBe(201);
    expect(getDb().select().from(containers).where(eq(containers.label, "XL-1")).get()).toMatchObject({ amount: 250, amountUnit: "mL", receivedAt: new Date(Date.UTC(2026, 2, 4)) });
  });

  it("imports 10,000 rows in one transaction (time printed, not asserted)", async () => {
    const big = containerCsv("BIG", 10_000, (i, cells) => {
      cells[7] = ["FC-1", "FC-2", "SH-1"][i % 3];
    });
    const before = await containerCount();
    const started = performance.now();
    const response = await upload(containerImportRoute.POST, "safety_officer", "big.csv", big);
    const ms = performance.now() - started;
    expect(response.status).toBe(201);
    expect(response.body.data.created).toBe(10_000);
    expect(await containerCount()).toBe(before + 10_000);
    const again = performance.now();
    const reimport = await upload(containerImportRoute.POST, "safety_officer", "big.csv", big);
    const reimportMs = performance.now() - again;
    expect(reimport.body.data.unchanged).toBe(10_000);
    console.log(`10,000-row container import: ${Math.round(ms)} ms to create, ${Math.round(reimportMs)} ms to re-import unchanged`);
  });
});

describe("import roles", () => {
  const file = containerCsv("ROLE", 2);

  it.each(["researcher", "facilities", "auditor"] as Role[])("the %s role may not import containers (403, nothing written)", async (role) => {
    const before = await containerCount();
    expect((await upload(containerPreviewRoute.POST, role, "roles.csv", file)).status).toBe(403);
    const response = await upload(containerImportRoute.POST, role, "roles.csv", file);
    expect(response.status).toBe(403);
    expect(response.body).toEqual({ error: { code: "forbidden", message: expect.any(String) } });
    expect(await containerCount()).toBe(before);
  });

  it("answers 401 without a session", async () => {
    expect((await upload(containerImportRoute.POST, null, "roles.csv", file)).status).toBe(401);
    expect((await upload(locationImportRoute.POST, null, "roles.csv", file)).status).toBe(401);
  });

  it.each(["researcher", "auditor"] as Role[])("the %s role may not import locations (403)", async (role) => {
    const response = await upload(locationImportRoute.POST, role, "harbour.csv", "site,room_code,room_name\nX,Y,Z\n");
    expect(response.status).toBe(403);
  });
});

describe("location import", () => {
  const harbour = fs.readFileSync(path.join(process.cwd(), "tests/fixtures/imports/harbour-locations.csv"));

  it("facilities staff create a new site with its rooms and units in one go", async () => {
    const preview = await upload(locationPreviewRoute.POST, "facilities", "harbour-locations.csv", harbour);
    expect(preview.status).toBe(200);
    expect(preview.body.data).toMatchObject({
      rowCount: 4,
      issues: [],
      toCreate: { sites: 1, rooms: 3, units: 3 },
      toUpdate: { sites: 0, rooms: 0, units: 0 },
    });
    expect(preview.body.data.notices).toContain("Site “Harbour Laboratory” is not in Headroom yet; the import will create it (first named on line 2).");
    expect(getDb().select().from(sites).where(eq(sites.name, "Harbour Laboratory")).get()).toBeUndefined();

    const response = await upload(locationImportRoute.POST, "facilities", "harbour-locations.csv", harbour);
    expect(response.status).toBe(201);
    expect(response.body.data).toEqual({
      created: { sites: 1, rooms: 3, units: 3 },
      updated: { sites: 0, rooms: 0, units: 0 },
      unchanged: { sites: 0, rooms: 0, units: 0 },
    });
    const site = getDb().select().from(sites).where(eq(sites.name, "Harbour Laboratory")).get()!;
    const siteRooms = getDb().select().from(rooms).where(eq(rooms.siteId, site.id)).orderBy(rooms.code).all();
    expect(siteRooms.map((r) => [r.code, r.name, r.kind, r.floorAreaM2, r.sprinklered])).toEqual([
      ["H-101", "Organic teaching lab", "laboratory", 60, true],
      ["H-102", "Solvent store", "storeroom", 12, false],
      ["H-103", "Instrument room", "laboratory", 20, false],
    ]);
    const units = getDb()
      .select({ code: storageUnits.code, room: rooms.code, kind: storageUnits.kind, setMaxC: storageUnits.setMaxC, ventilated: storageUnits.ventilated })
      .from(storageUnits)
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .where(eq(rooms.siteId, site.id))
      .orderBy(storageUnits.code)
      .all();
    expect(units).toEqual([
      { code: "HFC-1", room: "H-101", kind: "flammable_cabinet", setMaxC: null, ventilated: true },
      { code: "HFC-2", room: "H-102", kind: "flammable_cabinet", setMaxC: null, ventilated: false },
      { code: "HFR-1", room: "H-101", kind: "flammable_storage_refrigerator", setMaxC: 8, ventilated: false },
    ]);
    const summary = getDb().select().from(auditEvents).where(and(eq(auditEvents.action, "import"), eq(auditEvents.entityType, "location"))).all();
    expect(summary.map((a) => a.summary)).toEqual([
      "Imported locations from harbour-locations.csv: created 1 site, 3 rooms and 3 storage units; updated 0 rooms and 0 storage units",
    ]);
  });

  it("re-importing the same file changes nothing; a changed room is updated in place", async () => {
    const again = await upload(locationImportRoute.POST, "facilities", "harbour-locations.csv", harbour);
    expect(again.body.data).toEqual({
      created: { sites: 0, rooms: 0, units: 0 },
      updated: { sites: 0, rooms: 0, units: 0 },
      unchanged: { sites: 1, rooms: 3, units: 3 },
    });
    const changed = "site,room_code,room_name,air_changes_per_hour,unit_code,unit_name,unit_kind\nNorth Campus,B-014,Solvent store,10,FC-9,New cabinet,flammable_cabinet\n";
    const before = getDb().select().from(rooms).where(eq(rooms.code, "B-014")).get()!;
    const response = await upload(locationImportRoute.POST, "admin", "b014.csv", changed);
    expect(response.body.data).toEqual({
      created: { sites: 0, rooms: 0, units: 1 },
      updated: { sites: 0, rooms: 1, units: 0 },
      unchanged: { sites: 1, rooms: 0, units: 0 },
    });
    const after = getDb().select().from(rooms).where(eq(rooms.id, before.id)).get()!;
    expect(after).toMatchObject({ airChangesPerHour: 10, kind: before.kind, floorAreaM2: before.floorAreaM2, mixingFactor: before.mixingFactor });
    const audit = getDb().select().from(auditEvents).where(and(eq(auditEvents.entityType, "room"), eq(auditEvents.entityId, String(before.id)))).all();
    expect(audit.at(-1)).toMatchObject({ action: "update", before: { airChangesPerHour: before.airChangesPerHour }, after: { airChangesPerHour: 10 } });
  });

  it("a unit code differing from an existing one only in capitals is refused, and nothing is written", async () => {
    const file = "site,room_code,room_name,unit_code,unit_name,unit_kind\nNorth Campus,B-014,Solvent store,fc-1,Cabinet,flammable_cabinet\nNew Site,N-1,New room,N-FC,Cabinet,flammable_cabinet\n";
    const sitesBefore = await getDb().$count(sites);
    const response = await upload(locationImportRoute.POST, "admin", "caps.csv", file);
    expect(response.status).toBe(400);
    expect(response.body.error.issues).toEqual([expect.objectContaining({ line: 2, column: "unit_code", value: "fc-1" })]);
    expect(await getDb().$count(sites)).toBe(sitesBefore);
  });
});

describe("file-level problems", () => {
  it("missing columns answer 400 with the message naming them", async () => {
    const response = await upload(containerImportRoute.POST, "admin", "short.csv", "label,amout,site\nA-1,1,North Campus\n");
    expect(response.status).toBe(400);
    expect(response.body.error.code).toBe("missing_columns");
    expect(response.body.error.message).toMatch(/amount_unit/);
    expect(response.body.error.message).toMatch(/amout/);
  });

  it("a file that is not a spreadsheet answers 400 with the message", async () => {
    const pdf = new TextEncoder().encode("%PDF-1.7\n%âãÏÓ\n1 0 obj\n");
    for (const handler of [containerPreviewRoute.POST, containerImportRoute.POST, locationImportRoute.POST]) {
      const response = await upload(handler, "admin", "register.pdf", pdf);
      expect(response.status).toBe(400);
      expect(response.body.error.code).toBe("unsupported_format");
      expect(response.body.error.message).toMatch(/PDF/);
    }
  });

  it("a request without a file answers 400 on the file field", async () => {
    const response = await call(containerImportRoute.POST, { method: "POST", body: {}, cookie: cookies.admin });
    expect(response.status).toBe(400);
    expect(response.body.error).toMatchObject({ code: "invalid_input", fields: { file: [expect.any(String)] } });
    const empty = await upload(containerImportRoute.POST, "admin", "empty.csv", "");
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toBe("The chosen file is empty; choose the spreadsheet to import.");
  });

  it("a header without data rows is refused on commit and noted in the preview", async () => {
    const before = await getDb().select({ n: count() }).from(auditEvents).get();
    const preview = await upload(containerPreviewRoute.POST, "admin", "header.csv", HEADER + "\n");
    expect(preview.body.data.notices).toContain("The file has a header row but no rows of data; there is nothing to import.");
    const response = await upload(containerImportRoute.POST, "admin", "header.csv", HEADER + "\n");
    expect(response.status).toBe(400);
    expect(await getDb().select({ n: count() }).from(auditEvents).get()).toEqual(before);
  });
});

describe("templates", () => {
  it.each(["auditor", "researcher"] as Role[])("any signed-in role (%s) downloads both templates in both formats", async (role) => {
    for (const file of ["containers.csv", "locations.csv", "containers.xlsx", "locations.xlsx"]) {
      const request = new Request(`http://localhost:3999/api/v1/imports/templates/${file}`, { headers: { cookie: cookies[role] } });
      const response = await templateRoute.GET(request, { params: Promise.resolve({ file }) });
      expect(response.status).toBe(200);
      expect(response.headers.get("content-disposition")).toBe(`attachment; filename="headroom-${file.replace(".", "-template.")}"`);
      const bytes = new Uint8Array(await response.arrayBuffer());
      if (file.endsWith(".csv")) expect(new TextDecoder().decode(bytes)).toMatch(file.startsWith("containers") ? /^label,cas,/ : /^site,room_code,/);
      else expect([...bytes.slice(0, 4)]).toEqual([0x50, 0x4b, 0x03, 0x04]);
    }
  });

  it("an unknown template answers 404", async () => {
    const response = await call(templateRoute.GET, { path: "/api/v1/imports/templates/other.pdf", params: { file: "other.pdf" }, cookie: cookies.auditor });
    expect(response.status).toBe(404);
  });
});
