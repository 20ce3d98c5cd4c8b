import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { ImportFileError, MAX_DATA_ROWS, parseTabularFile, validateLocationRows } from "@/lib/imports";
import { encode } from "./fixtures";

async function fileError(bytes: Uint8Array, fileName: string): Promise<ImportFileError> {
  try {
    await parseTabularFile(bytes, fileName);
  } catch (e) {
    if (e instanceof ImportFileError) return e;
    throw e;
  }
  throw new Error("expected the file to be refused");
}

async function workbookBytes(fill: (sheet: ExcelJS.Worksheet, workbook: ExcelJS.Workbook) => void): Promise<Uint8Array> {
  const workbook = new ExcelJS.Workbook();
  const sheet = workbook.addWorksheet("Data");
  fill(sheet, workbook);
  return new Uint8Array(await workbook.xlsx.writeBuffer());
}

describe("reading CSV files", () => {
  it("reads UTF-8 with a byte-order mark and semicolons, and normalises the headers", async () => {
    const text = "\uFEFFLabel;Amount Unit; Storage-Unit ;notes\r\nHR-1;L;FC-1;Éthanol absolu\r\n";
    const table = await parseTabularFile(encode(text), "export.csv");
    expect(table).toEqual({
      format: "csv",
      headers: ["label", "amount_unit", "storage_unit", "notes"],
      rows: [{ line: 2, cells: { label: "HR-1", amount_unit: "L", storage_unit: "FC-1", notes: "Éthanol absolu" } }],
    });
  });

  it("keeps commas and line breaks inside quotes, and numbers lines as a spreadsheet does", async () => {
    const text = [
      "label,notes,amount",
      'HR-1,"keep cool, dry",1',
      'HR-2,"line one',
      'line two",2',
      "",
      "HR-3,plain,3",
      "   ",
      'HR-4,"say ""hello""",4',
      "",
    ].join("\n");
    const table = await parseTabularFile(encode(text), "containers.csv");
    expect(table.rows).toEqual([
      { line: 2, cells: { label: "HR-1", notes: "keep cool, dry", amount: "1" } },
      { line: 3, cells: { label: "HR-2", notes: "line one\nline two", amount: "2" } },
      { line: 5, cells: { label: "HR-3", notes: "plain", amount: "3" } },
      { line: 7, cells: { label: "HR-4", notes: 'say "hello"', amount: "4" } },
    ]);
  });

  it("follows a first line naming the delimiter, which a spreadsheet program does not show", async () => {
    const table = await parseTabularFile(encode("sep=;\nlabel;notes\nHR-1;a, b\n"), "a.csv");
    expect(table.headers).toEqual(["label", "notes"]);
    expect(table.rows).toEqual([{ line: 2, cells: { label: "HR-1", notes: "a, b" } }]);
  });

  it("reads tab-separated text pasted from a spreadsheet", async () => {
    const table = await parseTabularFile(encode("label\tamount\nHR-1\t2.5\n"), "paste.txt");
    expect(table.rows).toEqual([{ line: 2, cells: { label: "HR-1", amount: "2.5" } }]);
  });

  it("fills short rows with empty cells and keeps values beyond the header apart", async () => {
    const table = await parseTabularFile(encode("label,amount,notes\nHR-1\nHR-2,1,keep cool, dry\n"), "a.csv");
    expect(table.rows).toEqual([
      { line: 2, cells: { label: "HR-1", amount: "", notes: "" } },
      { line: 3, cells: { label: "HR-2", amount: "1", notes: "keep cool" }, extraCells: ["dry"] },
    ]);
  });

  it("ignores empty header cells left over at the end of the header row", async () => {
    const table = await parseTabularFile(encode("label,amount,,\nHR-1,1,,\n"), "a.csv");
    expect(table.headers).toEqual(["label", "amount"]);
  });

  it("finds the header below leading blank lines and keeps the line numbers", async () => {
    const table = await parseTabularFile(encode("\n\nlabel\nHR-1\n"), "a.csv");
    expect(table.rows).toEqual([{ line: 4, cells: { label: "HR-1" } }]);
  });

  it("refuses text that is not UTF-8", async () => {
    const bytes = new Uint8Array([...encode("label,notes\nHR-1,"), 0xc9, 0x74, 0x68, 0x0a]);
    const error = await fileError(bytes, "legacy.csv");
    expect(error.code).toBe("not_utf8");
    expect(error.message).toMatch(/Save it as “CSV UTF-8”/);
  });

  it("refuses a quote that is never closed, naming its line", async () => {
    const error = await fileError(encode('label,notes\nHR-1,ok\nHR-2,"oops\nHR-3,fine\n'), "a.csv");
    expect(error.code).toBe("malformed_csv");
    expect(error.message).toMatch(/^Line 3: a value starts with a double quote that is never closed/);
  });
});

describe("reading XLSX files", () => {
  it("reads numbers without float noise, dates as YYYY-MM-DD, cached formula results and rich text", async () => {
    const bytes = await workbookBytes((sheet) => {
      sheet.addRow(["Label", "Amount", "Received On", "Capacity", "Notes", "Owner Email", "Sprinklered"]);
      sheet.addRow([
        "HR-1",
        0.1 + 0.2,
        new Date(Date.UTC(2026, 0, 12)),
        { formula: "B2*2", result: 0.6000000000000001 },
        { richText: [{ text: "Keep " }, { font: { bold: true }, text: "cool" }] },
        { text: "r.okafor@example.org", hyperlink: "mailto:r.okafor@example.org" },
        true,
      ]);
      sheet.addRow(["HR-2", 1e-7, new Date(Date.UTC(2026, 1, 3, 14, 30)), 12345678901, null, null, false]);
    });
    const table = await parseTabularFile(bytes, "containers.xlsx");
    expect(table.format).toBe("xlsx");
    expect(table.headers).toEqual(["label", "amount", "received_on", "capacity", "notes", "owner_email", "sprinklered"]);
    expect(table.rows).toEqual([
      {
        line: 2,
        cells: {
          label: "HR-1",
          amount: "0.3",
          received_on: "2026-01-12",
          capacity: "0.6",
          notes: "Keep cool",
          owner_email: "r.okafor@example.org",
          sprinklered: "true",
        },
      },
      {
        line: 3,
        cells: {
          label: "HR-2",
          amount: "0.0000001",
          received_on: "2026-02-03T14:30:00",
          capacity: "12345678901",
          notes: "",
          owner_email: "",
          sprinklered: "false",
        },
      },
    ]);
  });

  it("numbers rows as the workbook does, skipping blank rows, and reads only the first sheet", async () => {
    const bytes = await workbookBytes((sheet, workbook) => {
      sheet.getCell("A1").value = "label";
      sheet.getCell("B1").value = "cas";
      sheet.getCell("A2").value = "HR-1";
      sheet.getCell("B2").value = "64-17-5";
      sheet.getCell("A5").value = "HR-2";
      sheet.getCell("B5").value = { formula: 'A5&"x"', result: { error: "#N/A" } } as ExcelJS.CellFormulaValue;
      workbook.addWorksheet("Other").addRow(["ignored"]);
    });
    const table = await parseTabularFile(bytes, "book.xlsx");
    expect(table.rows).toEqual([
      { line: 2, cells: { label: "HR-1", cas: "64-17-5" } },
      { line: 5, cells: { label: "HR-2", cas: "#N/A" } },
    ]);
  });

  it("refuses formulas whose result was never saved, naming the cell", async () => {
    const bytes = await workbookBytes((sheet) => {
      sheet.addRow(["label", "amount"]);
      sheet.addRow(["HR-1", { formula: "2*3" }]);
    });
    const error = await fileError(bytes, "generated.xlsx");
    expect(error.code).toBe("uncalculated_formulas");
    expect(error.message).toMatch(/^Cell B2 holds a formula whose result was never saved/);
  });

  it("refuses a ZIP archive that is not a workbook", async () => {
    const zipHeader = new Uint8Array([0x50, 0x4b, 0x03, 0x04, 1, 2, 3, 4, 5, 6, 7, 8]);
    const error = await fileError(zipHeader, "photos.zip");
    expect(error.code).toBe("unreadable_file");
  });
});

describe("refusing files", () => {
  it("refuses a binary that is not a spreadsheet", async () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    const error = await fileError(png, "photo.png");
    expect(error.code).toBe("unsupported_format");
    expect(error.message).toBe("photo.png is not a CSV or XLSX file. If it is text, save it as CSV with UTF-8 encoding.");
  });

  it("names old workbooks, PDFs and files whose name says .xlsx but are not", async () => {
    expect((await fileError(new Uint8Array([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]), "old.xls")).message).toBe(
      "old.xls is an old-style .xls workbook. Save it as .xlsx or as CSV (UTF-8) and upload that.",
    );
    expect((await fileError(encode("%PDF-1.7"), "sheet.pdf")).message).toBe("sheet.pdf is a PDF. Upload a CSV or XLSX file.");
    expect((await fileError(encode("label\nHR-1\n"), "renamed.xlsx")).code).toBe("unsupported_format");
  });

  it("refuses a file over 10 MB before reading it", async () => {
    const error = await fileError(new Uint8Array(10 * 1024 * 1024 + 1), "big.csv");
    expect(error.code).toBe("file_too_large");
    expect(error.status).toBe(413);
    expect(error.message).toBe("The file is 10.0 MB; imports take files up to 10 MB. Split it into smaller files.");
  });

  it("refuses more than 100,000 data rows", async () => {
    const text = "label\n" + "x\n".repeat(MAX_DATA_ROWS + 1);
    const error = await fileError(encode(text), "many.csv");
    expect(error.code).toBe("too_many_rows");
    expect(error.message).toBe("The file has more than 100,000 rows; split it into smaller files.");
    await expect(parseTabularFile(encode("label\n" + "x\n".repeat(MAX_DATA_ROWS)), "just.csv")).resolves.toMatchObject({
      rows: { length: MAX_DATA_ROWS },
    });
  });

  it("refuses a file without a header row", async () => {
    expect((await fileError(encode(""), "empty.csv")).code).toBe("no_header_row");
    expect((await fileError(encode("\n ;\n\n"), "blank.csv")).code).toBe("no_header_row");
  });

  it("refuses headers that appear twice after normalising, naming their columns", async () => {
    const error = await fileError(encode("label,Amount,amount,Label\nHR-1,1,2,HR-2\n"), "a.csv");
    expect(error.code).toBe("duplicate_headers");
    expect(error.columns).toEqual(["label", "amount"]);
    expect(error.message).toBe(
      "Each column name may appear once; these appear more than once: label (columns A and D), amount (columns B and C).",
    );
  });

  it("refuses values under a column without a name", async () => {
    const error = await fileError(encode("label,,amount\nHR-1,oops,1\n"), "a.csv");
    expect(error.code).toBe("blank_header");
    expect(error.message).toBe("Column B has values (line 2: “oops”) but no name in the header row. Name the column or delete it.");
  });

  it("lists every missing column when a file is checked", async () => {
    const table = await parseTabularFile(encode("site,room,notes\nNorth Campus,B-014,x\n"), "rooms.csv");
    expect(() => validateLocationRows(table, { siteIdByName: () => 1 })).toThrow(
      expect.objectContaining({
        code: "missing_columns",
        columns: ["room_code", "room_name"],
        message: "The location file is missing columns: room_code; room_name. Download the template to see every column.",
      }),
    );
  });
});
