import { describe, expect, it } from "vitest";
import { assessLocation, DEFAULT_ASSESSMENT_SETTINGS, quantityLimitFromRow, type AssessmentSettings } from "@/lib/assessment/rules";
import { CAS, container, designWorstCase, relativeDeviation, roomSnapshot, substance, unitSnapshot } from "./fixtures";

const cabinet = { kind: "flammable_cabinet" as const, setRange: null, internalVolumeL: 450, code: "FC-1", worstCase: { inControl: designWorstCase(25), controlLost: null } };
const quantityFindings = (findings: ReturnType<typeof assessLocation>) => findings.filter((f) => f.rule === "quantity-limit");

describe("quantity-limit", () => {
  const acetone = substance(CAS.acetone); // NFPA IB (FP −20 °C, BP 56.1 °C)

  it("60 × 4 L of acetone in a flammable cabinet: 240 L over the 227 L (60 gal) Class I–II example limit — high", () => {
    const contents = Array.from({ length: 60 }, () => container(acetone, 4));
    const [finding] = quantityFindings(assessLocation(unitSnapshot(contents, cabinet)));
    expect(finding.severity).toBe("high");
    expect(finding.value).toBeCloseTo(240, 10);
    expect(finding.limitValue).toBeCloseTo(227.1247, 3);
    expect(relativeDeviation(finding.ratio as number, 240 / (60 * 3.785411784))).toBeLessThan(1e-12);
    expect(finding.unit).toBe("L");
    expect(finding.fingerprint).toBe("quantity-limit|unit:12|limit:example-cabinet-class-i-ii|in_control");
    expect(finding.containerIds).toHaveLength(60);
    expect(finding.title).toBe("Class IA, IB, IC, II liquids in FC-1 total 240 L, over the limit of 227 L (Flammable-liquid cabinet, Class I and II)");
    // The engine's roll-up agrees with the rule's total.
    const rollUp = finding.trace.parts[0];
    expect(rollUp.method).toBe("Quantity roll-up by liquid class");
    expect(rollUp.steps[0].result.value).toBeCloseTo(240, 10);
    // The 454 L total limit is at 53 %: below the 80 % warning.
    expect(quantityFindings(assessLocation(unitSnapshot(contents, cabinet)))).toHaveLength(1);
  });

  it("48 × 4 L = 192 L is 84.5 % of the limit: a low warning (at or above 80 %)", () => {
    const [finding] = quantityFindings(assessLocation(unitSnapshot(Array.from({ length: 48 }, () => container(acetone, 4)), cabinet)));
    expect(finding.severity).toBe("low");
    expect(finding.title).toBe("Class IA, IB, IC, II liquids in FC-1 total 192 L, 84.5 % of the limit of 227 L (Flammable-liquid cabinet, Class I and II)");
  });

  it("a cabinet limit does not apply to a refrigerator; water is not counted", () => {
    expect(quantityFindings(assessLocation(unitSnapshot(Array.from({ length: 60 }, () => container(acetone, 4)))))).toEqual([]);
    expect(quantityFindings(assessLocation(unitSnapshot(Array.from({ length: 100 }, () => container(substance(CAS.water), 4)), cabinet)))).toEqual([]);
  });

  it("room limits use the sprinklered allowance in a sprinklered room (IFC example: 120 gal, 240 gal sprinklered)", () => {
    const drums = [container(acetone, 200), container(acetone, 200), container(acetone, 100)];
    const room = { volumeM3: 300, floorAreaM2: 100, airChangesPerHour: 6, worstCase: designWorstCase(25) };
    const unsprinklered = quantityFindings(assessLocation(roomSnapshot(drums, { ...room, sprinklered: false })));
    expect(unsprinklered[0].severity).toBe("high");
    expect(unsprinklered[0].limitValue).toBeCloseTo(454.2494, 3);
    expect(unsprinklered[0].scenario).toBe("room_worst_case");
    const sprinklered = quantityFindings(assessLocation(roomSnapshot(drums, { ...room, sprinklered: true })));
    expect(sprinklered).toEqual([]); // 500/908.5 = 55 %
  });

  it("uses the organisation's own limits and counts litres from kilograms by the liquid density", () => {
    const settings: AssessmentSettings = {
      ...DEFAULT_ASSESSMENT_SETTINGS,
      quantities: {
        ...DEFAULT_ASSESSMENT_SETTINGS.quantities,
        limits: [{ id: 11, name: "Local rule: 10 L of Class IB per unit", scope: "storage_unit", liquidClasses: ["IB"], maxVolumeL: 10, sprinkleredMaxVolumeL: null, basis: "Local policy" }],
      },
    };
    // 9.414 kg of acetone at 784.5 kg/m³ (0.7845 g/cm³ at 25 °C, CRC Handbook 95th ed., Physical Constants of Organic Compounds) = 12 L.
    const [finding] = quantityFindings(assessLocation(unitSnapshot([container(acetone, 9.414, "kg")], { kind: "open_shelving", setRange: null }), settings));
    expect(finding.fingerprint).toBe("quantity-limit|unit:12|limit:11|in_control");
    expect(finding.value).toBeCloseTo(12, 10);
    expect(finding.severity).toBe("high");
  });

  it("turns a stored quantity-limit row into a setting", () => {
    expect(quantityLimitFromRow({ id: 4, scope: "flammable_cabinet", liquidClasses: ["IA", "IB"], maxVolumeL: 100, sprinkleredMaxVolumeL: null, basis: "Local code §12" })).toEqual({
      id: 4,
      name: "Flammable-liquid cabinet, Class IA, IB",
      scope: "flammable_cabinet",
      liquidClasses: ["IA", "IB"],
      maxVolumeL: 100,
      sprinkleredMaxVolumeL: null,
      basis: "Local code §12",
    });
  });
});
