/**
 * How a logger file is read: which columns hold what, the unit, the date order, the time zone and
 * the file's delimiter, decimal mark and header line. One zod schema, shared by the upload page and
 * the API. Pure (safe in client code).
 */
import { z } from "zod";
import { isValidTimeZone } from "./zoned-time";

export const CSV_DELIMITERS = [",", ";", "\t"] as const;
export type CsvDelimiter = (typeof CSV_DELIMITERS)[number];
export const DELIMITER_LABELS: Record<CsvDelimiter, string> = { ",": "Comma (,)", ";": "Semicolon (;)", "\t": "Tab" };

export const UNIT_CHOICES = ["C", "F", "K", "column"] as const;
export type UnitChoice = (typeof UNIT_CHOICES)[number];

const column = (what: string) =>
  z.preprocess(
    (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
    z.string({ error: `Choose the ${what} column.` }).trim().max(200, "A column name has at most 200 characters.").optional(),
  );

export const csvMappingSchema = z
  .object({
    delimiter: z.enum(CSV_DELIMITERS, { error: "Choose the delimiter: comma, semicolon or tab." }),
    decimalSeparator: z.enum([".", ","], { error: "Choose the decimal separator: point or comma." }),
    /** File line of the header row; 0 when the file has none (columns are then named Column 1, Column 2 …). */
    headerLine: z.number({ error: "Give the header line as a number." }).int("Give the header line as a whole number.").min(0).max(10_000),
    timestampColumn: column("timestamp"),
    dateColumn: column("date"),
    timeColumn: column("time"),
    temperatureColumn: z.string({ error: "Choose the temperature column." }).trim().min(1, "Choose the temperature column.").max(200),
    unit: z.enum(UNIT_CHOICES, { error: "Choose the unit: °C, °F, K, or a column that holds it." }),
    unitColumn: column("unit"),
    deviceIdColumn: column("device id"),
    dateOrder: z.enum(["ymd", "dmy", "mdy"], { error: "Choose the date order: year, day or month first." }),
    timeZone: z
      .string({ error: "Choose the time zone the logger's clock shows." })
      .trim()
      .refine(isValidTimeZone, "Choose a time zone from the list (an IANA name such as Europe/Berlin)."),
  })
  .superRefine((m, ctx) => {
    if (m.timestampColumn && (m.dateColumn || m.timeColumn)) {
      ctx.addIssue({ code: "custom", path: ["timestampColumn"], message: "Choose either one timestamp column or separate date and time columns, not both." });
    } else if (!m.timestampColumn && !m.dateColumn) {
      ctx.addIssue({ code: "custom", path: ["timestampColumn"], message: "Choose the timestamp column (or the date and time columns)." });
    } else if (m.dateColumn && !m.timeColumn) {
      ctx.addIssue({ code: "custom", path: ["timeColumn"], message: "Choose the time column that goes with the date column." });
    }
    if (m.unit === "column" && !m.unitColumn) ctx.addIssue({ code: "custom", path: ["unitColumn"], message: "Choose the column that holds the unit." });
    const used = [
      ["timestampColumn", m.timestampColumn],
      ["dateColumn", m.dateColumn],
      ["timeColumn", m.timeColumn],
      ["temperatureColumn", m.temperatureColumn],
      ["unitColumn", m.unit === "column" ? m.unitColumn : undefined],
      ["deviceIdColumn", m.deviceIdColumn],
    ].filter((entry): entry is [string, string] => !!entry[1]);
    const seen = new Map<string, string>();
    for (const [field, name] of used) {
      if (seen.has(name)) ctx.addIssue({ code: "custom", path: [field], message: `Column “${name}” is already chosen for another purpose.` });
      else seen.set(name, field);
    }
  });

export type CsvMapping = z.output<typeof csvMappingSchema>;
export type CsvMappingInput = z.input<typeof csvMappingSchema>;

/** What is remembered on the sensor (the time zone is kept in its own column). */
export type RememberedMapping = Partial<Record<"timestampColumn" | "dateColumn" | "timeColumn" | "temperatureColumn" | "unit" | "unitColumn" | "deviceIdColumn" | "dateOrder" | "decimalSeparator" | "delimiter", string>>;

export function toRememberedMapping(m: CsvMapping): RememberedMapping {
  const out: RememberedMapping = { temperatureColumn: m.temperatureColumn, unit: m.unit, dateOrder: m.dateOrder, decimalSeparator: m.decimalSeparator, delimiter: m.delimiter };
  if (m.timestampColumn) out.timestampColumn = m.timestampColumn;
  if (m.dateColumn) out.dateColumn = m.dateColumn;
  if (m.timeColumn) out.timeColumn = m.timeColumn;
  if (m.unit === "column" && m.unitColumn) out.unitColumn = m.unitColumn;
  if (m.deviceIdColumn) out.deviceIdColumn = m.deviceIdColumn;
  return out;
}
