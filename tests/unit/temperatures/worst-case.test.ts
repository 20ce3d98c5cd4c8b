import { describe, expect, it } from "vitest";
import { controlledUnitWorstCase, controlLostWorstCase, highestReadingOutside, insideExcursion, selectWorstCase, type UnitExcursion, type WorstCaseCandidate } from "@/lib/temperatures/worst-case";

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

describe("a controlled unit in control and with control lost", () => {
  // Invented demo figures: a flammable-storage refrigerator (set range 2–8 °C) that failed over a weekend.
  const MIN = 60_000;
  const friday = Date.UTC(2026, 2, 6, 17, 0);
  const weekend: UnitExcursion = { sensor: "FSR-1", startMs: friday + 120 * MIN, endMs: friday + 175 * MIN, peakTempC: 21.7, peakAtMs: friday + 150 * MIN };
  const doorLeftOpen: UnitExcursion = { sensor: "FSR-1", startMs: friday + 400 * MIN, endMs: friday + 440 * MIN, peakTempC: 10.2, peakAtMs: friday + 410 * MIN };
  const room = selectWorstCase([{ kind: "design", tempC: 20 }]);

  it("tells a reading inside an excursion from one outside: from the start up to, not including, the end; an open one to now", () => {
    expect(insideExcursion(weekend.startMs, weekend)).toBe(true);
    expect(insideExcursion(weekend.endMs! - 1, weekend)).toBe(true);
    expect(insideExcursion(weekend.endMs!, weekend)).toBe(false); // the first reading back at or below the threshold
    expect(insideExcursion(weekend.startMs - 1, weekend)).toBe(false);
    expect(insideExcursion(friday + 10_000 * MIN, { startMs: weekend.startMs, endMs: null })).toBe(true);
  });

  it("takes the highest reading outside every excursion", () => {
    const readings = [
      { atMs: friday, tempC: 4.1 },
      { atMs: friday + 60 * MIN, tempC: 7.9 },
      { atMs: friday + 150 * MIN, tempC: 21.7 },
      { atMs: friday + 175 * MIN, tempC: 7.6 },
      { atMs: friday + 410 * MIN, tempC: 10.2 },
      { atMs: friday + 600 * MIN, tempC: 7.9 },
    ];
    expect(highestReadingOutside(readings, [weekend, doorLeftOpen])).toEqual({ atMs: friday + 600 * MIN, tempC: 7.9 });
    expect(highestReadingOutside(readings, [])).toEqual({ atMs: friday + 150 * MIN, tempC: 21.7 });
    expect(highestReadingOutside(readings.slice(2, 3), [weekend])).toBeNull();
  });

  it("in control: the highest reading outside the excursions, saying they were excluded; control lost: the highest peak above the room", () => {
    const { inControl, controlLost } = controlledUnitWorstCase({
      setMaxC: 8,
      highestOutside: { kind: "reading", tempC: 7.9, atMs: friday + 600 * MIN, sensor: "FSR-1" },
      excursions: [weekend, doorLeftOpen],
      room,
      lookBackDays: 365,
    });
    // The set range's 8.0 °C is above 7.9 °C, so the design value stands, with the exclusion said.
    expect(inControl.tempC).toBe(8);
    expect(inControl.description).toBe(
      "8.0 °C, upper end of the set range; the readings inside 2 excursions in the last 365 days are excluded (they count as control lost)",
    );
    expect(inControl.excludedExcursions).toBe(2);
    expect(controlLost.tempC).toBe(21.7);
    expect(controlLost.description).toBe(
      "21.7 °C, peak of the excursion on sensor FSR-1 (2026-03-06 19:30 UTC, ended), the highest of the unit's excursions in the last 365 days; above the room's worst case of 20.0 °C",
    );
  });

  it("names the reading when it is above the set range, and takes the room's worst case when it is above every peak", () => {
    const { inControl, controlLost } = controlledUnitWorstCase({
      setMaxC: 5,
      highestOutside: { kind: "reading", tempC: 7.9, atMs: friday + 600 * MIN, sensor: "FSR-1" },
      excursions: [doorLeftOpen],
      room,
      lookBackDays: 365,
    });
    expect(inControl.tempC).toBe(7.9);
    expect(inControl.description).toBe(
      "7.9 °C, highest reading in the last 365 days outside 1 excursion (excluded: they count as control lost), 2026-03-07 03:00 UTC from sensor FSR-1",
    );
    expect(controlLost.tempC).toBe(20);
    expect(controlLost.description).toBe("20.0 °C, design maximum (the room's worst case, as if the unit had failed)");
  });

  it("without excursions keeps the plain reading text, and never puts control lost below in control", () => {
    const { inControl, controlLost } = controlledUnitWorstCase({
      setMaxC: 8,
      highestOutside: { kind: "reading", tempC: 9.4, atMs: friday, sensor: "FSR-2" },
      excursions: [],
      room: selectWorstCase([{ kind: "design", tempC: 6 }]),
      lookBackDays: 90,
    });
    expect(inControl.description).toBe("9.4 °C, reading of 2026-03-06 17:00 UTC from sensor FSR-2");
    expect(controlLost).toBe(inControl);
  });
});
