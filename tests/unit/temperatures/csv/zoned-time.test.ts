import { describe, expect, it } from "vitest";
import { fixedOffsetZoneFor, formatOffset, isValidTimeZone, resolveLocalTime, ZonedClock, zoneOffsetMs } from "@/lib/temperatures/csv/zoned-time";

const wall = (iso: string) => Date.parse(`${iso}Z`); // the local wall time written as if it were UTC
const utc = (iso: string) => Date.parse(iso);
const HOUR = 3_600_000;

// 2026 changes: the EU changes at 01:00 UTC on the last Sundays of March and October (Directive
// 2000/84/EC, art. 2–3): 29 March and 25 October 2026. The US changes at 02:00 local time on the
// second Sunday of March and the first Sunday of November (15 U.S.C. §260a): 8 March and 1 November 2026.
describe("local times to UTC in Europe/Berlin, 2026", () => {
  it("maps winter and summer times with +01:00 and +02:00", () => {
    expect(resolveLocalTime(wall("2026-01-15T08:00:00"), "Europe/Berlin")).toEqual({ kind: "unique", atMs: utc("2026-01-15T07:00:00Z"), offsetMs: HOUR });
    expect(resolveLocalTime(wall("2026-07-14T15:40:00"), "Europe/Berlin")).toEqual({ kind: "unique", atMs: utc("2026-07-14T13:40:00Z"), offsetMs: 2 * HOUR });
  });

  it("29 March: 01:59:59 is 00:59:59Z, 03:00 is 01:00Z, and 02:00–02:59 never happened", () => {
    const clock = new ZonedClock("Europe/Berlin");
    expect(clock.resolve(wall("2026-03-29T01:59:59"))).toMatchObject({ kind: "unique", atMs: utc("2026-03-29T00:59:59Z") });
    expect(clock.resolve(wall("2026-03-29T03:00:00"))).toMatchObject({ kind: "unique", atMs: utc("2026-03-29T01:00:00Z") });
    expect(clock.resolve(wall("2026-03-29T02:30:00"))).toEqual({ kind: "skipped", offsetBeforeMs: HOUR, offsetAfterMs: 2 * HOUR, changeAtMs: utc("2026-03-29T01:00:00Z") });
    expect(clock.resolve(wall("2026-03-29T02:00:00")).kind).toBe("skipped");
  });

  it("25 October: 02:30 happened twice, at 00:30Z (+02:00) and 01:30Z (+01:00)", () => {
    const clock = new ZonedClock("Europe/Berlin");
    expect(clock.resolve(wall("2026-10-25T02:30:00"))).toEqual({
      kind: "ambiguous",
      earlierAtMs: utc("2026-10-25T00:30:00Z"),
      laterAtMs: utc("2026-10-25T01:30:00Z"),
      earlierOffsetMs: 2 * HOUR,
      laterOffsetMs: HOUR,
    });
    expect(clock.resolve(wall("2026-10-25T01:59:00"))).toMatchObject({ kind: "unique", atMs: utc("2026-10-24T23:59:00Z") });
    expect(clock.resolve(wall("2026-10-25T03:00:00"))).toMatchObject({ kind: "unique", atMs: utc("2026-10-25T02:00:00Z") });
  });
});

describe("local times to UTC in America/New_York, 2026", () => {
  it("8 March: 01:59 EST is 06:59Z, 03:00 EDT is 07:00Z, 02:30 never happened", () => {
    const clock = new ZonedClock("America/New_York");
    expect(clock.resolve(wall("2026-03-08T01:59:00"))).toMatchObject({ kind: "unique", atMs: utc("2026-03-08T06:59:00Z") });
    expect(clock.resolve(wall("2026-03-08T03:00:00"))).toMatchObject({ kind: "unique", atMs: utc("2026-03-08T07:00:00Z") });
    expect(clock.resolve(wall("2026-03-08T02:30:00"))).toMatchObject({ kind: "skipped", offsetBeforeMs: -5 * HOUR, offsetAfterMs: -4 * HOUR, changeAtMs: utc("2026-03-08T07:00:00Z") });
  });

  it("1 November: 01:30 happened at 05:30Z (EDT) and again at 06:30Z (EST)", () => {
    expect(resolveLocalTime(wall("2026-11-01T01:30:00"), "America/New_York")).toMatchObject({
      kind: "ambiguous",
      earlierAtMs: utc("2026-11-01T05:30:00Z"),
      laterAtMs: utc("2026-11-01T06:30:00Z"),
    });
    expect(resolveLocalTime(wall("2026-11-01T02:00:00"), "America/New_York")).toMatchObject({ kind: "unique", atMs: utc("2026-11-01T07:00:00Z") });
  });
});

describe("zones and offsets", () => {
  it("knows IANA names and fixed-offset zones, and refuses others", () => {
    expect(isValidTimeZone("Europe/Berlin")).toBe(true);
    expect(isValidTimeZone("UTC")).toBe(true);
    expect(isValidTimeZone("Etc/GMT-1")).toBe(true);
    expect(isValidTimeZone("Mars/Olympus_Mons")).toBe(false);
    expect(isValidTimeZone("")).toBe(false);
  });

  it("reads the offset at an instant, including a 45-minute one (Asia/Kathmandu is UTC+05:45)", () => {
    expect(zoneOffsetMs(utc("2026-07-01T00:00:00Z"), "Asia/Kathmandu")).toBe(5.75 * HOUR);
    expect(formatOffset(5.75 * HOUR)).toBe("+05:45");
    expect(formatOffset(-5 * HOUR)).toBe("−05:00");
  });

  it("names the fixed zone for a whole-hour offset, with the Etc/GMT sign reversed", () => {
    expect(fixedOffsetZoneFor(HOUR)).toBe("Etc/GMT-1");
    expect(fixedOffsetZoneFor(-5 * HOUR)).toBe("Etc/GMT+5");
    expect(fixedOffsetZoneFor(0)).toBe("UTC");
    expect(fixedOffsetZoneFor(5.75 * HOUR)).toBeNull();
    expect(resolveLocalTime(wall("2026-03-29T02:30:00"), "Etc/GMT-1")).toMatchObject({ kind: "unique", atMs: utc("2026-03-29T01:30:00Z") });
  });
});
