import { describe, expect, it } from "vitest";
import { casCheckDigit, readCas, readDate, readNumber } from "@/lib/imports";

describe("CAS numbers", () => {
  // Check-digit rule as published by CAS. The numbers of acetone, ethanol (CRC Handbook 95th ed., Physical Constants
  // of Organic Compounds) and water (… of Inorganic Compounds) are as listed there; a check digit shows only that a
  // number is well formed, not which substance it names.
  it("accepts valid numbers", () => {
    expect(readCas("67-64-1")).toEqual({ ok: true, value: "67-64-1" });
    expect(readCas("7732-18-5")).toEqual({ ok: true, value: "7732-18-5" });
    expect(readCas(" 64-17-5 ")).toEqual({ ok: true, value: "64-17-5" });
  });

  it("computes the check digit from the digits before it", () => {
    // 7732-18-5: 8×1 + 1×2 + 2×3 + 3×4 + 7×5 + 7×6 = 105 → 5
    expect(casCheckDigit("773218")).toBe(5);
    expect(casCheckDigit("6764")).toBe(1);
  });

  it("refuses a wrong check digit", () => {
    const read = readCas("67-64-2");
    expect(read.ok).toBe(false);
  });

  it("puts the hyphens back into a number written as digits only", () => {
    expect(readCas("7732185")).toEqual({ ok: true, value: "7732-18-5" });
  });
});

describe("numbers", () => {
  it("reads decimals with a dot, signs and exponents", () => {
    expect(readNumber("2.5")).toEqual({ ok: true, value: 2.5 });
    expect(readNumber(".5")).toEqual({ ok: true, value: 0.5 });
    expect(readNumber("+3")).toEqual({ ok: true, value: 3 });
    expect(readNumber("−20")).toEqual({ ok: true, value: -20 });
    expect(readNumber("1e3")).toEqual({ ok: true, value: 1000 });
  });

  it("refuses thousands separators and says what to write", () => {
    expect(readNumber("1,234.5")).toEqual({ ok: false, message: "Leave out thousands separators: write 1234.5." });
    expect(readNumber("1 500").ok).toBe(false);
  });
});

describe("dates", () => {
  it("reads YYYY-MM-DD and year-first forms as UTC midnight", () => {
    expect(readDate("2026-04-03")).toEqual({ ok: true, value: Date.UTC(2026, 3, 3) });
    expect(readDate("2026/4/3")).toEqual({ ok: true, value: Date.UTC(2026, 3, 3) });
    expect(readDate("2026-04-03T14:30:00")).toEqual({ ok: true, value: Date.UTC(2026, 3, 3) });
  });

  it("refuses words and far-off years", () => {
    expect(readDate("next week")).toEqual({ ok: false, message: "“next week” is not a date. Write dates as YYYY-MM-DD, e.g. 2026-04-03." });
    expect(readDate("3026-01-01")).toEqual({ ok: false, message: "3026-01-01 is outside the years 1900–2199; check the year." });
  });
});
