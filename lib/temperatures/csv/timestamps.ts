/**
 * Dates and times as loggers write them. Pure.
 *
 * Accepted (the date order decides only the forms whose year comes last):
 * - year first, always read year-month-day: 2026-07-14T15:40:00+02:00, 2026-07-14 15:40, 2026/7/14 15:40:05.250
 * - day first (order "dmy"): 14/07/2026 15:40, 14.07.2026 15:40:00, 14-07-26 3:40 PM
 * - month first (order "mdy"): 07/14/2026 3:40:00 PM
 * Times are 24-hour, or 12-hour with AM/PM (a.m., p.m., any case). A two-digit year is 2000–2099.
 * A time may end with its own UTC offset (Z, UTC, GMT, ±hh:mm, ±hhmm, ±hh): it is used as written and
 * the chosen time zone is ignored for that value. Without one the time is local to the chosen zone.
 */
import { utcMs } from "./zoned-time";

export type DateOrder = "ymd" | "dmy" | "mdy";

export type ParsedTimestamp =
  /** The text carried its own offset: a UTC instant. */
  | { kind: "instant"; atMs: number }
  /** A local wall time, to be resolved in the chosen zone. */
  | { kind: "local"; wallMs: number };

export type TimestampResult = ParsedTimestamp | { kind: "error"; message: string };

const TIME = String.raw`(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?(?:\s*([AaPp])\.?\s*[Mm]\.?)?`;
const OFFSET = String.raw`(?:\s*(Z|UTC|GMT|[+\-−]\d{2}(?::?\d{2})?))?`;
const YEAR_FIRST = new RegExp(String.raw`^(\d{4})([-/.])(\d{1,2})\2(\d{1,2})(?:(?:T|\s+|,\s*)${TIME}${OFFSET})?$`, "i");
const YEAR_LAST = new RegExp(String.raw`^(\d{1,2})([-/.])(\d{1,2})\2(\d{4}|\d{2})(?:(?:T|\s+|,\s*)${TIME}${OFFSET})?$`, "i");
const TIME_ONLY = new RegExp(String.raw`^${TIME}${OFFSET}$`, "i");

const ORDER_EXAMPLE: Record<DateOrder, string> = {
  ymd: "2026-07-14 15:40",
  dmy: "14/07/2026 15:40",
  mdy: "07/14/2026 3:40 PM",
};

export const DATE_ORDER_LABELS: Record<DateOrder, string> = {
  ymd: "Year first (2026-07-14)",
  dmy: "Day first (14/07/2026, 14.07.2026)",
  mdy: "Month first (07/14/2026)",
};

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Gregorian calendar: a leap year is divisible by 4, except centuries not divisible by 400. */
function daysInMonth(year: number, month: number): number {
  if (month === 2 && year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0)) return 29;
  return DAYS_IN_MONTH[month - 1];
}

type DateParts = { year: number; month: number; day: number };
type TimeParts = { hour: number; minute: number; second: number; ms: number; offsetMs: number | null };

function checkDate(parts: DateParts): string | null {
  if (parts.month < 1 || parts.month > 12) return `month ${parts.month} does not exist`;
  if (parts.day < 1 || parts.day > daysInMonth(parts.year, parts.month)) return `${parts.year}-${pad(parts.month)} has no day ${parts.day}`;
  return null;
}

function pad(n: number): string {
  return String(n).padStart(2, "0");
}

/** Groups from TIME + OFFSET starting at `at` in a match. */
function timeFrom(m: RegExpMatchArray, at: number): TimeParts | string {
  let hour = Number(m[at]);
  const minute = Number(m[at + 1]);
  const second = m[at + 2] ? Number(m[at + 2]) : 0;
  const ms = m[at + 3] ? Number(m[at + 3].slice(0, 3).padEnd(3, "0")) : 0;
  const meridiem = m[at + 4]?.toLowerCase();
  if (meridiem) {
    if (hour < 1 || hour > 12) return `${hour} o'clock does not exist on a 12-hour clock`;
    hour = (hour % 12) + (meridiem === "p" ? 12 : 0);
  } else if (hour > 23) return `hour ${hour} does not exist`;
  if (minute > 59) return `minute ${minute} does not exist`;
  if (second > 59) return `second ${second} does not exist`;
  const offsetText = m[at + 5];
  let offsetMs: number | null = null;
  if (offsetText) {
    const upper = offsetText.toUpperCase();
    if (upper === "Z" || upper === "UTC" || upper === "GMT") offsetMs = 0;
    else {
      const sign = offsetText[0] === "+" ? 1 : -1;
      const digits = offsetText.slice(1).replace(":", "");
      const oh = Number(digits.slice(0, 2));
      const om = digits.length > 2 ? Number(digits.slice(2, 4)) : 0;
      if (om > 59 || oh * 60 + om > 14 * 60) return `the offset ${offsetText} is not a UTC offset (they run from −14:00 to +14:00)`;
      offsetMs = sign * (oh * 60 + om) * 60_000;
    }
  }
  return { hour, minute, second, ms, offsetMs };
}

function yearFrom(text: string): number {
  return text.length === 2 ? 2000 + Number(text) : Number(text);
}

function combine(date: DateParts, time: TimeParts): ParsedTimestamp {
  const wallMs = utcMs(date.year, date.month - 1, date.day, time.hour, time.minute, time.second, time.ms);
  return time.offsetMs === null ? { kind: "local", wallMs } : { kind: "instant", atMs: wallMs - time.offsetMs };
}

const MIDNIGHT: TimeParts = { hour: 0, minute: 0, second: 0, ms: 0, offsetMs: null };

/**
 * Reads a date with a time of day. `requireTime` false accepts a date alone (the date column of a
 * file with separate date and time columns; the time is then added by `parseDateAndTime`).
 */
function parseDateTimeParts(text: string, order: DateOrder, requireTime: boolean): { date: DateParts; time: TimeParts | null } | string {
  const value = text.trim();
  let m = YEAR_FIRST.exec(value);
  let date: DateParts;
  let timeAt: number;
  if (m) {
    date = { year: Number(m[1]), month: Number(m[3]), day: Number(m[4]) };
    timeAt = 5;
  } else {
    m = YEAR_LAST.exec(value);
    if (!m) return notADate(value, order, requireTime);
    if (order === "ymd") {
      return `“${value}” has the year last; choose the date order (day first or month first) that the logger writes.`;
    }
    const first = Number(m[1]);
    const second = Number(m[3]);
    date = order === "dmy" ? { year: yearFrom(m[4]), month: second, day: first } : { year: yearFrom(m[4]), month: first, day: second };
    timeAt = 5;
  }
  const dateProblem = checkDate(date);
  if (dateProblem) {
    const other = swapHint(m, order);
    return `“${value}” is not a date: ${dateProblem}${other}.`;
  }
  if (m[timeAt] === undefined) {
    if (requireTime) return `“${value}” has a date but no time of day; write it as, for example, ${ORDER_EXAMPLE[order]}.`;
    return { date, time: null };
  }
  const time = timeFrom(m, timeAt);
  if (typeof time === "string") return `“${value}” is not a time: ${time}.`;
  return { date, time };
}

/** When the other order would make a real date, say so: the chosen order is probably wrong. */
function swapHint(m: RegExpMatchArray, order: DateOrder): string {
  if (order === "ymd" || m[4] === undefined || m[1].length === 4) return "";
  const first = Number(m[1]);
  const second = Number(m[3]);
  const year = yearFrom(m[4]);
  const swapped = order === "dmy" ? { year, month: first, day: second } : { year, month: second, day: first };
  if (checkDate(swapped) !== null) return "";
  return order === "dmy" ? " (read month first it would be a date: is the date order month first?)" : " (read day first it would be a date: is the date order day first?)";
}

function notADate(value: string, order: DateOrder, requireTime: boolean): string {
  if (value === "") return "The date is empty.";
  const example = requireTime ? ORDER_EXAMPLE[order] : ORDER_EXAMPLE[order].split(" ")[0];
  return `“${value}” is not a date${requireTime ? " and time" : ""} Headroom can read; write it as, for example, ${example}${order === "ymd" ? "" : " or 2026-07-14 15:40"}.`;
}

// ---------------------------------------------------------------------------------------------
// Fast paths for the fixed-width forms machines write (2026-07-14 15:40:00, 14.07.2026, 15:40:00):
// the same answers as the regular expressions below, a few times quicker per row. Anything else,
// and anything invalid (so that the message is the usual one), goes the regular way.
// ---------------------------------------------------------------------------------------------

function twoDigits(s: string, i: number): number {
  const a = s.charCodeAt(i) - 48;
  const b = s.charCodeAt(i + 1) - 48;
  return a >= 0 && a <= 9 && b >= 0 && b <= 9 ? a * 10 + b : -1;
}

/** A 10-character date at `i` (yyyy-mm-dd, or dd.mm.yyyy / mm/dd/yyyy by the order), or null. */
function fastDate(s: string, i: number, order: DateOrder): DateParts | null {
  const c4 = s.charCodeAt(i + 4);
  if ((c4 === 45 || c4 === 47) && s.charCodeAt(i + 7) === c4) {
    const hi = twoDigits(s, i);
    const lo = twoDigits(s, i + 2);
    if (hi < 0 || lo < 0) return null;
    const month = twoDigits(s, i + 5);
    const day = twoDigits(s, i + 8);
    if (month < 0 || day < 0) return null;
    const date = { year: hi * 100 + lo, month, day };
    return checkDate(date) === null ? date : null;
  }
  const c2 = s.charCodeAt(i + 2);
  if (order === "ymd" || !(c2 === 46 || c2 === 47 || c2 === 45) || s.charCodeAt(i + 5) !== c2) return null;
  const first = twoDigits(s, i);
  const second = twoDigits(s, i + 3);
  const hi = twoDigits(s, i + 6);
  const lo = twoDigits(s, i + 8);
  if (first < 0 || second < 0 || hi < 0 || lo < 0) return null;
  const year = hi * 100 + lo;
  const date = order === "dmy" ? { year, month: second, day: first } : { year, month: first, day: second };
  return checkDate(date) === null ? date : null;
}

/** hh:mm or hh:mm:ss (24-hour) at `i` to the end of the text, as ms of the day, or -1. */
function fastTimeMs(s: string, i: number): number {
  const length = s.length - i;
  if ((length !== 5 && length !== 8) || s.charCodeAt(i + 2) !== 58) return -1;
  const hour = twoDigits(s, i);
  const minute = twoDigits(s, i + 3);
  let second = 0;
  if (length === 8) {
    if (s.charCodeAt(i + 5) !== 58) return -1;
    second = twoDigits(s, i + 6);
  }
  if (hour < 0 || hour > 23 || minute < 0 || minute > 59 || second < 0 || second > 59) return -1;
  return ((hour * 60 + minute) * 60 + second) * 1000;
}

function fastTimestamp(s: string, order: DateOrder): ParsedTimestamp | null {
  if (s.length !== 16 && s.length !== 19) return null;
  const sep = s.charCodeAt(10);
  if (sep !== 32 && sep !== 84) return null;
  const date = fastDate(s, 0, order);
  if (!date) return null;
  const timeMs = fastTimeMs(s, 11);
  if (timeMs < 0) return null;
  return { kind: "local", wallMs: utcMs(date.year, date.month - 1, date.day) + timeMs };
}

/** A timestamp column: date and time in one value. */
export function parseTimestamp(text: string, order: DateOrder): TimestampResult {
  const fast = fastTimestamp(text, order);
  if (fast) return fast;
  if (text.trim() === "") return { kind: "error", message: "The timestamp is empty." };
  const parts = parseDateTimeParts(text, order, true);
  if (typeof parts === "string") return { kind: "error", message: parts };
  return combine(parts.date, parts.time ?? MIDNIGHT);
}

/** Separate date and time columns. The date column may itself hold a time, then the time column must be empty. */
export function parseDateAndTime(dateText: string, timeText: string, order: DateOrder): TimestampResult | { kind: "error"; message: string; column: "date" | "time" } {
  if (dateText.length === 10) {
    const date = fastDate(dateText, 0, order);
    const timeMs = date ? fastTimeMs(timeText, 0) : -1;
    if (date && timeMs >= 0) return { kind: "local", wallMs: utcMs(date.year, date.month - 1, date.day) + timeMs };
  }
  if (dateText.trim() === "") return { kind: "error", column: "date", message: "The date is empty." };
  const parts = parseDateTimeParts(dateText, order, false);
  if (typeof parts === "string") return { kind: "error", column: "date", message: parts };
  const timeValue = timeText.trim();
  if (parts.time) {
    if (timeValue !== "") return { kind: "error", column: "time", message: `The date column already holds a time of day; the time column should then be empty, not “${timeValue}”.` };
    return combine(parts.date, parts.time);
  }
  if (timeValue === "") return { kind: "error", column: "time", message: "The time is empty." };
  const m = TIME_ONLY.exec(timeValue);
  if (!m) return { kind: "error", column: "time", message: `“${timeValue}” is not a time of day; write it as 15:40, 15:40:05 or 3:40 PM.` };
  const time = timeFrom(m, 1);
  if (typeof time === "string") return { kind: "error", column: "time", message: `“${timeValue}” is not a time: ${time}.` };
  return combine(parts.date, time);
}

/**
 * What the dates in a sample say about the order: year first, or a first number above 12 (day
 * first), or a second number above 12 (month first). Null when the sample cannot tell.
 */
export function guessDateOrder(values: readonly string[]): DateOrder | null {
  let yearFirst = 0;
  let dayFirst = false;
  let monthFirst = false;
  let dotted = 0;
  let yearLast = 0;
  for (const raw of values) {
    const value = raw.trim();
    if (YEAR_FIRST.test(value)) {
      yearFirst++;
      continue;
    }
    const m = YEAR_LAST.exec(value);
    if (!m) continue;
    yearLast++;
    if (m[2] === ".") dotted++;
    if (Number(m[1]) > 12) dayFirst = true;
    if (Number(m[3]) > 12) monthFirst = true;
  }
  if (yearFirst > 0 && yearLast === 0) return "ymd";
  if (dayFirst && !monthFirst) return "dmy";
  if (monthFirst && !dayFirst) return "mdy";
  // Dotted dates (14.07.2026) are written day first where they are used.
  if (yearLast > 0 && dotted === yearLast && !monthFirst) return "dmy";
  return null;
}

/** The value parses as a date with a time (any order), for guessing which column holds what. */
export function looksLikeDateTime(value: string): boolean {
  const v = value.trim();
  const m = YEAR_FIRST.exec(v) ?? YEAR_LAST.exec(v);
  return !!m && m[5] !== undefined;
}

export function looksLikeDate(value: string): boolean {
  const v = value.trim();
  const m = YEAR_FIRST.exec(v) ?? YEAR_LAST.exec(v);
  return !!m && m[5] === undefined;
}

export function looksLikeTime(value: string): boolean {
  return TIME_ONLY.test(value.trim());
}

/** The text's own UTC offset is present (then the time zone does not apply to it). */
export function hasOwnOffset(value: string, order: DateOrder = "ymd"): boolean {
  const result = parseTimestamp(value, order);
  return result.kind === "instant";
}
