import { describe, expect, it } from "vitest";
import { DEFAULT_ASSESSMENT_SETTINGS } from "@/lib/assessment/rules";
import { DEFAULT_REASONS } from "@/lib/assessment/rules/default-reasons";

const HOW_FOUND = /memory|recalled|not read|estimated by/i;

describe("the reasons and sources of the default thresholds", () => {
  it("give every default a reasoning and a source that cites a publication or says common practice", () => {
    expect(DEFAULT_REASONS.length).toBeGreaterThanOrEqual(20);
    for (const reason of DEFAULT_REASONS) {
      expect(reason.reasoning.length).toBeGreaterThan(20);
      expect(reason.source).toMatch(/common practice|OSHA|NIOSH|NFPA|ASTM|EPA|IFC|IEC|GHS|Prudent Practices|SOM036a|Psat/i);
      expect(reason.source).not.toMatch(HOW_FOUND);
    }
  });

  it("never tell users how a value was found, in the defaults' own source notes either", () => {
    const sources = Object.values(DEFAULT_ASSESSMENT_SETTINGS).flatMap((group) => ("source" in group ? [group.source] : []));
    const bases = DEFAULT_ASSESSMENT_SETTINGS.quantities.limits.map((limit) => limit.basis);
    for (const text of [...sources, ...bases]) expect(text).not.toMatch(HOW_FOUND);
  });

  it("state the defaults the rules apply: 10 / 25 / 100 % LFL, a 10 °C margin, low in a closed unit free of ignition sources", () => {
    const value = (threshold: string) => DEFAULT_REASONS.find((r) => r.threshold === threshold)?.value;
    expect(value("Moderate from")).toBe("10 % of the LFL");
    expect(value("High from")).toBe("25 % of the LFL");
    expect(value("Critical from")).toBe("100 % of the LFL");
    expect(value("Margin below the flash point")).toBe("10 °C");
    const closed = DEFAULT_REASONS.find((r) => r.threshold === "In a closed unit free of ignition sources")!;
    expect(closed.severity).toBe("low");
    expect(closed.source).toMatch(/NFPA 45 \(2004 edition\), annex A\.12\.2\.2\.2\.1/);
  });
});
