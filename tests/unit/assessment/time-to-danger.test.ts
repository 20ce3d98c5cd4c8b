/**
 * Time to danger of a freezer's control-lost findings: threshold temperatures and the minutes after
 * a failure at which each is crossed (Newton's law of heating, τ = 4 h, from −18 °C towards 27 °C).
 */
import { describe, expect, it } from "vitest";
import { assessLocation } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, substance, unitSnapshot } from "./fixtures";

const METHANOL = "67-56-1";
const freezer = {
  id: 31,
  code: "FZ-9",
  kind: "freezer_minus_20" as const,
  internalVolumeL: 200,
  ignitionSourceFree: false,
  setRange: { minC: -25, maxC: -15 },
  warmUp: { tauMin: 240, source: "set" as const, reason: "τ = 4 h, set for this unit" },
  worstCase: { inControl: designWorstCase(-18, "upper end of the set range"), controlLost: null },
};
const assess = (contents: ReturnType<typeof container>[], overrides: Partial<typeof freezer> = {}) =>
  assessLocation(unitSnapshot(contents, { ...freezer, ...overrides }, { worstCase: designWorstCase(27) }));

describe("time to danger", () => {
  const findings = assess([container(substance(METHANOL), 1, "L", "sealed")]);
  const lost = (rule: string) => findings.find((f) => f.rule === rule && f.scenario === "control_lost");

  it("vapor at the LFL: the correlation solved for T, then the warm-up inverted", () => {
    const vapor = lost("enclosure-lfl");
    expect(vapor?.severity).toBe("critical");
    // By hand: methanol's LFL 6.0 % (library) at 101.325 kPa → Psat = 6.0795 kPa. VDI Heat Atlas 2nd ed.
    // saturation table: 6,177 Pa at 280.00 K; slope B = 4,654 K from the Merck Index points (20 mmHg at
    // −6.0 °C, 100 mmHg at 21.2 °C) → 1/T* = 1/280 + ln(6177/6079.5)/4654 → T* = 279.73 K = 6.58 °C.
    expect(vapor?.timeToDanger?.threshold).toBe("LFL");
    expect(vapor!.timeToDanger!.tempC).toBeGreaterThan(6.58 - 0.2);
    expect(vapor!.timeToDanger!.tempC).toBeLessThan(6.58 + 0.2);
    // t = −240 × ln((27 − 6.58)/(27 + 18)) = 189.6 min (±0.2 °C is ±2.4 min here).
    expect(vapor!.timeToDanger!.minutes).toBeGreaterThan(189.6 - 3);
    expect(vapor!.timeToDanger!.minutes).toBeLessThan(189.6 + 3);
    const steps = vapor!.trace.steps.map((s) => s.description);
    expect(steps.some((d) => d.startsWith("Threshold temperatures"))).toBe(true);
    expect(steps.some((d) => d.startsWith("Warm-up after a failure (Newton's law of heating)"))).toBe(true);
    expect(vapor!.trace.inputs.find((i) => i.symbol === "τ")?.value).toBe(240);
    // Every threshold on the way up, for the finding page: 10 % and 25 % LFL, then the LFL itself.
    expect(vapor!.trace.crossings?.map((c) => [c.threshold, c.severity])).toEqual([
      ["10 % LFL", "moderate"],
      ["25 % LFL", "high"],
      ["LFL", "critical"],
    ]);
    expect(vapor!.trace.crossings?.at(-1)?.minutes).toBe(vapor!.timeToDanger!.minutes);
  });

  it("flash point: exact threshold temperatures, analytic times", () => {
    const flash = lost("flash-point");
    // Methanol's flash point 9 °C (library): moderate at 9 °C; t = −240 × ln(18/45) = 219.91 min.
    expect(flash?.severity).toBe("moderate");
    expect(flash?.timeToDanger).toEqual({ minutes: 219.9, threshold: "flash point", tempC: 9 });
    // Within the 10 °C margin from −1 °C: t = −240 × ln(28/45) = 113.87 min, shown in the trace.
    const warmStep = flash!.trace.steps.find((s) => s.description.startsWith("Warm-up"));
    expect(warmStep?.substituted).toContain("within 10 °C of the flash point: t = −240 × ln((27 − (−1))/(27 − (−18))) = 113.9 min (1 h 54 min)");
  });

  it("already as bad at the set temperature → 0 minutes", () => {
    // Diethyl ether boils at 34.6 °C and reaches its LFL far below −18 °C.
    const ether = assess([container(substance(CAS.diethylEther), 1, "L", "sealed")]).find((f) => f.rule === "enclosure-lfl" && f.scenario === "control_lost");
    expect(ether?.timeToDanger?.minutes).toBe(0);
    expect(ether?.timeToDanger?.threshold).toBe("LFL");
  });

  it("no warm-up, or not a control-lost finding → null", () => {
    const without = assess([container(substance(METHANOL), 1, "L", "sealed")], { warmUp: null as never });
    expect(without.every((f) => f.timeToDanger === null)).toBe(true);
    expect(findings.filter((f) => f.scenario === "in_control").every((f) => f.timeToDanger === null)).toBe(true);
  });
});
