import { describe, expect, it } from "vitest";
import { CsvLimitError, CsvRecordError, CsvRecordReader, type CsvRecord } from "@/lib/temperatures/csv/records";
import { LOGGER_CSV_LIMITS } from "@/lib/limits";

function readAll(text: string, delimiter = ",", chunkSizes: number[] = [text.length || 1]): CsvRecord[] {
  const reader = new CsvRecordReader(delimiter);
  const out: CsvRecord[] = [];
  let at = 0;
  let k = 0;
  while (at < text.length) {
    const size = chunkSizes[k++ % chunkSizes.length];
    out.push(...reader.push(text.slice(at, at + size)));
    at += size;
  }
  out.push(...reader.end());
  return out;
}

const SAMPLE = 'Time,Temp,Note\r\n2026-07-14 10:00,4.5,"door ""A"""\r\n2026-07-14 10:01,4.6,"two\nlines"\n2026-07-14 10:02,4.7,\r2026-07-14 10:03,4.8,last';

describe("the streaming CSV record reader", () => {
  it("reads quoted values, doubled quotes, quoted line breaks and CRLF/LF/CR line ends, with the line each record starts on", () => {
    expect(readAll(SAMPLE)).toEqual([
      { line: 1, cells: ["Time", "Temp", "Note"] },
      { line: 2, cells: ["2026-07-14 10:00", "4.5", 'door "A"'] },
      { line: 3, cells: ["2026-07-14 10:01", "4.6", "two\nlines"] },
      { line: 5, cells: ["2026-07-14 10:02", "4.7", ""] },
      { line: 6, cells: ["2026-07-14 10:03", "4.8", "last"] },
    ]);
  });

  it("gives the same records however the text is cut into chunks", () => {
    const whole = readAll(SAMPLE);
    for (let size = 1; size <= SAMPLE.length; size++) expect(readAll(SAMPLE, ",", [size])).toEqual(whole);
    expect(readAll(SAMPLE, ",", [3, 1, 7, 2])).toEqual(whole);
  });

  it("keeps blank lines as one empty cell and counts them", () => {
    expect(readAll("a;b\n\n1;2\n", ";")).toEqual([
      { line: 1, cells: ["a", "b"] },
      { line: 2, cells: [""] },
      { line: 3, cells: ["1", "2"] },
    ]);
  });

  it("reads tab-separated text", () => {
    expect(readAll("a\tb\n1,5\t2\n", "\t")).toEqual([
      { line: 1, cells: ["a", "b"] },
      { line: 2, cells: ["1,5", "2"] },
    ]);
  });

  it("reports a quote that is never closed with the line it opens on", () => {
    expect(() => readAll('a,b\n1,2\n3,"open\n4,5\n')).toThrow(CsvRecordError);
    try {
      readAll('a,b\n1,2\n3,"open\n4,5\n');
    } catch (error) {
      expect((error as CsvRecordError).line).toBe(3);
      expect((error as Error).message).toMatch(/^Line 3: a value starts with a double quote that is never closed/);
    }
  });

  it("stops at a row longer than the limit, naming its line, without waiting for the row to end", () => {
    const reader = new CsvRecordReader(",", { maxRowChars: 100, maxColumns: 10 });
    expect(reader.push("a,b\n1,2\n")).toHaveLength(2);
    expect(() => reader.push("x".repeat(60))).not.toThrow();
    const error = (() => {
      try {
        reader.push("x".repeat(60));
      } catch (e) {
        return e;
      }
    })();
    expect(error).toBeInstanceOf(CsvLimitError);
    expect((error as CsvLimitError).line).toBe(3);
    expect((error as Error).message).toBe(
      "Line 3: the row runs on for more than 100 characters, the most one row of a logger file may have. A double quote that is never closed, or a file without line breaks, is the usual cause.",
    );
  });

  it("refuses a complete row over the length limit and a row with too many columns", () => {
    expect(() => new CsvRecordReader(",", { maxRowChars: 10, maxColumns: 10 }).push("12345678901\n")).toThrow(/^Line 1: the row runs on for more than 10 characters/);
    expect(() => new CsvRecordReader(",", { maxRowChars: 1000, maxColumns: 3 }).push("a,b,c\n1,2,3,4\n")).toThrow(
      "Line 2: the row has more than 3 columns, the most a logger file may have. Is the delimiter the right one?",
    );
    expect(LOGGER_CSV_LIMITS).toEqual({ maxUploadBytes: 100 * 1024 * 1024, maxRowChars: 32 * 1024, maxColumns: 1000 });
  });
});
