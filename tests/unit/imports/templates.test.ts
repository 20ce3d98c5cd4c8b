import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import {
  CONTAINER_COLUMNS,
  LOCATION_COLUMNS,
  containerTemplateCsv,
  locationTemplateCsv,
  parseTabularFile,
  validateContainerRows,
  validateLocationRows,
  writeTemplateXlsx,
} from "@/lib/imports";
import { encode, lookups } from "./fixtures";

const siteLookups = { siteIdByName: (name: string) => (name === "North Campus" ? 1 : undefined) };

describe("import templates", () => {
  it("writes the container template as CSV whose example rows pass the checks", async () => {
    const csv = containerTemplateCsv();
    expect(csv.split("\r\n")[0]).toBe(CONTAINER_COLUMNS.map((c) => c.name).join(","));
    const table = await parseTabularFile(encode(csv), "containers-template.csv");
    const result = validateContainerRows(table, lookups);
    expect(result.issues).toEqual([]);
    expect(result.notices).toEqual([]);
    expect(result.rows.map((r) => [r.line, r.label, r.substanceId, r.storageUnitId])).toEqual([
      [2, "HR-000123", 1, 100],
      [3, "HR-000124", 4, 101],
    ]);
  });

  it("writes the location template as CSV whose example rows pass the checks", async () => {
    const table = await parseTabularFile(encode(locationTemplateCsv()), "locations-template.csv");
    expect(table.headers).toEqual(LOCATION_COLUMNS.map((c) => c.name));
    const result = validateLocationRows(table, siteLookups);
    expect(result.issues).toEqual([]);
    expect(result.rooms.map((r) => [r.code, r.lines])).toEqual([["B-014", [2, 3]]]);
    expect(result.units.map((u) => u.code)).toEqual(["FC-1", "FR-2"]);
  });

  for (const kind of ["containers", "locations"] as const) {
    it(`writes the ${kind} template as a workbook that reads back and passes the checks`, async () => {
      const bytes = await writeTemplateXlsx(kind);
      const table = await parseTabularFile(bytes, `${kind}-template.xlsx`);
      expect(table.format).toBe("xlsx");
      const issues =
        kind === "containers"
          ? validateContainerRows(table, lookups).issues
          : validateLocationRows(table, siteLookups).issues;
      expect(issues).toEqual([]);
      expect(table.rows.map((r) => r.line)).toEqual([2, 3]);
    });
  }

  it("makes the workbook easy to fill in: bold frozen header, text codes, a sheet describing the columns", async () => {
    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load((await writeTemplateXlsx("containers")) as never);
    const [data, about] = workbook.worksheets;
    expect(data.name).toBe("Containers");
    expect(data.getRow(1).getCell(1).font?.bold).toBe(true);
    expect(data.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });

    const casColumn = CONTAINER_COLUMNS.findIndex((c) => c.name === "cas") + 1;
    expect(data.getCell(2, casColumn).value).toBe("64-17-5");
    expect(data.getCell(2, casColumn).numFmt).toBe("@");
    expect(data.getCell(40, casColumn).numFmt).toBe("@");
    const unitColumn = CONTAINER_COLUMNS.findIndex((c) => c.name === "amount_unit") + 1;
    expect(data.getCell(10, unitColumn).dataValidation).toMatchObject({ type: "list", formulae: ['"mL,L,g,kg"'] });

    expect(about.name).toBe("Columns");
    expect(about.getRow(1).values).toEqual([undefined, "column", "required", "meaning", "example", "accepted values"]);
    expect(about.rowCount).toBe(CONTAINER_COLUMNS.length + 1);
    expect(about.getRow(2).values).toEqual([
      undefined,
      "label",
      "yes",
      CONTAINER_COLUMNS[0].description,
      "HR-000123",
      "",
    ]);
  });
});
