/**
 * The register workbook through GET /api/v1/exports/register.xlsx: an auditor downloads it and the
 * test opens it with exceljs — sheet names and order, header rows, frozen headers and filters, one
 * finding's numbers, dates as dates, text that looks like a formula kept as text, the site filter,
 * and who may download. Every check value below is one this file inserts (an invented world).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import ExcelJS from "exceljs";
import { getDb } from "@/db/client";
import { FINDING_STATUSES } from "@/db/enums";
import { auditEvents, containers, excursions, exposureLimits, findings, findingTraces, readings, rooms, sensors, sites, storageUnits, substances, type User } from "@/db/schema";
import * as exportRoute from "@/app/api/v1/exports/register.xlsx/route";
import { PassThrough, Writable } from "node:stream";
import { locationWorstCases } from "@/lib/exports/location-worst-cases";
import { writeRegisterWorkbook } from "@/lib/exports/register-workbook";
import { ExportCancelledError } from "@/lib/exports/table-sheet";
import { TraceWriter } from "@/lib/register/store";
import { worstCaseForRoom, worstCaseForUnit } from "@/lib/temperatures/queries";
import { makeUser, sessionCookieFor } from "./helpers/world";

const RAISED_AT = Date.parse("2026-08-01T09:30:00Z");
const EXCURSION_START = Date.parse("2026-07-30T10:00:00Z");
const FORMULA_LABEL = '=HYPERLINK("http://x")';

let auditor: User, officer: User, researcher: User, facilities: User;
let siteId: number, otherSiteId: number, findingId: number, otherFindingId: number;

/** Long enough (≥ 100 characters) to be cited as [S…] and written out on the Trace sources sheet. */
const LONG_SOURCE = "invented test value, as if from a handbook table of flammability limits measured in a closed vessel at 25 °C";

const ENGINE_TRACE = {
  method: "Closed-enclosure bound",
  source: "after Popendorf's closed-room worst case",
  inputs: [
    { name: "Worst-case temperature", symbol: "T", value: 28, unit: "°C", source: "room design maximum" },
    { name: "Lower flammable limit", symbol: "LFL", value: 1.9, unit: "% vol", source: LONG_SOURCE },
  ],
  steps: [
    {
      description: "Saturation vapor pressure",
      formula: "log10(P/kPa) = A − B/(T + C)",
      substituted: "log10(P) = 6.1 − 1000/(28 + 230)",
      result: { name: "Saturation vapor pressure", symbol: "Psat", value: 22.7, unit: "kPa" },
    },
  ],
  result: { name: "Fraction of the LFL", symbol: "C/LFL", value: 210, unit: "% LFL" },
  warnings: ["@SUM(A1)"],
};

beforeAll(() => {
  const db = getDb();
  auditor = makeUser("auditor", { name: "Ada Auditor" });
  officer = makeUser("safety_officer", { name: "Sam Officer" });
  researcher = makeUser("researcher", { name: "Rhea Researcher" });
  facilities = makeUser("facilities", { name: "Faye Facilities" });
  siteId = db.insert(sites).values({ name: "Export campus" }).returning().get().id;
  otherSiteId = db.insert(sites).values({ name: "Other campus" }).returning().get().id;
  const roomId = db
    .insert(rooms)
    .values({ siteId, code: "R-1", name: "Solvent store", kind: "storeroom", floorAreaM2: 20, heightM: 3, airChangesPerHour: 6, designMaxTempC: 28 })
    .returning()
    .get().id;
  const unitId = db
    .insert(storageUnits)
    .values({ roomId, code: "FR-1", name: "Fridge", kind: "domestic_refrigerator", internalVolumeL: 150, setMinC: 2, setMaxC: 8, excursionThresholdC: 10, ownerId: researcher.id })
    .returning()
    .get().id;
  const otherRoomId = db.insert(rooms).values({ siteId: otherSiteId, code: "X-9", name: "Far lab" }).returning().get().id;
  const otherUnitId = db.insert(storageUnits).values({ roomId: otherRoomId, code: "SH-9", name: "Shelf", kind: "open_shelving" }).returning().get().id;
  const substanceId = db
    .insert(substances)
    .values({
      cas: "9999-99-9",
      name: "exportol (invented)",
      formula: "C4H10O",
      molarMassGPerMol: 74.12,
      normalBoilingPointC: 34.6,
      flashPointC: -45,
      lflVolPercent: 1.9,
      uflVolPercent: 36,
      autoignitionTempC: 160,
      correlations: [{ kind: "antoine", log: "log10", pressureUnit: "kPa", temperatureUnit: "C", a: 6.1, b: 1000, c: 230, tMinC: -40, tMaxC: 60, source: "invented coefficients" }],
      sources: { molarMassGPerMol: "invented: molar mass source", flashPointC: "invented: flash point source" },
    })
    .returning()
    .get().id;
  db.insert(exposureLimits)
    .values([
      { substanceId, kind: "TWA", value: 400, unit: "ppm", body: "TESTBODY", source: "invented limit source" },
      // 1,200 mg/m³ × 24.45 / 74.12 g/mol = 396 ppm: the lower TWA, so it takes the TWA columns.
      { substanceId, kind: "TWA", value: 1200, unit: "mg/m3", body: "OTHERBODY", source: "invented second source" },
      { substanceId, kind: "STEL", value: 500, unit: "ppm", body: "TESTBODY", source: "invented STEL source", note: "15 min" },
      { substanceId, kind: "IDLH", value: 1900, unit: "ppm", body: "TESTBODY", source: "invented IDLH source", note: "[10%LEL]" },
    ])
    .run();
  const containerId = db
    .insert(containers)
    .values({
      label: FORMULA_LABEL,
      substanceId,
      amount: 2.5,
      amountUnit: "L",
      state: "opened",
      storageUnitId: unitId,
      ownerId: researcher.id,
      receivedAt: new Date(Date.parse("2026-01-15T00:00:00Z")),
      notes: "+1+2",
    })
    .returning()
    .get().id;
  db.insert(containers).values({ label: "FAR-1", substanceId, amount: 500, amountUnit: "mL", storageUnitId: otherUnitId }).run();
  db.insert(containers).values({ label: "GONE-1", substanceId, amount: 0, amountUnit: "mL", state: "disposed", storageUnitId: unitId }).run();
  findingId = db
    .insert(findings)
    .values({
      fingerprint: `enclosure-lfl|unit:${unitId}|substance:${substanceId}|control_lost`,
      rule: "enclosure-lfl",
      severity: "critical",
      status: "mitigating",
      scenario: "control_lost",
      title: "exportol in FR-1 could reach 210 % LFL if the refrigerator fails",
      siteId,
      roomId,
      storageUnitId: unitId,
      containerId,
      substanceId,
      value: 209.83741526,
      limitValue: 100,
      ratio: 2.0983741526,
      unit: "% LFL",
      worstCaseTempC: 28,
      worstCaseSource: "28.0 °C, design maximum (the room's worst case, as if the unit had failed)",
      assigneeId: officer.id,
      mitigationPlan: "-move it to a flammable-storage refrigerator",
      firstRaisedAt: new Date(RAISED_AT),
      lastEvaluatedAt: new Date(RAISED_AT + 3_600_000),
    })
    .returning()
    .get().id;
  otherFindingId = db
    .insert(findings)
    .values({
      fingerprint: `quantity|room:${otherRoomId}|room_worst_case`,
      rule: "quantity-room",
      severity: "low",
      scenario: "room_worst_case",
      title: "Far lab quantity",
      siteId: otherSiteId,
      roomId: otherRoomId,
      value: 12,
      limitValue: 50,
      ratio: 0.24,
      unit: "L",
    })
    .returning()
    .get().id;
  const traces = new TraceWriter(db, new Date(RAISED_AT));
  traces.write(findingId, ENGINE_TRACE);
  traces.write(otherFindingId, { steps: [{ label: "Class IB volume", value: 12, unit: "L" }] });
  const sensorId = db.insert(sensors).values({ externalId: "LOG-FR-1", name: "Fridge logger", storageUnitId: unitId }).returning().get().id;
  db.insert(excursions)
    .values({
      sensorId,
      storageUnitId: unitId,
      thresholdC: 10,
      startAt: new Date(EXCURSION_START),
      endAt: new Date(EXCURSION_START + 90 * 60_000),
      peakTempC: 14.2,
      peakAt: new Date(EXCURSION_START + 45 * 60_000),
      acknowledgedAt: new Date(EXCURSION_START + 120 * 60_000),
      acknowledgedById: facilities.id,
      acknowledgeComment: "@door left open",
    })
    .run();
});

async function download(user: User | null, query = ""): Promise<Response> {
  const headers: Record<string, string> = user ? { cookie: await sessionCookieFor(user) } : {};
  const request = new Request(`http://localhost:3999/api/v1/exports/register.xlsx${query}`, { headers });
  return exportRoute.GET(request, { params: Promise.resolve({}) });
}

async function openWorkbook(response: Response): Promise<ExcelJS.Workbook> {
  const workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load((await response.arrayBuffer()) as unknown as ExcelJS.Buffer);
  return workbook;
}

function headers(sheet: ExcelJS.Worksheet): string[] {
  return (sheet.getRow(1).values as unknown[]).slice(1).map(String);
}

/** The Summary's "Findings by severity and status" table: each row's label and its Total column. */
function severityTotals(summary: ExcelJS.Worksheet): Map<string, unknown> {
  const totals = new Map<string, unknown>();
  summary.eachRow((row) => totals.set(String(row.getCell(1).value), row.getCell(FINDING_STATUSES.length + 2).value));
  return totals;
}

/** The data rows of a sheet as objects keyed by header, with the exceljs cells. */
function rowsOf(sheet: ExcelJS.Worksheet): Record<string, ExcelJS.Cell>[] {
  const keys = headers(sheet);
  const rows: Record<string, ExcelJS.Cell>[] = [];
  sheet.eachRow((row, n) => {
    if (n === 1) return;
    rows.push(Object.fromEntries(keys.map((key, i) => [key, row.getCell(i + 1)])));
  });
  return rows;
}

const DATA_SHEETS = ["Findings", "Finding traces", "Trace sources", "Inventory", "Locations", "Excursions", "Substances", "Methods and cautions"];

describe("GET /api/v1/exports/register.xlsx", () => {
  let workbook: ExcelJS.Workbook;
  let response: Response;

  beforeAll(async () => {
    response = await download(auditor);
    workbook = await openWorkbook(response);
  });

  it("answers an auditor with a workbook download that is not cached", () => {
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="headroom-register-\d{4}-\d{2}-\d{2}\.xlsx"$/);
    expect(response.headers.get("cache-control")).toContain("no-store");
  });

  it("holds the sheets in order, each data sheet with a bold frozen header row and a filter", () => {
    expect(workbook.worksheets.map((s) => s.name)).toEqual(["Summary", ...DATA_SHEETS]);
    for (const name of DATA_SHEETS) {
      const sheet = workbook.getWorksheet(name)!;
      expect(sheet.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });
      expect(sheet.autoFilter).toBeTruthy();
      expect(sheet.getRow(1).getCell(1).font?.bold).toBe(true);
    }
    expect(headers(workbook.getWorksheet("Findings")!)).toEqual([
      "Finding ID", "Severity", "Status", "Rule", "Scenario", "Title", "Site", "Room", "Storage unit", "Container",
      "Substance or mixture", "CAS number", "Value", "Limit", "Value ÷ limit (%)", "Value unit", "Worst case (°C)",
      "Worst-case source", "Time to danger after a failure (min)", "Time-to-danger threshold", "First raised (UTC)", "Last evaluated (UTC)", "Resolved (UTC)", "Assignee", "Mitigation plan",
      "Risk accepted until (UTC)", "Fingerprint",
    ]);
    expect(headers(workbook.getWorksheet("Inventory")!)).toEqual(expect.arrayContaining(["Container", "Amount", "Amount unit", "Received (UTC)"]));
    expect(headers(workbook.getWorksheet("Locations")!)).toEqual(expect.arrayContaining(["Room volume (m³)", "Unit internal volume (L)", "Worst case, in control (°C)", "Control lost (°C)"]));
    expect(headers(workbook.getWorksheet("Excursions")!)).toEqual(expect.arrayContaining(["Threshold (°C)", "Start (UTC)", "Duration (min)", "Peak (°C)"]));
    expect(headers(workbook.getWorksheet("Substances")!)).toEqual(expect.arrayContaining(["Molar mass M (g/mol)", "Molar mass source", "LFL (% vol)", "TWA", "TWA unit", "TWA issuing body", "TWA source", "STEL", "Ceiling", "IDLH", "Further exposure limits"]));
    const filter = workbook.getWorksheet("Findings")!.autoFilter as unknown as string;
    expect(String(typeof filter === "string" ? filter : JSON.stringify(filter))).toMatch(/A1/);
  });

  it("writes one finding's numbers as numbers and its times as dates", () => {
    const row = rowsOf(workbook.getWorksheet("Findings")!).find((r) => r["Finding ID"].value === findingId)!;
    expect(row).toBeDefined();
    // Stored 209.83741526 % LFL and a ratio of 2.0983741526: three significant figures, still numbers.
    for (const [key, expected] of [["Value", 210], ["Limit", 100], ["Value ÷ limit (%)", 2.1], ["Worst case (°C)", 28]] as const) {
      expect(row[key].type).toBe(ExcelJS.ValueType.Number);
      expect(row[key].value).toBe(expected);
    }
    expect(row["Value ÷ limit (%)"].numFmt).toBe("#,##0%"); // Excel shows 2.1 as 210 %
    expect(row["Rule"].value).toBe("Vapor in a closed unit or unventilated room as a fraction of the LFL");
    expect(row["Value unit"].value).toBe("% LFL");
    expect(row["Severity"].value).toBe("Critical");
    expect(row["Status"].value).toBe("Mitigating");
    expect(row["Scenario"].value).toBe("Control lost");
    expect(row["Site"].value).toBe("Export campus");
    expect(row["Storage unit"].value).toBe("FR-1");
    expect(row["Substance or mixture"].value).toBe("exportol (invented)");
    expect(row["CAS number"].value).toBe("9999-99-9");
    expect(row["Assignee"].value).toBe("Sam Officer");
    expect(row["First raised (UTC)"].value).toBeInstanceOf(Date);
    expect((row["First raised (UTC)"].value as Date).getTime()).toBe(RAISED_AT);
    expect((row["Last evaluated (UTC)"].value as Date).getTime()).toBe(RAISED_AT + 3_600_000);
    expect(row["Resolved (UTC)"].value).toBeNull();
  });

  it("keeps text that looks like a formula as a string cell, never a formula", () => {
    const container = rowsOf(workbook.getWorksheet("Inventory")!).find((r) => r["Container"].value === FORMULA_LABEL)!;
    const finding = rowsOf(workbook.getWorksheet("Findings")!).find((r) => r["Finding ID"].value === findingId)!;
    const comment = rowsOf(workbook.getWorksheet("Excursions")!)[0]["Comment"];
    const cells = [container["Container"], container["Notes"], finding["Container"], finding["Mitigation plan"], comment];
    expect(cells.map((c) => c.value)).toEqual([FORMULA_LABEL, "+1+2", FORMULA_LABEL, "-move it to a flammable-storage refrigerator", "@door left open"]);
    for (const cell of cells) {
      expect(cell.type).toBe(ExcelJS.ValueType.String);
      expect(cell.formula).toBeUndefined();
      expect(cell.numFmt).toBe("@");
    }
  });

  it("writes the finding's trace as readable lines in one cell, citing the long source on Trace sources", () => {
    const [row] = rowsOf(workbook.getWorksheet("Finding traces")!).filter((r) => r["Finding ID"].value === findingId);
    const sourceId = getDb().select().from(findingTraces).where(eq(findingTraces.findingId, findingId)).get()!.sourceIds![0];
    expect(row["Finding"].value).toBe("exportol in FR-1 could reach 210 % LFL if the refrigerator fails");
    const text = row["Calculation trace (one line per input, step, result and warning)"];
    expect(text.type).toBe(ExcelJS.ValueType.String);
    expect(text.numFmt).toBe("@");
    expect(String(text.value).split("\n")).toEqual([
      "Method: Closed-enclosure bound — after Popendorf's closed-room worst case",
      "Worst-case temperature (T) = 28 °C — room design maximum",
      `Lower flammable limit (LFL) = 1.9 % vol — [S${sourceId}]`,
      "Saturation vapor pressure: log10(P/kPa) = A − B/(T + C); log10(P) = 6.1 − 1000/(28 + 230) → 22.7 kPa — Saturation vapor pressure (Psat)",
      "Result: Fraction of the LFL (C/LFL) = 210 % LFL",
      "Warning: @SUM(A1)",
    ]);
    expect(row["Sources cited"].value).toBe(`S${sourceId}`);
    const sources = rowsOf(workbook.getWorksheet("Trace sources")!);
    expect(sources.map((r) => [r["Reference"].value, r["Source"].value])).toEqual([[`S${sourceId}`, LONG_SOURCE]]);
  });

  it("lists the containers in storage, locations with worst cases, the excursion and the substance with its sources", () => {
    const inventory = rowsOf(workbook.getWorksheet("Inventory")!);
    expect(inventory.map((r) => r["Container"].value).sort()).toEqual([FORMULA_LABEL, "FAR-1"].sort()); // disposed GONE-1 left out
    const held = inventory.find((r) => r["Container"].value === FORMULA_LABEL)!;
    expect(held["Amount"].value).toBe(2.5);
    expect(held["Amount unit"].value).toBe("L");
    expect((held["Received (UTC)"].value as Date).toISOString()).toBe("2026-01-15T00:00:00.000Z");

    const locations = rowsOf(workbook.getWorksheet("Locations")!);
    const room = locations.find((r) => r["Room"].value === "R-1" && r["Level"].value === "Room")!;
    expect(room["Room volume (m³)"].value).toBe(60); // 20 m² × 3 m
    expect(room["Worst case, in control (°C)"].value).toBe(28);
    const unit = locations.find((r) => r["Storage unit"].value === "FR-1")!;
    expect(unit["Unit internal volume (L)"].value).toBe(150);
    expect(unit["Worst case, in control (°C)"].value).toBe(8); // upper end of the set range
    expect(unit["Worst-case source"].value).toBe(
      "8.0 °C, upper end of the set range; the readings inside 1 excursion in the last 365 days are excluded (they count as control lost)",
    );
    expect(unit["Control lost (°C)"].value).toBe(28); // the room's design maximum
    expect(String(unit["Control-lost source"].value)).toContain("as if the unit had failed");

    const [excursion] = rowsOf(workbook.getWorksheet("Excursions")!);
    expect(excursion["Sensor"].value).toBe("LOG-FR-1");
    expect(excursion["Room"].value).toBe("R-1");
    expect(excursion["Duration (min)"].value).toBe(90);
    expect(excursion["Peak (°C)"].value).toBe(14.2);
    expect((excursion["Start (UTC)"].value as Date).getTime()).toBe(EXCURSION_START);
    expect(excursion["Acknowledged by"].value).toBe("Faye Facilities");

    const [substance] = rowsOf(workbook.getWorksheet("Substances")!);
    expect(substance["Substance"].value).toBe("exportol (invented)");
    expect(substance["Molar mass M (g/mol)"].value).toBe(74.12);
    expect(substance["Molar mass source"].value).toBe("invented: molar mass source");
    expect(substance["Flash point source"].value).toBe("invented: flash point source");
    expect(substance["A (or C1)"].value).toBe(6.1);
    expect(substance["Vapor-pressure equation"].value).toBe("Antoine: log10(P/kPa) = A − B/(t/°C + C)");
    // One row per substance, its limits in columns: the lower TWA (1,200 mg/m³ ≈ 396 ppm) in the TWA columns, the other listed.
    expect(rowsOf(workbook.getWorksheet("Substances")!)).toHaveLength(1);
    expect(substance["TWA"].value).toBe(1200);
    expect(substance["TWA unit"].value).toBe("mg/m³");
    expect(substance["TWA issuing body"].value).toBe("OTHERBODY");
    expect(substance["TWA source"].value).toBe("invented second source");
    expect(substance["STEL"].value).toBe(500);
    expect(substance["STEL source"].value).toBe("invented STEL source (15 min)");
    expect(substance["Ceiling"].value).toBeNull();
    expect(substance["IDLH"].value).toBe(1900);
    expect(substance["IDLH unit"].value).toBe("ppm");
    expect(substance["Further exposure limits"].value).toBe("TWA TESTBODY 400 ppm (invented limit source)");
  });

  it("states the counts, the caution and the methods", () => {
    const summary = workbook.getWorksheet("Summary")!;
    const text: string[] = [];
    summary.eachRow((row) => row.eachCell((cell) => text.push(String(cell.value))));
    expect(text.join("\n")).toContain("not air monitoring");
    expect(text.join("\n")).toContain("authority having jurisdiction");
    const labelled = new Map<string, unknown>();
    summary.eachRow((row) => labelled.set(String(row.getCell(1).value), row.getCell(2).value));
    expect(labelled.get("Containers in storage")).toBe(2);
    expect(labelled.get("Open excursions")).toBe(0);
    expect(labelled.get("Site")).toBe("All sites");
    // Findings by severity: the last column of each severity's row is its total over every status.
    const totals = severityTotals(summary);
    expect([totals.get("Critical"), totals.get("High"), totals.get("Low"), totals.get("Total")]).toEqual([1, 0, 1, 2]);
    const methods = rowsOf(workbook.getWorksheet("Methods and cautions")!);
    const items = methods.map((r) => `${r["Section"].value}: ${r["Item"].value}`);
    for (const expected of [
      "Method: Antoine equation",
      "Method: Clausius–Clapeyron equation",
      "Method: Enclosure bound",
      "Method: EPA RMP pool evaporation",
      "Method: Mackay–Matsugu evaporation",
      "Method: Well-mixed room model",
      "Method: Raoult's law",
      "Method: Le Chatelier's rule",
      "Assumption: Worst-case temperature",
      "Assumption: Look-back window",
      "Caution: Screening estimate, not air monitoring",
      "Caution: Local codes prevail",
      "Caution: Qualified people decide",
      "Caution: The defaults are examples",
    ])
      expect(items).toContain(expected);
  });

  it("records the download in the audit log", () => {
    const events = getDb().select().from(auditEvents).where(eq(auditEvents.entityType, "export")).all();
    expect(events.some((e) => e.actorId === auditor.id && e.action === "download" && e.summary.includes("all sites"))).toBe(true);
  });
});

describe("the site filter and who may download", () => {
  it("holds only the chosen site's findings, containers and locations", async () => {
    const response = await download(officer, `?siteId=${otherSiteId}`);
    expect(response.status).toBe(200);
    const workbook = await openWorkbook(response);
    expect(rowsOf(workbook.getWorksheet("Findings")!).map((r) => r["Finding ID"].value)).toEqual([otherFindingId]);
    expect(rowsOf(workbook.getWorksheet("Inventory")!).map((r) => r["Container"].value)).toEqual(["FAR-1"]);
    expect(rowsOf(workbook.getWorksheet("Locations")!).map((r) => r["Room"].value)).toEqual(["X-9", "X-9"]);
    expect(rowsOf(workbook.getWorksheet("Excursions")!)).toEqual([]);
    const trace = rowsOf(workbook.getWorksheet("Finding traces")!);
    expect(trace.map((r) => [r["Finding ID"].value, r["Calculation trace (one line per input, step, result and warning)"].value])).toEqual([[otherFindingId, "Class IB volume: 12 L"]]);
    expect(rowsOf(workbook.getWorksheet("Trace sources")!)).toEqual([]);
    const labelled = new Map<string, unknown>();
    workbook.getWorksheet("Summary")!.eachRow((row) => labelled.set(String(row.getCell(1).value), row.getCell(2).value));
    expect(labelled.get("Site")).toBe("Other campus");
    const totals = severityTotals(workbook.getWorksheet("Summary")!);
    expect([totals.get("Critical"), totals.get("Low"), totals.get("Total")]).toEqual([0, 1, 1]);
    // The site's container is of the one substance, so it alone is listed (once per exposure limit).
    expect(rowsOf(workbook.getWorksheet("Substances")!).map((r) => r["Substance"].value)).toEqual(["exportol (invented)"]);
  });

  it("answers 400 for a site id that is not a number or not a site, naming the field", async () => {
    for (const query of ["?siteId=abc", "?siteId=-2", "?siteId=999999"]) {
      const response = await download(auditor, query);
      expect(response.status).toBe(400);
      const body = await response.json();
      expect(body.error.code).toBe("invalid_input");
      expect(Object.keys(body.error.fields)).toEqual(["siteId"]);
    }
  });

  it("answers 403 to researchers and facilities staff and 401 without a session", async () => {
    expect((await download(researcher)).status).toBe(403);
    expect((await download(facilities)).status).toBe(403);
    const anonymous = await download(null);
    expect(anonymous.status).toBe(401);
    expect((await anonymous.json()).error.code).toBe("unauthenticated");
  });
});

describe("the Locations sheet's worst cases", () => {
  it("are those of worstCaseForRoom and worstCaseForUnit, for rooms and units with and without sensors", () => {
    const db = getDb();
    const nowMs = Date.parse("2026-08-03T12:00:00Z");
    const hour = 3_600_000;
    const site = db.insert(sites).values({ name: "Temperature campus" }).returning().get().id;
    const hot = db.insert(rooms).values({ siteId: site, code: "T-1", name: "Warm store", designMaxTempC: 25 }).returning().get().id;
    const bare = db.insert(rooms).values({ siteId: site, code: "T-2", name: "No data" }).returning().get().id;
    const fridge = db.insert(storageUnits).values({ roomId: hot, code: "TF-1", name: "Fridge", kind: "domestic_refrigerator", setMaxC: 8 }).returning().get().id;
    const shelf = db.insert(storageUnits).values({ roomId: hot, code: "TS-1", name: "Shelf", kind: "open_shelving" }).returning().get().id;
    const bareShelf = db.insert(storageUnits).values({ roomId: bare, code: "TS-2", name: "Shelf", kind: "open_shelving" }).returning().get().id;
    const roomLogger = db.insert(sensors).values({ externalId: "T-ROOM-A", name: "Room A", roomId: hot }).returning().get().id;
    const roomLogger2 = db.insert(sensors).values({ externalId: "T-ROOM-B", name: "Room B", roomId: hot }).returning().get().id;
    const fridgeLogger = db.insert(sensors).values({ externalId: "T-FRIDGE", name: "Fridge", storageUnitId: fridge }).returning().get().id;
    const shelfLogger = db.insert(sensors).values({ externalId: "T-SHELF", name: "Shelf", storageUnitId: shelf }).returning().get().id;
    const at = (hoursAgo: number) => new Date(nowMs - hoursAgo * hour);
    db.insert(readings)
      .values([
        { sensorId: roomLogger, at: at(500 * 24), tempC: 40 }, // outside the 365-day look-back
        { sensorId: roomLogger, at: at(30), tempC: 31 },
        { sensorId: roomLogger2, at: at(20), tempC: 31 }, // a tie: the later reading names the source
        { sensorId: roomLogger2, at: at(10), tempC: 22 },
        { sensorId: fridgeLogger, at: at(5), tempC: 9.5 },
        { sensorId: shelfLogger, at: at(4), tempC: 24 },
      ])
      .run();
    db.insert(excursions).values({ sensorId: fridgeLogger, storageUnitId: fridge, thresholdC: 9, startAt: at(6), peakTempC: 12, peakAt: at(5.5) }).run();

    const book = locationWorstCases(db, nowMs);
    for (const roomId of [hot, bare, 999_999]) expect(book.room(roomId)).toEqual(worstCaseForRoom(roomId, nowMs, db));
    for (const unitId of [fridge, shelf, bareShelf, 999_999]) expect(book.unit(unitId)).toEqual(worstCaseForUnit(unitId, nowMs, db));
    // The values themselves (from the readings and excursion inserted above):
    expect(book.room(hot)?.tempC).toBe(31);
    expect(book.room(hot)?.description).toContain("T-ROOM-B");
    // The 9.5 °C reading lies inside the open excursion: in control keeps the set range's 8 °C;
    // control lost is the higher of the room's 31 °C and the excursion's 12 °C peak.
    expect(book.unit(fridge).inControl?.tempC).toBe(8);
    expect(book.unit(fridge).controlLost?.tempC).toBe(31);
    expect(book.unit(shelf).inControl?.tempC).toBe(31);
    expect(book.room(bare)).toBeNull();
  });
});

describe("writeRegisterWorkbook", () => {
  async function toBuffer(write: (output: Writable) => Promise<unknown>): Promise<Buffer> {
    const output = new PassThrough();
    const chunks: Buffer[] = [];
    output.on("data", (chunk: Buffer) => chunks.push(chunk));
    await write(output);
    return Buffer.concat(chunks);
  }

  it("continues a table too long for one worksheet on the next, each part with its header, frozen row and filter", async () => {
    const bytes = await toBuffer((output) => writeRegisterWorkbook(output, { generatedBy: "test", nowMs: Date.now(), maxSheetRows: 2 }));
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(bytes as unknown as ExcelJS.Buffer);
    // Two findings, one data row per part below its header row.
    const names = workbook.worksheets.map((s) => s.name);
    expect(names.slice(0, 5)).toEqual(["Summary", "Findings", "Findings (2)", "Finding traces", "Finding traces (2)"]);
    for (const name of ["Findings", "Findings (2)", "Finding traces", "Finding traces (2)"]) {
      const sheet = workbook.getWorksheet(name)!;
      expect(headers(sheet)[0]).toBe("Finding ID");
      expect(sheet.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });
      expect(sheet.autoFilter).toBeTruthy();
    }
    const ids = ["Finding traces", "Finding traces (2)"].flatMap((name) => rowsOf(workbook.getWorksheet(name)!).map((r) => r["Finding ID"].value));
    expect(ids).toEqual([findingId, otherFindingId]);
  });

  it("stops with ExportCancelledError when its output closes early", async () => {
    const output = new PassThrough();
    output.once("data", () => output.destroy());
    output.resume();
    await expect(writeRegisterWorkbook(output, { generatedBy: "test", nowMs: Date.now() })).rejects.toBeInstanceOf(ExportCancelledError);
  });
});

describe("a trace text stored before texts were known to be XML-safe", () => {
  it("is checked and escaped as it is written, and what XML cannot hold is dropped", async () => {
    const db = getDb();
    const stored = db.select().from(findingTraces).where(eq(findingTraces.findingId, otherFindingId)).get()!;
    expect(stored.textXmlSafe).toBe(true); // TraceWriter's text
    db.update(findingTraces).set({ text: "Class IB volume: 12 L & <rising>\u0007", textXmlSafe: false }).where(eq(findingTraces.findingId, otherFindingId)).run();
    try {
      const workbook = await openWorkbook(await download(officer, `?siteId=${otherSiteId}`));
      const [trace] = rowsOf(workbook.getWorksheet("Finding traces")!);
      expect(trace["Calculation trace (one line per input, step, result and warning)"].value).toBe("Class IB volume: 12 L & <rising>");
    } finally {
      db.update(findingTraces).set({ text: stored.text, textXmlSafe: true }).where(eq(findingTraces.findingId, otherFindingId)).run();
    }
  });
});
