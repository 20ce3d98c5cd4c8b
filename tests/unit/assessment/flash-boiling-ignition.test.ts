import { describe, expect, it } from "vitest";
import { assessLocation, buildMixtureSnapshot, interiorIgnitionSources } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, roomSnapshot, substance, unit, unitSnapshot } from "./fixtures";

const shelf = (tempC: number) => ({ kind: "open_shelving" as const, setRange: null, internalVolumeL: null, worstCase: { inControl: designWorstCase(tempC), controlLost: null } });

describe("flash-point", () => {
  it("acetone at 25 °C is above its −20 °C flash point (moderate); the value is the temperature, the limit the flash point", () => {
    const acetone = substance(CAS.acetone);
    const [finding] = assessLocation(unitSnapshot([container(acetone, 2.5)], shelf(25))).filter((f) => f.rule === "flash-point");
    expect(finding).toMatchObject({ severity: "moderate", value: 25, limitValue: -20, unit: "°C", ratio: null, scenario: "in_control" });
    expect(finding.fingerprint).toBe(`flash-point|unit:12|substance:${acetone.id}|in_control`);
    expect(finding.title).toBe("Acetone in FSR-1 is above its flash point of −20.0 °C at its worst case (25.0 °C)");
    // The trace gives the equilibrium lower flammable temperature too (Psat/Patm = LFL 2.5 %: about −20 °C for acetone).
    const lower = finding.trace.inputs.find((input) => input.symbol === "T_L");
    expect(lower?.value as number).toBeGreaterThan(-25);
    expect(lower?.value as number).toBeLessThan(-15);
  });

  it("1-butanol (FP 35 °C, IEC 60079-20-1) at 25 °C is exactly 10 °C below it: within the margin (low); at 24.9 °C none", () => {
    const butanol = substance(CAS.nButanol);
    const at25 = assessLocation(unitSnapshot([container(butanol, 1)], shelf(25))).filter((f) => f.rule === "flash-point");
    expect(at25).toHaveLength(1);
    expect(at25[0].severity).toBe("low");
    expect(at25[0].title).toBe("1-butanol in FSR-1 comes within 10 °C of its flash point of 35.0 °C at its worst case (25.0 °C)");
    expect(assessLocation(unitSnapshot([container(butanol, 1)], shelf(24.9))).filter((f) => f.rule === "flash-point")).toEqual([]);
  });
  it("in a closed unit whose interior is free of ignition sources, a liquid above its flash point is information (low), not moderate", () => {
    // Acetone (FP −20 °C) at 8 °C in a flammable-storage refrigerator: NFPA 45 (2004) A.12.2.2.2.1 notes
    // that refrigerator temperatures are almost always above the flash points of the liquids stored
    // in them — which is why such units are built without ignition sources inside. The vapor itself
    // is graded by the enclosure rule; the flash-point line only says the liquid gives off flammable vapor.
    const acetone = substance(CAS.acetone);
    const [inFsr] = assessLocation(unitSnapshot([container(acetone, 1)])).filter((f) => f.rule === "flash-point");
    expect(inFsr).toMatchObject({ severity: "low", value: 8, limitValue: -20 });
    const steps = inFsr.trace.steps.map((step) => step.description);
    expect(steps.at(-1)).toBe("FSR-1 is closed and its interior is free of ignition sources: information only");
    // A closed flammable-liquid cabinet at 28 °C: the same.
    const cabinet = { kind: "flammable_cabinet" as const, setRange: null, internalVolumeL: 200, worstCase: { inControl: designWorstCase(28), controlLost: null } };
    expect(assessLocation(unitSnapshot([container(acetone, 1)], cabinet)).find((f) => f.rule === "flash-point")?.severity).toBe("low");
    // A domestic refrigerator has ignition sources in its compartment: still moderate.
    const domestic = { kind: "domestic_refrigerator" as const, code: "FR-1", ignitionSourceFree: false };
    expect(assessLocation(unitSnapshot([container(acetone, 1)], domestic)).find((f) => f.rule === "flash-point" && f.scenario === "in_control")?.severity).toBe("moderate");
    // A ventilated cabinet is not closed: its vapor reaches the room, so the room's grade holds.
    expect(assessLocation(unitSnapshot([container(acetone, 1)], { ...cabinet, ventilated: true })).find((f) => f.rule === "flash-point")?.severity).toBe("moderate");
  });
});

describe("boiling-point", () => {
  const ether = substance(CAS.diethylEther);

  it("diethyl ether at 36 °C boils (normal boiling point 34.4 °C, CRC): high, with the boiling temperature as the limit", () => {
    const [finding] = assessLocation(unitSnapshot([container(ether, 1)], shelf(36))).filter((f) => f.rule === "boiling-point");
    expect(finding.severity).toBe("high");
    expect(finding.value).toBe(36);
    // The Poling Antoine set reaches 101.325 kPa within 0.3 °C of the CRC normal boiling point.
    expect(Math.abs((finding.limitValue as number) - 34.4)).toBeLessThan(0.3);
    expect(finding.title).toMatch(/^Diethyl ether in FSR-1 would boil at its worst case \(36\.0 °C\) \(boiling point 34\.[0-9] °C at 101\.3 kPa\): closed containers can pressurise$/);
    expect(assessLocation(unitSnapshot([container(ether, 1)], shelf(33))).filter((f) => f.rule === "boiling-point")).toEqual([]);
  });

  it("boils lower at a site's lower pressure: at 84 kPa (about 1600 m) ether boils near 29 °C", () => {
    const findings = assessLocation(unitSnapshot([container(ether, 1)], shelf(30), { atmosphericPressureKPa: 84 }));
    const boiling = findings.find((f) => f.rule === "boiling-point");
    expect(boiling?.limitValue as number).toBeGreaterThan(28);
    expect(boiling?.limitValue as number).toBeLessThan(30);
  });

  it("an ideal mixture boils at its bubble point (Σ xᵢ·Pᵢsat = Patm), between its components' boiling points", () => {
    const mixture = buildMixtureSnapshot({
      id: 5,
      name: "ether–hexane",
      fractionBasis: "mole",
      components: [
        { substance: ether, fraction: 0.5 },
        { substance: substance(CAS.nHexane), fraction: 0.5 },
      ],
    });
    const findings = assessLocation(unitSnapshot([container({ kind: "mixture", mixture }, 1)], shelf(60)));
    const boiling = findings.find((f) => f.rule === "boiling-point");
    expect(boiling?.limitValue as number).toBeGreaterThan(34.4);
    expect(boiling?.limitValue as number).toBeLessThan(68.7);
  });
});

describe("ignition-source-unit", () => {
  it("diethyl ether (GHS 1, NFPA IA) in a domestic-type refrigerator is critical", () => {
    const ether = substance(CAS.diethylEther);
    const [finding] = assessLocation(unitSnapshot([container(ether, 0.5)], { kind: "domestic_refrigerator", ignitionSourceFree: false, code: "DF-2" })).filter(
      (f) => f.rule === "ignition-source-unit",
    );
    expect(finding.severity).toBe("critical");
    expect(finding.title).toBe("Diethyl ether (GHS category 1, NFPA class IA) is stored in DF-2, whose interior has ignition sources");
    expect(finding.trace.inputs.find((input) => input.symbol === "ignition")?.value).toMatch(/NFPA 45 \(2004\) annex A\.12\.2\.2\.2\.1/);
  });

  it("1-butanol (GHS 3, NFPA IC) is high; water and a flammable-storage refrigerator raise nothing", () => {
    const domestic = { kind: "domestic_refrigerator" as const, ignitionSourceFree: false };
    const butanol = assessLocation(unitSnapshot([container(substance(CAS.nButanol), 1)], domestic)).filter((f) => f.rule === "ignition-source-unit");
    expect(butanol.map((f) => f.severity)).toEqual(["high"]);
    expect(assessLocation(unitSnapshot([container(substance(CAS.water), 1)], domestic)).filter((f) => f.rule === "ignition-source-unit")).toEqual([]);
    expect(
      assessLocation(unitSnapshot([container(substance(CAS.diethylEther), 1)], { kind: "flammable_storage_refrigerator", ignitionSourceFree: false })).filter(
        (f) => f.rule === "ignition-source-unit",
      ),
    ).toEqual([]);
  });

  it("knows which interiors have ignition sources", () => {
    expect(interiorIgnitionSources(unit({ kind: "domestic_refrigerator", ignitionSourceFree: false }))).toMatch(/domestic-type refrigerator/);
    expect(interiorIgnitionSources(unit({ kind: "domestic_refrigerator", ignitionSourceFree: true }))).toBeNull();
    expect(interiorIgnitionSources(unit({ kind: "freezer_minus_20", ignitionSourceFree: false }))).toMatch(/freezer/);
    expect(interiorIgnitionSources(unit({ kind: "explosion_proof_refrigerator", ignitionSourceFree: false }))).toBeNull();
    expect(interiorIgnitionSources(unit({ kind: "flammable_cabinet", ignitionSourceFree: false }))).toBeNull();
    expect(interiorIgnitionSources(unit({ kind: "open_shelving", ignitionSourceFree: false }))).toBeNull();
  });

  it("a walk-in cold room with flammable liquids is flagged at room level", () => {
    const findings = assessLocation(roomSnapshot([container(substance(CAS.acetone), 1)], { kind: "cold_room", worstCase: designWorstCase(6) }));
    const finding = findings.find((f) => f.rule === "ignition-source-unit");
    expect(finding?.severity).toBe("critical");
    expect(finding?.storageUnitId).toBeNull();
    expect(finding?.scenario).toBe("room_worst_case");
  });
});
