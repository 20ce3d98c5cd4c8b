/**
 * Reads the first worksheet of an XLSX workbook row by row, from a file or from bytes, with every
 * limit enforced while it reads: the zip's parts through BoundedZip (sizes, total, packing ratio),
 * the XML through a check that no run of text between two tags can grow past what a cell may
 * hold (the XML parser keeps a text run whole until the next tag), and each cell's text, column
 * and the rows through the caller's sink, which may throw to stop reading at once.
 *
 * The XML is parsed with exceljs's own SAX wrapper (saxes), and dates and styles are read with
 * exceljs's styles parser, so that cell values come out as exceljs's in-memory reader gave them.
 * exceljs's streaming WorkbookReader is not used: it unzips with unzipper (trusting the local
 * headers, inflating without bounds), copies worksheets met before the shared strings to
 * temporary files without bounds, keeps a cell's whole text before anything can look at it, and
 * decodes each chunk on its own (a character split by a chunk boundary comes out garbled).
 */
import { StringDecoder } from "node:string_decoder";
import path from "node:path";
import parseSax from "exceljs/lib/utils/parse-sax.js";
import StylesXform from "exceljs/lib/xlsx/xform/style/styles-xform.js";
import exceljsUtils from "exceljs/lib/utils/utils.js";
import type yauzl from "yauzl";
import { IMPORT_LIMITS, XLSX_LIMITS } from "@/lib/limits";
import { ImportFileError } from "./errors";
import { BoundedZip, unreadableWorkbook, type ZipSource } from "./zip";

export type XlsxLimits = { columns: number; cellChars: number };

/** One non-blank row: its cells' text by column (index 0 = column A), and its row number. */
export type RowSink = (cells: string[], line: number) => void;

/** Cell text the workbook holds beyond the cell limit (kept as this marker, not as text). */
const TOO_LONG = Symbol("too long");

/** Columns as Excel numbers them: A = 1 … XFD = 16,384. */
const MAX_SHEET_COLUMN = 16_384;

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

/** "BC12" → 55; NaN for a reference that is not one. (A loop: a regex per cell showed in profiles.) */
function columnOfRef(ref: string): number {
  let n = 0;
  let letters = 0;
  let i = ref.charCodeAt(0) === 36 ? 1 : 0; // "$"
  for (; i < ref.length; i++) {
    const code = ref.charCodeAt(i) & ~32; // upper case
    if (code < 65 || code > 90) break;
    n = n * 26 + (code - 64);
    letters++;
  }
  if (letters === 0 || letters > 3) return NaN;
  if (ref.charCodeAt(i) === 36) i++;
  for (; i < ref.length; i++) {
    const code = ref.charCodeAt(i);
    if (code < 48 || code > 57) return NaN;
  }
  return n;
}

export function cellTooLong(where: string, chars: number | null, limit: number): ImportFileError {
  const count = chars === null ? `more than ${limit.toLocaleString("en")}` : chars.toLocaleString("en");
  return new ImportFileError(
    "cell_too_long",
    `${where}: the value has ${count} characters; a cell may hold at most ${limit.toLocaleString("en")} ` +
      "(as in Excel). Shorten it, or split it over several cells.",
  );
}

export function tooManyColumns(where: string, limit: number): ImportFileError {
  return new ImportFileError(
    "too_many_columns",
    `${where}: the file has values in more than ${limit.toLocaleString("en")} columns; imports read at most ` +
      `${limit.toLocaleString("en")}. Delete the columns that are not part of the import.`,
  );
}

function cellWhere(line: number, column: number): string {
  return `Line ${line}, column ${columnLetter(column - 1)} (cell ${columnLetter(column - 1)}${line})`;
}

/** Thrown by the XML check when a run between two tags passes the bound; turned into cell_too_long by the reader. */
class XmlRunTooLongError extends Error {}

/**
 * The part's text, decoded across chunk boundaries, refusing a run of more than `maxRunChars`
 * characters without a "<": the XML parser holds a text node (and a tag) whole until it ends.
 */
async function* xmlText(bytes: AsyncIterable<Buffer>, maxRunChars: number): AsyncGenerator<string> {
  const decoder = new StringDecoder("utf8");
  let run = 0;
  const check = (text: string) => {
    const last = text.lastIndexOf("<");
    if (last === -1) run += text.length;
    else {
      // Within the chunk, every stretch between two "<" must be short too.
      let at = text.indexOf("<");
      run += at;
      if (run > maxRunChars) throw new XmlRunTooLongError();
      // A chunk no longer than the bound cannot hold a longer stretch between two "<".
      if (text.length > maxRunChars) {
        while (at !== -1) {
          const from = at + 1;
          at = text.indexOf("<", from);
          if (at !== -1 && at - from > maxRunChars) throw new XmlRunTooLongError();
        }
      }
      run = text.length - last - 1;
    }
    if (run > maxRunChars) throw new XmlRunTooLongError();
  };
  for await (const chunk of bytes) {
    const text = decoder.write(chunk);
    check(text);
    if (text) yield text;
  }
  const rest = decoder.end();
  check(rest);
  if (rest) yield rest;
}

/** A run of XML this long cannot be a cell within the limit, however its characters are escaped (`&#1114111;` is 10). */
function maxRunChars(limits: XlsxLimits): number {
  return limits.cellChars * 10 + 1024;
}

async function* saxEvents(zip: BoundedZip, entry: yauzl.Entry, maxBytes: number, limits: XlsxLimits) {
  try {
    for await (const events of parseSax(xmlText(zip.read(entry, maxBytes), maxRunChars(limits)))) yield events;
  } catch (error) {
    if (error instanceof ImportFileError || error instanceof XmlRunTooLongError) throw error;
    // saxes: the XML is not well-formed.
    throw unreadableWorkbook();
  }
}

type WorkbookInfo = { date1904: boolean; firstSheetRelId: string | null };

async function readWorkbook(zip: BoundedZip, entry: yauzl.Entry, limits: XlsxLimits): Promise<WorkbookInfo> {
  const info: WorkbookInfo = { date1904: false, firstSheetRelId: null };
  for await (const events of saxEvents(zip, entry, XLSX_LIMITS.metadataBytes, limits)) {
    for (const event of events) {
      if (event.eventType !== "opentag") continue;
      const { name, attributes } = event.value;
      if (name === "workbookPr") info.date1904 = attributes.date1904 === "1" || attributes.date1904 === "true";
      if (name === "sheet" && info.firstSheetRelId === null) info.firstSheetRelId = attributes["r:id"] ?? null;
    }
  }
  return info;
}

type Relationship = { target: string; type: string };

async function readRelationships(zip: BoundedZip, entry: yauzl.Entry | undefined, limits: XlsxLimits): Promise<Map<string, Relationship>> {
  const rels = new Map<string, Relationship>();
  if (!entry) return rels;
  for await (const events of saxEvents(zip, entry, XLSX_LIMITS.metadataBytes, limits)) {
    for (const event of events) {
      if (event.eventType === "opentag" && event.value.name === "Relationship") {
        const { Id, Target, Type } = event.value.attributes;
        if (Id && Target) rels.set(Id, { target: Target, type: Type ?? "" });
      }
    }
  }
  return rels;
}

/** A relationship target as a zip entry name: relative to xl/, or absolute from the package root. */
function partName(target: string): string {
  return target.startsWith("/") ? target.slice(1) : path.posix.normalize(`xl/${target}`);
}

async function readStyles(zip: BoundedZip, entry: yauzl.Entry | undefined, limits: XlsxLimits): Promise<StylesXform | null> {
  if (!entry) return null;
  const styles = new StylesXform();
  try {
    await styles.parseStream(xmlText(zip.read(entry, XLSX_LIMITS.metadataBytes), maxRunChars(limits)));
  } catch (error) {
    if (error instanceof ImportFileError) throw error;
    throw unreadableWorkbook();
  }
  return styles;
}

type SharedString = string | typeof TOO_LONG;

/** The shared strings as plain text (rich-text runs joined); a string over the cell limit is kept as a marker. */
async function readSharedStrings(zip: BoundedZip, entry: yauzl.Entry | undefined, limits: XlsxLimits): Promise<SharedString[]> {
  const strings: SharedString[] = [];
  if (!entry) return strings;
  let text: string | typeof TOO_LONG | null = null;
  let inPhonetic = false;
  let inT = false;
  try {
    for await (const events of saxEvents(zip, entry, XLSX_LIMITS.entryBytes, limits)) {
      for (const event of events) {
        if (event.eventType === "opentag") {
          const { name } = event.value;
          if (name === "si") text = "";
          else if (name === "rPh") inPhonetic = true;
          else if (name === "t" && !inPhonetic) inT = true;
        } else if (event.eventType === "text") {
          if (inT && text !== null && text !== TOO_LONG) {
            text += event.value;
            if (text.length > limits.cellChars) text = TOO_LONG;
          }
        } else {
          const { name } = event.value;
          if (name === "t") inT = false;
          else if (name === "rPh") inPhonetic = false;
          else if (name === "si") {
            strings.push(text ?? "");
            text = null;
          }
        }
      }
    }
  } catch (error) {
    if (error instanceof XmlRunTooLongError) {
      // The XML parser cannot go on past the run it was refused, so the file is refused here, not at a cell using it.
      throw cellTooLong(`Shared text number ${strings.length + 1} of the workbook`, null, limits.cellChars);
    }
    throw error;
  }
  return strings;
}

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

type CellState = {
  column: number;
  type: string | undefined;
  styleId: number;
  /** `<f>` with text, or a shared formula: the cell is a formula (as exceljs decides). */
  formula: boolean;
  /** Text of `<v>` or of the inline string's `<t>` runs; null until some arrives. */
  text: string | null;
};

/** Reads the first worksheet, handing each row with a value to `onRow`. Throws ImportFileError. */
export async function readXlsxRows(source: ZipSource, onRow: RowSink, limits: XlsxLimits = IMPORT_LIMITS): Promise<void> {
  const zip = await BoundedZip.open(source);
  try {
    const workbookEntry = zip.entries.get("xl/workbook.xml");
    if (!workbookEntry) throw unreadableWorkbook();
    const workbook = await readWorkbook(zip, workbookEntry, limits);
    const rels = await readRelationships(zip, zip.entries.get("xl/_rels/workbook.xml.rels"), limits);
    const sheetRel = workbook.firstSheetRelId === null ? undefined : rels.get(workbook.firstSheetRelId);
    const sheetEntry = sheetRel ? zip.entries.get(partName(sheetRel.target)) : undefined;
    if (!sheetEntry) throw new ImportFileError("unreadable_file", "The workbook has no worksheets.");
    const relOfType = (suffix: string) => [...rels.values()].find((r) => r.type.endsWith(suffix));
    const stylesRel = relOfType("/styles");
    const stringsRel = relOfType("/sharedStrings");
    const styles = await readStyles(zip, zip.entries.get(stylesRel ? partName(stylesRel.target) : "xl/styles.xml"), limits);
    const sharedStrings = await readSharedStrings(zip, zip.entries.get(stringsRel ? partName(stringsRel.target) : "xl/sharedStrings.xml"), limits);
    await readSheet(zip, sheetEntry, { styles, sharedStrings, date1904: workbook.date1904 }, onRow, limits);
  } finally {
    zip.close();
  }
}

type SheetContext = { styles: StylesXform | null; sharedStrings: SharedString[]; date1904: boolean };

async function readSheet(zip: BoundedZip, entry: yauzl.Entry, context: SheetContext, onRow: RowSink, limits: XlsxLimits): Promise<void> {
  const dateStyles = new Map<number, boolean>();
  const isDate = (styleId: number) => {
    if (!styleId || !context.styles) return false;
    let date = dateStyles.get(styleId);
    if (date === undefined) {
      date = exceljsUtils.isDateFmt(context.styles.getStyleModel(styleId)?.numFmt);
      dateStyles.set(styleId, date);
    }
    return date;
  };
  const number = (text: string, styleId: number) => {
    const value = parseFloat(text);
    if (isDate(styleId)) return isoDate(exceljsUtils.excelToDate(value, context.date1904));
    return Number.isInteger(value) && Math.abs(value) < 1e15 ? String(value) : plainDecimal(value);
  };

  let inSheetData = false;
  let line = 0;
  let row: string[] | null = null;
  let lastColumn = 0;
  let cell: CellState | null = null;
  /** Which element's text is being collected: a value, an inline string run, a formula. */
  let collecting: "value" | "formula" | null = null;
  let inPhonetic = false;

  const valueOf = (c: CellState): string => {
    if (c.formula) {
      if (c.text === null || c.text === "") {
        throw new ImportFileError(
          "uncalculated_formulas",
          `Cell ${columnLetter(c.column - 1)}${line} holds a formula whose result was never saved. Open the file in a spreadsheet ` +
            "program, let it calculate, and save it again (or paste the values in place of the formulas).",
        );
      }
      if (c.type === "str") return exceljsUtils.xmlDecode(c.text);
      if (c.type === "b") return parseInt(c.text, 10) !== 0 ? "true" : "false";
      if (c.type === "e") return c.text;
      return number(c.text, c.styleId);
    }
    if (c.text === null || c.text === "") return "";
    switch (c.type) {
      case "s": {
        const shared = context.sharedStrings[parseInt(c.text, 10)];
        if (shared === undefined) throw unreadableWorkbook();
        if (shared === TOO_LONG) throw cellTooLong(cellWhere(line, c.column), null, limits.cellChars);
        return shared;
      }
      case "str":
        return exceljsUtils.xmlDecode(c.text);
      case "inlineStr":
        return c.text;
      case "b":
        return parseInt(c.text, 10) !== 0 ? "true" : "false";
      case "e":
        return c.text;
      default:
        return number(c.text, c.styleId);
    }
  };

  try {
    for await (const events of saxEvents(zip, entry, XLSX_LIMITS.entryBytes, limits)) {
      for (const event of events) {
        if (event.eventType === "opentag") {
          const { name, attributes } = event.value;
          if (name === "sheetData") inSheetData = true;
          else if (!inSheetData) continue;
          else if (name === "row") {
            const r = parseInt(attributes.r ?? "", 10);
            line = Number.isFinite(r) && r > 0 ? r : line + 1;
            row = [];
            lastColumn = 0;
          } else if (name === "c" && row) {
            const column = attributes.r ? columnOfRef(attributes.r) : lastColumn + 1;
            lastColumn = Number.isFinite(column) ? column : MAX_SHEET_COLUMN + 1;
            cell = { column: lastColumn, type: attributes.t, styleId: parseInt(attributes.s ?? "0", 10) || 0, formula: false, text: null };
          } else if (cell) {
            if (name === "f") {
              collecting = "formula";
              if (attributes.t === "shared") cell.formula = true;
            } else if (name === "v") collecting = "value";
            else if (name === "rPh") inPhonetic = true;
            else if (name === "t" && !inPhonetic) collecting = "value";
          }
        } else if (event.eventType === "text") {
          if (!cell || collecting === null) continue;
          if (collecting === "formula") {
            if (event.value !== "") cell.formula = true;
          } else {
            cell.text = (cell.text ?? "") + event.value;
            if (cell.text.length > limits.cellChars) throw cellTooLong(cellWhere(line, cell.column), null, limits.cellChars);
          }
        } else {
          const { name } = event.value;
          if (name === "sheetData") return;
          if (name === "f" || name === "v" || name === "t") collecting = null;
          else if (name === "rPh") inPhonetic = false;
          else if (name === "c" && cell && row) {
            const text = valueOf(cell);
            if (text !== "") {
              if (cell.column > limits.columns) throw tooManyColumns(cellWhere(line, cell.column), limits.columns);
              if (text.length > limits.cellChars) throw cellTooLong(cellWhere(line, cell.column), text.length, limits.cellChars);
              // Kept dense: empty cells before this one become "".
              while (row.length < cell.column - 1) row.push("");
              row[cell.column - 1] = text;
            }
            cell = null;
          } else if (name === "row" && row) {
            if (row.length > 0) onRow(row, line);
            row = null;
          }
        }
      }
    }
  } catch (error) {
    if (error instanceof XmlRunTooLongError) {
      throw cellTooLong(cell ? cellWhere(line, cell.column) : `Line ${line + 1}`, null, limits.cellChars);
    }
    throw error;
  }
}
