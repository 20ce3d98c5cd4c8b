/**
 * What the beginning of a logger file says about its layout: delimiter, decimal mark, header line
 * (loggers often write a block of device information before it), and a first guess at which column
 * holds what. The person confirms or corrects every choice before anything is read. Pure.
 */
import type { TemperatureUnit } from "../units";
import { CSV_DELIMITERS, type CsvDelimiter, type CsvMapping, type UnitChoice } from "./mapping";
import { CsvRecordReader, isBlankRecord, type CsvRecord } from "./records";
import { numberedHeaders } from "./rows";
import { guessDateOrder, hasOwnOffset, looksLikeDate, looksLikeDateTime, looksLikeTime, type DateOrder } from "./timestamps";
import { readTemperature, readUnit, unitInHeader, type DecimalSeparator } from "./values";

export type SuggestedMapping = Partial<Pick<CsvMapping, "timestampColumn" | "dateColumn" | "timeColumn" | "temperatureColumn" | "unitColumn" | "deviceIdColumn">> & {
  unit?: UnitChoice;
  dateOrder?: DateOrder;
};

export type DetectedLayout = {
  delimiter: CsvDelimiter;
  decimalSeparator: DecimalSeparator;
  /** File line of the header row, 0 when the file has none. */
  headerLine: number;
  headers: string[];
  /** The first lines of the file as text, to show. */
  sampleLines: { line: number; text: string }[];
  /** The first data rows, split into cells. */
  sampleRows: CsvRecord[];
  suggested: SuggestedMapping;
  /** Every sampled timestamp carries its own UTC offset (the time zone then changes nothing). */
  timestampsHaveOffset: boolean;
};

const SAMPLE_LINE_COUNT = 15;
const SAMPLE_ROW_COUNT = 10;
const MAX_SAMPLE_LINE_CHARS = 300;
const SEPARATOR_LINE = /^sep=(.)$/i;

/** Complete records of the head of a file (unless it is the whole file, the last, possibly cut, line is left out). */
function recordsOf(head: string, delimiter: string, wholeFile: boolean): CsvRecord[] {
  try {
    const reader = new CsvRecordReader(delimiter);
    const records = reader.push(head);
    if (wholeFile) records.push(...reader.end());
    return records.filter((r) => !isBlankRecord(r.cells));
  } catch {
    return [];
  }
}

function mode(values: number[]): { value: number; share: number } {
  const counts = new Map<number, number>();
  for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1);
  let best = 0;
  let bestCount = 0;
  for (const [v, c] of counts) if (c > bestCount || (c === bestCount && v > best)) [best, bestCount] = [v, c];
  return { value: best, share: values.length ? bestCount / values.length : 0 };
}

/** The delimiter that splits the later lines (past any information block) into the same number of cells, most of them. */
export function detectDelimiter(head: string, wholeFile = false): CsvDelimiter {
  const firstLine = head.split(/\r\n|\n|\r/, 1)[0]?.trim() ?? "";
  const declared = SEPARATOR_LINE.exec(firstLine)?.[1];
  if (declared && (CSV_DELIMITERS as readonly string[]).includes(declared)) return declared as CsvDelimiter;
  let best: { delimiter: CsvDelimiter; share: number; columns: number } | null = null;
  for (const delimiter of [";", "\t", ","] as const) {
    const records = recordsOf(head, delimiter, wholeFile).slice(-50);
    const { value, share } = mode(records.map((r) => r.cells.length));
    if (value < 2) continue;
    if (!best || share > best.share + 1e-9 || (Math.abs(share - best.share) <= 1e-9 && value > best.columns)) best = { delimiter, share, columns: value };
  }
  return best?.delimiter ?? ",";
}

function isDataLike(cells: readonly string[]): boolean {
  return cells.some((c) => looksLikeDateTime(c) || looksLikeDate(c));
}

const COMMA_DECIMAL = /^[+\-−]?\d+,\d+$/;
const POINT_DECIMAL = /^[+\-−]?\d+\.\d+$/;

/** `head` is the beginning of the file as text; `wholeFile` when it is all of it. */
export function detectLayout(head: string, wholeFile = false): DetectedLayout {
  const delimiter = detectDelimiter(head, wholeFile);
  const lines = head.split(/\r\n|\n|\r/);
  if (!wholeFile || lines[lines.length - 1] === "") lines.pop();
  const sampleLines = lines.slice(0, SAMPLE_LINE_COUNT).map((text, i) => ({ line: i + 1, text: text.length > MAX_SAMPLE_LINE_CHARS ? `${text.slice(0, MAX_SAMPLE_LINE_CHARS)}…` : text }));

  let records = recordsOf(head, delimiter, wholeFile);
  if (records.length && records[0].line === 1 && SEPARATOR_LINE.test(records[0].cells.join(delimiter).trim())) records = records.slice(1);

  const width = mode(records.slice(-50).map((r) => r.cells.length)).value;
  // The data rows have the file's usual width; an information block above them (serial number,
  // calibration date) is narrower even when it holds a date.
  let firstData = records.findIndex((r) => r.cells.length === width && isDataLike(r.cells));
  if (firstData === -1) firstData = records.findIndex((r) => isDataLike(r.cells));
  let headerIndex = -1;
  if (firstData > 0 && !isDataLike(records[firstData - 1].cells)) headerIndex = firstData - 1;
  else if (firstData === -1 && records.length) headerIndex = records.findIndex((r) => r.cells.length === width);

  const headerLine = headerIndex >= 0 ? records[headerIndex].line : 0;
  const dataStart = headerIndex >= 0 ? headerIndex + 1 : Math.max(firstData, 0);
  const dataRows = records.slice(dataStart);
  const headerCells = headerIndex >= 0 ? records[headerIndex].cells.map((h) => h.trim()) : numberedHeaders(width);
  const columnCount = Math.max(headerCells.length, width);
  const headers = headerIndex >= 0 ? headerCells.slice(0, columnCount) : numberedHeaders(columnCount);

  let commas = 0;
  let points = 0;
  for (const row of dataRows.slice(0, 200)) {
    for (const cell of row.cells) {
      const v = cell.trim();
      if (COMMA_DECIMAL.test(v)) commas++;
      else if (POINT_DECIMAL.test(v)) points++;
    }
  }
  const decimalSeparator: DecimalSeparator = commas > 0 && points === 0 ? "," : ".";
  const { suggested, timestampsHaveOffset } = suggestMapping(headers, dataRows.slice(0, 200), decimalSeparator);

  return { delimiter, decimalSeparator, headerLine, headers, sampleLines, sampleRows: dataRows.slice(0, SAMPLE_ROW_COUNT), suggested, timestampsHaveOffset };
}

const TIME_HEADER = /time|date|stamp|zeit|datum|heure/i;
const TEMPERATURE_HEADER = /temp|°|º|deg|celsius|fahrenheit|value|reading|wert/i;
const COUNTER_HEADER = /^\s*(#|no\.?|nr\.?|index|record|row|seq|line|point)\b/i;
const DEVICE_HEADER = /device|serial|sensor|logger|probe|s\/n|\bsn\b|\bid\b/i;

function share(values: string[], test: (v: string) => boolean): number {
  if (values.length === 0) return 0;
  let n = 0;
  for (const v of values) if (test(v)) n++;
  return n / values.length;
}

function suggestMapping(headers: string[], rows: CsvRecord[], decimal: DecimalSeparator): { suggested: SuggestedMapping; timestampsHaveOffset: boolean } {
  const columns = headers.map((name, i) => {
    const values = rows.map((r) => (r.cells[i] ?? "").trim()).filter((v) => v !== "");
    return {
      name,
      values,
      dateTime: share(values, looksLikeDateTime),
      date: share(values, looksLikeDate),
      time: share(values, looksLikeTime),
      number: share(values, (v) => readTemperature(v, decimal).ok),
      unit: share(values, (v) => readUnit(v) !== null),
      constant: values.length > 0 && values.every((v) => v === values[0]),
    };
  });
  const suggested: SuggestedMapping = {};
  const taken = new Set<string>();
  const pick = (candidates: typeof columns, prefer?: RegExp) => {
    const free = candidates.filter((c) => c.name && !taken.has(c.name));
    const chosen = (prefer && free.find((c) => prefer.test(c.name))) || free[0];
    if (chosen) taken.add(chosen.name);
    return chosen;
  };

  const stamp = pick(columns.filter((c) => c.dateTime >= 0.8), TIME_HEADER);
  let timeValues: string[] = [];
  if (stamp) {
    suggested.timestampColumn = stamp.name;
    timeValues = stamp.values;
  } else {
    const date = pick(columns.filter((c) => c.date >= 0.8), TIME_HEADER);
    const time = pick(columns.filter((c) => c.time >= 0.8), TIME_HEADER);
    if (date && time) {
      suggested.dateColumn = date.name;
      suggested.timeColumn = time.name;
      timeValues = date.values;
    }
  }
  const unitColumn = pick(columns.filter((c) => c.unit >= 0.8 && c.number < 0.8));
  const numeric = columns.filter((c) => c.number >= 0.8 && !COUNTER_HEADER.test(c.name));
  const temperature = pick(numeric, TEMPERATURE_HEADER);
  if (temperature) suggested.temperatureColumn = temperature.name;
  if (unitColumn) {
    suggested.unit = "column";
    suggested.unitColumn = unitColumn.name;
  } else {
    let unit: TemperatureUnit | null = temperature ? unitInHeader(temperature.name) : null;
    if (!unit && temperature) {
      const fromValue = readTemperature(temperature.values[0] ?? "", decimal);
      unit = fromValue.ok ? fromValue.unit : null;
    }
    if (unit) suggested.unit = unit;
  }
  const device = pick(columns.filter((c) => c.constant && c.number < 0.8 && c.dateTime === 0), DEVICE_HEADER);
  if (device && DEVICE_HEADER.test(device.name)) suggested.deviceIdColumn = device.name;

  const order = guessDateOrder(timeValues);
  if (order) suggested.dateOrder = order;
  const timestampsHaveOffset = !!stamp && stamp.values.length > 0 && stamp.values.every((v) => hasOwnOffset(v, order ?? "dmy"));
  return { suggested, timestampsHaveOffset };
}
