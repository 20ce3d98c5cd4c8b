import { describe, expect, it } from "vitest";
import { formatPercent, formatQuantity, formatSignificant, formatTempC } from "@/lib/assessment/rules/format";

describe("numbers in titles", () => {
  it("three significant figures, ×10ⁿ from 10⁵ up and below 10⁻³, a true minus sign", () => {
    expect(formatSignificant(2060.263)).toBe("2,060");
    expect(formatSignificant(209.7)).toBe("210");
    expect(formatSignificant(46.0)).toBe("46");
    expect(formatSignificant(48.77)).toBe("48.8");
    expect(formatSignificant(0.45959)).toBe("0.46");
    expect(formatSignificant(55146)).toBe("55,100");
    expect(formatSignificant(99_999)).toBe("100,000");
    expect(formatSignificant(213_000)).toBe("2.13 × 10⁵");
    expect(formatSignificant(1_000_000)).toBe("1 × 10⁶");
    expect(formatSignificant(0.000452)).toBe("4.52 × 10⁻⁴");
    expect(formatSignificant(-12.34)).toBe("−12.3");
    expect(formatSignificant(0)).toBe("0");
    expect(formatSignificant(Number.NaN)).toBe("—");
  });

  it("units beside the value; temperatures to one decimal", () => {
    expect(formatQuantity(227.1247, "L")).toBe("227 L");
    expect(formatPercent(2.1)).toBe("210 %");
    expect(formatTempC(21.3)).toBe("21.3 °C");
    expect(formatTempC(-45)).toBe("−45.0 °C");
  });
});
