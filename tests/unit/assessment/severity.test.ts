import { describe, expect, it } from "vitest";
import {
  ASSESSMENT_RULES,
  assessmentSettingsSchema,
  DEFAULT_ASSESSMENT_SETTINGS,
  exposureSeverity,
  flashPointSeverity,
  ignitionSeverity,
  lflSeverity,
  MISSING_DATA_KINDS,
  oxygenSeverity,
  quantitySeverity,
  RULE_IDS,
  worseSeverity,
  type AssessmentSettings,
} from "@/lib/assessment/rules";

const settings = DEFAULT_ASSESSMENT_SETTINGS;

describe("default thresholds", () => {
  it("are the 10 % / 25 % / 100 % LFL alarm fractions, each group naming its source and saying it is a default", () => {
    expect(settings.lfl).toMatchObject({ moderate: 0.1, high: 0.25, critical: 1 });
    // 10 %: OSHA 29 CFR 1910.146; 25 %: NYC Fire Code 502.9.5.1 (the researched alarm fractions).
    expect(settings.lfl.source).toMatch(/1910\.146/);
    expect(settings.lfl.source).toMatch(/NYC Fire Code 502\.9\.5\.1/);
    for (const group of Object.values(settings)) {
      expect((group as { source: string }).source).toMatch(/^Default, set by your organisation\./);
    }
  });

  it("use 19.5 % oxygen (OSHA 29 CFR 1910.134) and the NIOSH CO₂ limits (TWA 5000, STEL 30 000, IDLH 40 000 ppm)", () => {
    expect(settings.oxygen.deficiencyPercent).toBe(19.5);
    expect(settings.oxygen.evacuatePercent).toBe(18);
    expect(settings.carbonDioxide.limits.map((limit) => [limit.kind, limit.valuePpm])).toEqual([
      ["TWA", 5000],
      ["STEL", 30000],
      ["IDLH", 40000],
    ]);
  });

  it("give a 10 °C flash-point margin (ASTM E502's 5–10 °C) and a 1 cm spill depth with 15 minutes (EPA RMP guidance; STEL period)", () => {
    expect(settings.flashPoint.marginC).toBe(10);
    expect(settings.flashPoint.source).toMatch(/ASTM E502/);
    expect(settings.spill).toMatchObject({ poolDepthM: 0.01, durationMin: 15, airSpeedMPerS: 0.1, evaporationModel: "epa-rmp" });
  });

  it("ship example quantity limits in litres from US gallons (60 gal = 227.12 L, 120 gal = 454.25 L; 1 gal = 3.785411784 L exactly)", () => {
    const [cabinetClassI, cabinetTotal, room] = settings.quantities.limits;
    expect(cabinetClassI.maxVolumeL).toBeCloseTo(227.1247, 3);
    expect(cabinetTotal.maxVolumeL).toBeCloseTo(454.2494, 3);
    expect(room.sprinkleredMaxVolumeL).toBeCloseTo(908.4988, 3);
    for (const limit of settings.quantities.limits) expect(limit.basis).toMatch(/^Example default/);
  });

  it("pass their own schema, which a settings form uses", () => {
    expect(assessmentSettingsSchema.parse(settings)).toEqual(settings);
  });

  it("keeps settings stored before the cap for ignition-free units existed, giving them the default cap (high)", () => {
    const { ignitionFreeMaxSeverity, ...olderLfl } = settings.lfl;
    expect(ignitionFreeMaxSeverity).toBe("high");
    const older = { ...settings, lfl: { ...olderLfl, critical: 2 } };
    expect(assessmentSettingsSchema.parse(older).lfl).toEqual({ ...olderLfl, critical: 2, ignitionFreeMaxSeverity: "high" });
  });

  it("the schema rejects fractions out of order, an evacuation level above the deficiency level and an empty source", () => {
    const bad = (change: (s: AssessmentSettings) => unknown) => assessmentSettingsSchema.safeParse(change(structuredClone(settings) as AssessmentSettings));
    const lfl = bad((s) => ({ ...s, lfl: { ...s.lfl, high: 0.05 } }));
    expect(lfl.success).toBe(false);
    expect(lfl.error?.issues[0].message).toBe("The LFL fractions must rise from moderate to high to critical.");
    expect(bad((s) => ({ ...s, oxygen: { ...s.oxygen, evacuatePercent: 19.8 } })).success).toBe(false);
    expect(bad((s) => ({ ...s, flashPoint: { ...s.flashPoint, source: " " } })).error?.issues[0].message).toBe("Say where the values come from.");
    expect(bad((s) => ({ ...s, missingData: { ...s.missingData, severities: { ...s.missingData.severities, "no-lfl": "urgent" } } })).success).toBe(false);
  });

  it("has one severity for every kind of missing data", () => {
    expect(Object.keys(settings.missingData.severities).sort()).toEqual([...MISSING_DATA_KINDS].sort());
  });
});

describe("severity at the edges", () => {
  it("LFL fractions are reached at or above: exactly 10 %, 25 % and 100 % LFL", () => {
    expect(lflSeverity(0.0999999, settings)).toBeNull();
    expect(lflSeverity(0.1, settings)).toBe("moderate");
    expect(lflSeverity(0.2499999, settings)).toBe("moderate");
    expect(lflSeverity(0.25, settings)).toBe("high");
    expect(lflSeverity(0.9999999, settings)).toBe("high");
    expect(lflSeverity(1, settings)).toBe("critical");
    expect(lflSeverity(20.6, settings)).toBe("critical");
  });

  it("follows the organisation's fractions", () => {
    const strict = { ...settings, lfl: { ...settings.lfl, moderate: 0.05, high: 0.1, critical: 0.5 } };
    expect(lflSeverity(0.05, strict)).toBe("moderate");
    expect(lflSeverity(0.1, strict)).toBe("high");
    expect(lflSeverity(0.5, strict)).toBe("critical");
  });

  it("an exposure limit is exceeded only above it; the TWA action level (half the TWA) at or above", () => {
    expect(exposureSeverity("IDLH", 1, settings)).toBeNull();
    expect(exposureSeverity("IDLH", 1.0000001, settings)).toBe("critical");
    expect(exposureSeverity("STEL", 1.5, settings)).toBe("high");
    expect(exposureSeverity("ceiling", 1.01, settings)).toBe("high");
    expect(exposureSeverity("TWA", 1.01, settings)).toBe("moderate");
    expect(exposureSeverity("TWA", 1, settings)).toBe("low");
    expect(exposureSeverity("TWA", 0.5, settings)).toBe("low");
    expect(exposureSeverity("TWA", 0.4999, settings)).toBeNull();
    expect(exposureSeverity("STEL", 0.9, settings)).toBeNull();
  });

  it("a quantity limit is exceeded above 100 %; the warning starts at 80 %", () => {
    expect(quantitySeverity(1.0001, settings)).toBe("high");
    expect(quantitySeverity(1, settings)).toBe("low");
    expect(quantitySeverity(0.8, settings)).toBe("low");
    expect(quantitySeverity(0.7999, settings)).toBeNull();
  });

  it("oxygen is deficient strictly below 19.5 % and calls for evacuation below 18 %", () => {
    expect(oxygenSeverity(19.5, settings)).toBeNull();
    expect(oxygenSeverity(19.49, settings)).toBe("high");
    expect(oxygenSeverity(18, settings)).toBe("high");
    expect(oxygenSeverity(17.99, settings)).toBe("critical");
  });

  it("flash point: at or above it moderate, within the 10 °C margin low (FP − T ≤ 10), further below none", () => {
    expect(flashPointSeverity(-20, -20, settings)).toBe("moderate");
    expect(flashPointSeverity(25, 35, settings)).toBe("low");
    expect(flashPointSeverity(24.99, 35, settings)).toBeNull();
    // Inside a closed unit free of ignition sources: information (low) at most; none stays none.
    expect(flashPointSeverity(-20, -20, settings, true)).toBe("low");
    expect(flashPointSeverity(24.99, 35, settings, true)).toBeNull();
  });

  it("ignition sources: GHS 1–2 / NFPA IA–IB critical, GHS 3 / NFPA IC high, combustible or unclassed none", () => {
    expect(ignitionSeverity(1, "IA", settings)).toBe("critical");
    expect(ignitionSeverity(2, "IB", settings)).toBe("critical");
    expect(ignitionSeverity(3, "IC", settings)).toBe("high");
    expect(ignitionSeverity(3, "II", settings)).toBe("high");
    expect(ignitionSeverity(4, "IIIA", settings)).toBeNull();
    expect(ignitionSeverity(null, null, settings)).toBeNull();
  });

  it("worseSeverity picks the worse", () => {
    expect(worseSeverity("low", "high")).toBe("high");
    expect(worseSeverity(null, "moderate")).toBe("moderate");
    expect(worseSeverity("critical", null)).toBe("critical");
  });
});

describe("rules", () => {
  it("have stable kebab-case ids with labels", () => {
    expect(RULE_IDS).toEqual([
      "enclosure-lfl",
      "ignition-source-unit",
      "flash-point",
      "boiling-point",
      "spill-exposure",
      "spill-lfl",
      "quantity-limit",
      "oxygen-depletion",
      "co2-exposure",
      "missing-data",
    ]);
    for (const rule of ASSESSMENT_RULES) {
      expect(rule.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
      expect(rule.label.length).toBeGreaterThan(10);
    }
  });
});
