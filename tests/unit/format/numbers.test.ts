import { describe, expect, it } from "vitest";
import { formatNumber, formatQuantity, formatTempC } from "@/lib/format/numbers";

describe("number formatting", () => {
  it("uses sensible significant figures and never a raw float", () => {
    expect(formatNumber(24.69834)).toBe("24.7");
    expect(formatNumber(0.1 + 0.2)).toBe("0.3");
    expect(formatNumber(2.1e5)).toBe("2.1 × 10⁵");
    expect(formatNumber(243_812)).toBe("2.44 × 10⁵");
    expect(formatNumber(0.000412)).toBe("4.12 × 10⁻⁴");
    expect(formatNumber(1234)).toBe("1,230");
    expect(formatNumber(-22.21)).toBe("−22.2");
    expect(formatNumber(Number.NaN)).toBe("—");
    expect(formatNumber(null)).toBe("—");
  });

  it("puts the unit beside the value", () => {
    expect(formatQuantity(58.6, "kPa")).toBe("58.6 kPa");
    expect(formatQuantity(210, "% LFL")).toBe("210 % LFL");
    expect(formatQuantity(undefined, "kPa")).toBe("—");
    expect(formatTempC(31.24)).toBe("31.2 °C");
    expect(formatTempC(-20)).toBe("−20.0 °C");
  });
});
