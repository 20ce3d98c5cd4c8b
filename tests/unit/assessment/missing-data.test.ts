import { describe, expect, it } from "vitest";
import { assessLocation, type CandidateFinding } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, roomSnapshot, substance, substanceWith, unitSnapshot } from "./fixtures";

const missing = (findings: CandidateFinding[]) => findings.filter((f) => f.rule === "missing-data");

describe("missing-data: nothing is skipped silently", () => {
  it("no Antoine or other correlation: reported (low), and the vapor is still estimated by Clausius–Clapeyron from the boiling point", () => {
    const ether = substanceWith(CAS.diethylEther, { id: 901, correlations: [] });
    const findings = assessLocation(unitSnapshot([container(ether, 10, "mL", "opened")], { worstCase: { inControl: designWorstCase(4), controlLost: designWorstCase(4) } }));
    const [gap] = missing(findings);
    expect(gap.fingerprint).toBe("missing-data|unit:12|substance:901/no-correlation|in_control");
    expect(gap.severity).toBe("low");
    expect(gap.substanceId).toBe(901);
    expect(gap.title).toBe("Missing data: diethyl ether in FSR-1 has no vapor-pressure correlation (Antoine or DIPPR-101)");
    expect(gap.trace.steps[0].substituted).toMatch(/Clausius–Clapeyron/);
    // Reported once however many scenarios and rules needed it.
    expect(missing(findings)).toHaveLength(1);
    const enclosure = findings.find((f) => f.rule === "enclosure-lfl");
    expect(enclosure?.severity).toBe("high");
    expect(enclosure?.trace.warnings.some((w) => /Clausius–Clapeyron/.test(w))).toBe(true);
  });

  it("no correlation and no boiling point: moderate, and the vapor rules cannot run for it", () => {
    const ether = substanceWith(CAS.diethylEther, { id: 902, correlations: [], normalBoilingPointC: null });
    const findings = assessLocation(unitSnapshot([container(ether, 10, "mL", "opened")]));
    expect(missing(findings).map((f) => [f.fingerprint, f.severity])).toEqual([["missing-data|unit:12|substance:902/no-vapor-pressure-method|in_control", "moderate"]]);
    expect(findings.some((f) => f.rule === "enclosure-lfl" || f.rule === "boiling-point")).toBe(false);
    // Without a boiling point it cannot be classed either, but its flash point is still compared.
    expect(findings.some((f) => f.rule === "flash-point")).toBe(true);
  });

  it("no LFL for a liquid with a flash point: moderate, left out of the % LFL", () => {
    const ether = substanceWith(CAS.diethylEther, { id: 903, lflVolPercent: null });
    const findings = assessLocation(unitSnapshot([container(ether, 10, "mL", "opened")]));
    const [gap] = missing(findings);
    expect(gap.fingerprint).toBe("missing-data|unit:12|substance:903/no-lfl|in_control");
    expect(gap.severity).toBe("moderate");
    expect(findings.some((f) => f.rule === "enclosure-lfl")).toBe(false);
  });

  it("no room volume for an unventilated room: moderate, and the room is bounded by the saturated concentration alone", () => {
    const findings = assessLocation(
      roomSnapshot([container(substance(CAS.ethanol), 1, "L")], { kind: "cold_room", airChangesPerHour: 0, volumeM3: null, worstCase: designWorstCase(8) }),
    );
    const [gap] = missing(findings);
    expect(gap.fingerprint).toBe("missing-data|room:7|room-volume/no-room-volume|room_worst_case");
    expect(gap.title).toBe("Missing data: room 2.115 has no volume (floor area and height)");
    expect(gap.severity).toBe("moderate");
    // 1 L of ethanol in an unknown volume: the saturation bound, 87 % LFL at 8 °C (see the enclosure tests).
    expect(findings.find((f) => f.rule === "enclosure-lfl")?.ratio).toBeCloseTo(0.8753, 3);
  });

  it("no room volume for a ventilated room: the spill cannot be modelled, and that is reported", () => {
    const findings = assessLocation(roomSnapshot([container(substance(CAS.acetone), 20)], { volumeM3: null }));
    expect(missing(findings).map((f) => f.fingerprint)).toEqual(["missing-data|room:7|room-volume/no-room-volume|room_worst_case"]);
    expect(findings.some((f) => f.rule.startsWith("spill"))).toBe(false);
  });

  it("no internal volume of a closed unit: low, assessed at the saturated concentration", () => {
    const findings = assessLocation(unitSnapshot([container(substance(CAS.diethylEther), 10, "mL", "opened")], { internalVolumeL: null, worstCase: { inControl: designWorstCase(4), controlLost: designWorstCase(4) } }));
    expect(missing(findings).map((f) => [f.fingerprint, f.severity, f.title])).toEqual([
      ["missing-data|unit:12|unit-volume/no-unit-volume|in_control", "low", "Missing data: FSR-1 has no internal volume"],
    ]);
    // 10 mL would have given 46 % LFL; without the volume the bound is C_sat = 2.9 × 10⁵ ppm: critical by
    // the fractions, high in this flammable-storage refrigerator (interior free of ignition sources).
    expect(findings.find((f) => f.rule === "enclosure-lfl")?.severity).toBe("high");
  });

  it("no worst-case temperature: each scenario that lacks one is reported", () => {
    const findings = assessLocation(unitSnapshot([container(substance(CAS.acetone), 1)], { worstCase: { inControl: null, controlLost: null } }, { worstCase: null }));
    expect(missing(findings).map((f) => f.fingerprint).sort()).toEqual([
      "missing-data|unit:12|worst-case-control_lost/no-worst-case|control_lost",
      "missing-data|unit:12|worst-case-in_control/no-worst-case|in_control",
    ]);
  });

  it("an amount in kilograms without a density: low, and the container is left out of the quantity totals", () => {
    const acetone = substanceWith(CAS.acetone, { id: 904, liquidDensityKgPerM3: null });
    const findings = assessLocation(unitSnapshot([container(acetone, 2, "kg", "sealed", { containerId: 31 })], { kind: "flammable_cabinet", setRange: null }));
    const gap = missing(findings).find((f) => f.fingerprint.endsWith("/no-density|in_control"));
    expect(gap?.severity).toBe("low");
    expect(gap?.containerId).toBe(31);
  });

  it("an LFL but no flash point (dichloromethane with the 13 % LEL its library entry lists as an alternative; no flash point in IEC 60079-20-1): it cannot be classed", () => {
    const dcm = substanceWith(CAS.dichloromethane, { id: 906, lflVolPercent: 13 });
    const findings = assessLocation(unitSnapshot([container(dcm, 1)], { kind: "flammable_cabinet", setRange: null }));
    const gap = missing(findings).find((f) => f.fingerprint === `missing-data|unit:12|substance:${dcm.id}/no-flash-point|in_control`);
    expect(gap?.severity).toBe("moderate");
    expect(gap?.title).toBe("Missing data: dichloromethane in FSR-1 has an LFL but no flash point");
  });

  it("no exposure limit for a substance in a spill (water needs none)", () => {
    const hexane = substanceWith(CAS.nHexane, { id: 905, exposureLimits: [] });
    const findings = assessLocation(roomSnapshot([container(hexane, 20), container(substance(CAS.water), 20)]));
    expect(missing(findings).map((f) => f.fingerprint)).toEqual(["missing-data|room:7|substance:905/no-exposure-limit|spill"]);
  });
});
