/**
 * The storage planner's order and its "safer than": the verdict first, then the worst severity,
 * then the time to danger (none ranks best), then nearness; safer means a lower worst severity or
 * the same with a longer time to danger, whatever the verdict. Invented places.
 */
import { describe, expect, it } from "vitest";
import { comparePlaces, liquidVolumeL, saferThan, type StoragePlanItem } from "@/lib/assessment/storage-plan";
import type { StoredContent } from "@/lib/assessment/rules";

let next = 0;
function place(overrides: Partial<StoragePlanItem>): StoragePlanItem {
  next += 1;
  return {
    storageUnitId: next,
    code: `U-${next}`,
    name: "Test unit",
    unitKind: "flammable_cabinet",
    roomId: 1,
    roomCode: "R-1",
    roomName: "Test room",
    siteId: 1,
    siteName: "Test site",
    verdict: "raises",
    worstSeverity: "moderate",
    maxRatio: null,
    timeToDanger: null,
    raised: 1,
    nearness: "other_site",
    reason: "",
    ...overrides,
  };
}

const sorted = (items: StoragePlanItem[]) => [...items].sort(comparePlaces).map((i) => i.code);

describe("comparePlaces", () => {
  it("puts nothing raised before already flagged before raises, whatever the severity and nearness", () => {
    const raises = place({ code: "raises", verdict: "raises", worstSeverity: "low", nearness: "same_room" });
    const flagged = place({ code: "flagged", verdict: "already_flagged", worstSeverity: "critical", nearness: "same_site" });
    const clear = place({ code: "clear", verdict: "no_findings", worstSeverity: null, nearness: "other_site" });
    expect(sorted([raises, flagged, clear])).toEqual(["clear", "flagged", "raises"]);
  });

  it("then the lowest worst severity, then the longest time to danger with none best, then nearness", () => {
    const high = place({ code: "high", worstSeverity: "high", nearness: "same_room" });
    const soon = place({ code: "soon", worstSeverity: "moderate", timeToDanger: { minutes: 30, threshold: "LFL", tempC: 12 } });
    const later = place({ code: "later", worstSeverity: "moderate", timeToDanger: { minutes: 240, threshold: "LFL", tempC: 12 } });
    const never = place({ code: "never", worstSeverity: "moderate", timeToDanger: null, nearness: "other_site" });
    const neverNear = place({ code: "never-near", worstSeverity: "moderate", timeToDanger: null, nearness: "same_site" });
    expect(sorted([high, soon, later, never, neverNear])).toEqual(["never-near", "never", "later", "soon", "high"]);
  });
});

describe("saferThan", () => {
  it("compares the worst severity first: an already critical place is not safer than one that would raise high", () => {
    const critical = place({ verdict: "already_flagged", worstSeverity: "critical" });
    const high = place({ verdict: "raises", worstSeverity: "high" });
    expect(saferThan(high, critical)).toBe(true);
    expect(saferThan(critical, high)).toBe(false);
    expect(saferThan(place({ verdict: "no_findings", worstSeverity: null }), place({ worstSeverity: "low" }))).toBe(true);
  });

  it("at the same severity, only a longer time to danger is safer", () => {
    const a = place({ verdict: "already_flagged", worstSeverity: "high" });
    const b = place({ verdict: "raises", worstSeverity: "high" });
    expect(saferThan(a, b)).toBe(false);
    const later = place({ worstSeverity: "high", timeToDanger: { minutes: 120, threshold: "LFL", tempC: 10 } });
    const sooner = place({ worstSeverity: "high", timeToDanger: { minutes: 20, threshold: "LFL", tempC: 10 } });
    expect(saferThan(later, sooner)).toBe(true);
    expect(saferThan(sooner, later)).toBe(false);
  });
});

describe("liquidVolumeL", () => {
  const content = (density: number | null) => ({ kind: "substance", substance: { liquidDensityKgPerM3: density } }) as unknown as StoredContent;
  it("takes volumes as given and masses through the liquid density (kg/m³ = g/L)", () => {
    expect(liquidVolumeL({ amount: 250, amountUnit: "mL", content: content(null) })).toBe(0.25);
    expect(liquidVolumeL({ amount: 2, amountUnit: "L", content: content(null) })).toBe(2);
    // 500 g at an invented density of 800 kg/m³: 0.625 L; 1 kg: 1.25 L.
    expect(liquidVolumeL({ amount: 500, amountUnit: "g", content: content(800) })).toBe(0.625);
    expect(liquidVolumeL({ amount: 1, amountUnit: "kg", content: content(800) })).toBe(1.25);
    expect(liquidVolumeL({ amount: 1, amountUnit: "kg", content: content(null) })).toBeNull();
  });
});
