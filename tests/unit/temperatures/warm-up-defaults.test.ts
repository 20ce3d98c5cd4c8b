/**
 * The default warm-up time constants per kind of unit. Check values: the holding times of the USDA
 * Food Safety and Inspection Service fact sheet "Keeping Food Safe During an Emergency" (a closed
 * refrigerator about 4 hours, a half-full freezer about 24 hours), taken as τ; the −80 °C freezer's
 * 8 hours is common practice. The lower-bound argument is checked by hand with Newton's law.
 */
import { describe, expect, it } from "vitest";
import { STORAGE_UNIT_KINDS } from "@/db/enums";
import { isTemperatureControlled } from "@/lib/assessment/rules/context";
import { warmUpMinutesToReach } from "@/lib/hazard";
import { defaultWarmUpReason, formatTauMin, WARM_UP_DEFAULTS, warmUpDefaultFor } from "@/lib/temperatures/warm-up-defaults";

describe("default warm-up time constants", () => {
  it("has one for every kind that is temperature-controlled by its kind, and one for any other unit with a set range", () => {
    const controlledKinds = STORAGE_UNIT_KINDS.filter((kind) => isTemperatureControlled({ kind, setRange: null } as Parameters<typeof isTemperatureControlled>[0]));
    expect(controlledKinds.map((kind) => warmUpDefaultFor(kind).kind)).toEqual(controlledKinds);
    expect(warmUpDefaultFor("other").kind).toBe("controlled_other");
    expect(warmUpDefaultFor("flammable_cabinet").kind).toBe("controlled_other");
  });

  it("takes the published holding times as τ: 4 h for refrigerators (USDA FSIS), 24 h for a −20 °C freezer (USDA FSIS, half full), 8 h for a −80 °C freezer (common practice)", () => {
    expect(warmUpDefaultFor("domestic_refrigerator").tauMin).toBe(240);
    expect(warmUpDefaultFor("flammable_storage_refrigerator").tauMin).toBe(240);
    expect(warmUpDefaultFor("explosion_proof_refrigerator").tauMin).toBe(240);
    expect(warmUpDefaultFor("freezer_minus_20").tauMin).toBe(1440);
    expect(warmUpDefaultFor("freezer_minus_80").tauMin).toBe(480);
    for (const d of WARM_UP_DEFAULTS) expect(d.source).toMatch(/USDA Food Safety and Inspection Service|Common practice/);
  });

  it("is a lower bound: with τ = 4 h a refrigerator at 3 °C in a 20 °C room passes 4 °C long before the 4 hours (by hand: 4 h · ln(17/16) = 14.6 min)", () => {
    const minutes = warmUpMinutesToReach({ roomTempC: 20, startTempC: 3, tauMin: 240 }, 4)!;
    expect(minutes).toBeCloseTo(240 * Math.log(17 / 16), 6);
    expect(minutes).toBeCloseTo(14.55, 2);
    expect(minutes).toBeLessThan(240);
  });

  it("says in one sentence what the default is, for which kind, and its source", () => {
    expect(defaultWarmUpReason("freezer_minus_20")).toMatch(/^τ = 24 h, default for a −20 °C freezer \(no usable recorded failure of this unit\): A half-full freezer holds its temperature for about 24 hours/);
    expect(defaultWarmUpReason("other")).toMatch(/^τ = 4 h, default for a unit with a set range/);
  });
});

describe("τ for people", () => {
  it("is written in hours and minutes", () => {
    expect(formatTauMin(240)).toBe("4 h");
    expect(formatTauMin(242.2)).toBe("4 h 2 min");
    expect(formatTauMin(1440)).toBe("24 h");
    expect(formatTauMin(45)).toBe("45 min");
    expect(formatTauMin(43_200)).toBe("720 h");
  });
});
