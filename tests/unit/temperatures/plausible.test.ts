import { describe, expect, it } from "vitest";
import { DEFAULT_READING_LIMITS, formatTempLimitC, instantProblem, parseOffsetInstant, temperatureProblem } from "@/lib/temperatures/plausible";

const NOW = Date.parse("2026-12-05T12:00:00Z");

describe("parseOffsetInstant", () => {
  it("reads an instant with Z, a positive or a negative offset, with or without seconds and fractions", () => {
    expect(parseOffsetInstant("2026-07-14T15:40:00+02:00")).toEqual({ ok: true, atMs: Date.parse("2026-07-14T13:40:00Z") });
    expect(parseOffsetInstant("2026-07-14T13:40Z")).toEqual({ ok: true, atMs: Date.parse("2026-07-14T13:40:00Z") });
    expect(parseOffsetInstant("2026-07-14T08:10:05.25-05:30")).toEqual({ ok: true, atMs: Date.parse("2026-07-14T13:40:05.250Z") });
    expect(parseOffsetInstant("2024-02-29T00:00:00Z")).toEqual({ ok: true, atMs: Date.parse("2024-02-29T00:00:00Z") });
    expect(parseOffsetInstant("2026-07-14T00:00:00+14:00")).toEqual({ ok: true, atMs: Date.parse("2026-07-13T10:00:00Z") });
    expect(parseOffsetInstant("2026-07-14T00:00:00-14:00")).toEqual({ ok: true, atMs: Date.parse("2026-07-14T14:00:00Z") });
  });

  it("reads years before 100 as written (not as 19xx) so that the window can refuse them", () => {
    expect(parseOffsetInstant("0001-01-01T00:00:00Z")).toEqual({ ok: true, atMs: Date.parse("0001-01-01T00:00:00Z") });
    expect(new Date((parseOffsetInstant("0001-01-01T00:00:00Z") as { atMs: number }).atMs).getUTCFullYear()).toBe(1);
  });

  it("refuses dates and times that do not exist instead of rolling them over", () => {
    expect(parseOffsetInstant("2026-02-30T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: 2026-02 has no day 30." });
    expect(parseOffsetInstant("2026-02-29T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: 2026-02 has no day 29." }); // 2026 is not a leap year
    expect(parseOffsetInstant("2100-02-29T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: 2100-02 has no day 29." }); // a century not divisible by 400
    expect(parseOffsetInstant("2026-04-31T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: 2026-04 has no day 31." });
    expect(parseOffsetInstant("2026-13-01T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: month 13 does not exist." });
    expect(parseOffsetInstant("2026-00-10T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: month 0 does not exist." });
    expect(parseOffsetInstant("2026-01-00T10:00:00Z")).toEqual({ ok: false, message: "is not a real date: 2026-01 has no day 0." });
    expect(parseOffsetInstant("2026-07-14T24:00:00Z")).toEqual({ ok: false, message: "is not a real time of day: 24:00:00 (hours run 00–23, minutes and seconds 00–59)." });
    expect(parseOffsetInstant("2026-07-14T10:60Z").ok).toBe(false);
    expect(parseOffsetInstant("2026-07-14T10:59:60Z").ok).toBe(false);
  });

  it("refuses offsets beyond ±14:00 and text that is not ISO-8601 with an offset", () => {
    expect(parseOffsetInstant("2026-07-14T10:00:00+14:01")).toEqual({ ok: false, message: "has the offset +14:01, beyond ±14:00: no place on Earth uses it." });
    expect(parseOffsetInstant("2026-07-14T10:00:00-15:00").ok).toBe(false);
    expect(parseOffsetInstant("2026-07-14T10:00:00+02:60").ok).toBe(false);
    for (const text of ["2026-07-14 10:00", "2026-07-14T10:00:00", "NaN", "Infinity", "", "1752488400000", "14/07/2026 10:00Z", "2026-07-14T10:00:00+0200"]) {
      expect(parseOffsetInstant(text)).toEqual({ ok: false, message: "must be ISO-8601 with an offset (Z or ±hh:mm), e.g. 2026-07-14T15:40:00+02:00." });
    }
  });
});

describe("instantProblem", () => {
  it("accepts from 2000-01-01 up to 5 minutes after the server's time", () => {
    expect(instantProblem(Date.parse("2000-01-01T00:00:00Z"), DEFAULT_READING_LIMITS, NOW)).toBeNull();
    expect(instantProblem(NOW + 5 * 60_000, DEFAULT_READING_LIMITS, NOW)).toBeNull();
  });

  it("refuses 1970, the year 1, 9999-12-31 and 6 minutes ahead", () => {
    expect(instantProblem(0, DEFAULT_READING_LIMITS, NOW)).toBe("is 1970-01-01T00:00:00Z, before 2000-01-01T00:00:00Z, the earliest reading Headroom stores: is the logger's clock set?");
    expect(instantProblem(Date.parse("1999-12-31T23:59:59Z"), DEFAULT_READING_LIMITS, NOW)).toMatch(/^is 1999-12-31T23:59:59Z, before 2000-01-01/);
    expect(instantProblem(Date.parse("0001-01-01T00:00:00Z"), DEFAULT_READING_LIMITS, NOW)).toMatch(/^is 0001-01-01T00:00:00Z, before/);
    expect(instantProblem(Date.parse("9999-12-31T00:00:00Z"), DEFAULT_READING_LIMITS, NOW)).toBe(
      "is 9999-12-31T00:00:00Z, more than 5 minutes after the server's time (2026-12-05T12:00:00Z): is the logger's clock or its time zone wrong?",
    );
    expect(instantProblem(NOW + 6 * 60_000, DEFAULT_READING_LIMITS, NOW)).toMatch(/^is 2026-12-05T12:06:00Z, more than 5 minutes after/);
  });

  it("follows configured limits", () => {
    const limits = { ...DEFAULT_READING_LIMITS, earliestMs: Date.parse("2020-01-01T00:00:00Z"), maxFutureMs: 0 };
    expect(instantProblem(Date.parse("2019-06-01T00:00:00Z"), limits, NOW)).toMatch(/before 2020-01-01T00:00:00Z/);
    expect(instantProblem(NOW + 1, limits, NOW)).toMatch(/more than 0 minutes after/);
  });
});

describe("temperatureProblem", () => {
  it("accepts −200 to 200 °C and refuses what no sensor in storage reads", () => {
    expect(temperatureProblem(-200, DEFAULT_READING_LIMITS)).toBeNull();
    expect(temperatureProblem(200, DEFAULT_READING_LIMITS)).toBeNull();
    expect(temperatureProblem(4.6, DEFAULT_READING_LIMITS)).toBeNull();
    // −273.15 °C is absolute zero (NIST SP 811): −273 is a logger's error value.
    expect(temperatureProblem(-273, DEFAULT_READING_LIMITS)).toBe("is -273 °C, outside −200 to 200 °C: an error value of the logger, or the wrong unit?");
    expect(temperatureProblem(250, DEFAULT_READING_LIMITS)).toBe("is 250 °C, outside −200 to 200 °C: an error value of the logger, or the wrong unit?");
    expect(temperatureProblem(Number.NaN, DEFAULT_READING_LIMITS)).toBe("must be a finite number, in °C.");
    expect(temperatureProblem(Number.POSITIVE_INFINITY, DEFAULT_READING_LIMITS)).toBe("must be a finite number, in °C.");
  });

  it("follows a configured range, printed with true minus signs", () => {
    expect(temperatureProblem(-90, { ...DEFAULT_READING_LIMITS, minTempC: -80.5, maxTempC: 60 })).toBe("is -90 °C, outside −80.5 to 60 °C: an error value of the logger, or the wrong unit?");
    expect(formatTempLimitC(-200)).toBe("−200");
  });
});
