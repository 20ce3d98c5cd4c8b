import { describe, expect, it } from "vitest";
import { assessLocation, buildMixtureSnapshot, DEFAULT_ASSESSMENT_SETTINGS, type CandidateFinding } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, relativeDeviation, roomSnapshot, substance, unitSnapshot } from "./fixtures";

const byFingerprint = (findings: CandidateFinding[], fingerprint: string) => {
  const found = findings.find((f) => f.fingerprint === fingerprint);
  if (!found) throw new Error(`No finding ${fingerprint} among ${findings.map((f) => f.fingerprint).join(", ")}`);
  return found;
};

// Gas constant and temperatures as in the engine: R = 8.314462618 J/(mol·K), 0 °C = 273.15 K, 1 atm = 101.325 kPa.
describe("enclosure-lfl: closed units", () => {
  const ether = substance(CAS.diethylEther);

  it("a 4 L bottle of diethyl ether in a 280 L refrigerator at 20 °C is saturation-limited: 581 000 ppm = 3420 % LFL (critical by the fractions, high in a rated unit)", () => {
    // Psat(20 °C) from the VDI Heat Atlas Wagner set (Tc 466.63 K, Pc 3651 kPa) → 58.885 kPa; the
    // handbook check value is 442 mmHg = 58.93 kPa (NRC Prudent Practices 1995, LCSS), 0.08 % higher.
    // C_sat = 58.885/101.325 × 10⁶ = 581 147 ppm. All-evaporated: 4 L × 713.8 g/L (0.7138 g/cm³ at 20 °C,
    // CRC Handbook 95th ed., Physical Constants of Organic Compounds) = 2855 g → (2855/74.123) × 24.055
    // / (1000 × 0.276) × 10⁶ = 3.36 × 10⁶ ppm (capped at 10⁶), so
    // C = min(C_sat, C_inv) = C_sat. LFL 1.7 % (IEC 60079-20-1) → 581 147/17 000 = 34.19 = 3419 % LFL.
    const findings = assessLocation(
      unitSnapshot([container(ether, 4, "L", "sealed", { containerId: 41 })], {
        worstCase: { inControl: designWorstCase(20, "upper end of the set range"), controlLost: designWorstCase(20) },
      }),
    );
    const finding = byFingerprint(findings, "enclosure-lfl|unit:12|substance:7|in_control");
    // 3400 % LFL ≥ 100 % → critical by the alarm fractions; the flammable-storage refrigerator's
    // interior is free of ignition sources, so the default cap makes it high (both steps in the trace).
    expect(finding.severity).toBe("high");
    expect(finding.trace.steps.map((step) => [step.description, step.result?.value])).toEqual([
      ["Severity from the LFL alarm fractions (reached at or above)", "critical"],
      ["The unit's interior is free of ignition sources: at most the severity the settings allow for such a unit", "high"],
    ]);
    expect(relativeDeviation(finding.value as number, 3418.51)).toBeLessThan(1e-4);
    expect(relativeDeviation(finding.value as number, (442 / 760) * 1e6 / 17000 * 100)).toBeLessThan(0.01);
    expect(finding).toMatchObject({ unit: "% LFL", limitValue: 100, containerId: 41, substanceId: 7, storageUnitId: 12, roomId: 7, siteId: 1 });
    expect(finding.ratio).toBeCloseTo((finding.value as number) / 100, 12);
    expect(finding.worstCaseTempC).toBe(20);
    expect(finding.worstCaseSource).toBe("20.0 °C, upper end of the set range");
    expect(finding.title).toBe("Diethyl ether in FSR-1 could reach 3,420 % LFL at its worst case in control (20.0 °C)");
    const bound = finding.trace.parts.find((part) => part.method === "Closed-enclosure bound");
    expect(bound?.steps.at(-1)?.description).toBe("The smaller of the two (saturation-limited)");
  });

  it("the same bottle is critical in a unit with ignition sources inside, or when the cap for rated units is set to critical", () => {
    const bottle = [container(ether, 4, "L", "sealed", { containerId: 41 })];
    const worstCase = { inControl: designWorstCase(20, "upper end of the set range"), controlLost: designWorstCase(20) };
    const domestic = assessLocation(unitSnapshot(bottle, { kind: "domestic_refrigerator", ignitionSourceFree: false, worstCase }));
    expect(byFingerprint(domestic, "enclosure-lfl|unit:12|substance:7|in_control").severity).toBe("critical");
    const uncapped = { ...DEFAULT_ASSESSMENT_SETTINGS, lfl: { ...DEFAULT_ASSESSMENT_SETTINGS.lfl, ignitionFreeMaxSeverity: "critical" as const } };
    const rated = byFingerprint(assessLocation(unitSnapshot(bottle, { worstCase }), uncapped), "enclosure-lfl|unit:12|substance:7|in_control");
    expect(rated.severity).toBe("critical");
    expect(rated.trace.steps).toHaveLength(1);
  });

  it("a 10 mL bottle in the same refrigerator at 4 °C is inventory-limited: 7822 ppm = 46 % LFL (high)", () => {
    // By hand: m = 10 mL × 0.7138 g/mL (at 20 °C, CRC Handbook 95th ed., Physical Constants of Organic Compounds) = 7.138 g; Vm(4 °C) = 8.314462618 × 277.15/101.325 = 22.742 L/mol (NIOSH
    // NMAM Appendix A gives 22.74); V_free = 0.280 − 0.00001 m³; C_inv = (7.138/74.123) × 22.742/(1000 × 0.27999)
    // × 10⁶ = 7821.9 ppm, far below C_sat (2.9 × 10⁵ ppm at 4 °C); 7821.9/17 000 = 0.4601.
    const findings = assessLocation(
      unitSnapshot([container(ether, 10, "mL", "opened")], { worstCase: { inControl: designWorstCase(4), controlLost: designWorstCase(4) } }),
    );
    const finding = byFingerprint(findings, "enclosure-lfl|unit:12|substance:7|in_control");
    expect(finding.severity).toBe("high");
    expect(relativeDeviation(finding.ratio as number, 0.460113)).toBeLessThan(1e-5);
    const bound = finding.trace.parts[0];
    expect(bound.steps.at(-1)?.description).toBe("The smaller of the two (inventory-limited)");
    expect(relativeDeviation(bound.result.value as number, 7821.922)).toBeLessThan(1e-5);
  });

  it("assesses a refrigerator in control and with control lost (warmed to its room), each with its own fingerprint and source", () => {
    const findings = assessLocation(
      unitSnapshot([container(ether, 10, "mL", "opened")], { worstCase: { inControl: designWorstCase(4), controlLost: null } }, { worstCase: designWorstCase(21.3) }),
    );
    const inControl = byFingerprint(findings, "enclosure-lfl|unit:12|substance:7|in_control");
    const lost = byFingerprint(findings, "enclosure-lfl|unit:12|substance:7|control_lost");
    expect(lost.worstCaseTempC).toBe(21.3);
    expect(lost.worstCaseSource).toBe("21.3 °C, design maximum (the room's worst case, as if the unit had failed)");
    // Inventory-limited in both: C_inv grows with T as Vm does, 294.45/277.15.
    expect((lost.ratio as number) / (inControl.ratio as number)).toBeCloseTo(294.45 / 277.15, 10);
    expect(lost.title).toBe("Diethyl ether in FSR-1 could reach 48.9 % LFL if the refrigerator fails (control lost, 21.3 °C)");
  });

  it("adds the open containers together: ΣCᵢ/LFLᵢ (Le Chatelier), each at most its own saturated concentration", () => {
    // Two open 10 mL ether bottles at 4 °C: 2 × 7822 ppm (each inventory-limited) = 15 644 ppm → 92.0 % LFL;
    // the largest alone gives 46.0 %.
    const findings = assessLocation(
      unitSnapshot([container(ether, 10, "mL", "opened"), container(ether, 10, "mL", "in_use"), container(ether, 10, "mL", "sealed")], {
        worstCase: { inControl: designWorstCase(4), controlLost: designWorstCase(4) },
      }),
    );
    const open = byFingerprint(findings, "enclosure-lfl|unit:12|open-containers|in_control");
    expect(open.severity).toBe("high");
    // Free volume now 0.280 − 0.00003 m³.
    const expected = ((2 * (7.138 / 74.123) * 22.742199) / (1000 * 0.27997)) * 1e6 / 17000;
    expect(relativeDeviation(open.ratio as number, expected)).toBeLessThan(1e-5);
    expect(open.containerIds).toHaveLength(2);
    expect(open.title).toBe("Open containers in FSR-1 could reach 92 % LFL together at its worst case in control (4.0 °C)");
  });

  it("open liquids whose vapor pressures add up to more than the ambient pressure fill the enclosure with vapor only (Dalton's law)", () => {
    // By hand at 30 °C (Poling 5th ed. App. A Antoine sets, P in bar, T in K):
    // ether log10 P = 4.10962 − 1090.64/(303.15 − 41.95) = −0.06588 → 85.93 kPa (handbook ≈ 86 kPa at 30 °C, recalled from memory);
    // acetone log10 P = 4.2184 − 1197.01/(303.15 − 45.09) = −0.42010 → 38.01 kPa.
    // Together 123.94 kPa > 101.325 kPa: the vapor displaces all the air, y = Pᵢ/ΣP → ether 0.6933, acetone 0.3067.
    // LFL 1.7 % and 2.5 % (IEC 60079-20-1): f = 693 300/17 000 + 306 700/25 000 = 40.78 + 12.27 = 53.05.
    const acetone = substance(CAS.acetone);
    const findings = assessLocation(
      unitSnapshot([container(ether, 1, "L", "opened"), container(acetone, 1, "L", "opened")], { worstCase: { inControl: designWorstCase(30), controlLost: designWorstCase(30) } }),
    );
    const open = byFingerprint(findings, "enclosure-lfl|unit:12|open-containers|in_control");
    expect(relativeDeviation(open.ratio as number, 53.05)).toBeLessThan(0.003);
    const dalton = open.trace.steps.find((step) => step.description.startsWith("Together more than the whole enclosure"));
    expect(dalton?.result?.value).toBe(1_000_000);
    // Without the cap the two would have given (85.93 / 17 000 + 38.01 / 25 000) / 101.325 × 10⁶ = 64.9.
    expect(open.ratio as number).toBeLessThan(64);
  });

  it("raises nothing below 10 % LFL, and nothing for open shelving", () => {
    const hexane = substance(CAS.nHexane);
    const cold = assessLocation(unitSnapshot([container(hexane, 1, "mL", "opened")], { worstCase: { inControl: designWorstCase(4), controlLost: designWorstCase(4) } }));
    expect(cold.filter((f) => f.rule === "enclosure-lfl")).toEqual([]);
    const shelf = assessLocation(unitSnapshot([container(ether, 1, "L", "opened")], { kind: "open_shelving", setRange: null, internalVolumeL: null }));
    expect(shelf.filter((f) => f.rule === "enclosure-lfl")).toEqual([]);
  });

  it("water has no LFL and no flash point: not flammable, no finding and no missing data", () => {
    const findings = assessLocation(unitSnapshot([container(substance(CAS.water), 1, "L", "opened")]));
    expect(findings).toEqual([]);
  });
});

describe("enclosure-lfl: mixtures by Raoult's law and Le Chatelier's rule", () => {
  it("1 mol benzene + 2 mol toluene at 25 °C in a closed cabinet: 41 755 + 25 025 ppm → 598 % LFL, LFL_mix 1.116 %", () => {
    // x_benzene = 1/3. With the library's sets at 25 °C (benzene: Poling 5th ed. Wagner set, 95.201 mmHg;
    // toluene: VDI Heat Atlas Wagner set, 28.528 mmHg — both within 0.1 % of their reference equations of state):
    // C_b = 1/3 × 12.6924 kPa/101.325 × 10⁶ = 41 755 ppm, C_t = 2/3 × 3.80341/101.325 × 10⁶ = 25 025 ppm;
    // LFL 1.2 % and 1.0 % (IEC 60079-20-1): 41 755/12 000 + 25 025/10 000 = 5.982.
    // Le Chatelier over the vapor: y_b = 0.62527 → LFL_mix = 1/(0.62527/1.2 + 0.37473/1.0) = 1.1163 %.
    const mixture = buildMixtureSnapshot({
      id: 3,
      name: "benzene–toluene waste",
      fractionBasis: "mole",
      components: [
        { substance: substance(CAS.benzene), fraction: 1 / 3 },
        { substance: substance(CAS.toluene), fraction: 2 / 3 },
      ],
    });
    const findings = assessLocation(
      unitSnapshot([container({ kind: "mixture", mixture }, 2.5, "L", "sealed", { containerId: 77 })], {
        kind: "flammable_cabinet",
        setRange: null,
        internalVolumeL: 500,
        worstCase: { inControl: designWorstCase(25), controlLost: null },
      }),
    );
    const finding = byFingerprint(findings, "enclosure-lfl|unit:12|mixture:3|in_control");
    expect(finding.mixtureId).toBe(3);
    expect(finding.substanceId).toBeNull();
    expect(relativeDeviation(finding.ratio as number, 5.98202)).toBeLessThan(1e-4);
    const raoult = finding.trace.parts.find((part) => part.method === "Raoult's law (ideal solution)");
    expect(relativeDeviation(raoult?.result.value as number, (1 / 3) * 12.6924 + (2 / 3) * 3.80341)).toBeLessThan(1e-4);
    const chatelier = finding.trace.parts.find((part) => part.method === "Le Chatelier's mixing rule");
    expect(relativeDeviation(chatelier?.result.value as number, 1.11633)).toBeLessThan(1e-4);
    expect(finding.trace.warnings.some((w) => /ideal solution/.test(w))).toBe(true);
    expect(finding.title).toBe("Benzene–toluene waste in FSR-1 could reach 598 % LFL at its worst case (25.0 °C)");
  });

  it("mass fractions become mole fractions (xᵢ = (wᵢ/Mᵢ)/Σ(wⱼ/Mⱼ)) and the mixture density follows ideal mixing", () => {
    const mixture = buildMixtureSnapshot({
      id: 4,
      name: "by mass",
      fractionBasis: "mass",
      components: [
        { substance: substance(CAS.benzene), fraction: 0.2977 },
        { substance: substance(CAS.toluene), fraction: 0.7023 },
      ],
    });
    // 1:2 by moles is 29.77 : 70.23 by mass (78.114 and 92.141 g/mol).
    expect(mixture.components[0].moleFraction).toBeCloseTo(1 / 3, 4);
    const rhoB = substance(CAS.benzene).liquidDensityKgPerM3 as number;
    const rhoT = substance(CAS.toluene).liquidDensityKgPerM3 as number;
    expect(mixture.liquidDensityKgPerM3).toBeCloseTo(1 / (0.2977 / rhoB + 0.7023 / rhoT), 6);
    expect(mixture.flashPointC).toBe(-11);
    expect(mixture.flashPointBasis).toBe("lowest-component");
    expect(mixture.ghsCategory).toBe(2);
    expect(mixture.nfpaClass).toBe("IB");
  });
});

describe("enclosure-lfl: an unventilated room", () => {
  it("a cold room without ventilation is bounded like a closed unit, at the room's worst case: ethanol at 8 °C, 87 % LFL", () => {
    // 20 L of ethanol (15.8 kg) in a 30 m³ cold room at 8 °C: C_inv ≫ C_sat, so saturation-limited. Poling 5th ed.
    // Wagner set (Tc 513.92 K, Pc 6132 kPa) → 2.7493 kPa → 27 133 ppm; LFL 3.1 % → 0.8753.
    const findings = assessLocation(
      roomSnapshot([container(substance(CAS.ethanol), 20, "L", "sealed")], { kind: "cold_room", airChangesPerHour: 0, volumeM3: 30, worstCase: designWorstCase(8) }),
    );
    const finding = byFingerprint(findings, "enclosure-lfl|room:7|substance:" + substance(CAS.ethanol).id + "|room_worst_case");
    expect(finding.storageUnitId).toBeNull();
    expect(finding.severity).toBe("high");
    expect(relativeDeviation(finding.ratio as number, 0.875263)).toBeLessThan(1e-5);
    expect(finding.title).toBe("Ethanol in room 2.115 could reach 87.5 % LFL at the room's worst case (8.0 °C)");
  });
});
