import { describe, expect, it } from "vitest";
import { detectLayout } from "@/lib/temperatures/csv/detect";

describe("layout detection from the start of a logger file", () => {
  it("finds the delimiter, the decimal comma and the header below an information block", () => {
    const text = [
      "Device type;Cold-store logger",
      "Serial number;LOG-CR2",
      "Calibration date;2026-01-12",
      "",
      "Date;Time;Temperature;Unit;Serial",
      "14.07.2026;10:00:00;4,5;°C;LOG-CR2",
      "14.07.2026;10:00:30;4,6;°C;LOG-CR2",
      "14.07.2026;10:01:00;-0,1;°C;LOG-CR2",
    ].join("\r\n");
    const layout = detectLayout(text, true);
    expect(layout).toMatchObject({
      delimiter: ";",
      decimalSeparator: ",",
      headerLine: 5,
      headers: ["Date", "Time", "Temperature", "Unit", "Serial"],
      suggested: { dateColumn: "Date", timeColumn: "Time", temperatureColumn: "Temperature", unit: "column", unitColumn: "Unit", deviceIdColumn: "Serial", dateOrder: "dmy" },
      timestampsHaveOffset: false,
    });
    expect(layout.sampleRows.map((r) => r.line)).toEqual([6, 7, 8]);
    expect(layout.sampleLines[1]).toEqual({ line: 2, text: "Serial number;LOG-CR2" });
  });

  it("reads a comma file with ISO timestamps, a unit in the header and a record counter", () => {
    const text = "#,Timestamp,Temperature (°F),Battery\n1,2026-07-14T10:00:00Z,40.1,3.1\n2,2026-07-14T10:05:00Z,40.3,3.1\n";
    expect(detectLayout(text, true)).toMatchObject({
      delimiter: ",",
      decimalSeparator: ".",
      headerLine: 1,
      suggested: { timestampColumn: "Timestamp", temperatureColumn: "Temperature (°F)", unit: "F", dateOrder: "ymd" },
      timestampsHaveOffset: true,
    });
  });

  it("names the columns Column 1, Column 2 … when the file has no header row", () => {
    const layout = detectLayout("2026-07-14 10:00\t4.5\n2026-07-14 10:01\t4.4\n", true);
    expect(layout).toMatchObject({ delimiter: "\t", headerLine: 0, headers: ["Column 1", "Column 2"], suggested: { timestampColumn: "Column 1", temperatureColumn: "Column 2" } });
  });

  it("leaves out the last line of a head cut from a longer file", () => {
    const layout = detectLayout("Time,Temp\n2026-07-14 10:00,4.5\n2026-07-14 10:0");
    expect(layout.sampleRows).toHaveLength(1);
    expect(layout.sampleLines).toHaveLength(2);
  });
});
