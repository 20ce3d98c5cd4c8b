import { describe, expect, it } from "vitest";
import { controlLostWorstCase, selectWorstCase, type WorstCaseCandidate } from "@/lib/temperatures/worst-case";

const heatWave = Date.UTC(2026, 6, 14, 15, 40);

describe("worst-case temperature", () => {
  it("takes the highest of the design maximum, the highest reading and an open excursion peak, and says where it came from", () => {
    const candidates: WorstCaseCandidate[] = [
      { kind: "design", tempC: 28 },
      { kind: "reading", tempC: 31.2, atMs: heatWave, sensor: "S-204" },
    ];
    const worst = selectWorstCase(candidates)!;
    expect(worst.tempC).toBe(31.2);
    expect(worst.description).toBe("31.2 °C, reading of 2026-07-14 15:40 UTC from sensor S-204");
    expect(worst.candidates).toHaveLength(2);
  });

  it("prefers an open excursion's peak when it is the highest", () => {
    const worst = selectWorstCase([
      { kind: "design", tempC: 8 },
      { kind: "reading", tempC: 6.5, atMs: heatWave, sensor: "S-11" },
      { kind: "excursion", tempC: 19.5, atMs: heatWave, sensor: "S-11" },
    ])!;
    expect(worst.source.kind).toBe("excursion");
    expect(worst.description).toMatch(/^19.5 °C, peak of the open excursion on sensor S-11/);
  });

  it("keeps the design value on a tie, and falls back to it with no readings", () => {
    expect(selectWorstCase([{ kind: "reading", tempC: 30, atMs: heatWave, sensor: "S-1" }, { kind: "design", tempC: 30 }])!.source.kind).toBe("design");
    expect(selectWorstCase([{ kind: "design", tempC: 27 }])!.description).toBe("27.0 °C, design maximum");
    expect(selectWorstCase([])).toBeNull();
    expect(selectWorstCase([{ kind: "design", tempC: Number.NaN }])).toBeNull();
  });

  it("assesses a failed refrigerator at its room's worst case ('control lost')", () => {
    const unit = selectWorstCase([{ kind: "design", tempC: 8 }]);
    const room = selectWorstCase([{ kind: "design", tempC: 28 }, { kind: "reading", tempC: 29.4, atMs: heatWave, sensor: "S-2" }]);
    const lost = controlLostWorstCase(unit, room)!;
    expect(lost.tempC).toBe(29.4);
    expect(lost.description).toMatch(/as if the unit had failed/);
    // A unit whose own worst case is above the room's keeps its own.
    const hot = selectWorstCase([{ kind: "excursion", tempC: 35, atMs: heatWave, sensor: "S-9" }]);
    expect(controlLostWorstCase(hot, room)!.tempC).toBe(35);
    expect(controlLostWorstCase(unit, null)).toBe(unit);
  });
});
