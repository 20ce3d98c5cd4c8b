import { describe, expect, it } from "vitest";
import { RATIO_NUM_FMT, substanceLimits, toSignificant } from "@/lib/exports/register-workbook";

describe("workbook numbers", () => {
  it("keeps three significant figures and stays a number", () => {
    expect(toSignificant(36.3841)).toBe(36.4); // Excel's #,##0% shows it as 3,640 %, as the register does
    expect(toSignificant(0.0123456)).toBe(0.0123);
    expect(toSignificant(12345.678)).toBe(12300);
    expect(toSignificant(0)).toBe(0);
    expect(toSignificant(null)).toBeNull();
    expect(toSignificant(Number.NaN)).toBeNull();
    expect(RATIO_NUM_FMT).toBe("#,##0%");
  });
});

describe("a substance's exposure limits in columns", () => {
  // Invented figures. 300 mg/m³ × 24.45 / 78.11 g/mol = 93.9 ppm (ideal-gas molar volume at 25 °C, 101.325 kPa).
  const limit = (kind: "TWA" | "STEL" | "ceiling" | "IDLH", value: number, unit: "ppm" | "mg/m3", body: string, note: string | null = null) => ({
    id: 1,
    substanceId: 1,
    kind,
    value,
    unit,
    body,
    source: `${body} table`,
    note,
  });

  it("puts the lowest limit of each kind in its columns (compared in ppm) and lists the others", () => {
    const { limits, furtherLimits } = substanceLimits({
      molarMassGPerMol: 78.11,
      exposureLimits: [limit("TWA", 100, "ppm", "BODY-A"), limit("TWA", 300, "mg/m3", "BODY-B"), limit("ceiling", 25, "ppm", "BODY-A", "15 min")],
    });
    expect(limits.TWA?.body).toBe("BODY-B");
    expect(limits.ceiling?.value).toBe(25);
    expect(limits.STEL).toBeUndefined();
    expect(furtherLimits).toBe("TWA BODY-A 100 ppm (BODY-A table)");
    expect(substanceLimits({ molarMassGPerMol: 78.11, exposureLimits: [] })).toEqual({ limits: {}, furtherLimits: null });
  });
});
