/**
 * The workbook reader's limits on their own, with small limits so the files stay small: a part is
 * stopped on the bytes actually inflated whatever it declares, the ratio and total hold while
 * inflating, and text crossing chunk boundaries stays whole. Also pins the exceljs 4.4 internals
 * the reader uses beside its public API.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createRequire } from "node:module";
import { Readable } from "node:stream";
import ExcelJS from "exceljs";
import { afterAll, describe, expect, it } from "vitest";
import { ImportFileError, parseTabularFile, parseTabularPath, parseTabularStream } from "@/lib/imports";
import { BoundedZip } from "@/lib/imports/zip";
import { writeXlsxZipBomb, writeZip } from "../../fixtures/hostile-files";

const require = createRequire(import.meta.url);
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-xlsx-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const small = { entryBytes: 1_000_000, totalBytes: 1_500_000, compressionRatio: 100, ratioFromBytes: 200_000, entries: 20 };

async function drain(zip: BoundedZip, name: string): Promise<number> {
  let bytes = 0;
  for await (const chunk of zip.read(zip.entries.get(name)!)) bytes += chunk.length;
  return bytes;
}

async function refusal(work: () => Promise<unknown>): Promise<ImportFileError> {
  try {
    await work();
  } catch (error) {
    if (error instanceof ImportFileError) return error;
    throw error;
  }
  throw new Error("expected a refusal");
}

describe("the zip limits", () => {
  it("checks the central directory before inflating anything: part size, ratio, total, number of parts", async () => {
    const file = path.join(dir, "declared.zip");
    await writeZip(file, [{ name: "a.xml", content: ["y".repeat(1_200_000)] }]);
    expect((await refusal(() => BoundedZip.open({ path: file }, small))).message).toBe(
      "The workbook's part a.xml unpacks to 1.1 MB; an import workbook may hold at most 1 MB in one part. Split the data into smaller files.",
    );
    await writeZip(file, [{ name: "a.xml", content: ["y".repeat(300_000)] }]);
    const ratio = await refusal(() => BoundedZip.open({ path: file }, small));
    expect(ratio.code).toBe("zip_bomb");
    expect(ratio.status).toBe(400);
    await writeZip(file, [
      { name: "a.xml", content: ["<a>" + "1234567890".repeat(9000) + "</a>"] },
      ...Array.from({ length: 20 }, (_, i) => ({ name: `p${i}.xml`, content: ["<p/>"] })),
    ]);
    expect((await refusal(() => BoundedZip.open({ path: file }, small))).message).toMatch(/^The workbook is made of 21 parts/);
  });

  it("stops a part that declares 1 KB at the first inflated byte past the part limit", async () => {
    const file = path.join(dir, "lying.zip");
    // Incompressible enough to stay under the ratio: the size limit is what must stop it.
    let seed = 7;
    const noisy = Array.from({ length: 1_600_000 }, () => String.fromCharCode(97 + ((seed = (seed * 48_271) % 2_147_483_647) % 26))).join("");
    await writeZip(file, [{ name: "a.xml", content: [noisy], declaredUncompressedBytes: 1024 }]);
    const zip = await BoundedZip.open({ path: file }, small);
    try {
      const error = await refusal(() => drain(zip, "a.xml"));
      expect(error.code).toBe("entry_too_large");
      expect(error.status).toBe(413);
      expect(error.message).toBe(
        "The workbook's part a.xml unpacks to more than 1 MB; an import workbook may hold at most 1 MB in one part. Split the data into smaller files.",
      );
    } finally {
      zip.close();
    }
  });

  it("stops a part that declares 1 KB once it inflates past the ratio", async () => {
    const file = path.join(dir, "tight.zip");
    await writeZip(file, [{ name: "a.xml", content: ["z".repeat(900_000)], declaredUncompressedBytes: 1024 }]);
    const zip = await BoundedZip.open({ path: file }, small);
    try {
      expect((await refusal(() => drain(zip, "a.xml"))).code).toBe("zip_bomb");
    } finally {
      zip.close();
    }
  });
});

describe("reading workbooks from disk", () => {
  it("keeps characters whole across chunk boundaries and reads cells up to the limit", async () => {
    const workbook = new ExcelJS.Workbook();
    const sheet = workbook.addWorksheet("Data");
    const long = "é€😀a".repeat(6000); // 30,000 UTF-16 units, over 60 KB of UTF-8: several inflate chunks
    sheet.addRow(["label", "notes"]);
    sheet.addRow(["HR-1", long]);
    sheet.addRow(["HR-2", { richText: [{ text: "Ké" }, { text: "ep" }] }]);
    const file = path.join(dir, "unicode.xlsx");
    await workbook.xlsx.writeFile(file);
    const table = await parseTabularPath(file, "unicode.xlsx");
    expect(table.rows).toEqual([
      { line: 2, cells: { label: "HR-1", notes: long } },
      { line: 3, cells: { label: "HR-2", notes: "Kéep" } },
    ]);
  });

  it("refuses a 40,000-character shared string when it is read, and one of 32,767 is read", async () => {
    const over = path.join(dir, "over.xlsx");
    await writeXlsxZipBomb(over, { cellBytes: 40_000 });
    const error = await refusal(() => parseTabularPath(over, "over.xlsx"));
    expect(error.code).toBe("cell_too_long");
    expect(error.message).toBe(
      "Line 2, column A (cell A2): the value has more than 32,767 characters; a cell may hold at most 32,767 (as in Excel). Shorten it, or split it over several cells.",
    );
    const at = path.join(dir, "at.xlsx");
    await writeXlsxZipBomb(at, { cellBytes: 32_767, place: "inline" });
    const table = await parseTabularFile(new Uint8Array(fs.readFileSync(at)), "at.xlsx");
    expect(table.rows[0].cells.label).toHaveLength(32_767);
  });
});

describe("the exceljs 4.4 internals the workbook reader uses", () => {
  it("are there with the shapes lib/imports/exceljs-internals.d.ts declares", () => {
    expect(require("exceljs/package.json").version).toBe("4.4.0");
    expect(typeof require("exceljs/lib/utils/parse-sax.js")).toBe("function");
    const StylesXform = require("exceljs/lib/xlsx/xform/style/styles-xform.js");
    expect(typeof StylesXform.prototype.parseStream).toBe("function");
    expect(typeof StylesXform.prototype.getStyleModel).toBe("function");
    const utils = require("exceljs/lib/utils/utils.js");
    expect(utils.isDateFmt("yyyy-mm-dd")).toBe(true);
    expect(utils.isDateFmt("0.00")).toBe(false);
    expect(utils.excelToDate(46034).toISOString()).toBe("2026-01-12T00:00:00.000Z");
  });
});

describe("reading from a stream", () => {
  it("reads a workbook handed over as a stream and leaves no temporary file", async () => {
    const workbook = new ExcelJS.Workbook();
    workbook.addWorksheet("Data").addRows([["label", "amount"], ["HR-1", 2.5]]);
    const bytes = Buffer.from(await workbook.xlsx.writeBuffer());
    const tempDir = fs.mkdtempSync(path.join(dir, "stream-"));
    const table = await parseTabularStream(Readable.from([bytes.subarray(0, 100), bytes.subarray(100)]), "book.xlsx", tempDir);
    expect(table.rows).toEqual([{ line: 2, cells: { label: "HR-1", amount: "2.5" } }]);
    expect(fs.readdirSync(tempDir)).toEqual([]);
  });

  it("refuses a stream at the first bytes past 10 MB, without reading on", async () => {
    const tempDir = fs.mkdtempSync(path.join(dir, "stream-"));
    let produced = 0;
    const endless = Readable.from(
      (function* () {
        for (;;) {
          produced += 65_536;
          yield Buffer.alloc(65_536, 0x61);
        }
      })(),
    );
    const error = await refusal(() => parseTabularStream(endless, "endless.csv", tempDir));
    expect(error.code).toBe("file_too_large");
    expect(error.message).toBe("The file is larger than 10 MB; imports take files up to 10 MB. Split it into smaller files.");
    expect(produced).toBeLessThan(10 * 1024 * 1024 + 4 * 65_536);
    expect(fs.readdirSync(tempDir)).toEqual([]);
  });
});
