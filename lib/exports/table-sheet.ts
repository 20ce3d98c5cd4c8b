/**
 * One table on a streamed worksheet of an exceljs WorkbookWriter: a bold header row that stays in
 * view (frozen, ySplit 1), a filter over the whole table, column widths, and cells typed by
 * column — numbers as numbers, dates as dates (UTC), every string through safeText with the Text
 * number format. A table longer than a worksheet allows continues on "<name> (2)".
 *
 * Speed and memory. exceljs builds a Row and a Cell object and renders each cell through its XML
 * writer; for a register of 100,000 findings with their traces (millions of rows) that alone takes
 * minutes. So exceljs writes the worksheet itself (views, columns, the header row, the filter, the
 * styles, the zip) and the data rows go into the worksheet's stream as sheetData XML written here,
 * with the style ids exceljs assigned. Text that repeats (labels, units, sources) goes into the
 * workbook's shared-strings table, up to a bound; the rest is written inline. And exceljs 4.4's
 * worksheet stream writes into the zip entry's deflate stream without waiting, so the Pace below
 * waits whenever that backlog grows, keeping memory flat. The few exceljs internals used are typed
 * in `WorkbookInternals` / `SheetStream`; tests/unit/exports pins the exceljs version they were
 * read from, and the integration test reads every sheet back with exceljs.
 */
import type { Writable } from "node:stream";
import ExcelJS from "exceljs";
import { MAX_CELL_CHARS, safeText, TEXT_NUM_FMT, XML_INVALID } from "./safe-text";

/**
 * - text: a string, or XML-safe UTF-8 bytes (see XmlSafeBytes); anything else is written as its text;
 * - number: a finite number, otherwise left empty (never a string);
 * - date / datetime: a Date or epoch ms, shown as a date or date and time (UTC);
 * - value: a number, a boolean or a string, whichever it is (trace values);
 * - boolean: true/false.
 */
export type ColumnKind = "text" | "number" | "date" | "datetime" | "value" | "boolean";

/**
 * UTF-8 text in a Buffer whose producer guarantees it holds only characters XML can hold and no
 * carriage return (lib/exports/safe-text.ts xmlSafeText), such as a calculation trace's stored
 * text read as a blob. In a `unique` text column such a cell is copied into the sheet as bytes —
 * no decoding, checking and encoding again of hundreds of megabytes — unless it holds a markup
 * character (&, <, >) or is longer than a cell may be; then it is written as its text.
 */
export type XmlSafeBytes = Buffer;

export type Column<R> = {
  header: string;
  /** Width in characters. */
  width: number;
  kind: ColumnKind;
  value: (row: R) => unknown;
  /** Number format for number columns, e.g. "0.0" for temperatures; General otherwise. */
  numFmt?: string;
  /** Text that is different in (nearly) every row: written inline, never into the shared-strings table. */
  unique?: boolean;
};

/** The most rows one worksheet can hold (Excel's limit, header row included). */
export const MAX_SHEET_ROWS = 1_048_576;

export const DATE_NUM_FMT = "yyyy-mm-dd";
export const DATETIME_NUM_FMT = "yyyy-mm-dd hh:mm";

export const TEXT_STYLE: Partial<ExcelJS.Style> = Object.freeze({ numFmt: TEXT_NUM_FMT }) as Partial<ExcelJS.Style>;
export const HEADER_STYLE: Partial<ExcelJS.Style> = Object.freeze({
  numFmt: TEXT_NUM_FMT,
  font: { bold: true },
  alignment: { vertical: "top", wrapText: true },
  fill: { type: "pattern", pattern: "solid", fgColor: { argb: "FFE6EBED" } },
  border: { bottom: { style: "thin", color: { argb: "FF7A8A90" } } },
}) as Partial<ExcelJS.Style>;

/** Bounds of the shared-strings table (it stays in memory until the workbook is committed). */
const MAX_SHARED_STRINGS = 50_000;
const MAX_SHARED_CHARS = 4_000_000;
/** Longer text is written inline: sharing it saves little and costs memory. */
const MAX_SHARED_LENGTH = 1000;

/** Rows are collected into chunks of about this many characters before they go to the stream. */
const CHUNK_CHARS = 16 * 1024;
/** The deflate backlog (bytes) past which writing waits for the compressor. */
const MAX_BACKLOG_BYTES = 4 * 2 ** 20;

// -------------------------------------------------------------------------------------------------
// The exceljs 4.4 internals used (read from node_modules/exceljs/lib/stream/xlsx/*.js)
// -------------------------------------------------------------------------------------------------

type WorkbookInternals = {
  styles: { addStyleModel(style: Partial<ExcelJS.Style>, cellType?: ExcelJS.ValueType): number };
  sharedStrings: { add(value: string): number; count: number };
};

/**
 * The worksheet's zip-entry stream (a StreamBuf). It writes everything it is given into
 * `pipes[0]` — the PassThrough archiver puts in front of the entry (archiver-utils
 * normalizeInputSource) — without waiting, so that is where a backlog collects while the
 * compressor or the reader is behind, or while earlier entries are still being zipped.
 */
type SheetStream = { write(chunk: string | Buffer): void; pipes?: BufferedStream[] };

/** A readable-stream 2.x stream (archiver's): it has no writableLength, only the states. */
type BufferedStream = Writable & { _writableState?: { length: number }; _readableState?: { length: number } };

function backlogBytes(stream: BufferedStream): number {
  return (stream._writableState?.length ?? 0) + (stream._readableState?.length ?? 0);
}

function internalsOf(workbook: ExcelJS.stream.xlsx.WorkbookWriter): WorkbookInternals {
  return workbook as unknown as WorkbookInternals;
}

function streamOf(sheet: ExcelJS.Worksheet): SheetStream {
  return (sheet as unknown as { stream: SheetStream }).stream;
}

// -------------------------------------------------------------------------------------------------
// Pace: backpressure and cancellation
// -------------------------------------------------------------------------------------------------

export class ExportCancelledError extends Error {
  constructor() {
    super("The export was cancelled: its output closed.");
    this.name = "ExportCancelledError";
  }
}

/** Resolves on the stream's "drain", or as soon as either stream closes or fails (nothing will drain then). */
function drained(stream: Writable, output: Writable): Promise<void> {
  return new Promise((resolve) => {
    const done = () => {
      for (const [target, event] of listeners) target.off(event, done);
      resolve();
    };
    const listeners: [Writable, string][] = [
      [stream, "drain"],
      [stream, "close"],
      [stream, "error"],
      [output, "close"],
      [output, "error"],
    ];
    for (const [target, event] of listeners) target.on(event, done);
  });
}

/**
 * Lets the compressor and the reader keep up: waits while more than a few MB wait in front of the
 * sheet's zip entry (not yet compressed, or not yet reached), and while the output's reader is
 * behind. Stops the export when the output has closed.
 */
export class Pace {
  constructor(private readonly output: Writable) {}

  async breathe(sheet?: SheetStream): Promise<void> {
    for (;;) {
      if (this.output.destroyed) throw new ExportCancelledError();
      if (this.output.writableNeedDrain) {
        await drained(this.output, this.output);
        continue;
      }
      const entry = sheet?.pipes?.[0];
      if (entry && backlogBytes(entry) > MAX_BACKLOG_BYTES) {
        await drained(entry, this.output);
        continue;
      }
      break;
    }
    await new Promise<void>((resolve) => setImmediate(resolve));
  }
}

// -------------------------------------------------------------------------------------------------
// Cells as XML
// -------------------------------------------------------------------------------------------------

/** Column letters for 1-based column numbers (A … Z, AA …). */
function columnLetters(n: number): string {
  let letters = "";
  for (let rest = n; rest > 0; rest = Math.floor((rest - 1) / 26)) letters = String.fromCharCode(65 + ((rest - 1) % 26)) + letters;
  return letters;
}

/** Anything that needs a second look: markup characters, CR, control characters, surrogates. */
const SPECIAL = /[&<>\u0000-\u0008\u000B-\u001F\uD800-\uDFFF\uFFFE\uFFFF]/;

/** Text as XML element content: markup characters escaped, characters XML cannot hold dropped. */
export function xmlText(text: string): string {
  if (!SPECIAL.test(text)) return text;
  // Characters XML 1.0 does not allow are dropped (exceljs drops them too).
  const valid = text.replace(XML_INVALID, "");
  // A carriage return is kept as a character reference: XML parsers turn a raw one into a line feed.
  return valid.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/\r/g, "&#13;");
}

/** Space, tab, line feed or carriage return: kept at the ends of a text only with xml:space="preserve". */
function isSpace(code: number): boolean {
  return code === 32 || code === 9 || code === 10 || code === 13;
}

/** Excel's serial date (days since 1899-12-30, UTC) for epoch ms. */
function excelSerial(ms: number): number {
  return ms / 86_400_000 + 25_569;
}

function finite(value: unknown): number | null {
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}

function epochMs(value: unknown): number | null {
  if (value instanceof Date) {
    const ms = value.getTime();
    return Number.isNaN(ms) ? null : ms;
  }
  return finite(value);
}

/** The workbook's shared strings, filled up to a bound; past it, text is written inline. */
export function sharedTextOf(workbook: ExcelJS.stream.xlsx.WorkbookWriter): SharedText {
  return new SharedText(internalsOf(workbook).sharedStrings);
}

export class SharedText {
  private chars = 0;
  private readonly known = new Map<string, number>();
  constructor(private readonly table: WorkbookInternals["sharedStrings"]) {}

  /** The shared index of this text, or null to write it inline. */
  indexOf(text: string): number | null {
    const index = this.known.get(text);
    if (index !== undefined) return index;
    if (text.length > MAX_SHARED_LENGTH || this.known.size >= MAX_SHARED_STRINGS || this.chars + text.length > MAX_SHARED_CHARS) return null;
    const added = this.table.add(text);
    this.known.set(text, added);
    this.chars += text.length;
    return added;
  }
}

type Prepared<R> = Column<R> & { letters: string; styleAttr: string };

export class TableSheet<R> {
  private readonly columns: Prepared<R>[];
  private readonly textStyleAttr: string;
  private readonly numberStyleAttr: string;
  private sheet!: ExcelJS.Worksheet;
  private stream!: SheetStream;
  private chunk = "";
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
    private readonly shared: SharedText,
    private readonly maxRows = MAX_SHEET_ROWS,
  ) {
    const styles = internalsOf(workbook).styles;
    const attr = (style: Partial<ExcelJS.Style>, type: ExcelJS.ValueType) => {
      const id = styles.addStyleModel(style, type);
      return id ? ` s="${id}"` : "";
    };
    this.textStyleAttr = attr(TEXT_STYLE, ExcelJS.ValueType.String);
    this.numberStyleAttr = attr({}, ExcelJS.ValueType.Number);
    this.columns = columns.map((c, i) => {
      let styleAttr = this.numberStyleAttr;
      if (c.kind === "text") styleAttr = this.textStyleAttr;
      else if (c.kind === "date") styleAttr = attr({ numFmt: DATE_NUM_FMT }, ExcelJS.ValueType.Date);
      else if (c.kind === "datetime") styleAttr = attr({ numFmt: DATETIME_NUM_FMT }, ExcelJS.ValueType.Date);
      else if (c.numFmt) styleAttr = attr({ numFmt: c.numFmt }, ExcelJS.ValueType.Number);
      else if (c.kind === "boolean") styleAttr = "";
      return { ...c, letters: columnLetters(i + 1), styleAttr };
    });
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
    // Committing the header through exceljs writes the columns and opens sheetData.
    header.commit();
    this.stream = streamOf(this.sheet);
    this.lastRow = 1;
  }

  private textCell(ref: string, text: string, column: Prepared<R>): string {
    const shared = column.unique ? null : this.shared.indexOf(text);
    if (shared !== null) return `<c r="${ref}"${this.textStyleAttr} t="s"><v>${shared}</v></c>`;
    const space = isSpace(text.charCodeAt(0)) || isSpace(text.charCodeAt(text.length - 1)) ? ' xml:space="preserve"' : "";
    return `<c r="${ref}"${this.textStyleAttr} t="inlineStr"><is><t${space}>${xmlText(text)}</t></is></c>`;
  }

  private cell(column: Prepared<R>, rowNumber: number, value: unknown): string {
    const ref = column.letters + rowNumber;
    switch (column.kind) {
      case "text": {
        const text = safeText(value);
        return text === null ? "" : this.textCell(ref, text, column);
      }
      case "number": {
        const n = finite(value);
        return n === null ? "" : `<c r="${ref}"${column.styleAttr}><v>${n}</v></c>`;
      }
      case "date":
      case "datetime": {
        const ms = epochMs(value);
        return ms === null ? "" : `<c r="${ref}"${column.styleAttr}><v>${excelSerial(ms)}</v></c>`;
      }
      case "boolean":
        return typeof value === "boolean" ? `<c r="${ref}" t="b"><v>${value ? 1 : 0}</v></c>` : "";
      case "value": {
        const n = finite(value);
        if (n !== null) return `<c r="${ref}"${column.styleAttr}><v>${n}</v></c>`;
        if (typeof value === "boolean") return `<c r="${ref}" t="b"><v>${value ? 1 : 0}</v></c>`;
        const text = safeText(value);
        return text === null ? "" : this.textCell(ref, text, column);
      }
    }
  }

  /** Characters (or bytes) that went to the stream since the last drain(). */
  private pending = 0;

  private flush(): void {
    if (this.chunk) {
      this.stream.write(this.chunk);
      this.pending += this.chunk.length;
    }
    this.chunk = "";
  }

  /**
   * True once a chunk's worth of rows went to the stream since the last drain(): call drain()
   * then. The compressor works on the thread pool, but this thread hands it each chunk; a turn of
   * the event loop per chunk lets it compress one chunk while the next rows are built (draining
   * once per page of rows instead made the two take turns, and the export a third slower).
   */
  get wantsDrain(): boolean {
    return this.pending >= CHUNK_CHARS;
  }

  private commitPart(): void {
    this.flush();
    this.sheet.autoFilter = { from: { row: 1, column: 1 }, to: { row: this.lastRow, column: this.columns.length } };
    this.sheet.commit();
  }

  /** Bytes to copy into the sheet as they are (see XmlSafeBytes), or null to write them as text. */
  private copyable(bytes: Uint8Array, column: Prepared<R>): Buffer | null {
    if (!column.unique || bytes.length > MAX_CELL_CHARS) return null;
    // Buffer's indexOf is a native search: three of them cost far less than a pass in JavaScript.
    const buffer = Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length);
    return buffer.indexOf(0x26) < 0 && buffer.indexOf(0x3c) < 0 && buffer.indexOf(0x3e) < 0 ? buffer : null;
  }

  /** Writes one data row. Call `drain()` when wantsDrain says so, and after each page, to let the output catch up. */
  add(record: R): void {
    if (this.lastRow >= this.maxRows) {
      this.commitPart();
      this.open();
    }
    const rowNumber = ++this.lastRow;
    this.rowCount += 1;
    let xml = `<row r="${rowNumber}">`;
    for (const column of this.columns) {
      let value = column.value(record);
      if (value === null || value === undefined) continue;
      if (column.kind === "text" && value instanceof Uint8Array) {
        if (value.length === 0) continue;
        const bytes = this.copyable(value, column);
        if (bytes === null) {
          value = Buffer.from(value.buffer, value.byteOffset, value.length).toString("utf8");
        } else {
          const space = isSpace(bytes[0]) || isSpace(bytes[bytes.length - 1]) ? ' xml:space="preserve"' : "";
          this.chunk += `${xml}<c r="${column.letters}${rowNumber}"${this.textStyleAttr} t="inlineStr"><is><t${space}>`;
          this.flush();
          this.stream.write(bytes);
          this.pending += bytes.length;
          xml = "</t></is></c>";
          continue;
        }
      }
      xml += this.cell(column, rowNumber, value);
    }
    this.chunk += `${xml}</row>`;
    if (this.chunk.length >= CHUNK_CHARS) this.flush();
  }

  /** Waits while the compressor or the reader is behind (see Pace). */
  async drain(): Promise<void> {
    this.flush();
    this.pending = 0;
    await this.pace.breathe(this.stream);
  }

  /** Sets the filter over the table and commits the worksheet. */
  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.commitPart();
    await this.pace.breathe(this.stream);
  }
}
