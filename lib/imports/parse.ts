/**
 * Reads a CSV or XLSX file into header names and rows of text cells. No I/O: the caller hands over
 * the bytes. Line numbers are the row numbers a spreadsheet program shows (the header is line 1 when
 * it is the first row; blank rows count but are not returned).
 */
import ExcelJS from "exceljs";
import Papa from "papaparse";
import { ImportFileError } from "./errors";

export const MAX_FILE_BYTES = 10 * 1024 * 1024;
export const MAX_DATA_ROWS = 100_000;

export type TabularFormat = "csv" | "xlsx";

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

/** Spreadsheet column letters for a 0-based index: 0 → A, 26 → AA. */
export function columnLetter(index: number): string {
  let n = index + 1;
  let letters = "";
  while (n > 0) {
    const rem = (n - 1) % 26;
    letters = String.fromCharCode(65 + rem) + letters;
    n = Math.floor((n - 1) / 26);
  }
  return letters;
}

export async function parseTabularFile(bytes: Uint8Array, fileName: string): Promise<ParsedTable> {
  if (bytes.byteLength > MAX_FILE_BYTES) {
    const mb = (bytes.byteLength / (1024 * 1024)).toFixed(1);
    throw new ImportFileError(
      "file_too_large",
      `The file is ${mb} MB; imports take files up to 10 MB. Split it into smaller files.`,
    );
  }
  const format = detectFormat(bytes, fileName);
  const grid = format === "xlsx" ? await readXlsxGrid(bytes) : readCsvGrid(bytes);
  return buildTable(format, grid);
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

/** Rows of raw cells, index 0 = line 1. */
type Grid = { cells: string[]; line: number }[];

function decodeUtf8(bytes: Uint8Array): string {
  try {
    // The decoder drops a leading byte-order mark.
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new ImportFileError(
      "not_utf8",
      "The file is not UTF-8 text, so accented letters and symbols would come out wrong. " +
        "Save it as “CSV UTF-8” (or as .xlsx) and upload it again.",
    );
  }
}

/** The header names hold no delimiters, so the first non-blank line tells which one the file uses. */
function detectDelimiter(text: string): string {
  const firstLine = text.split(/\r\n|\n|\r/).find((l) => l.trim() !== "") ?? "";
  const unquoted = firstLine.replace(/"[^"]*"/g, "");
  const counts = [",", ";", "\t"].map((d) => ({ d, n: unquoted.split(d).length - 1 }));
  counts.sort((a, b) => b.n - a.n);
  return counts[0].n > 0 ? counts[0].d : ",";
}

/** A first line "sep=;" names the delimiter; spreadsheet programs hide it, so it takes no line number. */
const SEPARATOR_LINE = /^sep=(.)\r?\n/i;

function readCsvGrid(bytes: Uint8Array): Grid {
  let text = decodeUtf8(bytes);
  let delimiter: string;
  const separatorLine = text.match(SEPARATOR_LINE);
  if (separatorLine) {
    delimiter = separatorLine[1];
    text = text.slice(separatorLine[0].length);
  } else delimiter = detectDelimiter(text);
  const result = Papa.parse<string[]>(text, { delimiter, header: false, skipEmptyLines: false });
  const quoteError = result.errors.find((e) => e.type === "Quotes");
  if (quoteError) {
    const line = (quoteError.row ?? 0) + 1;
    throw new ImportFileError(
      "malformed_csv",
      `Line ${line}: a value starts with a double quote that is never closed, so the rest of the file ` +
        `would be read as one value. Close the quote, or remove it.`,
    );
  }
  // Each parsed record is one spreadsheet row, even when a quoted value spans several text lines.
  return result.data.map((cells, i) => ({ cells, line: i + 1 }));
}

// ---------------------------------------------------------------------------------------------
// XLSX
// ---------------------------------------------------------------------------------------------

async function readXlsxGrid(bytes: Uint8Array): Promise<Grid> {
  const workbook = new ExcelJS.Workbook();
  try {
    // exceljs declares its own Buffer type; a Node Buffer is what it reads.
    await workbook.xlsx.load(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength) as unknown as ExcelJS.Buffer);
  } catch {
    throw new ImportFileError(
      "unreadable_file",
      "The file looks like a ZIP archive but is not a readable Excel workbook. Save it again as .xlsx or as CSV.",
    );
  }
  const sheet = workbook.worksheets[0];
  if (!sheet) {
    throw new ImportFileError("unreadable_file", "The workbook has no worksheets.");
  }
  const grid: Grid = [];
  let dataRows = 0;
  sheet.eachRow({ includeEmpty: false }, (row) => {
    const cells: string[] = [];
    const count = row.cellCount;
    for (let c = 1; c <= count; c++) {
      const cell = row.getCell(c);
      if (isUncalculatedFormula(cell.value)) {
        throw new ImportFileError(
          "uncalculated_formulas",
          `Cell ${cell.address} holds a formula whose result was never saved. Open the file in a spreadsheet ` +
            "program, let it calculate, and save it again (or paste the values in place of the formulas).",
        );
      }
      cells.push(cellText(cell.value));
    }
    if (grid.length > 0 && cells.some((v) => v.trim() !== "")) dataRows++;
    if (dataRows > MAX_DATA_ROWS) throw tooManyRows();
    grid.push({ cells, line: row.number });
  });
  return grid;
}

function isUncalculatedFormula(value: ExcelJS.CellValue): boolean {
  return (
    typeof value === "object" &&
    value !== null &&
    ("formula" in value || "sharedFormula" in value) &&
    (value as { result?: unknown }).result === undefined
  );
}

function cellText(value: ExcelJS.CellValue): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return plainDecimal(value);
  if (typeof value === "string") return value;
  if (typeof value === "boolean") return value ? "true" : "false";
  if (value instanceof Date) return isoDate(value);
  if (typeof value === "object") {
    if ("richText" in value) return value.richText.map((r) => r.text).join("");
    if ("formula" in value || "sharedFormula" in value) {
      return cellText((value as { result?: ExcelJS.CellValue }).result ?? null);
    }
    if ("hyperlink" in value) {
      const text = (value as ExcelJS.CellHyperlinkValue).text as unknown;
      return typeof text === "string" ? text : cellText(text as ExcelJS.CellValue);
    }
    if ("error" in value) return String(value.error);
  }
  return String(value);
}

/** Dates in a workbook are calendar values; exceljs hands them over as UTC instants. */
function isoDate(date: Date): string {
  if (Number.isNaN(date.getTime())) return "";
  const iso = date.toISOString();
  return iso.endsWith("T00:00:00.000Z") ? iso.slice(0, 10) : iso.slice(0, 19);
}

/**
 * A number as a person would type it: 15 significant digits at most (what a spreadsheet keeps, so
 * 0.1 + 0.2 reads 0.3) and never in exponent notation.
 */
export function plainDecimal(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const rounded = Number(value.toPrecision(15));
  const text = String(rounded);
  if (!/e/i.test(text)) return text;
  const [mantissa, exponentText] = text.toLowerCase().split("e");
  const exponent = Number(exponentText);
  const negative = mantissa.startsWith("-");
  const digits = mantissa.replace(/^-/, "").replace(".", "");
  const pointAt = mantissa.replace(/^-/, "").indexOf(".");
  const intLength = (pointAt === -1 ? digits.length : pointAt) + exponent;
  let out: string;
  if (intLength <= 0) out = "0." + "0".repeat(-intLength) + digits;
  else if (intLength >= digits.length) out = digits + "0".repeat(intLength - digits.length);
  else out = digits.slice(0, intLength) + "." + digits.slice(intLength);
  return (negative ? "-" : "") + out;
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

function buildTable(format: TabularFormat, grid: Grid): ParsedTable {
  const headerIndex = grid.findIndex((r) => !isBlank(r.cells));
  if (headerIndex === -1) {
    throw new ImportFileError("no_header_row", "The file is empty: the first row should hold the column names.");
  }
  const headerRow = grid[headerIndex];
  const rawHeaders = headerRow.cells.map(normalizeHeader);
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

  const rows: ParsedRow[] = [];
  for (const { cells: raw, line } of grid.slice(headerIndex + 1)) {
    if (isBlank(raw)) continue;
    if (rows.length >= MAX_DATA_ROWS) throw tooManyRows();
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
    const extra = raw.slice(width).map((v) => v.trim());
    const row: ParsedRow = { line, cells };
    if (extra.some((v) => v !== "")) row.extraCells = extra;
    rows.push(row);
  }
  return { format, headers: headers.filter((h) => h !== ""), rows };
}
