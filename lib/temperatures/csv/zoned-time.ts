/**
 * Local wall-clock times in an IANA time zone to UTC instants, with the platform's time-zone data
 * (Intl.DateTimeFormat), no library. Pure.
 *
 * A "wall time" is the local date and time written as if it were UTC: Date.UTC(y, m − 1, d, h, min, s).
 * offset = wall time − UTC instant, so instant = wall time − offset.
 *
 * Daylight-saving changes, decided once and written down:
 * - When clocks go back, one hour of wall times happens twice (ambiguous). `resolve` returns both
 *   instants; the row reader takes the first occurrence (the earlier instant) unless the file has
 *   already moved past it (see rows.ts).
 * - When clocks go forward, one hour of wall times never happens (skipped). `resolve` says so and
 *   the row reader reports it as an error: a logger whose clock shows such a time does not follow
 *   daylight saving time, and a fixed-offset zone is then the right choice.
 *
 * Speed: a day far from any change (no change within a day on either side) maps with one offset;
 * for a day near a change the change instant is found once by bisection. After that each row costs
 * a map lookup, not an Intl call.
 */

export const DAY_MS = 86_400_000;
const SECOND_MS = 1000;

export type LocalResolution =
  | { kind: "unique"; atMs: number; offsetMs: number }
  /** Clocks went back: the wall time happened twice, first with `earlierOffsetMs`. */
  | { kind: "ambiguous"; earlierAtMs: number; laterAtMs: number; earlierOffsetMs: number; laterOffsetMs: number }
  /** Clocks went forward over this wall time: it never happened. */
  | { kind: "skipped"; offsetBeforeMs: number; offsetAfterMs: number; changeAtMs: number };

type DayInfo = { offsetMs: number } | { offsetBeforeMs: number; offsetAfterMs: number; changeAtMs: number };

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(zone: string): Intl.DateTimeFormat {
  let formatter = formatters.get(zone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat("en-US", {
      timeZone: zone,
      hourCycle: "h23",
      era: "short",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
    });
    formatters.set(zone, formatter);
  }
  return formatter;
}

/** True for a zone name the platform knows ("Europe/Berlin", "UTC", "Etc/GMT-1"). */
export function isValidTimeZone(zone: string): boolean {
  if (typeof zone !== "string" || zone.trim() === "" || zone.length > 64) return false;
  try {
    formatterFor(zone);
    return true;
  } catch {
    return false;
  }
}

/** The zone's offset from UTC at an instant, in ms (Europe/Berlin in July: +7,200,000). */
export function zoneOffsetMs(atMs: number, zone: string): number {
  const seconds = Math.floor(atMs / SECOND_MS) * SECOND_MS;
  let y = 0, mo = 0, d = 0, h = 0, mi = 0, s = 0, bc = false;
  for (const part of formatterFor(zone).formatToParts(seconds)) {
    switch (part.type) {
      case "era": bc = part.value === "BC"; break;
      case "year": y = Number(part.value); break;
      case "month": mo = Number(part.value); break;
      case "day": d = Number(part.value); break;
      case "hour": h = Number(part.value); break;
      case "minute": mi = Number(part.value); break;
      case "second": s = Number(part.value); break;
    }
  }
  // Year 1 BC is year 0 of the proleptic Gregorian calendar that Date counts in.
  return utcMs(bc ? 1 - y : y, mo - 1, d, h, mi, s) - seconds;
}

/** Date.UTC, except that the years 0–99 stay as written (Date.UTC reads them as 1900–1999). */
export function utcMs(year: number, monthIndex: number, day: number, hour = 0, minute = 0, second = 0, ms = 0): number {
  const t = Date.UTC(year, monthIndex, day, hour, minute, second, ms);
  if (year >= 100 || year < 0) return t;
  const d = new Date(t);
  d.setUTCFullYear(year);
  return d.getTime();
}

/** Resolves wall times of one zone; keeps what it learns per day. */
export class ZonedClock {
  private readonly days = new Map<number, DayInfo>();

  constructor(readonly zone: string) {
    if (!isValidTimeZone(zone)) throw new RangeError(`Unknown time zone: ${zone}`);
  }

  resolve(wallMs: number): LocalResolution {
    const day = this.dayInfo(Math.floor(wallMs / DAY_MS));
    if ("offsetMs" in day) return { kind: "unique", atMs: wallMs - day.offsetMs, offsetMs: day.offsetMs };
    const { offsetBeforeMs, offsetAfterMs, changeAtMs } = day;
    const before = wallMs - offsetBeforeMs; // valid when it is before the change
    const after = wallMs - offsetAfterMs; // valid when it is at or after the change
    const beforeValid = before < changeAtMs;
    const afterValid = after >= changeAtMs;
    if (beforeValid && afterValid) {
      return { kind: "ambiguous", earlierAtMs: Math.min(before, after), laterAtMs: Math.max(before, after), earlierOffsetMs: before < after ? offsetBeforeMs : offsetAfterMs, laterOffsetMs: before < after ? offsetAfterMs : offsetBeforeMs };
    }
    if (beforeValid) return { kind: "unique", atMs: before, offsetMs: offsetBeforeMs };
    if (afterValid) return { kind: "unique", atMs: after, offsetMs: offsetAfterMs };
    return { kind: "skipped", offsetBeforeMs, offsetAfterMs, changeAtMs };
  }

  private dayInfo(dayNumber: number): DayInfo {
    let info = this.days.get(dayNumber);
    if (info) return info;
    // Offsets are within ±14 h, so every wall time of the day is an instant inside [start − 1 day, start + 2 days).
    const fromMs = dayNumber * DAY_MS - DAY_MS;
    const toMs = dayNumber * DAY_MS + 2 * DAY_MS;
    const offsetBeforeMs = zoneOffsetMs(fromMs, this.zone);
    const offsetAfterMs = zoneOffsetMs(toMs, this.zone);
    if (offsetBeforeMs === offsetAfterMs) {
      // Assumes no two changes that cancel out within three days (none in the time-zone data since 1970).
      info = { offsetMs: offsetBeforeMs };
    } else {
      // Bisection to the second: the first instant with the new offset.
      let lo = Math.floor(fromMs / SECOND_MS);
      let hi = Math.floor(toMs / SECOND_MS);
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (zoneOffsetMs(mid * SECOND_MS, this.zone) === offsetBeforeMs) lo = mid;
        else hi = mid;
      }
      info = { offsetBeforeMs, offsetAfterMs, changeAtMs: hi * SECOND_MS };
    }
    this.days.set(dayNumber, info);
    return info;
  }
}

/** One-off resolution (tests, single values). Rows use a ZonedClock. */
export function resolveLocalTime(wallMs: number, zone: string): LocalResolution {
  return new ZonedClock(zone).resolve(wallMs);
}

/** "+02:00", "−05:00", "+05:45". */
export function formatOffset(offsetMs: number): string {
  const sign = offsetMs < 0 ? "−" : "+";
  const minutes = Math.abs(Math.round(offsetMs / 60_000));
  return `${sign}${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;
}

/**
 * Fixed-offset zones for loggers that never change their clock: the IANA "Etc/GMT" names, whose
 * sign is the reverse of the usual one (Etc/GMT-1 is UTC+01:00).
 */
export function fixedOffsetZones(): { zone: string; label: string }[] {
  const zones: { zone: string; label: string }[] = [];
  for (let hours = -12; hours <= 14; hours++) {
    if (hours === 0) continue;
    const zone = `Etc/GMT${hours > 0 ? "-" : "+"}${Math.abs(hours)}`;
    zones.push({ zone, label: `UTC${formatOffset(hours * 3_600_000)} all year (${zone})` });
  }
  return zones;
}

/** The fixed-offset zone for a whole-hour offset, or null (e.g. +05:45 has none). */
export function fixedOffsetZoneFor(offsetMs: number): string | null {
  if (offsetMs === 0) return "UTC";
  if (offsetMs % 3_600_000 !== 0) return null;
  const hours = offsetMs / 3_600_000;
  if (hours < -12 || hours > 14) return null;
  return `Etc/GMT${hours > 0 ? "-" : "+"}${Math.abs(hours)}`;
}
