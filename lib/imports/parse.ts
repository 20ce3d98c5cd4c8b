/**
 * Reads a CSV or XLSX file into header names and rows of text cells, from a file on disk, a Node
 * stream (written to a temporary file first) or bytes in memory, with every limit of
 * `IMPORT_LIMITS` / `XLSX_LIMITS` enforced while it reads: reading stops at the first row, column,
 * cell or unpacked byte past a limit. Line numbers are the row numbers a spreadsheet program shows
 * (the header is line 1 when it is the first row; blank rows count but are not returned).
 */
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import type { Readable } from "node:stream";
import Papa from "papaparse";
import { IMPORT_LIMITS } from "@/lib/limits";
import { ImportFileError } from "./errors";
import { cellTooLong, columnLetter, readXlsxRows, tooManyColumns, type RowSink } from "./xlsx";

export { columnLetter, plainDecimal } from "./xlsx";

export const MAX_FILE_BYTES = IMPORT_LIMITS.fileBytes;
export const MAX_DATA_ROWS = IMPORT_LIMITS.dataRows;

export type TabularFormat = "csv" | "xlsx";

/** Where a file to read is: on disk (an upload streamed to a temporary file), or in memory. */
export type TabularSource = { path: string } | { bytes: Uint8Array };

export type ParsedRow = {
  /** Row number as a spreadsheet program shows it. */
  line: number;
  /** Cell text by normalised header name, trimmed; empty cells are "". */
  cells: Record<string, string>;
  /** Values beyond the last header (usually an unquoted comma inside a value); absent when none. */
  extraCells?: string[];
};

export type ParsedTable = {
  format: TabularFormat;
  headers: string[];
  rows: ParsedRow[];
};

/** "Amount Unit" → "amount_unit", " Storage-Unit " → "storage_unit". */
export function normalizeHeader(header: string): string {
  return header
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, "_");
}

function fileTooLarge(sizeBytes: number): ImportFileError {
  const mb = (sizeBytes / (1024 * 1024)).toFixed(1);
  const limitMb = Math.round(MAX_FILE_BYTES / (1024 * 1024));
  return new ImportFileError("file_too_large", `The file is ${mb} MB; imports take files up to ${limitMb} MB. Split it into smaller files.`);
}

/** Reads a file held in memory. */
export async function parseTabularFile(bytes: Uint8Array, fileName: string): Promise<ParsedTable> {
  return parseTabular({ bytes }, fileName);
}

/** Reads a file on disk, streaming: what a worker thread is handed. */
export async function parseTabularPath(filePath: string, fileName: string): Promise<ParsedTable> {
  return parseTabular({ path: filePath }, fileName);
}

/**
 * Reads a Node stream: it is written to a temporary file in `tempDir` (an XLSX workbook is read
 * from its end, the zip's central directory), refused at the first byte past the upload limit,
 * read from there, and the file is deleted whatever happens.
 */
export async function parseTabularStream(stream: Readable, fileName: string, tempDir: string): Promise<ParsedTable> {
  const filePath = path.join(tempDir, `${randomBytes(16).toString("hex")}.upload`);
  try {
    const file = await fs.promises.open(filePath, "wx", 0o600);
    try {
      let written = 0;
      for await (const chunk of stream as AsyncIterable<Buffer | string>) {
        const bytes = typeof chunk === "string" ? Buffer.from(chunk) : chunk;
        written += bytes.length;
        if (written > MAX_FILE_BYTES) {
          stream.destroy();
          throw new ImportFileError(
            "file_too_large",
            `The file is larger than ${Math.round(MAX_FILE_BYTES / (1024 * 1024))} MB; imports take files up to ` +
              `${Math.round(MAX_FILE_BYTES / (1024 * 1024))} MB. Split it into smaller files.`,
          );
        }
        await file.write(bytes);
      }
    } finally {
      await file.close();
    }
    return await parseTabularPath(filePath, fileName);
  } finally {
    await fs.promises.rm(filePath, { force: true });
  }
}

export async function parseTabular(source: TabularSource, fileName: string): Promise<ParsedTable> {
  const sizeBytes = "path" in source ? (await fs.promises.stat(source.path)).size : source.bytes.byteLength;
  if (sizeBytes > MAX_FILE_BYTES) throw fileTooLarge(sizeBytes);
  const format = detectFormat(await headOf(source, 8192), fileName);
  const table = new TableBuilder(format);
  if (format === "xlsx") await readXlsxRows(source, table.add);
  else await readCsvRows(source, table.add);
  return table.finish();
}

async function headOf(source: TabularSource, length: number): Promise<Uint8Array> {
  if ("bytes" in source) return source.bytes.subarray(0, length);
  const handle = await fs.promises.open(source.path, "r");
  try {
    const buffer = new Uint8Array(length);
    const { bytesRead } = await handle.read(buffer, 0, length, 0);
    return buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

// ---------------------------------------------------------------------------------------------
// Format detection
// ---------------------------------------------------------------------------------------------

const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04];
const OLE_MAGIC = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];
const PDF_MAGIC = [0x25, 0x50, 0x44, 0x46];

function startsWith(bytes: Uint8Array, magic: number[]): boolean {
  return magic.every((b, i) => bytes[i] === b);
}

function detectFormat(bytes: Uint8Array, fileName: string): TabularFormat {
  const extension = fileName.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1] ?? "";
  if (startsWith(bytes, ZIP_MAGIC)) return "xlsx";
  if (startsWith(bytes, OLE_MAGIC)) {
    throw new ImportFileError(
      "unsupported_format",
      `${fileName} is an old-style .xls workbook. Save it as .xlsx or as CSV (UTF-8) and upload that.`,
    );
  }
  if (startsWith(bytes, PDF_MAGIC)) {
    throw new ImportFileError("unsupported_format", `${fileName} is a PDF. Upload a CSV or XLSX file.`);
  }
  if (extension === "xlsx") {
    throw new ImportFileError(
      "unsupported_format",
      `${fileName} is named .xlsx but is not an Excel workbook. Save it again as .xlsx or as CSV.`,
    );
  }
  // Text never contains NUL bytes; UTF-16 text and binaries do.
  const sample = bytes.subarray(0, 8192);
  if (sample.includes(0)) {
    throw new ImportFileError(
      "unsupported_format",
      `${fileName} is not a CSV or XLSX file. If it is text, save it as CSV with UTF-8 encoding.`,
    );
  }
  return "csv";
}

// ---------------------------------------------------------------------------------------------
// CSV
// ---------------------------------------------------------------------------------------------

/**
 * The text of a CSV file, decoded as UTF-8 while it is read (a byte that is not UTF-8 refuses the
 * file). The whole text is kept: it is bounded by the upload limit (10 MB), and papaparse reads a
 * string in one pass. Fed a stream instead, papaparse re-reads the unfinished record with every
 * chunk, which an unclosed quote turns into seconds of work (measured: 7 s for 10 MB), and it
 * took 10 s for 3 million short lines where a string takes well under one.
 */
async function readUtf8(source: TabularSource): Promise<string> {
  // The decoder drops a leading byte-order mark.
  const decoder = new TextDecoder("utf-8", { fatal: true });
  try {
    if ("bytes" in source) return decoder.decode(source.bytes);
    let text = "";
    let read = 0;
    for await (const chunk of fs.createReadStream(source.path, { highWaterMark: 1024 * 1024 }) as AsyncIterable<Buffer>) {
      read += chunk.length;
      if (read > MAX_FILE_BYTES) throw fileTooLarge(read);
      text += decoder.decode(chunk, { stream: true });
    }
    return text + decoder.decode();
  } catch (error) {
    if (error instanceof ImportFileError) throw error;
    throw new ImportFileError(
      "not_utf8",
      "The file is not UTF-8 text, so accented letters and symbols would come out wrong. " +
        "Save it as “CSV UTF-8” (or as .xlsx) and upload it again.",
    );
  }
}

/** The header names hold no delimiters, so the first non-blank line tells which one the file uses. */
function detectDelimiter(text: string): string {
  const firstLine = firstNonBlankLine(text);
  const unquoted = firstLine.replace(/"[^"]*"/g, "");
  const counts = [",", ";", "\t"].map((d) => ({ d, n: unquoted.split(d).length - 1 }));
  counts.sort((a, b) => b.n - a.n);
  return counts[0].n > 0 ? counts[0].d : ",";
}

/** Walks the lines only as far as needed: the text may hold millions of them. */
function firstNonBlankLine(text: string): string {
  const lineBreak = /\r\n|\n|\r/g;
  let from = 0;
  while (from <= text.length) {
    const match = lineBreak.exec(text);
    const end = match ? match.index : text.length;
    const line = text.slice(from, end);
    if (line.trim() !== "") return line;
    if (!match) break;
    from = lineBreak.lastIndex;
  }
  return "";
}

/** A first line "sep=;" names the delimiter; spreadsheet programs hide it, so it takes no line number. */
const SEPARATOR_LINE = /^sep=(.)\r?\n/i;

async function readCsvRows(source: TabularSource, onRow: RowSink): Promise<void> {
  let text = await readUtf8(source);
  let delimiter: string;
  const separatorLine = text.match(SEPARATOR_LINE);
  if (separatorLine) {
    delimiter = separatorLine[1];
    text = text.slice(separatorLine[0].length);
  } else delimiter = detectDelimiter(text);
  let failure: unknown = null;
  // Each parsed record is one spreadsheet row, even when a quoted value spans several text lines.
  let line = 0;
  Papa.parse<string[]>(text, {
    delimiter,
    header: false,
    skipEmptyLines: false,
    step: (result, parser) => {
      if (failure) return;
      line++;
      try {
        if (result.errors.some((e) => e.type === "Quotes")) {
          throw new ImportFileError(
            "malformed_csv",
            `Line ${line}: a value starts with a double quote that is never closed, so the rest of the file ` +
              `would be read as one value. Close the quote, or remove it.`,
          );
        }
        const cells = result.data;
        for (let i = 0; i < cells.length; i++) {
          const value = cells[i];
          if (value.length > IMPORT_LIMITS.cellChars) throw cellTooLong(`Line ${line}, column ${columnLetter(i)}`, value.length, IMPORT_LIMITS.cellChars);
          if (i >= IMPORT_LIMITS.columns && value.trim() !== "") throw tooManyColumns(`Line ${line}, column ${columnLetter(i)}`, IMPORT_LIMITS.columns);
        }
        onRow(cells, line);
      } catch (error) {
        failure = error;
        parser.abort();
      }
    },
  });
  if (failure) throw failure;
}

// ---------------------------------------------------------------------------------------------
// Header and rows
// ---------------------------------------------------------------------------------------------

function tooManyRows(): ImportFileError {
  return new ImportFileError(
    "too_many_rows",
    `The file has more than ${MAX_DATA_ROWS.toLocaleString("en")} rows; split it into smaller files.`,
  );
}

function isBlank(cells: string[]): boolean {
  return cells.every((c) => c.trim() === "");
}

/**
 * Takes the rows as they are read: the first non-blank one is the header, checked at once; each
 * later one becomes a data row, and the first data row past the limit stops the reading.
 */
class TableBuilder {
  private headers: string[] | null = null;
  private width = 0;
  private readonly rows: ParsedRow[] = [];

  constructor(private readonly format: TabularFormat) {}

  readonly add = (raw: string[], line: number): void => {
    if (isBlank(raw)) return;
    if (this.headers === null) this.setHeader(raw);
    else this.addRow(raw, line);
  };

  private setHeader(cells: string[]): void {
    const rawHeaders = cells.map(normalizeHeader);
    // Trailing blank header cells (formatting left over in a spreadsheet) are dropped.
    let width = rawHeaders.length;
    while (width > 0 && rawHeaders[width - 1] === "") width--;
    const headers = rawHeaders.slice(0, width);

    const positions = new Map<string, number[]>();
    headers.forEach((h, i) => {
      if (h !== "") positions.set(h, [...(positions.get(h) ?? []), i]);
    });
    const duplicates = [...positions].filter(([, at]) => at.length > 1);
    if (duplicates.length > 0) {
      const list = duplicates
        .map(([h, at]) => `${h} (columns ${at.map(columnLetter).join(" and ")})`)
        .join(", ");
      throw new ImportFileError(
        "duplicate_headers",
        `Each column name may appear once; these appear more than once: ${list}.`,
        duplicates.map(([h]) => h),
      );
    }
    this.headers = headers;
    this.width = width;
  }

  private addRow(raw: string[], line: number): void {
    const headers = this.headers!;
    if (this.rows.length >= MAX_DATA_ROWS) throw tooManyRows();
    const cells: Record<string, string> = {};
    headers.forEach((h, i) => {
      const value = (raw[i] ?? "").trim();
      if (h === "") {
        if (value !== "") {
          throw new ImportFileError(
            "blank_header",
            `Column ${columnLetter(i)} has values (line ${line}: “${value}”) but no name in the header row. ` +
              "Name the column or delete it.",
          );
        }
        return;
      }
      cells[h] = value;
    });
    const extra = raw.slice(this.width).map((v) => v.trim());
    const row: ParsedRow = { line, cells };
    if (extra.some((v) => v !== "")) row.extraCells = extra;
    this.rows.push(row);
  }

  finish(): ParsedTable {
    if (this.headers === null) {
      throw new ImportFileError("no_header_row", "The file is empty: the first row should hold the column names.");
    }
    return { format: this.format, headers: this.headers.filter((h) => h !== ""), rows: this.rows };
  }
}
