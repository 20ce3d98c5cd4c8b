import { describe, expect, it } from "vitest";
import { assessLocation } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, relativeDeviation, roomSnapshot, substance } from "./fixtures";

describe("oxygen-depletion and co2-exposure", () => {
  it("10 L of liquid nitrogen lost into a 60 m³ room: 6.925 m³ of gas, O₂ 18.49 % — below 19.5 %, high", () => {
    // By hand: 10 L × 806.5 g/L (UW-Madison LN₂ data) = 8065 g = 287.89 mol × 24.055 L/mol (20 °C) = 6.925 m³
    // (expansion ≈ 692, cf. "about 700", Univ. of Oxford S4/03); O₂ = 20.9 × (1 − 6.925/60) = 18.488 %.
    const findings = assessLocation(roomSnapshot([container(substance(CAS.nitrogen), 10, "L", "sealed", { containerId: 3 })], { volumeM3: 60, worstCase: designWorstCase(20) }));
    const oxygen = findings.find((f) => f.rule === "oxygen-depletion");
    expect(oxygen?.severity).toBe("high");
    expect(relativeDeviation(oxygen?.value as number, 18.488)).toBeLessThan(2e-4);
    expect(oxygen?.limitValue).toBe(19.5);
    expect(oxygen?.ratio).toBeCloseTo(19.5 / (oxygen?.value as number), 12);
    expect(oxygen?.unit).toBe("% O₂");
    expect(oxygen?.fingerprint).toBe("oxygen-depletion|room:7|cryogen-inventory|room_worst_case");
    expect(oxygen?.containerIds).toEqual([3]);
    expect(oxygen?.title).toBe("Oxygen in room 2.115 could fall to 18.5 % if its cryogens were all released (room worst case)");
    // Liquid rules leave the cryogen alone: it is far above its boiling point, but that is what a cryogen does.
    expect(findings.some((f) => f.rule === "boiling-point" || f.rule === "flash-point")).toBe(false);
  });

  it("the linear displacement formula of the Univ. of Oxford Safety Office (S4/03 App. 1): V_gas/V_room = 0.2 gives 16.7 % from 20.9 % — critical below 18 %", () => {
    // 12 m³ of gas in 60 m³: 20.9 × 0.8 = 16.72 %. 12 m³ at 20 °C = 498.86 mol of N₂ = 13.975 kg = 17.33 L of LN₂.
    const litres = ((12000 / 24.05529) * 28.014) / 806.5;
    const oxygen = assessLocation(roomSnapshot([container(substance(CAS.nitrogen), litres)], { volumeM3: 60, worstCase: designWorstCase(20) })).find((f) => f.rule === "oxygen-depletion");
    expect(oxygen?.value as number).toBeCloseTo(16.72, 3);
    expect(oxygen?.severity).toBe("critical");
    expect(oxygen?.limitValue).toBe(18);
  });

  it("5 lb (2.27 kg) of dry ice in a sealed 22.5 m³ cold room: 1.24 m³ CO₂ = 55 000 ppm, above the 40 000 ppm IDLH — critical", () => {
    // Worked illustration (derived): 2.27 kg × 0.546 m³/kg (ideal gas at 20 °C) = 1.24 m³ → 5.5 % ≈ 55 000 ppm
    // (the dry-ice example of the research notes; NIOSH IDLH 40 000 ppm). By hand here: 2270/44.009 × 24.055 L =
    // 1.2408 m³; 1.2408/22.5 × 10⁶ = 55 146 ppm. O₂ = 20.9 × (1 − 0.05515) = 19.75 %: no oxygen finding —
    // CO₂ is toxic long before it is an asphyxiant.
    const findings = assessLocation(
      roomSnapshot([container(substance(CAS.carbonDioxide), 2.27, "kg", "sealed", { containerId: 8 })], { kind: "cold_room", volumeM3: 22.5, airChangesPerHour: 0, worstCase: designWorstCase(4) }),
    );
    const co2 = findings.find((f) => f.rule === "co2-exposure");
    expect(co2?.severity).toBe("critical");
    expect(relativeDeviation(co2?.value as number, 55146)).toBeLessThan(2e-4);
    expect(co2?.limitValue).toBe(40000);
    expect(co2?.unit).toBe("ppm");
    expect(co2?.title).toBe("2.27 kg of dry ice in room 2.115 could raise CO₂ to 55,100 ppm, 138 % of the NIOSH IDLH, if it all sublimes");
    expect(co2?.trace.parts[0].method).toBe("Dry ice subliming in a closed room");
    expect(findings.some((f) => f.rule === "oxygen-depletion")).toBe(false);
  });

  it("1 kg of dry ice in the same room: 24 300 ppm exceeds the TWA only — moderate", () => {
    const co2 = assessLocation(roomSnapshot([container(substance(CAS.carbonDioxide), 1, "kg")], { volumeM3: 22.5, worstCase: designWorstCase(20) })).find((f) => f.rule === "co2-exposure");
    expect(co2?.severity).toBe("moderate");
    expect(co2?.limitValue).toBe(5000);
  });

  it("without a room volume it reports the gap instead", () => {
    const findings = assessLocation(roomSnapshot([container(substance(CAS.nitrogen), 10)], { volumeM3: null }));
    expect(findings.map((f) => f.fingerprint)).toContain("missing-data|room:7|room-volume/no-room-volume|room_worst_case");
  });
});
