/**
 * What a stored temperature reading may be: a real instant in a window (not before a configured
 * earliest date, not more than a few minutes ahead of the server's clock) and a finite temperature
 * in the configured physical range. Pure: the limits come from lib/config.ts `readingLimits()`.
 *
 * One range for every sensor, whatever its location's kind. A narrower default per kind (2–8 °C
 * for a refrigerator, −90…−60 °C for a −80 °C freezer) would refuse exactly the readings that
 * matter: a refrigerator that fails reads the room's temperature, a freezer left open warms to it,
 * a fire heats any room. The set range and the excursion threshold judge those readings; this
 * range only catches what no sensor in storage reads — a logger's error value (−273, 999.9), a wrong
 * unit, a corrupted message.
 */
export type ReadingLimits = { earliestMs: number; maxFutureMs: number; minTempC: number; maxTempC: number };

export const DEFAULT_READING_LIMITS: ReadingLimits = {
  earliestMs: Date.UTC(2000, 0, 1),
  maxFutureMs: 5 * 60_000,
  minTempC: -200,
  maxTempC: 200,
};

/** ISO-8601 with an explicit offset: date, time to the minute at least, then Z or ±hh:mm. */
const ISO_WITH_OFFSET = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?(?:(Z)|([+-])(\d{2}):(\d{2}))$/;

/** UTC offsets in use run from −12:00 to +14:00; ±14:00 is the bound both ways. */
const MAX_OFFSET_MINUTES = 14 * 60;

export type InstantResult = { ok: true; atMs: number } | { ok: false; message: string };

/** "2026-07-14T13:40:00Z" (whole seconds shown without milliseconds). */
export function formatInstantUtc(atMs: number): string {
  return new Date(atMs).toISOString().replace(".000Z", "Z");
}

/**
 * Reads an ISO-8601 instant with its offset strictly: every field in its calendar range (no
 * 2026-02-30, month 13, 24:00 or second 60), the offset within ±14:00, and the fields read back
 * from the computed instant equal to those written (so nothing rolls over into the next month).
 */
export function parseOffsetInstant(text: string): InstantResult {
  const m = ISO_WITH_OFFSET.exec(text);
  if (!m) return { ok: false, message: "must be ISO-8601 with an offset (Z or ±hh:mm), e.g. 2026-07-14T15:40:00+02:00." };
  const [year, month, day, hour, minute] = [1, 2, 3, 4, 5].map((i) => Number(m[i]));
  const second = m[6] ? Number(m[6]) : 0;
  const ms = m[7] ? Number(m[7].slice(0, 3).padEnd(3, "0")) : 0;
  if (month < 1 || month > 12) return { ok: false, message: `is not a real date: month ${month} does not exist.` };
  if (hour > 23 || minute > 59 || second > 59) return { ok: false, message: `is not a real time of day: ${m[4]}:${m[5]}${m[6] ? `:${m[6]}` : ""} (hours run 00–23, minutes and seconds 00–59).` };
  let offsetMinutes = 0;
  if (!m[8]) {
    const oh = Number(m[10]);
    const om = Number(m[11]);
    if (om > 59 || oh * 60 + om > MAX_OFFSET_MINUTES) return { ok: false, message: `has the offset ${m[9]}${m[10]}:${m[11]}, beyond ±14:00: no place on Earth uses it.` };
    offsetMinutes = (m[9] === "+" ? 1 : -1) * (oh * 60 + om);
  }
  // setUTCFullYear, not Date.UTC: Date.UTC reads the years 0–99 as 1900–1999.
  const wall = new Date(0);
  wall.setUTCFullYear(year, month - 1, day);
  wall.setUTCHours(hour, minute, second, ms);
  if (wall.getUTCFullYear() !== year || wall.getUTCMonth() !== month - 1 || wall.getUTCDate() !== day) {
    return { ok: false, message: `is not a real date: ${m[1]}-${m[2]} has no day ${day}.` };
  }
  return { ok: true, atMs: wall.getTime() - offsetMinutes * 60_000 };
}

/** Null when the instant is inside the window, else why not (a sentence without a subject). */
export function instantProblem(atMs: number, limits: ReadingLimits, nowMs: number): string | null {
  if (atMs < limits.earliestMs) {
    return `is ${formatInstantUtc(atMs)}, before ${formatInstantUtc(limits.earliestMs)}, the earliest reading Headroom stores: is the logger's clock set?`;
  }
  if (atMs > nowMs + limits.maxFutureMs) {
    const minutes = Math.round(limits.maxFutureMs / 60_000);
    return `is ${formatInstantUtc(atMs)}, more than ${minutes} minute${minutes === 1 ? "" : "s"} after the server's time (${formatInstantUtc(Math.floor(nowMs / 1000) * 1000)}): is the logger's clock or its time zone wrong?`;
  }
  return null;
}

/** Null when the temperature (°C) is finite and in the range, else why not. */
export function temperatureProblem(tempC: number, limits: ReadingLimits): string | null {
  if (!Number.isFinite(tempC)) return "must be a finite number, in °C.";
  if (tempC < limits.minTempC || tempC > limits.maxTempC) {
    return `is ${tempC} °C, outside ${formatTempLimitC(limits.minTempC)} to ${formatTempLimitC(limits.maxTempC)} °C: an error value of the logger, or the wrong unit?`;
  }
  return null;
}

/** A limit as the messages print it, with a true minus sign: "−200". */
export function formatTempLimitC(tempC: number): string {
  return tempC < 0 ? `−${-tempC}` : String(tempC);
}
