import { describe, expect, it } from "vitest";
import { assessLocation, DEFAULT_ASSESSMENT_SETTINGS, type AssessmentSettings } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, relativeDeviation, roomSnapshot, substance } from "./fixtures";

// A ventilated laboratory (invented): 100 m³, 40 m² floor, 6 air changes per hour, mixing factor 0.5, 25 °C.
const lab = { volumeM3: 100, floorAreaM2: 40, airChangesPerHour: 6, mixingFactor: 0.5, worstCase: designWorstCase(25) };

/**
 * By hand for acetone at 25 °C (VDI Heat Atlas Wagner set: Psat = 30.723 kPa = 230.44 mmHg), U = 0.1 m/s, depth 1 cm:
 * EPA RMP Eq. D-1, QR = 0.284·U^0.78·MW^(2/3)·A·VP/(82.05·T) with A in ft² (0.1 m² per litre spilled →
 * 1.0764 ft²): QR = 0.284 × 0.16596 × 14.997 × 1.0764 × 230.44/(82.05 × 298.15) = 0.0071675 lb/min per litre
 * = 0.054184 g/s (× 453.59237/60). Well-mixed room: Q = 6 × 100/3600 = 0.16667 m³/s, k·Q = 0.083333 m³/s;
 * a pool of 784.5 g per litre (0.7845 g/cm³ at 25 °C, CRC Handbook 95th ed., Physical Constants of Organic Compounds) lasts 784.5/0.054184 = 14 478 s (241 min);
 * C(t) = G/(k·Q)·(1 − e^(−k·Q·t/V)); ppm = mg/m³ × 24.465/58.08.
 */
describe("spill in a ventilated room", () => {
  const acetone = substance(CAS.acetone);

  it("1 L of acetone: 274 ppm at its highest, above the NIOSH REL TWA of 250 ppm (moderate); 145 ppm in 15 minutes", () => {
    const findings = assessLocation(roomSnapshot([container(acetone, 1, "L", "sealed", { containerId: 5 })], lab));
    const exposure = findings.find((f) => f.rule === "spill-exposure");
    expect(exposure).toBeDefined();
    expect(exposure?.fingerprint).toBe(`spill-exposure|room:7|substance:${acetone.id}|spill`);
    expect(exposure?.scenario).toBe("spill");
    expect(exposure?.severity).toBe("moderate");
    expect(relativeDeviation(exposure?.value as number, 273.891)).toBeLessThan(1e-4);
    expect(exposure?.limitValue).toBe(250);
    expect(relativeDeviation(exposure?.ratio as number, 1.09557)).toBeLessThan(1e-4);
    expect(exposure?.unit).toBe("ppm");
    expect(exposure?.containerId).toBe(5);
    expect(exposure?.title).toBe("A 1 L spill of acetone in room 2.115 could reach 110 % of the NIOSH TWA at its highest (spill, 25.0 °C)");
    // The engine's traces: pool area, Eq. D-1, the two well-mixed-room evaluations, the limit ratios.
    const methods = exposure?.trace.parts.map((part) => part.method) ?? [];
    expect(methods[0]).toBe("Spill pool area from volume and depth");
    const evaporation = exposure?.trace.parts.find((part) => part.method.startsWith("Pool evaporation, US EPA RMP Eq. D-1"));
    expect(relativeDeviation(evaporation?.result.value as number, 0.0541843)).toBeLessThan(1e-4);
    const short = exposure?.trace.parts.find((part) => part.method.endsWith("highest within 15 min"));
    expect(relativeDeviation(short?.result.value as number, 144.515)).toBeLessThan(1e-4);
    const long = exposure?.trace.parts.find((part) => part.method.endsWith("highest overall"));
    expect(long?.result.value as number).toBeCloseTo(exposure?.value as number, 6);
    expect(exposure?.trace.warnings.some((w) => /outdoor wind/.test(w))).toBe(true);
    // 274 ppm is 1.1 % of the 2.5 % LFL: no spill-lfl finding.
    expect(findings.find((f) => f.rule === "spill-lfl")).toBeUndefined();
  });

  it("20 L of acetone: 2890 ppm within 15 minutes, above the NIOSH IDLH of 2500 ppm (critical), and 21.9 % LFL (moderate)", () => {
    // The pool is 2 m² (below the 40 m² floor): G = 20 × 0.054184 = 1.0837 g/s, same 241 min to evaporate.
    const findings = assessLocation(roomSnapshot([container(acetone, 20)], lab));
    const exposure = findings.find((f) => f.rule === "spill-exposure");
    expect(exposure?.severity).toBe("critical");
    expect(relativeDeviation(exposure?.value as number, 2890.30)).toBeLessThan(1e-4);
    expect(exposure?.limitValue).toBe(2500);
    expect(exposure?.title).toBe("A 20 L spill of acetone in room 2.115 could reach 116 % of the NIOSH IDLH within 15 minutes (spill, 25.0 °C)");
    const lfl = findings.find((f) => f.rule === "spill-lfl");
    expect(lfl?.severity).toBe("moderate");
    expect(relativeDeviation(lfl?.ratio as number, 0.219113)).toBeLessThan(1e-4);
    expect(lfl?.title).toBe("A 20 L spill of acetone in room 2.115 could reach 21.9 % LFL (spill, 25.0 °C)");
  });

  it("takes the largest container of each liquid", () => {
    const findings = assessLocation(roomSnapshot([container(acetone, 1), container(acetone, 20, "L", "sealed", { containerId: 9 }), container(acetone, 4)], lab));
    expect(findings.find((f) => f.rule === "spill-exposure")?.containerId).toBe(9);
  });

  it("caps the pool at the floor area", () => {
    // 200 L would spread to 20 m²; a 5 m² floor caps it, so G is a quarter.
    const small = { ...lab, floorAreaM2: 5 };
    const capped = assessLocation(roomSnapshot([container(acetone, 200)], small)).find((f) => f.rule === "spill-lfl");
    const pool = capped?.trace.parts[0];
    expect(pool?.result.value).toBe(5);
  });

  it("uses the Mackay–Matsugu correlation when the organisation chooses it", () => {
    const settings: AssessmentSettings = { ...DEFAULT_ASSESSMENT_SETTINGS, spill: { ...DEFAULT_ASSESSMENT_SETTINGS.spill, evaporationModel: "mackay-matsugu" } };
    const finding = assessLocation(roomSnapshot([container(acetone, 20)], lab), settings).find((f) => f.rule === "spill-exposure");
    expect(finding?.trace.parts.some((part) => part.method.startsWith("Pool evaporation, Mackay–Matsugu mass transfer"))).toBe(true);
  });

  it("an unventilated room gets the enclosure bound instead, and unknown air changes count as unventilated (and are reported)", () => {
    const unknown = assessLocation(roomSnapshot([container(acetone, 1)], { ...lab, airChangesPerHour: null }));
    expect(unknown.some((f) => f.rule.startsWith("spill"))).toBe(false);
    expect(unknown.some((f) => f.rule === "enclosure-lfl")).toBe(true);
    expect(unknown.find((f) => f.rule === "missing-data")?.title).toBe("Missing data: room 2.115 has no air changes per hour");
  });
});
