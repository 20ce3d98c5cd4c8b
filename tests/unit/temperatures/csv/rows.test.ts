import { describe, expect, it } from "vitest";
import { csvMappingSchema, type CsvMappingInput } from "@/lib/temperatures/csv/mapping";
import { CsvRecordReader } from "@/lib/temperatures/csv/records";
import { DEFAULT_READING_LIMITS } from "@/lib/temperatures/plausible";
import { createMemoryInstantIndex, createRowReader, CsvMappingError, duplicateError, type CsvReading, type CsvRowError } from "@/lib/temperatures/csv/rows";

const base: CsvMappingInput = { delimiter: ",", decimalSeparator: ".", headerLine: 1, timestampColumn: "Time", temperatureColumn: "Temp", unit: "C", dateOrder: "ymd", timeZone: "UTC" };

/** Reads a whole text the way the upload does: header on mapping.headerLine, then every row. */
function readText(text: string, input: Partial<CsvMappingInput> = {}, deviceId: string | null = "LOG-7", nowMs = Date.parse("2026-12-05T12:00:00Z")) {
  const mapping = csvMappingSchema.parse({ ...base, ...input });
  const reader = new CsvRecordReader(mapping.delimiter);
  const records = [...reader.push(text), ...reader.end()];
  const header = records.find((r) => r.line === mapping.headerLine)!;
  const rows = createRowReader(header.cells, mapping, deviceId, { limits: DEFAULT_READING_LIMITS, nowMs });
  const index = createMemoryInstantIndex();
  const readings: CsvReading[] = [];
  const errors: CsvRowError[] = [];
  for (const record of records) {
    if (record.line <= mapping.headerLine || record.cells.every((c) => c.trim() === "")) continue;
    const reading = rows.read(record.cells, record.line, errors);
    if (!reading) continue;
    const earlier = index.add(reading);
    if (earlier && earlier.tempC !== reading.tempC) errors.push(duplicateError(reading, earlier, rows.timeColumn, rows.timeText(record.cells)));
    else if (!earlier) readings.push(reading);
  }
  return { readings, errors };
}

const iso = (r: CsvReading) => new Date(r.atMs).toISOString();

describe("rows to readings", () => {
  it("converts a °F file to °C (46.4 °F = 8 °C, NIST SP 811 B.9)", () => {
    const { readings, errors } = readText("Time,Temp\n2026-07-14 10:00,46.4\n2026-07-14 10:05,41\n", { unit: "F" });
    expect(errors).toEqual([]);
    expect(readings.map((r) => r.tempC)).toEqual([8, 5]);
  });

  it("takes the unit from a unit column", () => {
    const { readings, errors } = readText("Time,Temp,U\n2026-07-14 10:00,46.4,°F\n2026-07-14 10:05,5,degC\n2026-07-14 10:10,5,%\n", { unit: "column", unitColumn: "U" });
    expect(readings.map((r) => r.tempC)).toEqual([8, 5]);
    expect(errors).toEqual([{ line: 4, column: "U", value: "%", message: "“%” is not a temperature unit; write °C, °F or K." }]);
  });

  it("reports every problem of every row with its file line and column", () => {
    const text = [
      "Time,Temp,Device",
      "2026-07-14 10:00,4.5,LOG-7",
      "2026-07-14 10:05,,LOG-7",
      "2026-07-14 25:00,abc,LOG-8",
      "2026-07-14 10:15,250,LOG-7",
      "",
      "2026-07-14 10:20,-0.5,",
    ].join("\n");
    const { readings, errors } = readText(text, { deviceIdColumn: "Device" });
    expect(readings.map((r) => [r.line, iso(r), r.tempC])).toEqual([
      [2, "2026-07-14T10:00:00.000Z", 4.5],
    ]);
    expect(errors).toEqual([
      { line: 3, column: "Temp", value: "", message: "The temperature is empty." },
      { line: 4, column: "Time", value: "2026-07-14 25:00", message: "“2026-07-14 25:00” is not a time: hour 25 does not exist." },
      { line: 4, column: "Temp", value: "abc", message: "“abc” is not a number." },
      { line: 4, column: "Device", value: "LOG-8", message: "Device id “LOG-8” is not this sensor's (“LOG-7”): the row comes from another logger." },
      { line: 5, column: "Temp", value: "250", message: "250 °C is outside −200 to 200 °C: an error value of the logger, or the wrong unit?" },
      { line: 7, column: "Device", value: "", message: "The device id is empty; this sensor's is “LOG-7”." },
    ]);
  });

  it("counts an instant given twice with the same value once, and reports it with a different value", () => {
    const { readings, errors } = readText("Time,Temp\n2026-07-14 10:00,4.5\n2026-07-14 10:00,4.5\n2026-07-14T12:00+02:00,4.7\n");
    expect(readings).toHaveLength(1);
    expect(errors).toEqual([
      { line: 4, column: "Time", value: "2026-07-14T12:00+02:00", message: "Line 2 has the same instant (2026-07-14T10:00:00Z) with 4.5 °C; this line says 4.7 °C. Keep one of the two." },
    ]);
  });

  it("reads a logger's local time in its zone, and a value with its own offset as written", () => {
    const { readings } = readText("Time,Temp\n14/07/2026 15:40,4\n14/07/2026 15:45:00+00:00,4\n15/01/2026 08:00,4\n", { dateOrder: "dmy", timeZone: "Europe/Berlin" });
    expect(readings.map(iso)).toEqual(["2026-07-14T13:40:00.000Z", "2026-07-14T15:45:00.000Z", "2026-01-15T07:00:00.000Z"]);
  });

  it("reads a file in time order through the repeated hour of 25 October 2026 in Berlin as two passes", () => {
    const local = ["01:30", "02:00", "02:30", "02:59", "02:00", "02:30", "02:59", "03:00"];
    const text = "Time,Temp\n" + local.map((t) => `2026-10-25 ${t},4`).join("\n");
    const { readings, errors } = readText(text, { timeZone: "Europe/Berlin" });
    expect(errors).toEqual([]);
    expect(readings.map(iso)).toEqual([
      "2026-10-24T23:30:00.000Z",
      "2026-10-25T00:00:00.000Z", // first pass, +02:00
      "2026-10-25T00:30:00.000Z",
      "2026-10-25T00:59:00.000Z",
      "2026-10-25T01:00:00.000Z", // second pass, +01:00
      "2026-10-25T01:30:00.000Z",
      "2026-10-25T01:59:00.000Z",
      "2026-10-25T02:00:00.000Z",
    ]);
  });

  it("takes the first occurrence for a repeated-hour time standing alone", () => {
    const { readings } = readText("Time,Temp\n2026-11-01 01:30,4\n", { timeZone: "America/New_York" });
    expect(readings.map(iso)).toEqual(["2026-11-01T05:30:00.000Z"]);
  });

  it("refuses a local time skipped when clocks went forward and names the fixed zone that fits", () => {
    const { errors } = readText("Date,Clock,Temp\n29.03.2026,02:30,4\n", { timestampColumn: undefined, dateColumn: "Date", timeColumn: "Clock", dateOrder: "dmy", timeZone: "Europe/Berlin" });
    expect(errors).toEqual([
      {
        line: 2,
        column: "Date",
        value: "29.03.2026 02:30",
        message:
          "“29.03.2026 02:30” does not exist in Europe/Berlin: clocks went forward from UTC+01:00 to UTC+02:00 at 2026-03-29T01:00:00Z. If the logger's clock ignores daylight saving time, choose the time zone “UTC+01:00 all year” (Etc/GMT-1).",
      },
    ]);
    const fixed = readText("Date,Clock,Temp\n29.03.2026,02:30,4\n", { timestampColumn: undefined, dateColumn: "Date", timeColumn: "Clock", dateOrder: "dmy", timeZone: "Etc/GMT-1" });
    expect(fixed.readings.map(iso)).toEqual(["2026-03-29T01:30:00.000Z"]);
  });

  it("refuses a mapping naming a column the file lacks, listing each", () => {
    expect(() => readText("Time,Temp\n", { temperatureColumn: "Temperature", deviceIdColumn: "Serial" })).toThrow(CsvMappingError);
    try {
      readText("Time,Temp\n", { temperatureColumn: "Temperature", deviceIdColumn: "Serial" });
    } catch (error) {
      expect((error as CsvMappingError).fields).toEqual({ temperatureColumn: ["The file has no column “Temperature”."], deviceIdColumn: ["The file has no column “Serial”."] });
    }
  });
});

describe("the mapping schema", () => {
  it("needs one timestamp column or a date and a time column, a unit column for unit 'column', and a known zone", () => {
    const issues = (input: Partial<CsvMappingInput>) => csvMappingSchema.safeParse({ ...base, ...input }).error?.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    expect(issues({})).toBeUndefined();
    expect(issues({ timestampColumn: "" })).toEqual(["timestampColumn: Choose the timestamp column (or the date and time columns)."]);
    expect(issues({ timestampColumn: undefined, dateColumn: "D" })).toEqual(["timeColumn: Choose the time column that goes with the date column."]);
    expect(issues({ unit: "column" })).toEqual(["unitColumn: Choose the column that holds the unit."]);
    expect(issues({ timeZone: "Europe/Atlantis" })).toEqual(["timeZone: Choose a time zone from the list (an IANA name such as Europe/Berlin)."]);
    expect(issues({ temperatureColumn: "Time" })).toEqual(["temperatureColumn: Column “Time” is already chosen for another purpose."]);
  });

  it("refuses instants outside the plausible window and days that do not exist, by line and column, as the logger API does", () => {
    const text = [
      "Time,Temp",
      "9999-12-31 23:00,4.5",
      "1970-01-01 00:00,4.5",
      "0001-01-01T00:00Z,4.5",
      "2026-02-30 10:00,4.5",
      "2026-12-05 12:06,4.5",
      "2026-12-05T12:04:00Z,4.5",
      "2026-12-05 10:00,-273",
      "2026-07-14 10:00:00+14:30,4.5",
    ].join("\n");
    const { readings, errors } = readText(text);
    expect(readings.map((r) => r.line)).toEqual([7]);
    expect(errors).toEqual([
      { line: 2, column: "Time", value: "9999-12-31 23:00", message: "“9999-12-31 23:00” is 9999-12-31T23:00:00Z, more than 5 minutes after the server's time (2026-12-05T12:00:00Z): is the logger's clock or its time zone wrong?" },
      { line: 3, column: "Time", value: "1970-01-01 00:00", message: "“1970-01-01 00:00” is 1970-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?" },
      { line: 4, column: "Time", value: "0001-01-01T00:00Z", message: "“0001-01-01T00:00Z” is 0001-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?" },
      { line: 5, column: "Time", value: "2026-02-30 10:00", message: "“2026-02-30 10:00” is not a date: 2026-02 has no day 30." },
      { line: 6, column: "Time", value: "2026-12-05 12:06", message: "“2026-12-05 12:06” is 2026-12-05T12:06:00Z, more than 5 minutes after the server's time (2026-12-05T12:00:00Z): is the logger's clock or its time zone wrong?" },
      { line: 8, column: "Temp", value: "-273", message: "-273 °C is outside −200 to 200 °C: an error value of the logger, or the wrong unit?" },
      { line: 9, column: "Time", value: "2026-07-14 10:00:00+14:30", message: "“2026-07-14 10:00:00+14:30” is not a time: the offset +14:30 is not a UTC offset (they run from −14:00 to +14:00)." },
    ]);
  });
});
