import { PassThrough } from "node:stream";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";
import { MAX_CELL_CHARS } from "@/lib/exports/safe-text";
import { Pace, sharedTextOf, TableSheet, xmlText, type Column } from "@/lib/exports/table-sheet";

type Row = { label: string | null; note: string | null; n: unknown; at: unknown; ok: unknown; v: unknown };

const COLUMNS: Column<Row>[] = [
  { header: "Label", width: 10, kind: "text", value: (r) => r.label },
  { header: "Note", width: 10, kind: "text", unique: true, value: (r) => r.note },
  { header: "Number (°C)", width: 10, kind: "number", numFmt: "0.0", value: (r) => r.n },
  { header: "At (UTC)", width: 10, kind: "datetime", value: (r) => r.at },
  { header: "OK", width: 5, kind: "boolean", value: (r) => r.ok },
  { header: "Value", width: 10, kind: "value", value: (r) => r.v },
];

async function roundTrip(rows: Row[]): Promise<ExcelJS.Worksheet> {
  const output = new PassThrough();
  const chunks: Buffer[] = [];
  output.on("data", (c: Buffer) => chunks.push(c));
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: output, useStyles: true, useSharedStrings: false });
  const sheet = new TableSheet(workbook, "T", COLUMNS, new Pace(output), sharedTextOf(workbook));
  for (const row of rows) sheet.add(row);
  await sheet.close();
  await workbook.commit();
  const read = new ExcelJS.Workbook();
  await read.xlsx.load(Buffer.concat(chunks) as unknown as ExcelJS.Buffer);
  return read.getWorksheet("T")!;
}

describe("TableSheet", () => {
  it("writes each kind of cell so that exceljs reads back the same values and types", async () => {
    const at = Date.UTC(2026, 7, 1, 9, 30);
    const sheet = await roundTrip([
      { label: "=1+1", note: "  spaced & <tagged> \r\n line ", n: 28.25, at, ok: true, v: 22.7 },
      { label: "=1+1", note: "bell\u0007 and a lone \uD800 surrogate", n: Number.NaN, at: new Date(at), ok: false, v: "@SUM(A1)" },
      { label: null, note: null, n: "12", at: null, ok: "yes", v: false },
    ]);
    expect((sheet.getRow(1).values as unknown[]).slice(1)).toEqual(["Label", "Note", "Number (°C)", "At (UTC)", "OK", "Value"]);
    const [a, b, c] = [2, 3, 4].map((n) => sheet.getRow(n));
    expect(a.getCell(1).value).toBe("=1+1");
    expect(b.getCell(1).value).toBe("=1+1"); // the second time from the shared-strings table
    for (const cell of [a.getCell(1), b.getCell(1), a.getCell(2), b.getCell(6)]) {
      expect(cell.type).toBe(ExcelJS.ValueType.String);
      expect(cell.formula).toBeUndefined();
      expect(cell.numFmt).toBe("@");
    }
    expect(a.getCell(2).value).toBe("  spaced & <tagged> \r\n line ");
    expect(b.getCell(2).value).toBe("bell and a lone  surrogate");
    expect(a.getCell(3).value).toBe(28.25);
    expect(a.getCell(3).numFmt).toBe("0.0");
    expect(b.getCell(3).value).toBeNull(); // NaN is no number
    expect(c.getCell(3).value).toBeNull(); // nor is a string
    expect((a.getCell(4).value as Date).getTime()).toBe(at);
    expect((b.getCell(4).value as Date).getTime()).toBe(at);
    expect([a.getCell(5).value, b.getCell(5).value, c.getCell(5).value]).toEqual([true, false, null]);
    expect([a.getCell(6).value, b.getCell(6).value, c.getCell(6).value]).toEqual([22.7, "@SUM(A1)", false]);
    expect(sheet.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });
    expect(sheet.autoFilter).toBe("A1:F4");
  });
});

describe("TableSheet with text as XML-safe UTF-8 bytes", () => {
  it("copies the bytes into a unique text column, and writes them as text where they hold markup or sit in a shared column", async () => {
    const text = "Antoine: log10(P/kPa) = A − B/(T + C)\n  P = 30.76 kPa — [S3]";
    const sheet = await roundTrip([
      { label: null, note: Buffer.from(text), n: 1, at: null, ok: null, v: null } as unknown as Row,
      { label: null, note: Buffer.from("  indented first and last line \n"), n: 2, at: null, ok: null, v: null } as unknown as Row,
      { label: null, note: Buffer.from("C < LFL & T > flash point"), n: 3, at: null, ok: null, v: null } as unknown as Row,
      { label: Buffer.from("shared label"), note: Buffer.alloc(0), n: 4, at: null, ok: null, v: null } as unknown as Row,
      { label: Buffer.from("shared label"), note: Buffer.from("x".repeat(40_000)), n: 5, at: null, ok: null, v: null } as unknown as Row,
    ]);
    const [a, b, c, d, e] = [2, 3, 4, 5, 6].map((n) => sheet.getRow(n));
    expect(a.getCell(2).value).toBe(text);
    expect(a.getCell(2).numFmt).toBe("@");
    expect(a.getCell(3).value).toBe(1); // the row goes on after the bytes
    expect(b.getCell(2).value).toBe("  indented first and last line \n");
    expect(c.getCell(2).value).toBe("C < LFL & T > flash point");
    expect([d.getCell(1).value, e.getCell(1).value]).toEqual(["shared label", "shared label"]);
    expect(d.getCell(2).value).toBeNull(); // no bytes, no cell
    const cut = String(e.getCell(2).value);
    expect(cut).toHaveLength(MAX_CELL_CHARS);
    expect(cut.endsWith("[cut at the cell limit]")).toBe(true);
    expect(e.getCell(3).value).toBe(5);
  });
});

describe("xmlText", () => {
  it("escapes markup, keeps a carriage return as a reference and drops what XML cannot hold", () => {
    expect(xmlText("plain")).toBe("plain");
    expect(xmlText("a & <b> c")).toBe("a &amp; &lt;b&gt; c");
    expect(xmlText("x\ry")).toBe("x&#13;y");
    expect(xmlText("\u0000\u0008ok\u000B\uFFFF")).toBe("ok");
    expect(xmlText("pair \uD83D\uDE00 kept, lone \uDE00 dropped")).toBe("pair \uD83D\uDE00 kept, lone  dropped");
  });
});
