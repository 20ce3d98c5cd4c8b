/**
 * One data row of a logger file to one reading (UTC instant, °C), or every problem of the row by
 * file line and column name. Pure; rows are read in file order because of the rule for the repeated
 * hour when clocks go back:
 *
 * An ambiguous local time takes its first occurrence (the earlier UTC instant, i.e. the offset in
 * force before the change) unless that instant is before the previous row's: a file in time order
 * that has already passed through the repeated hour once is then in its second pass, and the later
 * instant is taken. A local time skipped when clocks go forward is an error naming the fixed-offset
 * zone that would fit a logger that ignores daylight saving time.
 */
import type { TemperatureUnit } from "../units";
import type { CsvMapping } from "./mapping";
import { parseDateAndTime, parseTimestamp, type TimestampResult } from "./timestamps";
import { DEFAULT_READING_LIMITS, formatTempLimitC, instantProblem, type ReadingLimits } from "../plausible";
import { readTemperature, readUnit, storedTempC, UNIT_LABELS } from "./values";
import { fixedOffsetZoneFor, formatOffset, ZonedClock } from "./zoned-time";

export type CsvRowError = { line: number; column: string; value: string; message: string };
export type CsvReading = { line: number; atMs: number; tempC: number };

/** The mapping names columns the file does not have (or has twice). */
export class CsvMappingError extends Error {
  constructor(
    message: string,
    readonly fields: Record<string, string[]>,
  ) {
    super(message);
  }
}

/** Header names for a file without a header row. */
export function numberedHeaders(count: number): string[] {
  return Array.from({ length: count }, (_, i) => `Column ${i + 1}`);
}

const MAX_VALUE_CHARS = 200;

function clip(value: string): string {
  return value.length > MAX_VALUE_CHARS ? `${value.slice(0, MAX_VALUE_CHARS)}…` : value;
}

function formatUtc(atMs: number): string {
  return new Date(atMs).toISOString().replace(".000Z", "Z");
}

export type RowReader = {
  /** The reading, or null with the row's problems appended to `errors`. */
  read(cells: readonly string[], line: number, errors: CsvRowError[]): CsvReading | null;
  /** The row's time as written (the timestamp cell, or the date and time cells). */
  timeText(cells: readonly string[]): string;
  /** The row's temperature cell as written (with a unit cell after it, when the unit has a column). */
  temperatureText(cells: readonly string[]): string;
  /** The column errors about the row's time are reported under. */
  readonly timeColumn: string;
};

/**
 * `plausible`: the window of instants and the range of temperatures a reading must be in (the
 * same as the logger API's; see lib/temperatures/plausible.ts), and the server's time the window
 * ends from.
 */
export function createRowReader(
  headers: readonly string[],
  mapping: CsvMapping,
  expectedDeviceId: string | null,
  plausible: { limits: ReadingLimits; nowMs: number } = { limits: DEFAULT_READING_LIMITS, nowMs: Date.now() },
): RowReader {
  const { limits, nowMs } = plausible;
  const fields: Record<string, string[]> = {};
  const indexOf = (field: string, name: string | undefined): number => {
    if (!name) return -1;
    let at = headers.reduce<number[]>((found, h, i) => (h.trim() === name ? [...found, i] : found), []);
    if (at.length === 0) at = headers.reduce<number[]>((found, h, i) => (h.trim().toLowerCase() === name.toLowerCase() ? [...found, i] : found), []);
    if (at.length === 0) fields[field] = [`The file has no column “${name}”.`];
    else if (at.length > 1) fields[field] = [`The file has ${at.length} columns named “${name}”; rename them so each name appears once.`];
    return at.length === 1 ? at[0] : -1;
  };
  const timestampAt = indexOf("timestampColumn", mapping.timestampColumn);
  const dateAt = indexOf("dateColumn", mapping.dateColumn);
  const timeAt = indexOf("timeColumn", mapping.timeColumn);
  const temperatureAt = indexOf("temperatureColumn", mapping.temperatureColumn);
  const unitAt = mapping.unit === "column" ? indexOf("unitColumn", mapping.unitColumn) : -1;
  const deviceAt = indexOf("deviceIdColumn", mapping.deviceIdColumn);
  if (Object.keys(fields).length) {
    throw new CsvMappingError(Object.values(fields).flat().join(" "), fields);
  }

  const clock = new ZonedClock(mapping.timeZone);
  const fixedUnit: TemperatureUnit | null = mapping.unit === "column" ? null : mapping.unit;
  const timeColumnName = mapping.timestampColumn ?? mapping.dateColumn!;
  let previousAtMs = -Infinity;
  let lastUnitText: string | null = null;
  let lastUnit: TemperatureUnit | null = null;

  function instantOf(result: TimestampResult, text: string): { atMs: number } | { message: string } {
    if (result.kind === "error") return { message: result.message };
    if (result.kind === "instant") return { atMs: result.atMs };
    const resolved = clock.resolve(result.wallMs);
    if (resolved.kind === "unique") return { atMs: resolved.atMs };
    if (resolved.kind === "ambiguous") {
      return { atMs: resolved.earlierAtMs >= previousAtMs || resolved.laterAtMs < previousAtMs ? resolved.earlierAtMs : resolved.laterAtMs };
    }
    const fixed = fixedOffsetZoneFor(resolved.offsetBeforeMs);
    return {
      message:
        `“${text}” does not exist in ${mapping.timeZone}: clocks went forward from UTC${formatOffset(resolved.offsetBeforeMs)} to ` +
        `UTC${formatOffset(resolved.offsetAfterMs)} at ${formatUtc(resolved.changeAtMs)}. If the logger's clock ignores daylight saving time, ` +
        (fixed ? `choose the time zone “UTC${formatOffset(resolved.offsetBeforeMs)} all year” (${fixed}).` : "choose a fixed-offset time zone."),
    };
  }

  function inWindow(outcome: { atMs: number } | { message: string }, text: string): { atMs: number } | { message: string } {
    if (!("atMs" in outcome)) return outcome;
    const problem = instantProblem(outcome.atMs, limits, nowMs);
    return problem ? { message: `“${clip(text)}” ${problem}` } : outcome;
  }

  const cellOf = (cells: readonly string[], at: number) => (at >= 0 && at < cells.length ? cells[at].trim() : "");

  return {
    timeColumn: timeColumnName,
    timeText: (cells) => (timestampAt >= 0 ? cellOf(cells, timestampAt) : `${cellOf(cells, dateAt)} ${cellOf(cells, timeAt)}`),
    temperatureText: (cells) => (unitAt >= 0 ? `${cellOf(cells, temperatureAt)} ${cellOf(cells, unitAt)}` : cellOf(cells, temperatureAt)),
    read(cells, line, errors) {
      const before = errors.length;

      let atMs: number | null = null;
      if (timestampAt >= 0) {
        const text = cellOf(cells, timestampAt);
        const outcome = inWindow(instantOf(parseTimestamp(text, mapping.dateOrder), text), text);
        if ("atMs" in outcome) atMs = outcome.atMs;
        else errors.push({ line, column: timeColumnName, value: clip(text), message: outcome.message });
      } else {
        const dateText = cellOf(cells, dateAt);
        const timeText = cellOf(cells, timeAt);
        const result = parseDateAndTime(dateText, timeText, mapping.dateOrder);
        if (result.kind === "error") {
          const isTime = "column" in result && result.column === "time";
          errors.push({ line, column: isTime ? mapping.timeColumn! : mapping.dateColumn!, value: clip(isTime ? timeText : dateText), message: result.message });
        } else {
          const outcome = inWindow(instantOf(result, `${dateText} ${timeText}`), `${dateText} ${timeText}`);
          if ("atMs" in outcome) atMs = outcome.atMs;
          else errors.push({ line, column: mapping.dateColumn!, value: clip(`${dateText} ${timeText}`), message: outcome.message });
        }
      }

      let unit: TemperatureUnit | null = fixedUnit;
      if (unitAt >= 0) {
        const text = cellOf(cells, unitAt);
        // A unit column usually holds one value all the way down.
        if (text !== lastUnitText) {
          lastUnitText = text;
          lastUnit = readUnit(text);
        }
        unit = lastUnit;
        if (!unit) {
          errors.push({
            line,
            column: mapping.unitColumn!,
            value: clip(text),
            message: text === "" ? "The unit is empty; write °C, °F or K." : `“${text}” is not a temperature unit; write °C, °F or K.`,
          });
        }
      }

      let tempC: number | null = null;
      const temperatureText = cellOf(cells, temperatureAt);
      const temperature = readTemperature(temperatureText, mapping.decimalSeparator);
      if (!temperature.ok) {
        errors.push({ line, column: mapping.temperatureColumn, value: clip(temperatureText), message: temperature.message });
      } else if (temperature.unit && unit && temperature.unit !== unit) {
        errors.push({
          line,
          column: mapping.temperatureColumn,
          value: clip(temperatureText),
          message: `The value is written in ${UNIT_LABELS[temperature.unit]} but the unit ${unitAt >= 0 ? "column says" : "chosen is"} ${UNIT_LABELS[unit]}.`,
        });
      } else if (unit) {
        tempC = storedTempC(temperature.value, unit);
        if (!(tempC >= limits.minTempC && tempC <= limits.maxTempC)) {
          const asC = unit === "C" ? "" : ` (${tempC.toFixed(1)} °C)`;
          errors.push({
            line,
            column: mapping.temperatureColumn,
            value: clip(temperatureText),
            message: `${temperatureText} ${UNIT_LABELS[unit]}${asC} is outside ${formatTempLimitC(limits.minTempC)} to ${formatTempLimitC(limits.maxTempC)} °C: an error value of the logger, or the wrong unit?`,
          });
          tempC = null;
        }
      }

      if (deviceAt >= 0 && expectedDeviceId !== null) {
        const text = cellOf(cells, deviceAt);
        if (text !== expectedDeviceId) {
          errors.push({
            line,
            column: mapping.deviceIdColumn!,
            value: clip(text),
            message: text === "" ? `The device id is empty; this sensor's is “${expectedDeviceId}”.` : `Device id “${clip(text)}” is not this sensor's (“${expectedDeviceId}”): the row comes from another logger.`,
          });
        }
      }

      if (atMs !== null) previousAtMs = atMs;
      if (errors.length > before || atMs === null || tempC === null) return null;
      return { line, atMs, tempC };
    },
  };
}

/**
 * Checks instants seen twice in one file: the same instant with the same temperature counts once;
 * with a different temperature it is an error on the later line, naming the earlier one. The
 * server keeps the instants in an SQLite table; tests use the in-memory one.
 */
export type InstantIndex = {
  /** Null when the instant is new (and is now recorded); else the earlier line and temperature. */
  add(reading: CsvReading): { line: number; tempC: number } | null;
};

export function createMemoryInstantIndex(): InstantIndex {
  const seen = new Map<number, { line: number; tempC: number }>();
  return {
    add(reading) {
      const earlier = seen.get(reading.atMs);
      if (earlier) return earlier;
      seen.set(reading.atMs, { line: reading.line, tempC: reading.tempC });
      return null;
    },
  };
}

export function duplicateError(reading: CsvReading, earlier: { line: number; tempC: number }, column: string, value: string): CsvRowError {
  return {
    line: reading.line,
    column,
    value: clip(value),
    message: `Line ${earlier.line} has the same instant (${formatUtc(reading.atMs)}) with ${earlier.tempC} °C; this line says ${reading.tempC} °C. Keep one of the two.`,
  };
}
