/**
 * Downloadable templates: the header and two invented example rows, as CSV or as a workbook with a
 * sheet that explains every column.
 */
import ExcelJS from "exceljs";
import { z } from "zod";
import Papa from "papaparse";
import type { ImportColumn } from "./columns";
import { CONTAINER_COLUMNS } from "./containers";
import { LOCATION_COLUMNS } from "./locations";

export type TemplateKind = "containers" | "locations";

/** The template files `GET /api/v1/imports/templates/{file}` serves (any other name: 404). */
export const TEMPLATE_FILES = ["containers.csv", "containers.xlsx", "locations.csv", "locations.xlsx"] as const;
export const templateFileSchema = z.enum(TEMPLATE_FILES);

/** Invented example rows; the location rows declare the units the container rows are stored in. */
const CONTAINER_EXAMPLES: Record<string, string>[] = [
  {
    label: "HR-000123",
    cas: "64-17-5",
    amount: "2.5",
    amount_unit: "L",
    capacity: "2.5",
    capacity_unit: "L",
    container_kind: "glass_bottle",
    state: "sealed",
    site: "North Campus",
    room: "B-014",
    storage_unit: "FC-1",
    owner_email: "r.okafor@example.org",
    received_on: "2026-01-12",
    expires_on: "2028-01-31",
  },
  {
    label: "HR-000124",
    substance: "Diethyl ether",
    amount: "350",
    amount_unit: "mL",
    capacity: "500",
    capacity_unit: "mL",
    container_kind: "metal_can",
    state: "opened",
    site: "North Campus",
    room: "B-014",
    storage_unit: "FR-2",
    received_on: "2026-02-03",
    opened_on: "2026-02-10",
    expires_on: "2026-08-10",
    notes: "Peroxide test due monthly",
  },
];

const LOCATION_EXAMPLES: Record<string, string>[] = [
  {
    site: "North Campus",
    room_code: "B-014",
    room_name: "Solvent store",
    room_kind: "storeroom",
    floor_area_m2: "18",
    height_m: "2.8",
    air_changes_per_hour: "6",
    mixing_factor: "0.5",
    design_max_temp_c: "30",
    sprinklered: "yes",
    unit_code: "FC-1",
    unit_name: "Flammables cabinet 1",
    unit_kind: "flammable_cabinet",
    internal_volume_l: "450",
    ventilated: "no",
    ignition_source_free: "yes",
  },
  {
    site: "North Campus",
    room_code: "B-014",
    room_name: "Solvent store",
    unit_code: "FR-2",
    unit_name: "Flammable-storage refrigerator",
    unit_kind: "flammable_storage_refrigerator",
    internal_volume_l: "150",
    set_min_c: "2",
    set_max_c: "8",
    excursion_threshold_c: "10",
    excursion_min_duration_min: "30",
    ventilated: "no",
    ignition_source_free: "yes",
  },
];

const TEMPLATES: Record<TemplateKind, { columns: readonly ImportColumn[]; examples: Record<string, string>[] }> = {
  containers: { columns: CONTAINER_COLUMNS, examples: CONTAINER_EXAMPLES },
  locations: { columns: LOCATION_COLUMNS, examples: LOCATION_EXAMPLES },
};

function templateCsv(kind: TemplateKind): string {
  const { columns, examples } = TEMPLATES[kind];
  const header = columns.map((c) => c.name);
  const rows = examples.map((e) => header.map((h) => e[h] ?? ""));
  return Papa.unparse([header, ...rows], { newline: "\r\n" }) + "\r\n";
}

export function containerTemplateCsv(): string {
  return templateCsv("containers");
}

export function locationTemplateCsv(): string {
  return templateCsv("locations");
}

/** Rows made ready for typing into: formats, choice lists and column widths reach this far. */
const PREPARED_ROWS = 500;

function exampleCellValue(column: ImportColumn, text: string): ExcelJS.CellValue {
  if (text === "") return null;
  if (column.type === "number") return Number(text);
  if (column.type === "date") {
    const [y, m, d] = text.split("-").map(Number);
    return new Date(Date.UTC(y, m - 1, d));
  }
  return text;
}

export async function writeTemplateXlsx(kind: TemplateKind): Promise<Buffer> {
  const { columns, examples } = TEMPLATES[kind];
  const workbook = new ExcelJS.Workbook();
  workbook.creator = "Headroom";

  const sheet = workbook.addWorksheet(kind === "containers" ? "Containers" : "Locations", {
    views: [{ state: "frozen", ySplit: 1 }],
  });
  sheet.columns = columns.map((c) => ({
    header: c.name,
    key: c.name,
    width: Math.max(12, c.name.length + 2, Math.min(40, c.example.length + 2)),
    // Codes as text, so a CAS number such as 10-12-3 or a code like 1-2 is never turned into a date.
    style: { numFmt: c.type === "date" ? "yyyy-mm-dd" : c.type === "number" ? "General" : "@" },
  }));
  sheet.getRow(1).font = { bold: true };
  for (const example of examples) {
    sheet.addRow(Object.fromEntries(columns.map((c) => [c.name, exampleCellValue(c, example[c.name] ?? "")])));
  }
  columns.forEach((column, index) => {
    const choices =
      column.type === "choice" ? column.choices : column.type === "yes_no" ? (["yes", "no"] as const) : undefined;
    if (!choices) return;
    const list = `"${choices.join(",")}"`;
    for (let r = 2; r <= PREPARED_ROWS + 1; r++) {
      sheet.getCell(r, index + 1).dataValidation = {
        type: "list",
        allowBlank: true,
        formulae: [list],
        showErrorMessage: true,
        errorTitle: column.name,
        error: `Use one of: ${choices.join(", ")}`,
      };
    }
  });

  const about = workbook.addWorksheet("Columns", { views: [{ state: "frozen", ySplit: 1 }] });
  about.columns = [
    { header: "column", key: "column", width: 32 },
    { header: "required", key: "required", width: 10 },
    { header: "meaning", key: "meaning", width: 90 },
    { header: "example", key: "example", width: 28, style: { numFmt: "@" } },
    { header: "accepted values", key: "accepted", width: 60 },
  ];
  about.getRow(1).font = { bold: true };
  for (const column of columns) {
    about.addRow({
      column: column.name,
      required: column.required ? "yes" : "no",
      meaning: column.description,
      example: column.example,
      accepted:
        column.type === "choice"
          ? (column.choices ?? []).join(", ")
          : column.type === "yes_no"
            ? "yes, no"
            : column.type === "date"
              ? "YYYY-MM-DD or a date cell"
              : column.type === "number"
                ? "a number with a dot as the decimal mark"
                : "",
    });
  }
  about.getColumn("meaning").alignment = { wrapText: true, vertical: "top" };

  const written = await workbook.xlsx.writeBuffer();
  return Buffer.from(written as ArrayBuffer);
}
