import { describe, expect, it } from "vitest";
import { parseDateAndTime, parseTimestamp, guessDateOrder } from "@/lib/temperatures/csv/timestamps";
import { readTemperature, readUnit, storedTempC, unitInHeader } from "@/lib/temperatures/csv/values";

const wall = (iso: string) => Date.parse(`${iso}Z`);

describe("timestamps", () => {
  it("reads ISO 8601 with and without an offset; an offset makes it an instant", () => {
    expect(parseTimestamp("2026-07-14T15:40:00+02:00", "dmy")).toEqual({ kind: "instant", atMs: Date.parse("2026-07-14T13:40:00Z") });
    expect(parseTimestamp("2026-07-14T13:40:00Z", "ymd")).toEqual({ kind: "instant", atMs: Date.parse("2026-07-14T13:40:00Z") });
    expect(parseTimestamp("2026-07-14 15:40:00 -0500", "ymd")).toEqual({ kind: "instant", atMs: Date.parse("2026-07-14T20:40:00Z") });
    expect(parseTimestamp("2026-07-14 15:40", "ymd")).toEqual({ kind: "local", wallMs: wall("2026-07-14T15:40:00") });
    expect(parseTimestamp("2026-07-14T15:40:05.25", "ymd")).toEqual({ kind: "local", wallMs: wall("2026-07-14T15:40:05.250") });
  });

  it("reads day-first and month-first dates by the chosen order, dotted dates and 12-hour times", () => {
    expect(parseTimestamp("14/07/2026 15:40", "dmy")).toEqual({ kind: "local", wallMs: wall("2026-07-14T15:40:00") });
    expect(parseTimestamp("14.07.2026 15:40:30", "dmy")).toEqual({ kind: "local", wallMs: wall("2026-07-14T15:40:30") });
    expect(parseTimestamp("07/14/2026 3:40:00 PM", "mdy")).toEqual({ kind: "local", wallMs: wall("2026-07-14T15:40:00") });
    expect(parseTimestamp("03/04/2026 12:05 a.m.", "mdy")).toEqual({ kind: "local", wallMs: wall("2026-03-04T00:05:00") });
    expect(parseTimestamp("03/04/2026 12:05 PM", "dmy")).toEqual({ kind: "local", wallMs: wall("2026-04-03T12:05:00") });
    expect(parseTimestamp("14-07-26 08:00", "dmy")).toEqual({ kind: "local", wallMs: wall("2026-07-14T08:00:00") });
  });

  it("explains what is wrong, and suggests the other date order when it would fit", () => {
    expect(parseTimestamp("07/14/2026 15:40", "dmy")).toEqual({ kind: "error", message: "“07/14/2026 15:40” is not a date: month 14 does not exist (read month first it would be a date: is the date order month first?)." });
    expect(parseTimestamp("2026-02-30 10:00", "ymd")).toEqual({ kind: "error", message: "“2026-02-30 10:00” is not a date: 2026-02 has no day 30." });
    expect(parseTimestamp("2026-07-14 13:00 PM", "ymd").kind).toBe("error");
    expect(parseTimestamp("2026-07-14", "ymd")).toMatchObject({ kind: "error", message: expect.stringMatching(/no time of day/) });
    expect(parseTimestamp("yesterday", "dmy")).toMatchObject({ kind: "error", message: expect.stringMatching(/is not a date and time/) });
    expect(parseTimestamp("", "dmy")).toEqual({ kind: "error", message: "The timestamp is empty." });
  });

  it("joins separate date and time columns", () => {
    expect(parseDateAndTime("02/28/2026", "12:45:00", "mdy")).toEqual({ kind: "local", wallMs: wall("2026-02-28T12:45:00") });
    expect(parseDateAndTime("28.02.2026", "1:45 PM", "dmy")).toEqual({ kind: "local", wallMs: wall("2026-02-28T13:45:00") });
    expect(parseDateAndTime("28.02.2026", "", "dmy")).toMatchObject({ kind: "error", column: "time" });
    expect(parseDateAndTime("28.02.2026", "25:00", "dmy")).toMatchObject({ kind: "error", column: "time", message: "“25:00” is not a time: hour 25 does not exist." });
  });

  it("guesses the date order only when the sample can tell", () => {
    expect(guessDateOrder(["2026-07-14 10:00"])).toBe("ymd");
    expect(guessDateOrder(["12/07/2026 10:00", "13/07/2026 10:00"])).toBe("dmy");
    expect(guessDateOrder(["07/12/2026 10:00", "07/13/2026 10:00"])).toBe("mdy");
    expect(guessDateOrder(["03/04/2026 10:00"])).toBeNull();
    expect(guessDateOrder(["03.04.2026 10:00"])).toBe("dmy");
  });
});

describe("temperatures and units", () => {
  it("converts °F and K to °C by definition (NIST SP 811: t/°C = (t/°F − 32)·5/9; t/°C = T/K − 273.15)", () => {
    expect(storedTempC(46.4, "F")).toBe(8); // 46.4 °F = 8 °C exactly
    expect(storedTempC(32, "F")).toBe(0);
    expect(storedTempC(-40, "F")).toBe(-40);
    expect(storedTempC(212, "F")).toBe(100);
    expect(storedTempC(277.15, "K")).toBe(4);
    expect(storedTempC(4.2, "C")).toBe(4.2);
  });

  it("reads unit symbols as loggers write them", () => {
    for (const text of ["C", "°C", "ºC", "degC", "deg C", "Celsius", "°c"]) expect(readUnit(text)).toBe("C");
    for (const text of ["F", "°F", "degF", "Fahrenheit"]) expect(readUnit(text)).toBe("F");
    expect(readUnit("K")).toBe("K");
    expect(readUnit("%RH")).toBeNull();
    expect(unitInHeader("Temperature (°F)")).toBe("F");
    expect(unitInHeader("Temp [°C]")).toBe("C");
    expect(unitInHeader("Temperature")).toBeNull();
  });

  it("reads numbers with the chosen decimal mark, a true minus sign and a unit written after the value", () => {
    expect(readTemperature("4.5", ".")).toEqual({ ok: true, value: 4.5, unit: null });
    expect(readTemperature("−18,25", ",")).toEqual({ ok: true, value: -18.25, unit: null });
    expect(readTemperature("40.1 °F", ".")).toEqual({ ok: true, value: 40.1, unit: "F" });
    expect(readTemperature("4,5", ".")).toMatchObject({ ok: false, message: expect.stringMatching(/decimal comma/) });
    expect(readTemperature("4.5", ",")).toMatchObject({ ok: false, message: expect.stringMatching(/decimal point/) });
    expect(readTemperature("Err", ".")).toEqual({ ok: false, message: "“Err” is not a number." });
    expect(readTemperature(" ", ".")).toEqual({ ok: false, message: "The temperature is empty." });
  });
});

describe("fixed-width timestamps read quickly give the same instants as the general forms", () => {
  it("for every form, over random valid dates and times", async () => {
    const fc = (await import("fast-check")).default;
    const two = (n: number) => String(n).padStart(2, "0");
    fc.assert(
      fc.property(fc.date({ min: new Date("1990-01-01T00:00:00Z"), max: new Date("2099-12-31T23:59:59Z"), noInvalidDate: true }), (date) => {
        const wallMs = Math.floor(date.getTime() / 1000) * 1000;
        const d = new Date(wallMs);
        const [y, mo, da, h, mi, s] = [d.getUTCFullYear(), two(d.getUTCMonth() + 1), two(d.getUTCDate()), two(d.getUTCHours()), two(d.getUTCMinutes()), two(d.getUTCSeconds())];
        const expected = { kind: "local", wallMs };
        expect(parseTimestamp(`${y}-${mo}-${da} ${h}:${mi}:${s}`, "dmy")).toEqual(expected);
        expect(parseTimestamp(`${y}-${mo}-${da}T${h}:${mi}:${s}`, "ymd")).toEqual(expected);
        expect(parseTimestamp(`${da}.${mo}.${y} ${h}:${mi}:${s}`, "dmy")).toEqual(expected);
        expect(parseTimestamp(`${mo}/${da}/${y} ${h}:${mi}:${s}`, "mdy")).toEqual(expected);
        expect(parseDateAndTime(`${da}/${mo}/${y}`, `${h}:${mi}:${s}`, "dmy")).toEqual(expected);
        // The same instants through the general forms (single-digit hour, 12-hour clock).
        const hour12 = ((d.getUTCHours() + 11) % 12) + 1;
        expect(parseTimestamp(`${y}-${mo}-${da} ${hour12}:${mi}:${s} ${d.getUTCHours() < 12 ? "AM" : "PM"}`, "ymd")).toEqual(expected);
      }),
      { numRuns: 300 },
    );
  });
});
