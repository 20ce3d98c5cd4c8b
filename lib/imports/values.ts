/**
 * Readers for single cells. Each returns the typed value or a message for the person fixing the
 * spreadsheet. Empty cells are handled by the caller (required or default), never here.
 */

export type Read<T> = { ok: true; value: T } | { ok: false; message: string };

const ok = <T>(value: T): Read<T> => ({ ok: true, value });
const fail = (message: string): Read<never> => ({ ok: false, message });

/** Numbers in messages are shown with a true minus sign, as everywhere in Headroom. */
export function showNumber(value: number): string {
  return String(value).replace("-", "−");
}

// ---------------------------------------------------------------------------------------------
// Numbers
// ---------------------------------------------------------------------------------------------

const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * A decimal number with a dot as the decimal mark. Commas are refused rather than guessed: "1,500"
 * is 1.5 in much of Europe and 1500 in English-speaking countries, and a factor of 1000 in a
 * quantity is not a mistake a hazard register may make quietly. The message says what to write.
 */
export function readNumber(raw: string): Read<number> {
  const text = raw.trim().replace(/^\u2212/, "-");
  if (PLAIN_NUMBER.test(text)) {
    const value = Number(text);
    if (Number.isFinite(value)) return ok(value);
    return fail(`“${raw}” is too large to be a quantity.`);
  }
  if (text.includes(",")) {
    const single = text.match(/^([+-]?\d+),(\d+)$/);
    if (single) {
      const [, whole, part] = single;
      const asDecimal = `${whole}.${part}`;
      const hint =
        part.length === 3
          ? `write ${asDecimal} or ${whole}${part}, whichever is meant`
          : `write ${asDecimal}`;
      return fail(
        `Use a dot as the decimal mark: ${hint}. Commas are not accepted because 1,500 can mean 1.5 or 1500.`,
      );
    }
    if (/^[+-]?\d{1,3}(,\d{3})+(\.\d+)?$/.test(text)) {
      return fail(`Leave out thousands separators: write ${text.replace(/,/g, "")}.`);
    }
    return fail(`“${raw}” is not a number. Use digits with a dot as the decimal mark, e.g. 2.5.`);
  }
  if (/^[+-]?(\d+\.?\d*|\.\d+)\s*[^\d\s.,]/.test(text)) {
    return fail(`“${raw}” is not a number: give the number alone and put the unit in its own column.`);
  }
  return fail(`“${raw}” is not a number. Use digits with a dot as the decimal mark, e.g. 2.5.`);
}

// ---------------------------------------------------------------------------------------------
// Dates
// ---------------------------------------------------------------------------------------------

const DAY_MS = 86_400_000;

function utcDate(year: number, month: number, day: number): number | undefined {
  const ms = Date.UTC(year, month - 1, day);
  const d = new Date(ms);
  if (d.getUTCFullYear() !== year || d.getUTCMonth() !== month - 1 || d.getUTCDate() !== day) return undefined;
  return ms;
}

const pad = (n: number) => String(n).padStart(2, "0");
const isoOf = (year: number, month: number, day: number) => `${year}-${pad(month)}-${pad(day)}`;

/**
 * A calendar date, stored as UTC midnight in epoch milliseconds. Accepted: YYYY-MM-DD (what the
 * parser also produces from real date cells in a workbook), the same with a time of day (the time is
 * dropped), and year-first forms like 2026/4/3. Day-first and month-first forms are refused: 03/04/2026
 * is 3 April in one country and 4 March in another.
 */
export function readDate(raw: string): Read<number> {
  const text = raw.trim();
  const yearFirst = text.match(/^(\d{4})[-/.](\d{1,2})[-/.](\d{1,2})(?:[T ]\d{1,2}:\d{2}(?::\d{2}(?:\.\d+)?)?Z?)?$/);
  if (yearFirst) {
    const [year, month, day] = yearFirst.slice(1, 4).map(Number);
    const ms = utcDate(year, month, day);
    if (ms === undefined) return fail(`${text} is not a date on the calendar (check the month and day).`);
    if (year < 1900 || year > 2199) return fail(`${text} is outside the years 1900–2199; check the year.`);
    return ok(ms);
  }
  const dayOrMonthFirst = text.match(/^(\d{1,2})[-/.](\d{1,2})[-/.](\d{2}|\d{4})$/);
  if (dayOrMonthFirst) {
    const [a, b, y] = dayOrMonthFirst.slice(1, 4).map(Number);
    const year = y < 100 ? 2000 + y : y;
    const asDayFirst = utcDate(year, b, a) !== undefined ? isoOf(year, b, a) : undefined;
    const asMonthFirst = utcDate(year, a, b) !== undefined ? isoOf(year, a, b) : undefined;
    const base = `Write dates as YYYY-MM-DD`;
    if (asDayFirst && asMonthFirst && asDayFirst !== asMonthFirst) {
      return fail(`${base}: ${text} could be ${asDayFirst} or ${asMonthFirst}.`);
    }
    const only = asDayFirst ?? asMonthFirst;
    return fail(only ? `${base}; did you mean ${only}?` : `${base}; ${text} is not a date on the calendar.`);
  }
  if (/^\d{4,6}(\.\d+)?$/.test(text)) {
    // Serial day numbers from a spreadsheet (days since 1899-12-30).
    const serial = Number(text);
    const guess = new Date(Date.UTC(1899, 11, 30) + Math.floor(serial) * DAY_MS).toISOString().slice(0, 10);
    return fail(
      `${text} looks like a spreadsheet day number, not a date (it would be ${guess}). ` +
        "Format the column as a date, or write YYYY-MM-DD.",
    );
  }
  return fail(`“${raw}” is not a date. Write dates as YYYY-MM-DD, e.g. 2026-04-03.`);
}

// ---------------------------------------------------------------------------------------------
// Yes/no and choices
// ---------------------------------------------------------------------------------------------

const TRUE_WORDS = new Set(["yes", "true", "1", "y"]);
const FALSE_WORDS = new Set(["no", "false", "0", "n"]);

export function readYesNo(raw: string): Read<boolean> {
  const text = raw.trim().toLowerCase();
  if (TRUE_WORDS.has(text)) return ok(true);
  if (FALSE_WORDS.has(text)) return ok(false);
  return fail(`Write yes or no; got “${raw}”.`);
}

/** "In use" / "in-use" / "IN_USE" → "in_use". */
export function normalizeChoice(raw: string): string {
  return raw.trim().toLowerCase().replace(/[\s-]+/g, "_");
}

export function readChoice<T extends string>(raw: string, choices: readonly T[], what: string): Read<T> {
  const key = normalizeChoice(raw);
  const found = choices.find((c) => c === key);
  if (found) return ok(found);
  return fail(`Unknown ${what} “${raw}”; use one of: ${choices.join(", ")}.`);
}

// ---------------------------------------------------------------------------------------------
// CAS numbers
// ---------------------------------------------------------------------------------------------

/**
 * CAS Registry Number check digit: the digits before it, each multiplied by its position counted
 * from the right (1, 2, 3 …), summed, modulo 10. Published by CAS, "CAS Registry Number" format
 * description (cas.org).
 */
export function casCheckDigit(digitsBeforeCheck: string): number {
  let sum = 0;
  const reversed = [...digitsBeforeCheck].reverse();
  reversed.forEach((d, i) => {
    sum += Number(d) * (i + 1);
  });
  return sum % 10;
}

/** A valid CAS number in its standard hyphenated form; digits without hyphens are accepted too. */
export function readCas(raw: string): Read<string> {
  const text = raw.trim();
  let parts: [string, string, string] | undefined;
  const hyphenated = text.match(/^(\d{2,7})-(\d{2})-(\d)$/);
  if (hyphenated) parts = [hyphenated[1], hyphenated[2], hyphenated[3]];
  else if (/^\d{5,10}$/.test(text)) parts = [text.slice(0, -3), text.slice(-3, -1), text.slice(-1)];
  if (!parts) {
    const looksLikeDate = /^\d{4}-\d{2}-\d{2}/.test(text);
    return fail(
      looksLikeDate
        ? `“${text}” is a date, not a CAS number: the spreadsheet probably turned the CAS number into a date. ` +
            "Format the column as text and type the number again."
        : `“${text}” is not a CAS number; CAS numbers look like 67-64-1 (2–7 digits, 2 digits, 1 check digit).`,
    );
  }
  const [head, middle, check] = parts;
  const formatted = `${head}-${middle}-${check}`;
  const expected = casCheckDigit(head + middle);
  if (Number(check) !== expected) {
    return fail(
      `CAS number ${formatted} is not valid: its check digit should be ${expected} — ` +
        `did you mean ${head}-${middle}-${expected}? Otherwise another digit is mistyped.`,
    );
  }
  return ok(formatted);
}

// ---------------------------------------------------------------------------------------------
// Text
// ---------------------------------------------------------------------------------------------

/** Names are matched with runs of spaces collapsed; case is left to the lookup. */
export function collapseSpaces(raw: string): string {
  return raw.trim().replace(/\s+/g, " ");
}

const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

export function readEmail(raw: string): Read<string> {
  const text = raw.trim().replace(/^mailto:/i, "").toLowerCase();
  if (EMAIL.test(text)) return ok(text);
  return fail(`“${raw}” is not an e-mail address.`);
}

// ---------------------------------------------------------------------------------------------
// Quantities with a range
// ---------------------------------------------------------------------------------------------

export type NumberRange = {
  /** What the number is, for messages: "Floor area". */
  label: string;
  /** Unit symbol for messages, e.g. "m²", "°C"; empty for pure numbers. */
  unit: string;
  min?: number;
  max?: number;
  /** The minimum itself is not allowed (e.g. area > 0). */
  minExclusive?: boolean;
  integer?: boolean;
};

function describeRange(r: NumberRange): string {
  const u = (n: number) => `${showNumber(n)}${r.unit === "" ? "" : ` ${r.unit}`}`;
  if (r.min !== undefined && r.max !== undefined) {
    return r.minExclusive ? `more than ${u(r.min)} and at most ${u(r.max)}` : `between ${u(r.min)} and ${u(r.max)}`;
  }
  if (r.min !== undefined) return r.minExclusive ? `more than ${u(r.min)}` : `${u(r.min)} or more`;
  if (r.max !== undefined) return `at most ${u(r.max)}`;
  return "a number";
}

export function readNumberInRange(raw: string, range: NumberRange): Read<number> {
  const read = readNumber(raw);
  if (!read.ok) return read;
  const value = read.value;
  const below = range.min !== undefined && (range.minExclusive ? value <= range.min : value < range.min);
  const above = range.max !== undefined && value > range.max;
  if (below || above) {
    return fail(`${range.label} must be ${describeRange(range)}; got ${showNumber(value)}.`);
  }
  if (range.integer && !Number.isInteger(value)) {
    return fail(`${range.label} must be a whole number; got ${showNumber(value)}.`);
  }
  return read;
}
