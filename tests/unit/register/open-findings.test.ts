import { describe, expect, it } from "vitest";
import { compareWorstFirst, groupByUnit, ratioPercent, registerHrefFor, splitByScope, worstSeverity, type OpenFindingRow } from "@/lib/register/open-findings";

function row(id: number, overrides: Partial<OpenFindingRow> = {}): OpenFindingRow {
  return { id, severity: "low", status: "open", title: `Finding ${id}`, scenario: "spill", value: null, limit: null, ratio: null, unit: null, roomId: 1, storageUnitId: null, unitCode: null, visible: true, ...overrides };
}

describe("worstSeverity", () => {
  it("picks the worst, or null for none", () => {
    expect(worstSeverity(["low", "high", "moderate"])).toBe("high");
    expect(worstSeverity(["moderate", "critical"])).toBe("critical");
    expect(worstSeverity([])).toBeNull();
  });
});

describe("compareWorstFirst", () => {
  it("orders by severity, then ratio (none last), then the oldest id", () => {
    const rows = [row(5, { severity: "moderate" }), row(4, { severity: "moderate", ratio: 0.4 }), row(3, { severity: "critical", ratio: 1.2 }), row(2, { severity: "moderate", ratio: 0.9 }), row(1, { severity: "moderate" })];
    expect(rows.sort(compareWorstFirst).map((r) => r.id)).toEqual([3, 2, 4, 1, 5]);
  });

  it("puts a limit with nothing left of it (an infinite ratio) first within its severity", () => {
    expect([row(1, { severity: "high", ratio: 3 }), row(2, { severity: "high", ratio: Infinity })].sort(compareWorstFirst).map((r) => r.id)).toEqual([2, 1]);
  });
});

describe("splitByScope", () => {
  it("lists what the reader may open and only counts the rest, with its worst severity", () => {
    const here = splitByScope([row(1, { severity: "low" }), row(2, { severity: "critical", visible: false }), row(3, { severity: "high" }), row(4, { severity: "moderate", visible: false })], "own");
    expect(here.items.map((item) => item.id)).toEqual([3, 1]);
    expect(here.items[0]).not.toHaveProperty("visible");
    expect(here.hidden).toEqual({ count: 2, worst: "critical" });
    expect(here.scope).toBe("own");
  });

  it("has nothing hidden when every row is visible", () => {
    expect(splitByScope([row(1)], "all").hidden).toEqual({ count: 0, worst: null });
  });
});

describe("groupByUnit", () => {
  it("orders the groups by their worst finding; on a tie the room's own first, then units in code order (numbers in order)", () => {
    const groups = groupByUnit([
      row(1, { storageUnitId: 12, unitCode: "FR-10" }),
      row(2),
      row(3, { storageUnitId: 11, unitCode: "FR-2" }),
      row(4, { storageUnitId: 12, unitCode: "FR-10" }),
      row(5, { storageUnitId: 13, unitCode: "SH-1", severity: "critical" }),
    ]);
    expect(groups.map((g) => [g.unitCode, g.items.map((i) => i.id)])).toEqual([
      ["SH-1", [5]],
      [null, [2]],
      ["FR-2", [3]],
      ["FR-10", [1, 4]],
    ]);
  });
});

describe("ratioPercent", () => {
  it("writes the ratio to the limit as a percentage", () => {
    const format = (n: number) => String(Math.round(n));
    expect(ratioPercent(2.1, format)).toBe("210 %");
    expect(ratioPercent(0.85, format)).toBe("85 %");
    expect(ratioPercent(Infinity, format)).toBe("∞ %");
    expect(ratioPercent(null, format)).toBeNull();
  });
});

describe("registerHrefFor", () => {
  it("filters the register to the place", () => {
    expect(registerHrefFor({ kind: "room", roomId: 7 })).toBe("/register?roomId=7");
    expect(registerHrefFor({ kind: "unit", storageUnitId: 12 })).toBe("/register?storageUnitId=12");
    expect(registerHrefFor({ kind: "container", containerId: 301 })).toBe("/register?containerId=301");
  });
});
