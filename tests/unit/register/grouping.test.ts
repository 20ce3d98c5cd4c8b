import { describe, expect, it } from "vitest";
import { compareWorstFirst, findingGroupKey, groupFindings, lineValues, type GroupableFinding } from "@/lib/register/grouping";

// The demo's FR-1 (a domestic refrigerator, 9.6 °C in control, 28 °C with control lost), as assessed:
// invented demo data, values as the register stores them.
const fr1: GroupableFinding[] = [
  { id: 1, fingerprint: "enclosure-lfl|unit:5|substance:7|in_control", scenario: "in_control", severity: "critical", ratio: 22.09, value: 2209.1, unit: "% LFL" },
  { id: 2, fingerprint: "enclosure-lfl|unit:5|substance:7|control_lost", scenario: "control_lost", severity: "critical", ratio: 46.32, value: 4631.7, unit: "% LFL" },
  { id: 3, fingerprint: "flash-point|unit:5|substance:7|in_control", scenario: "in_control", severity: "moderate", ratio: null, value: 9.6, unit: "°C" },
  { id: 4, fingerprint: "flash-point|unit:5|substance:7|control_lost", scenario: "control_lost", severity: "moderate", ratio: null, value: 28, unit: "°C" },
  { id: 5, fingerprint: "enclosure-lfl|unit:5|open-containers|in_control", scenario: "in_control", severity: "critical", ratio: 28.09, value: 2809, unit: "% LFL" },
  { id: 6, fingerprint: "enclosure-lfl|unit:5|open-containers|control_lost", scenario: "control_lost", severity: "critical", ratio: 52.76, value: 5276, unit: "% LFL" },
  { id: 7, fingerprint: "ignition-source-unit|unit:5|substance:7|in_control", scenario: "in_control", severity: "critical", ratio: null, value: -45, unit: "°C" },
  { id: 8, fingerprint: "missing-data|unit:5|substance:9/no-lfl|in_control", scenario: "in_control", severity: "moderate", ratio: null, value: null, unit: null },
];

describe("findingGroupKey", () => {
  it("drops the scenario and keeps rule, location and subject (with its detail)", () => {
    expect(findingGroupKey("enclosure-lfl|unit:5|substance:7|control_lost")).toBe("enclosure-lfl|unit:5|substance:7");
    expect(findingGroupKey("missing-data|unit:5|substance:9/no-lfl|in_control")).toBe("missing-data|unit:5|substance:9/no-lfl");
    expect(findingGroupKey("spill-lfl|room:3|substance:7|spill")).toBe("spill-lfl|room:3|substance:7");
  });
});

describe("groupFindings", () => {
  const lines = groupFindings(fr1);

  it("makes one line per rule, location and subject, and loses or repeats no finding", () => {
    expect(lines.map((l) => l.key)).toEqual([
      "enclosure-lfl|unit:5|open-containers",
      "enclosure-lfl|unit:5|substance:7",
      "ignition-source-unit|unit:5|substance:7",
      "flash-point|unit:5|substance:7",
      "missing-data|unit:5|substance:9/no-lfl",
    ]);
    expect(lines.flatMap((l) => l.findingIds).sort((a, b) => a - b)).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });

  it("heads each line with its worst finding (severity, then ratio) and lists the others worst first", () => {
    const ether = lines[1];
    expect(ether.lead.id).toBe(2);
    expect(ether.others.map((f) => f.id)).toEqual([1]);
    expect(ether.findingIds).toEqual([2, 1]);
    expect(lineValues(ether)).toBe("4,630 % LFL if control is lost · 2,210 % LFL in control");
    // Flash point: same severity, no ratio: the hotter scenario leads.
    expect(lines[3].lead.id).toBe(4);
    expect(lineValues(lines[3])).toBe("28 °C if control is lost · 9.6 °C in control");
    // A finding without a value shows its scenario alone.
    expect(lineValues(lines[4])).toBe("in control");
  });

  it("puts a higher severity first whatever the ratio, and a finding with a ratio before one without", () => {
    const high = { id: 10, fingerprint: "a|unit:1|x|in_control", scenario: "in_control", severity: "high" as const, ratio: 90, value: 1, unit: "ppm" };
    const critical = { ...high, id: 11, severity: "critical" as const, ratio: 1.1 };
    const noRatio = { ...critical, id: 12, ratio: null };
    expect([high, noRatio, critical].sort(compareWorstFirst).map((f) => f.id)).toEqual([11, 12, 10]);
  });

  it("keeps a lone finding as a line of its own, and an empty list as no lines", () => {
    expect(groupFindings([fr1[6]])).toEqual([{ key: "ignition-source-unit|unit:5|substance:7", lead: fr1[6], others: [], findingIds: [7] }]);
    expect(groupFindings([])).toEqual([]);
  });
});
