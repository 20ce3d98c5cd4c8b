import "server-only";
import type { Writable } from "node:stream";
import ExcelJS from "exceljs";
import { getDb, type Db } from "@/db/client";
import { FINDING_STATUSES, SEVERITIES, type FindingStatus, type Scenario, type Severity } from "@/db/enums";
import {
  excursionPage,
  exportPageQueries,
  findSite,
  locationRows,
  traceSourcesById,
  registerCounts,
  settingsInForce,
  substancesInScope,
  type ContainerExportRow,
  type ExcursionExportRow,
  type ExportScope,
  type FindingExportRow,
  type SubstanceExportRow,
} from "@/db/queries/register-export";
import { NotFoundError } from "@/lib/errors";
import { CONTAINER_KIND_LABELS, CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { ROOM_KIND_LABELS, STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";
import { formatTempC } from "@/lib/format/numbers";
import { correlationCoefficients, correlationEquation } from "@/lib/format/correlations";
import { lookBackDays } from "@/lib/temperatures/queries";
import { locationWorstCases } from "./location-worst-cases";
import { assumptions, CAUTIONS, METHODS, SUMMARY_CAUTION, type MethodStatement } from "./methods";
import { safeText, TEXT_NUM_FMT } from "./safe-text";
import { DATETIME_NUM_FMT, ExportCancelledError, HEADER_STYLE, Pace, sharedTextOf, TableSheet, TEXT_STYLE, type Column, type SharedText } from "./table-sheet";
import { traceText } from "@/lib/register/trace-text";
import { ruleLabel, type RuleId } from "@/lib/assessment/rules/rule-ids";
import { EXPOSURE_LIMIT_KINDS } from "@/db/enums";
import { installNativeZipCrc } from "./zip-crc";

/**
 * The register as an Excel workbook for auditors, streamed: Summary, Findings, Finding traces,
 * Trace sources, Inventory, Locations, Excursions, Substances, Methods and cautions. Each sheet is written row
 * by row and committed before the next begins, and the long tables are read in pages, so memory
 * stays flat for any size of register. Every string goes through safeText (lib/exports/safe-text.ts).
 */

export const REGISTER_SHEETS = [
  "Summary",
  "Findings",
  "Finding traces",
  "Trace sources",
  "Inventory",
  "Locations",
  "Excursions",
  "Substances",
  "Methods and cautions",
] as const;

export const WORKBOOK_TITLE = "Vapor-hazard register: audit workbook";

const PAGE_ROWS = 1000;
/** Traces are kilobytes of text each: fewer per page keeps memory flat. */
const TRACE_PAGE_ROWS = 250;

export type RegisterWorkbookOptions = {
  siteId?: number;
  /** Who asked for it (name and e-mail address), printed on the Summary sheet. */
  generatedBy: string;
  nowMs: number;
  /** Rows per worksheet before a table continues on "<name> (2)" (Excel's limit by default; tests lower it). */
  maxSheetRows?: number;
};

export type RegisterWorkbookResult = {
  findings: number;
  /** Findings with a trace on the "Finding traces" sheet. */
  traces: number;
  /** Sources the traces cite, listed on "Trace sources". */
  traceSources: number;
  containers: number;
  locations: number;
  excursions: number;
  substances: number;
  /** Whether the zip entries' CRC-32 came from zlib (see zip-crc.ts), for logs and the benchmark. */
  nativeZipCrc: boolean;
  /** Time spent on each sheet (and the final commit), for logs and the benchmark. */
  timingsMs: Record<string, number>;
};

export const SEVERITY_LABELS: Record<Severity, string> = { critical: "Critical", high: "High", moderate: "Moderate", low: "Low" };
export const STATUS_LABELS: Record<FindingStatus, string> = {
  open: "Open",
  acknowledged: "Acknowledged",
  mitigating: "Mitigating",
  resolved: "Resolved",
  risk_accepted: "Risk accepted",
};
export const SCENARIO_LABELS: Record<Scenario, string> = {
  room_worst_case: "Room worst case",
  in_control: "In control",
  control_lost: "Control lost",
  spill: "Spill",
};

const label = <K extends string>(labels: Record<K, string>, code: string | null | undefined) => (code == null ? null : (labels[code as K] ?? code));

/** A number to `significant` figures, still a number (the register shows 3). */
export function toSignificant(value: number | null | undefined, significant = 3): number | null {
  if (value == null || !Number.isFinite(value)) return null;
  return value === 0 ? 0 : Number(value.toPrecision(significant));
}

/** Ratios are stored as fractions (36.4 = 3,640 %): Excel's % format shows them as the register does. */
export const RATIO_NUM_FMT = "#,##0%";

// -------------------------------------------------------------------------------------------------
// Columns
// -------------------------------------------------------------------------------------------------

const FINDING_COLUMNS: Column<FindingExportRow>[] = [
  { header: "Finding ID", width: 10, kind: "number", value: (r) => r.id },
  { header: "Severity", width: 10, kind: "text", value: (r) => label(SEVERITY_LABELS, r.severity) },
  { header: "Status", width: 14, kind: "text", value: (r) => label(STATUS_LABELS, r.status) },
  { header: "Rule", width: 40, kind: "text", value: (r) => ruleLabel(r.rule as RuleId) },
  { header: "Scenario", width: 16, kind: "text", value: (r) => label(SCENARIO_LABELS, r.scenario) },
  { header: "Title", width: 60, kind: "text", unique: true, value: (r) => r.title },
  { header: "Site", width: 20, kind: "text", value: (r) => r.siteName },
  { header: "Room", width: 12, kind: "text", value: (r) => r.roomCode },
  { header: "Storage unit", width: 12, kind: "text", value: (r) => r.unitCode },
  { header: "Container", width: 16, kind: "text", unique: true, value: (r) => r.containerLabel },
  { header: "Substance or mixture", width: 26, kind: "text", value: (r) => r.substanceName ?? r.mixtureName },
  { header: "CAS number", width: 12, kind: "text", value: (r) => r.cas },
  { header: "Value", width: 12, kind: "number", value: (r) => toSignificant(r.value) },
  { header: "Limit", width: 12, kind: "number", value: (r) => toSignificant(r.limitValue) },
  { header: "Value ÷ limit (%)", width: 12, kind: "number", numFmt: RATIO_NUM_FMT, value: (r) => toSignificant(r.ratio) },
  { header: "Value unit", width: 10, kind: "text", value: (r) => r.unit },
  { header: "Worst case (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.worstCaseTempC },
  { header: "Worst-case source", width: 50, kind: "text", value: (r) => r.worstCaseSource },
  { header: "Time to danger after a failure (min)", width: 14, kind: "number", numFmt: "#,##0", value: (r) => (r.timeToDangerMin == null ? null : Math.round(r.timeToDangerMin)) },
  { header: "Time-to-danger threshold", width: 18, kind: "text", value: (r) => (r.timeToDangerThreshold == null ? null : `${r.timeToDangerThreshold} at ${formatTempC(r.timeToDangerTempC)}`) },
  { header: "First raised (UTC)", width: 17, kind: "datetime", value: (r) => r.firstRaisedAt },
  { header: "Last evaluated (UTC)", width: 17, kind: "datetime", value: (r) => r.lastEvaluatedAt },
  { header: "Resolved (UTC)", width: 17, kind: "datetime", value: (r) => r.resolvedAt },
  { header: "Assignee", width: 22, kind: "text", value: (r) => r.assigneeName },
  { header: "Mitigation plan", width: 40, kind: "text", unique: true, value: (r) => r.mitigationPlan },
  { header: "Risk accepted until (UTC)", width: 14, kind: "date", value: (r) => r.riskAcceptedUntil },
  { header: "Fingerprint", width: 40, kind: "text", unique: true, value: (r) => r.fingerprint },
];

type TraceSheetRow = { id: number; title: string; text: string | Buffer; sourceIds: number[] };

const TRACE_COLUMNS: Column<TraceSheetRow>[] = [
  { header: "Finding ID", width: 10, kind: "number", value: (r) => r.id },
  { header: "Finding", width: 40, kind: "text", value: (r) => r.title },
  { header: "Calculation trace (one line per input, step, result and warning)", width: 120, kind: "text", unique: true, value: (r) => r.text },
  { header: "Sources cited", width: 24, kind: "text", value: (r) => (r.sourceIds.length ? r.sourceIds.map((id) => `S${id}`).join(", ") : null) },
];

type TraceSourceSheetRow = { id: number; text: string };

const TRACE_SOURCE_COLUMNS: Column<TraceSourceSheetRow>[] = [
  { header: "Reference", width: 10, kind: "text", value: (r) => `S${r.id}` },
  { header: "Source", width: 140, kind: "text", unique: true, value: (r) => r.text },
];

const INVENTORY_COLUMNS: Column<ContainerExportRow>[] = [
  { header: "Container", width: 16, kind: "text", unique: true, value: (r) => r.label },
  { header: "Substance or mixture", width: 26, kind: "text", value: (r) => r.substanceName ?? r.mixtureName },
  { header: "CAS number", width: 12, kind: "text", value: (r) => r.cas },
  { header: "Amount", width: 10, kind: "number", value: (r) => r.amount },
  { header: "Amount unit", width: 8, kind: "text", value: (r) => r.amountUnit },
  { header: "Capacity", width: 10, kind: "number", value: (r) => r.capacity },
  { header: "Capacity unit", width: 8, kind: "text", value: (r) => r.capacityUnit },
  { header: "Container kind", width: 16, kind: "text", value: (r) => label(CONTAINER_KIND_LABELS, r.containerKind) },
  { header: "State", width: 12, kind: "text", value: (r) => label(CONTAINER_STATE_LABELS, r.state) },
  { header: "Site", width: 20, kind: "text", value: (r) => r.siteName },
  { header: "Room", width: 12, kind: "text", value: (r) => r.roomCode },
  { header: "Storage unit", width: 12, kind: "text", value: (r) => r.unitCode },
  { header: "Owner", width: 22, kind: "text", value: (r) => r.ownerName },
  { header: "Received (UTC)", width: 12, kind: "date", value: (r) => r.receivedAt },
  { header: "Opened (UTC)", width: 12, kind: "date", value: (r) => r.openedAt },
  { header: "Expires (UTC)", width: 12, kind: "date", value: (r) => r.expiresAt },
  { header: "Notes", width: 40, kind: "text", unique: true, value: (r) => r.notes },
];

type LocationSheetRow = {
  siteName: string;
  roomCode: string;
  roomName: string;
  unitCode: string | null;
  unitName: string | null;
  level: "Room" | "Storage unit";
  kind: string;
  roomVolumeM3: number | null;
  unitVolumeL: number | null;
  airChangesPerHour: number | null;
  mixingFactor: number | null;
  designMaxTempC: number | null;
  setMinC: number | null;
  setMaxC: number | null;
  excursionThresholdC: number | null;
  excursionMinDurationMin: number | null;
  sprinklered: boolean | null;
  ventilated: boolean | null;
  ignitionSourceFree: boolean | null;
  inControlTempC: number | null;
  inControlSource: string | null;
  controlLostTempC: number | null;
  controlLostSource: string | null;
};

const LOCATION_COLUMNS: Column<LocationSheetRow>[] = [
  { header: "Site", width: 20, kind: "text", value: (r) => r.siteName },
  { header: "Room", width: 12, kind: "text", value: (r) => r.roomCode },
  { header: "Room name", width: 24, kind: "text", value: (r) => r.roomName },
  { header: "Storage unit", width: 12, kind: "text", value: (r) => r.unitCode },
  { header: "Unit name", width: 24, kind: "text", value: (r) => r.unitName },
  { header: "Level", width: 12, kind: "text", value: (r) => r.level },
  { header: "Kind", width: 26, kind: "text", value: (r) => r.kind },
  { header: "Room volume (m³)", width: 12, kind: "number", value: (r) => r.roomVolumeM3 },
  { header: "Unit internal volume (L)", width: 12, kind: "number", value: (r) => r.unitVolumeL },
  { header: "Air changes per hour (1/h)", width: 12, kind: "number", value: (r) => r.airChangesPerHour },
  { header: "Mixing factor", width: 10, kind: "number", value: (r) => r.mixingFactor },
  { header: "Design maximum (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.designMaxTempC },
  { header: "Set range min (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.setMinC },
  { header: "Set range max (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.setMaxC },
  { header: "Excursion threshold (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.excursionThresholdC },
  { header: "Excursion minimum duration (min)", width: 12, kind: "number", value: (r) => r.excursionMinDurationMin },
  { header: "Sprinklered", width: 11, kind: "boolean", value: (r) => r.sprinklered },
  { header: "Ventilated", width: 11, kind: "boolean", value: (r) => r.ventilated },
  { header: "Free of ignition sources", width: 11, kind: "boolean", value: (r) => r.ignitionSourceFree },
  { header: "Worst case, in control (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.inControlTempC },
  { header: "Worst-case source", width: 50, kind: "text", value: (r) => r.inControlSource },
  { header: "Control lost (°C)", width: 12, kind: "number", numFmt: "0.0", value: (r) => r.controlLostTempC },
  { header: "Control-lost source", width: 50, kind: "text", value: (r) => r.controlLostSource },
];

const EXCURSION_COLUMNS: Column<ExcursionExportRow & { durationMin: number }>[] = [
  { header: "Sensor", width: 16, kind: "text", value: (r) => r.sensorExternalId },
  { header: "Sensor name", width: 24, kind: "text", value: (r) => r.sensorName },
  { header: "Site", width: 20, kind: "text", value: (r) => r.siteName },
  { header: "Room", width: 12, kind: "text", value: (r) => r.roomCode },
  { header: "Storage unit", width: 12, kind: "text", value: (r) => r.unitCode },
  { header: "Threshold (°C)", width: 11, kind: "number", numFmt: "0.0", value: (r) => r.thresholdC },
  { header: "Start (UTC)", width: 17, kind: "datetime", value: (r) => r.startAt },
  { header: "End (UTC)", width: 17, kind: "datetime", value: (r) => r.endAt },
  { header: "Still open", width: 9, kind: "boolean", value: (r) => r.endAt == null },
  { header: "Duration (min)", width: 11, kind: "number", numFmt: "0", value: (r) => r.durationMin },
  { header: "Peak (°C)", width: 10, kind: "number", numFmt: "0.0", value: (r) => r.peakTempC },
  { header: "Peak at (UTC)", width: 17, kind: "datetime", value: (r) => r.peakAt },
  { header: "Acknowledged by", width: 22, kind: "text", value: (r) => r.acknowledgedByName },
  { header: "Acknowledged at (UTC)", width: 17, kind: "datetime", value: (r) => r.acknowledgedAt },
  { header: "Comment", width: 40, kind: "text", unique: true, value: (r) => r.acknowledgeComment },
];

type SubstanceSheetRow = {
  substance: SubstanceExportRow;
  correlation: Record<string, unknown> | null;
  furtherCorrelations: string | null;
  /** Per kind, the most protective limit (lowest, compared in ppm); the others go to "Further exposure limits". */
  limits: Partial<Record<ExposureLimitKind, ExposureLimitRow>>;
  furtherLimits: string | null;
};

type ExposureLimitRow = SubstanceExportRow["exposureLimits"][number];
type ExposureLimitKind = ExposureLimitRow["kind"];

const LIMIT_KIND_HEADERS: Record<ExposureLimitKind, string> = { TWA: "TWA", STEL: "STEL", ceiling: "Ceiling", IDLH: "IDLH" };
const limitUnit = (unit: string | null | undefined) => (unit === "mg/m3" ? "mg/m³" : (unit ?? null));

/**
 * A limit in ppm to compare limits given in different units: ppm = mg/m³ × 24.45 / M, the molar
 * volume of an ideal gas at 25 °C and 101.325 kPa (the NIOSH Pocket Guide's conversion).
 */
function limitPpm(limit: ExposureLimitRow, molarMassGPerMol: number): number {
  return limit.unit === "ppm" ? limit.value : (limit.value * 24.45) / molarMassGPerMol;
}

function describeLimit(limit: ExposureLimitRow): string {
  return `${LIMIT_KIND_HEADERS[limit.kind]} ${limit.body} ${toSignificant(limit.value)} ${limitUnit(limit.unit)}${limit.note ? ` ${limit.note}` : ""} (${limit.source})`;
}

/** One row per substance: for each kind the lowest limit in its columns, the rest listed in one cell. */
export function substanceLimits(substance: Pick<SubstanceExportRow, "exposureLimits" | "molarMassGPerMol">): Pick<SubstanceSheetRow, "limits" | "furtherLimits"> {
  const limits: SubstanceSheetRow["limits"] = {};
  const further: string[] = [];
  for (const kind of EXPOSURE_LIMIT_KINDS) {
    const ofKind = substance.exposureLimits
      .filter((l) => l.kind === kind)
      .sort((a, b) => limitPpm(a, substance.molarMassGPerMol) - limitPpm(b, substance.molarMassGPerMol));
    if (ofKind.length === 0) continue;
    limits[kind] = ofKind[0];
    further.push(...ofKind.slice(1).map(describeLimit));
  }
  return { limits, furtherLimits: further.length ? further.join("; ") : null };
}

const limitColumns = (kind: ExposureLimitKind): Column<SubstanceSheetRow>[] => [
  { header: `${LIMIT_KIND_HEADERS[kind]}`, width: 9, kind: "number", value: (r) => toSignificant(r.limits[kind]?.value) },
  { header: `${LIMIT_KIND_HEADERS[kind]} unit`, width: 8, kind: "text", value: (r) => limitUnit(r.limits[kind]?.unit) },
  { header: `${LIMIT_KIND_HEADERS[kind]} issuing body`, width: 11, kind: "text", value: (r) => r.limits[kind]?.body ?? null },
  {
    header: `${LIMIT_KIND_HEADERS[kind]} source`,
    width: 34,
    kind: "text",
    value: (r) => {
      const limit = r.limits[kind];
      return limit ? `${limit.source}${limit.note ? ` (${limit.note})` : ""}` : null;
    },
  },
];

const num = (v: unknown) => (typeof v === "number" ? v : null);
const source = (r: SubstanceSheetRow, key: string) => r.substance.sources[key] ?? null;

function correlationForm(c: Record<string, unknown>): string {
  return correlationEquation(c);
}

function correlationSummary(c: Record<string, unknown>): string {
  return `${correlationForm(c)}; ${correlationCoefficients(c)}; valid ${String(c.tMinC)} to ${String(c.tMaxC)} °C${c.source ? ` (${String(c.source)})` : ""}`;
}

const SUBSTANCE_COLUMNS: Column<SubstanceSheetRow>[] = [
  { header: "Substance", width: 24, kind: "text", value: (r) => r.substance.name },
  { header: "CAS number", width: 12, kind: "text", value: (r) => r.substance.cas },
  { header: "Formula", width: 12, kind: "text", value: (r) => r.substance.formula },
  { header: "Physical state", width: 10, kind: "text", value: (r) => r.substance.physicalState },
  { header: "Molar mass M (g/mol)", width: 11, kind: "number", value: (r) => r.substance.molarMassGPerMol },
  { header: "Molar mass source", width: 30, kind: "text", value: (r) => source(r, "molarMassGPerMol") },
  { header: "Normal boiling point Tb (°C)", width: 11, kind: "number", value: (r) => r.substance.normalBoilingPointC },
  { header: "Boiling point source", width: 30, kind: "text", value: (r) => source(r, "normalBoilingPointC") },
  { header: "Enthalpy of vaporization (kJ/mol)", width: 12, kind: "number", value: (r) => r.substance.enthalpyOfVaporizationKJPerMol },
  { header: "Enthalpy of vaporization source", width: 30, kind: "text", value: (r) => source(r, "enthalpyOfVaporizationKJPerMol") },
  { header: "Flash point (°C)", width: 10, kind: "number", value: (r) => r.substance.flashPointC },
  { header: "Flash point source", width: 30, kind: "text", value: (r) => source(r, "flashPointC") },
  { header: "LFL (% vol)", width: 9, kind: "number", value: (r) => r.substance.lflVolPercent },
  { header: "LFL source", width: 30, kind: "text", value: (r) => source(r, "lflVolPercent") },
  { header: "UFL (% vol)", width: 9, kind: "number", value: (r) => r.substance.uflVolPercent },
  { header: "UFL source", width: 30, kind: "text", value: (r) => source(r, "uflVolPercent") },
  { header: "Autoignition temperature (°C)", width: 11, kind: "number", value: (r) => r.substance.autoignitionTempC },
  { header: "Autoignition source", width: 30, kind: "text", value: (r) => source(r, "autoignitionTempC") },
  { header: "Vapor-pressure equation", width: 34, kind: "text", value: (r) => (r.correlation ? correlationForm(r.correlation) : null) },
  { header: "A (or C1)", width: 11, kind: "number", value: (r) => num(r.correlation?.a ?? r.correlation?.c1) },
  { header: "B (or C2)", width: 11, kind: "number", value: (r) => num(r.correlation?.b ?? r.correlation?.c2) },
  { header: "C (or C3)", width: 11, kind: "number", value: (r) => num(r.correlation?.c ?? r.correlation?.c3) },
  { header: "C4", width: 11, kind: "number", value: (r) => num(r.correlation?.c4) },
  { header: "C5", width: 11, kind: "number", value: (r) => num(r.correlation?.c5) },
  { header: "Equation valid from (°C)", width: 10, kind: "number", value: (r) => num(r.correlation?.tMinC) },
  { header: "Equation valid to (°C)", width: 10, kind: "number", value: (r) => num(r.correlation?.tMaxC) },
  { header: "Equation source", width: 40, kind: "text", value: (r) => (r.correlation?.source as string | undefined) ?? null },
  { header: "Further vapor-pressure equations", width: 40, kind: "text", value: (r) => r.furtherCorrelations },
  ...EXPOSURE_LIMIT_KINDS.flatMap(limitColumns),
  { header: "Further exposure limits", width: 60, kind: "text", value: (r) => r.furtherLimits },
];

type MethodSheetRow = MethodStatement & { section: string; value?: number | null; unit?: string | null };

const METHOD_COLUMNS: Column<MethodSheetRow>[] = [
  { header: "Section", width: 16, kind: "text", value: (r) => r.section },
  { header: "Item", width: 30, kind: "text", value: (r) => r.item },
  { header: "Statement", width: 100, kind: "text", value: (r) => r.statement },
  { header: "Value", width: 10, kind: "number", value: (r) => r.value },
  { header: "Unit", width: 8, kind: "text", value: (r) => r.unit },
  { header: "Source", width: 60, kind: "text", value: (r) => r.source },
];

// -------------------------------------------------------------------------------------------------
// Sheets
// -------------------------------------------------------------------------------------------------

type Context = { workbook: ExcelJS.stream.xlsx.WorkbookWriter; db: Db; pages: ReturnType<typeof exportPageQueries>; scope: ExportScope; pace: Pace; shared: SharedText; nowMs: number; maxSheetRows?: number };

function table<R>(ctx: Context, name: string, columns: Column<R>[]): TableSheet<R> {
  return new TableSheet(ctx.workbook, name, columns, ctx.pace, ctx.shared, ctx.maxSheetRows);
}

async function writeSummary(ctx: Context, opts: RegisterWorkbookOptions, siteName: string | null): Promise<void> {
  const counts = registerCounts(ctx.db, ctx.scope);
  const sheet = ctx.workbook.addWorksheet("Summary");
  sheet.columns = [{ width: 30 }, ...FINDING_STATUSES.map(() => ({ width: 14 })), { width: 10 }];
  const boldText = Object.freeze({ font: { bold: true }, numFmt: TEXT_NUM_FMT }) as Partial<ExcelJS.Style>;
  const boldNumber = Object.freeze({ font: { bold: true } }) as Partial<ExcelJS.Style>;
  const title = Object.freeze({ font: { bold: true, size: 14 }, numFmt: TEXT_NUM_FMT }) as Partial<ExcelJS.Style>;
  const caution = Object.freeze({
    font: { bold: true },
    numFmt: TEXT_NUM_FMT,
    alignment: { wrapText: true, vertical: "top" },
    fill: { type: "pattern", pattern: "solid", fgColor: { argb: "FFFFF4D6" } },
    border: { top: { style: "medium" }, bottom: { style: "medium" }, left: { style: "medium" }, right: { style: "medium" } },
  }) as Partial<ExcelJS.Style>;
  const datetime = Object.freeze({ numFmt: DATETIME_NUM_FMT }) as Partial<ExcelJS.Style>;
  type SummaryCell = { value: string | number | Date | null; bold?: boolean; style?: Partial<ExcelJS.Style> };
  let rowNumber = 0;
  const put = (values: SummaryCell[], height?: number) => {
    rowNumber += 1;
    const row = sheet.getRow(rowNumber);
    values.forEach((v, i) => {
      const cell = row.getCell(i + 1);
      if (typeof v.value === "string") {
        const text = safeText(v.value);
        if (text === null) return;
        cell.value = text;
        cell.style = v.style ?? (v.bold ? boldText : TEXT_STYLE);
      } else if (typeof v.value === "number" && Number.isFinite(v.value)) {
        cell.value = v.value;
        if (v.bold) cell.style = boldNumber;
      } else if (v.value instanceof Date) {
        cell.value = v.value;
        cell.style = datetime;
      }
    });
    if (height) row.height = height;
    row.commit();
  };
  const lastColumn = FINDING_STATUSES.length + 2;

  put([{ value: WORKBOOK_TITLE, style: title }], 22);
  put([]);
  put([{ value: "Generated at (UTC)", bold: true }, { value: new Date(opts.nowMs) }]);
  put([{ value: "Generated by", bold: true }, { value: opts.generatedBy }]);
  put([{ value: "Site", bold: true }, { value: siteName ?? "All sites" }]);
  put([{ value: "Worst-case look-back window (days)", bold: true }, { value: lookBackDays(ctx.db) }]);
  put([]);
  sheet.mergeCells(rowNumber + 1, 1, rowNumber + 1, lastColumn);
  put([{ value: `Caution. ${SUMMARY_CAUTION}`, style: caution }], 64);
  put([]);

  put([{ value: "Findings by severity and status", bold: true }]);
  put([{ value: "Severity", style: HEADER_STYLE }, ...FINDING_STATUSES.map((s) => ({ value: STATUS_LABELS[s], style: HEADER_STYLE })), { value: "Total", style: HEADER_STYLE }]);
  const n = (severity: Severity | null, status: FindingStatus | null) =>
    counts.findings.filter((c) => (severity === null || c.severity === severity) && (status === null || c.status === status)).reduce((sum, c) => sum + c.n, 0);
  for (const severity of SEVERITIES) {
    put([{ value: SEVERITY_LABELS[severity] }, ...FINDING_STATUSES.map((s) => ({ value: n(severity, s) })), { value: n(severity, null), bold: true }]);
  }
  put([{ value: "Total", bold: true }, ...FINDING_STATUSES.map((s) => ({ value: n(null, s), bold: true })), { value: n(null, null), bold: true }]);
  put([]);

  put([{ value: "Inventory, locations and temperatures", bold: true }]);
  put([{ value: "Containers in storage" }, { value: counts.containersInStorage }]);
  put([{ value: "Rooms" }, { value: counts.rooms }]);
  put([{ value: "Storage units" }, { value: counts.storageUnits }]);
  put([{ value: "Open excursions" }, { value: counts.openExcursions }]);
  put([]);

  put([{ value: "Sheets", bold: true }]);
  const about: Record<(typeof REGISTER_SHEETS)[number], string> = {
    Summary: "this page",
    Findings: "every finding with its value, limit, ratio, worst-case temperature and its source",
    "Finding traces": "each finding's calculation in one cell, a line per step: inputs, formulas, the numbers put in, results and warnings",
    "Trace sources": "the long sources the traces cite as [S…]: substance data, methods and the severity thresholds",
    Inventory: "every container in storage with its location, amount and owner",
    Locations: "rooms and storage units with their worst-case temperatures and where they came from",
    Excursions: "temperature excursions with start, end, duration and peak",
    Substances: "the property data used, with the source of every value, and the exposure limits",
    "Methods and cautions": "the methods, assumptions, settings and cautions behind the numbers",
  };
  for (const name of REGISTER_SHEETS) put([{ value: name }, { value: about[name] }]);
  sheet.commit();
  await ctx.pace.breathe();
}

/**
 * Writes a table read page by page after the last id seen (keyset paging on the shared
 * connection; no statement stays open between pages), draining the sheet whenever it asks
 * (a chunk went to its stream) and after each page.
 */
async function writePaged<P extends { id: number }, R>(
  sheet: TableSheet<R>,
  pageSize: number,
  fetch: (afterId: number) => P[],
  write: (row: P) => void,
): Promise<number> {
  for (let after = 0; ; ) {
    const page = fetch(after);
    for (const row of page) {
      write(row);
      if (sheet.wantsDrain) await sheet.drain();
    }
    await sheet.drain();
    if (page.length < pageSize) break;
    after = page[page.length - 1].id;
  }
  await sheet.close();
  return sheet.rowCount;
}

async function writeFindings(ctx: Context): Promise<number> {
  const sheet = table(ctx, "Findings", FINDING_COLUMNS);
  return writePaged(sheet, PAGE_ROWS, (after) => ctx.pages.findings(ctx.scope, after, PAGE_ROWS), (row) => sheet.add(row));
}

/**
 * One row per finding with its trace as readable lines (rendered when the trace was stored, see
 * lib/register/trace-text.ts; a trace stored before that is rendered here, its sources written
 * out). Returns the ids of the sources the traces cite.
 */
async function writeTraces(ctx: Context): Promise<{ rows: number; sourceIds: Set<number> }> {
  const sheet = table(ctx, "Finding traces", TRACE_COLUMNS);
  const sourceIds = new Set<number>();
  const rows = await writePaged(sheet, TRACE_PAGE_ROWS, (after) => ctx.pages.traces(ctx.scope, after, TRACE_PAGE_ROWS), (finding) => {
    const cited: number[] = finding.sourceIds ? (JSON.parse(finding.sourceIds) as number[]) : [];
    for (const id of cited) sourceIds.add(id);
    sheet.add({ id: finding.id, title: finding.title, text: finding.text ?? traceText(finding.traceJson), sourceIds: cited });
  });
  return { rows, sourceIds };
}

async function writeTraceSources(ctx: Context, ids: Set<number>): Promise<number> {
  const sheet = table(ctx, "Trace sources", TRACE_SOURCE_COLUMNS);
  const sorted = [...ids].sort((a, b) => a - b);
  for (let i = 0; i < sorted.length; i += PAGE_ROWS) {
    for (const row of traceSourcesById(ctx.db, sorted.slice(i, i + PAGE_ROWS))) sheet.add(row);
    await sheet.drain();
  }
  await sheet.close();
  return sheet.rowCount;
}

async function writeInventory(ctx: Context): Promise<number> {
  const sheet = table(ctx, "Inventory", INVENTORY_COLUMNS);
  return writePaged(sheet, PAGE_ROWS, (after) => ctx.pages.containers(ctx.scope, after, PAGE_ROWS), (row) => sheet.add(row));
}

async function writeLocations(ctx: Context): Promise<number> {
  const sheet = table(ctx, "Locations", LOCATION_COLUMNS);
  const worstCases = locationWorstCases(ctx.db, ctx.nowMs);
  for (const room of locationRows(ctx.db, ctx.scope)) {
    const roomWorst = worstCases.room(room.id);
    sheet.add({
      siteName: room.siteName,
      roomCode: room.code,
      roomName: room.name,
      unitCode: null,
      unitName: null,
      level: "Room",
      kind: label(ROOM_KIND_LABELS, room.kind) ?? room.kind,
      // toPrecision(12) drops binary noise such as 307.20000000000005 from area × height.
      roomVolumeM3: room.floorAreaM2 != null && room.heightM != null ? Number((room.floorAreaM2 * room.heightM).toPrecision(12)) : null,
      unitVolumeL: null,
      airChangesPerHour: room.airChangesPerHour,
      mixingFactor: room.mixingFactor,
      designMaxTempC: room.designMaxTempC,
      setMinC: room.setMinC,
      setMaxC: room.setMaxC,
      excursionThresholdC: room.excursionThresholdC,
      excursionMinDurationMin: room.excursionMinDurationMin,
      sprinklered: room.sprinklered,
      ventilated: null,
      ignitionSourceFree: null,
      inControlTempC: roomWorst?.tempC ?? null,
      inControlSource: roomWorst?.description ?? null,
      controlLostTempC: null,
      controlLostSource: null,
    });
    for (const unit of room.units) {
      const worst = worstCases.unit(unit.id);
      sheet.add({
        siteName: room.siteName,
        roomCode: room.code,
        roomName: room.name,
        unitCode: unit.code,
        unitName: unit.name,
        level: "Storage unit",
        kind: label(STORAGE_UNIT_KIND_LABELS, unit.kind) ?? unit.kind,
        roomVolumeM3: null,
        unitVolumeL: unit.internalVolumeL,
        airChangesPerHour: null,
        mixingFactor: null,
        designMaxTempC: null,
        setMinC: unit.setMinC,
        setMaxC: unit.setMaxC,
        excursionThresholdC: unit.excursionThresholdC,
        excursionMinDurationMin: unit.excursionMinDurationMin,
        sprinklered: null,
        ventilated: unit.ventilated,
        ignitionSourceFree: unit.ignitionSourceFree,
        inControlTempC: worst.inControl?.tempC ?? null,
        inControlSource: worst.inControl?.description ?? null,
        controlLostTempC: worst.controlLost?.tempC ?? null,
        controlLostSource: worst.controlLost?.description ?? null,
      });
    }
    await sheet.drain();
  }
  await sheet.close();
  return sheet.rowCount;
}

async function writeExcursions(ctx: Context): Promise<number> {
  const sheet = table(ctx, "Excursions", EXCURSION_COLUMNS);
  return writePaged(sheet, PAGE_ROWS, (after) => excursionPage(ctx.db, ctx.scope, after, PAGE_ROWS), (row) => {
    // End − start; for an open excursion, up to the sensor's latest reading.
    const endMs = row.endAt?.getTime() ?? row.lastReadingAtMs ?? row.startAt.getTime();
    sheet.add({ ...row, durationMin: Math.max(0, (endMs - row.startAt.getTime()) / 60_000) });
  });
}

async function writeSubstances(ctx: Context): Promise<number> {
  const sheet = table(ctx, "Substances", SUBSTANCE_COLUMNS);
  const list = substancesInScope(ctx.db, ctx.scope);
  for (const substance of list) {
    const [first, ...further] = (substance.correlations ?? []) as Record<string, unknown>[];
    const base = { substance, correlation: first ?? null, furtherCorrelations: further.length ? further.map(correlationSummary).join(" | ") : null };
    sheet.add({ ...base, ...substanceLimits(substance) });
  }
  await sheet.close();
  return list.length;
}

async function writeMethods(ctx: Context): Promise<void> {
  const sheet = table(ctx, "Methods and cautions", METHOD_COLUMNS);
  for (const m of METHODS) sheet.add({ section: "Method", ...m });
  for (const a of assumptions(lookBackDays(ctx.db))) sheet.add({ section: "Assumption", ...a });
  const inForce = settingsInForce(ctx.db);
  for (const s of inForce.settings) {
    const isNumber = typeof s.value === "number";
    sheet.add({
      section: "Setting",
      item: s.key,
      statement: isNumber ? "" : typeof s.value === "string" ? s.value : JSON.stringify(s.value),
      value: isNumber ? (s.value as number) : null,
      source: "Setting stored by this organisation",
    });
  }
  for (const q of inForce.quantityLimits) {
    const scopeText = q.scope === "flammable_cabinet" ? "Flammable-liquid cabinet" : q.scope === "storage_unit" ? "Storage unit" : "Room";
    sheet.add({
      section: "Quantity limit",
      item: `${scopeText}: classes ${q.liquidClasses.join(", ")}`,
      statement: `At most this volume of the classes named${q.sprinkleredMaxVolumeL != null ? `; ${q.sprinkleredMaxVolumeL} L where the room is sprinklered` : ""}.`,
      value: q.maxVolumeL,
      unit: "L",
      source: q.basis,
    });
  }
  for (const c of CAUTIONS) sheet.add({ section: "Caution", ...c });
  await sheet.close();
}

/**
 * Streams the register workbook to `output` and resolves once the whole file has been written to
 * it. Rejects with ExportCancelledError when the output closes early (a cancelled download), and
 * with NotFoundError for an unknown site. The caller ends or destroys `output` on failure.
 */
export async function writeRegisterWorkbook(output: Writable, opts: RegisterWorkbookOptions): Promise<RegisterWorkbookResult> {
  const db = getDb();
  const scope: ExportScope = opts.siteId ? { siteId: opts.siteId } : {};
  const site = opts.siteId ? findSite(db, opts.siteId) : null;
  if (opts.siteId && !site) throw new NotFoundError("That site");

  const nativeZipCrc = installNativeZipCrc();
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: output, useStyles: true, useSharedStrings: false, zip: { zlib: { level: 1 } } });
  workbook.creator = "Headroom";
  workbook.lastModifiedBy = "Headroom";
  workbook.created = new Date(opts.nowMs);
  workbook.modified = new Date(opts.nowMs);
  workbook.title = WORKBOOK_TITLE;

  // commit() waits for the output's "finish", which never comes once the output is destroyed.
  let onClose: () => void = () => {};
  const closedEarly = new Promise<never>((_, reject) => {
    onClose = () => {
      if (!output.writableFinished) reject(new ExportCancelledError());
    };
    output.once("close", onClose);
  });
  closedEarly.catch(() => {});

  const ctx: Context = { workbook, db, pages: exportPageQueries(db), scope, pace: new Pace(output), shared: sharedTextOf(workbook), nowMs: opts.nowMs, maxSheetRows: opts.maxSheetRows };
  try {
    const timingsMs: Record<string, number> = {};
    const timed = async <T>(name: string, write: () => Promise<T>): Promise<T> => {
      const startedAt = performance.now();
      const result = await write();
      timingsMs[name] = Math.round(performance.now() - startedAt);
      return result;
    };
    await timed("Summary", () => writeSummary(ctx, opts, site?.name ?? null));
    const findings = await timed("Findings", () => writeFindings(ctx));
    const traces = await timed("Finding traces", () => writeTraces(ctx));
    const traceSources = await timed("Trace sources", () => writeTraceSources(ctx, traces.sourceIds));
    const containers = await timed("Inventory", () => writeInventory(ctx));
    const locations = await timed("Locations", () => writeLocations(ctx));
    const excursions = await timed("Excursions", () => writeExcursions(ctx));
    const substances = await timed("Substances", () => writeSubstances(ctx));
    await timed("Methods and cautions", () => writeMethods(ctx));
    await timed("commit", () => Promise.race([workbook.commit(), closedEarly]));
    return { findings, traces: traces.rows, traceSources, containers, locations, excursions, substances, nativeZipCrc, timingsMs };
  } finally {
    output.off("close", onClose);
  }
}

/** `headroom-register-2026-08-01.xlsx` for the UTC day of nowMs. */
export function registerWorkbookFileName(nowMs: number): string {
  return `headroom-register-${new Date(nowMs).toISOString().slice(0, 10)}.xlsx`;
}
