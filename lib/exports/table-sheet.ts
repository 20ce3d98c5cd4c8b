/**
 * One table on a streamed worksheet (exceljs WorkbookWriter): a bold header row that stays in
 * view (frozen, ySplit 1), a filter over the whole table, column widths, and cells typed by
 * column — numbers as numbers, dates as dates (UTC), every string through safeText with the Text
 * number format. Rows are written and committed one by one, so memory stays flat however long the
 * table is; a table longer than a worksheet allows continues on "<name> (2)".
 */
import type { Writable } from "node:stream";
import type ExcelJS from "exceljs";
import { safeText, TEXT_NUM_FMT } from "./safe-text";

/**
 * - text: a string (anything else is written as its text);
 * - number: a finite number, otherwise left empty (never a string);
 * - date / datetime: a Date or epoch ms, shown as a date or date and time (UTC);
 * - value: a number, a boolean or a string, whichever it is (trace values);
 * - boolean: true/false.
 */
export type ColumnKind = "text" | "number" | "date" | "datetime" | "value" | "boolean";

export type Column<R> = {
  header: string;
  /** Width in characters. */
  width: number;
  kind: ColumnKind;
  value: (row: R) => unknown;
  /** Number format for number columns, e.g. "0.0" for temperatures; General otherwise. */
  numFmt?: string;
};

/** The most rows one worksheet can hold (Excel's limit, header row included). */
export const MAX_SHEET_ROWS = 1_048_576;

export const DATE_NUM_FMT = "yyyy-mm-dd";
export const DATETIME_NUM_FMT = "yyyy-mm-dd hh:mm";

// exceljs caches a style's id by object identity: sharing one object per kind of cell keeps it
// from working the style out again for every cell.
export const TEXT_STYLE: Partial<ExcelJS.Style> = Object.freeze({ numFmt: TEXT_NUM_FMT }) as Partial<ExcelJS.Style>;
const NUMBER_STYLE: Partial<ExcelJS.Style> = Object.freeze({}) as Partial<ExcelJS.Style>;
const BOOLEAN_STYLE: Partial<ExcelJS.Style> = Object.freeze({}) as Partial<ExcelJS.Style>;
export const HEADER_STYLE: Partial<ExcelJS.Style> = Object.freeze({
  numFmt: TEXT_NUM_FMT,
  font: { bold: true },
  alignment: { vertical: "top", wrapText: true },
  fill: { type: "pattern", pattern: "solid", fgColor: { argb: "FFE6EBED" } },
  border: { bottom: { style: "thin", color: { argb: "FF7A8A90" } } },
}) as Partial<ExcelJS.Style>;

export class ExportCancelledError extends Error {
  constructor() {
    super("The export was cancelled: its output closed.");
    this.name = "ExportCancelledError";
  }
}

/**
 * Lets the zip and deflate streams catch up every few rows and waits while the reader is behind,
 * so the workbook flows out as it is written instead of piling up in memory. Stops the export
 * when the output has been closed (a download cancelled).
 */
export class Pace {
  private count = 0;
  constructor(
    private readonly output: Writable,
    private readonly everyRows = 200,
  ) {}

  async tick(): Promise<void> {
    this.count += 1;
    if (this.count % this.everyRows === 0) await this.breathe();
  }

  async breathe(): Promise<void> {
    if (this.output.destroyed) throw new ExportCancelledError();
    if (this.output.writableNeedDrain) {
      await new Promise<void>((resolve) => {
        const done = () => {
          this.output.off("drain", done);
          this.output.off("close", done);
          resolve();
        };
        this.output.on("drain", done);
        this.output.on("close", done);
      });
      if (this.output.destroyed) throw new ExportCancelledError();
    }
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
}

function finite(value: unknown): number | null {
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}

function asDate(value: unknown): Date | null {
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? null : value;
  if (typeof value === "number" && Number.isFinite(value)) return new Date(value);
  return null;
}

type Prepared<R> = Column<R> & { style: Partial<ExcelJS.Style> };

function prepare<R>(columns: Column<R>[]): Prepared<R>[] {
  return columns.map((c) => {
    let style = NUMBER_STYLE;
    if (c.kind === "text") style = TEXT_STYLE;
    else if (c.kind === "date") style = Object.freeze({ numFmt: DATE_NUM_FMT }) as Partial<ExcelJS.Style>;
    else if (c.kind === "datetime") style = Object.freeze({ numFmt: DATETIME_NUM_FMT }) as Partial<ExcelJS.Style>;
    else if (c.numFmt) style = Object.freeze({ numFmt: c.numFmt }) as Partial<ExcelJS.Style>;
    return { ...c, style };
  });
}

/** Writes one value into a cell by its column's kind. */
export function setCell<R>(cell: ExcelJS.Cell, column: Prepared<R>, value: unknown): void {
  switch (column.kind) {
    case "text": {
      const text = safeText(value);
      if (text === null) return;
      cell.value = text;
      cell.style = TEXT_STYLE;
      return;
    }
    case "number": {
      const n = finite(value);
      if (n === null) return;
      cell.value = n;
      cell.style = column.style;
      return;
    }
    case "date":
    case "datetime": {
      const d = asDate(value);
      if (d === null) return;
      cell.value = d;
      cell.style = column.style;
      return;
    }
    case "boolean": {
      if (typeof value !== "boolean") return;
      cell.value = value;
      cell.style = BOOLEAN_STYLE;
      return;
    }
    case "value": {
      if (typeof value === "number") {
        const n = finite(value);
        if (n !== null) {
          cell.value = n;
          cell.style = column.style;
          return;
        }
      }
      if (typeof value === "boolean") {
        cell.value = value;
        cell.style = BOOLEAN_STYLE;
        return;
      }
      const text = safeText(value);
      if (text === null) return;
      cell.value = text;
      cell.style = TEXT_STYLE;
    }
  }
}

export class TableSheet<R> {
  private readonly columns: Prepared<R>[];
  private sheet!: ExcelJS.Worksheet;
  private lastRow = 0;
  private part = 0;
  private closed = false;
  /** Data rows written over all parts. */
  rowCount = 0;

  constructor(
    private readonly workbook: ExcelJS.stream.xlsx.WorkbookWriter,
    readonly name: string,
    columns: Column<R>[],
    private readonly pace: Pace,
    private readonly maxRows = MAX_SHEET_ROWS,
  ) {
    this.columns = prepare(columns);
    this.open();
  }

  private open(): void {
    this.part += 1;
    const sheetName = this.part === 1 ? this.name : `${this.name} (${this.part})`;
    // Views are written when the sheet opens, so the frozen header goes in with addWorksheet.
    this.sheet = this.workbook.addWorksheet(sheetName, { views: [{ state: "frozen", xSplit: 0, ySplit: 1, topLeftCell: "A2", activeCell: "A2" }] });
    this.sheet.columns = this.columns.map((c) => ({ width: c.width }));
    const header = this.sheet.getRow(1);
    this.columns.forEach((c, i) => {
      const cell = header.getCell(i + 1);
      cell.value = c.header;
      cell.style = HEADER_STYLE;
    });
    header.commit();
    this.lastRow = 1;
  }

  private commitPart(): void {
    this.sheet.autoFilter = { from: { row: 1, column: 1 }, to: { row: this.lastRow, column: this.columns.length } };
    this.sheet.commit();
  }

  async add(record: R): Promise<void> {
    if (this.lastRow >= this.maxRows) {
      this.commitPart();
      this.open();
    }
    this.lastRow += 1;
    this.rowCount += 1;
    const row = this.sheet.getRow(this.lastRow);
    for (let i = 0; i < this.columns.length; i++) {
      const column = this.columns[i];
      const value = column.value(record);
      if (value !== null && value !== undefined) setCell(row.getCell(i + 1), column, value);
    }
    row.commit();
    await this.pace.tick();
  }

  /** Sets the filter over the table and commits the worksheet. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.commitPart();
    await this.pace.breathe();
  }
}
