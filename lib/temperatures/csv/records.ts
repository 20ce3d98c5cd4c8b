/**
 * A streaming CSV record reader (RFC 4180: a delimiter, double quotes with "" inside quoted values,
 * CRLF, LF or CR line ends, quoted values spanning lines). Text goes in chunk by chunk; complete
 * records come out with the file line they start on (1-based, as a text editor counts, so a quoted
 * value spanning two lines makes the next record start two lines later). Pure.
 *
 * Why not papaparse here: the logger importer must name the file line of every bad row and must
 * never hold the file in memory; papaparse's streaming step reports character offsets, not lines.
 * The reader keeps only the unfinished record between chunks.
 */
import { LOGGER_CSV_LIMITS } from "@/lib/limits";

export type CsvRecord = { line: number; cells: string[] };

export class CsvRecordError extends Error {
  constructor(
    readonly line: number,
    message: string,
  ) {
    super(message);
  }
}

/**
 * A row over one of the limits (lib/limits.ts LOGGER_CSV_LIMITS): the reader stops there, so that
 * it never holds more than one row's worth of text.
 */
export class CsvLimitError extends CsvRecordError {}

export type CsvRecordLimits = { maxRowChars: number; maxColumns: number };

const QUOTE = 34;
const LF = 10;
const CR = 13;

export class CsvRecordReader {
  private leftover = "";
  /** File line on which `leftover` starts. */
  private line = 1;
  private readonly delimiter: number;

  constructor(
    delimiter: string,
    private readonly limits: CsvRecordLimits = LOGGER_CSV_LIMITS,
  ) {
    if (delimiter.length !== 1) throw new RangeError("The delimiter is one character.");
    this.delimiter = delimiter.charCodeAt(0);
  }

  /** The records completed by this chunk of text. */
  push(text: string): CsvRecord[] {
    return this.parse(this.leftover + text, false);
  }

  /** The last record (a file need not end with a line break). Throws on a quote never closed. */
  end(): CsvRecord[] {
    return this.parse(this.leftover, true);
  }

  private parse(s: string, final: boolean): CsvRecord[] {
    const records: CsvRecord[] = [];
    const n = s.length;
    const delimiter = this.delimiter;
    let i = 0;
    let line = this.line;
    while (i < n) {
      const recordStart = i;
      const recordLine = line;
      const cells: string[] = [];
      let complete = false;
      for (;;) {
        let value: string;
        if (s.charCodeAt(i) === QUOTE) {
          let j = i + 1;
          let segmentStart = j;
          value = "";
          let closed = false;
          for (;;) {
            const q = s.indexOf('"', j);
            if (q === -1) break;
            if (q + 1 < n && s.charCodeAt(q + 1) === QUOTE) {
              value += s.slice(segmentStart, q + 1);
              j = q + 2;
              segmentStart = j;
              continue;
            }
            if (q + 1 >= n && !final) break; // cannot tell yet whether "" follows
            value += s.slice(segmentStart, q);
            i = q + 1;
            closed = true;
            break;
          }
          if (!closed) {
            if (final) {
              throw new CsvRecordError(
                recordLine,
                `Line ${recordLine}: a value starts with a double quote that is never closed, so the rest of the file would be read as one value. Close the quote, or remove it.`,
              );
            }
            return this.keep(s, recordStart, recordLine, records);
          }
          line += countLineBreaks(value);
          // Text between the closing quote and the delimiter (`"a"b`) is kept, as spreadsheet programs do.
          let k = i;
          while (k < n) {
            const c = s.charCodeAt(k);
            if (c === delimiter || c === LF || c === CR) break;
            k++;
          }
          if (k > i) {
            value += s.slice(i, k);
            i = k;
          }
        } else {
          let j = i;
          while (j < n) {
            const c = s.charCodeAt(j);
            if (c === delimiter || c === LF || c === CR) break;
            j++;
          }
          value = s.slice(i, j);
          i = j;
        }
        if (i >= n) {
          if (!final) return this.keep(s, recordStart, recordLine, records);
          cells.push(value);
          complete = true;
          break;
        }
        cells.push(value);
        if (cells.length > this.limits.maxColumns) throw this.tooManyColumns(recordLine);
        const c = s.charCodeAt(i);
        if (c === delimiter) {
          i++;
          if (i >= n) {
            if (!final) return this.keep(s, recordStart, recordLine, records);
            cells.push("");
            complete = true;
            break;
          }
          continue;
        }
        if (c === CR) {
          if (i + 1 >= n && !final) return this.keep(s, recordStart, recordLine, records);
          i += i + 1 < n && s.charCodeAt(i + 1) === LF ? 2 : 1;
        } else i += 1;
        line += 1;
        complete = true;
        break;
      }
      if (i - recordStart > this.limits.maxRowChars) throw this.tooLong(recordLine);
      if (cells.length > this.limits.maxColumns) throw this.tooManyColumns(recordLine);
      if (complete) records.push({ line: recordLine, cells });
    }
    this.leftover = "";
    this.line = line;
    return records;
  }

  private keep(s: string, from: number, line: number, records: CsvRecord[]): CsvRecord[] {
    this.leftover = s.slice(from);
    this.line = line;
    if (this.leftover.length > this.limits.maxRowChars) throw this.tooLong(line);
    return records;
  }

  private tooLong(line: number): CsvLimitError {
    return new CsvLimitError(
      line,
      `Line ${line}: the row runs on for more than ${this.limits.maxRowChars.toLocaleString("en-US")} characters, the most one row of a logger file may have. ` +
        "A double quote that is never closed, or a file without line breaks, is the usual cause.",
    );
  }

  private tooManyColumns(line: number): CsvLimitError {
    return new CsvLimitError(
      line,
      `Line ${line}: the row has more than ${this.limits.maxColumns.toLocaleString("en-US")} columns, the most a logger file may have. Is the delimiter the right one?`,
    );
  }
}

/** CRLF counts once. */
function countLineBreaks(value: string): number {
  let count = 0;
  for (let i = 0; i < value.length; i++) {
    const c = value.charCodeAt(i);
    if (c === LF) count++;
    else if (c === CR) {
      count++;
      if (value.charCodeAt(i + 1) === LF) i++;
    }
  }
  return count;
}

/** A blank line is one empty cell (or only spaces). */
export function isBlankRecord(cells: readonly string[]): boolean {
  for (const cell of cells) if (cell.trim() !== "") return false;
  return true;
}
