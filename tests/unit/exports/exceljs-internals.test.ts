/**
 * lib/exports/table-sheet.ts writes data rows straight into exceljs's streamed worksheets and reads
 * a few of its internals (read from exceljs 4.4.0 and archiver 5.3). This pins the versions and the
 * shapes it relies on, so an upgrade is checked here first.
 */
import { createRequire } from "node:module";
import { PassThrough } from "node:stream";
import ExcelJS from "exceljs";
import { describe, expect, it } from "vitest";

const require = createRequire(import.meta.url);

describe("the exceljs internals the register workbook uses", () => {
  it("are those of exceljs 4.4.0 with archiver 5", () => {
    expect(require("exceljs/package.json").version).toBe("4.4.0");
    expect(require("archiver/package.json").version).toMatch(/^5\./);
  });

  it("has a style registry, a shared-strings table and a worksheet entry stream piped into the zip", () => {
    const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: new PassThrough(), useStyles: true, useSharedStrings: false });
    const internals = workbook as unknown as { styles: { addStyleModel: unknown }; sharedStrings: { add: unknown; count: number } };
    expect(typeof internals.styles.addStyleModel).toBe("function");
    expect(typeof internals.sharedStrings.add).toBe("function");
    const sheet = workbook.addWorksheet("x");
    const stream = (sheet as unknown as { stream: { write: unknown; pipes: { _writableState?: { length: number } }[] } }).stream;
    expect(typeof stream.write).toBe("function");
    expect(stream.pipes).toHaveLength(1);
    expect(typeof stream.pipes[0]._writableState?.length).toBe("number");
  });
});
