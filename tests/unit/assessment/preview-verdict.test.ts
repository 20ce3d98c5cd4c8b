import { describe, expect, it } from "vitest";
import { previewVerdict, titleInSentence, verdictSentence, type VerdictFacts } from "@/lib/assessment/preview-verdict";

const base: VerdictFacts = { mode: "store", unitCode: "FR-1", contentName: "diethyl ether", raised: [], current: [], otherStandingCount: 0, cleared: [], sourceUnitCode: null };
const etherCritical = { severity: "critical" as const, title: "Diethyl ether in FR-1 could reach 4,630 % LFL if the refrigerator fails (control lost, 28.0 °C)", outcome: "unchanged" as const };

describe("titleInSentence", () => {
  it("lower-cases only the library name the title capitalised", () => {
    expect(titleInSentence("Diethyl ether in FR-1 could reach 2,210 % LFL.", ["diethyl ether"])).toBe("diethyl ether in FR-1 could reach 2,210 % LFL");
    expect(titleInSentence("Open containers in FR-1 could reach 5,280 % LFL together", ["acetone"])).toBe("open containers in FR-1 could reach 5,280 % LFL together");
    expect(titleInSentence("N,N-dimethylformamide in FC-4 is above its flash point", ["N,N-dimethylformamide"])).toBe("N,N-dimethylformamide in FC-4 is above its flash point");
    expect(titleInSentence("IA+IB liquids in FC-1 total 120 L", ["acetone"])).toBe("IA+IB liquids in FC-1 total 120 L");
  });
});

describe("the verdict and its sentence", () => {
  it("never says nothing when the place is already flagged for it", () => {
    const facts = { ...base, current: [etherCritical, { severity: "moderate" as const, title: "Diethyl ether in FR-1 is above its flash point of −45.0 °C", outcome: "unchanged" as const }] };
    expect(previewVerdict(facts)).toBe("already_flagged");
    expect(verdictSentence(facts)).toBe(
      "Already critical here: diethyl ether in FR-1 could reach 4,630 % LFL if the refrigerator fails (control lost, 28.0 °C). Storing more keeps it so. 1 other open finding here concerns diethyl ether too.",
    );
    expect(verdictSentence({ ...facts, mode: "edit", current: [etherCritical] })).toBe(
      "Already critical here: diethyl ether in FR-1 could reach 4,630 % LFL if the refrigerator fails (control lost, 28.0 °C). Saving these changes keeps it so.",
    );
  });

  it("names the worst new or worse finding, and what already stands", () => {
    const facts: VerdictFacts = {
      ...base,
      mode: "move",
      unitCode: "FSR-1",
      raised: [
        { severity: "critical", title: "Open containers in FSR-1 could reach 120 % LFL together", isNew: false, previous: { severity: "high" } },
        { severity: "moderate", title: "Diethyl ether in FSR-1 is above its flash point", isNew: true, previous: null },
      ],
      current: [{ severity: "high", title: "Diethyl ether in FSR-1 could reach 90 % LFL", outcome: "unchanged" }],
      cleared: [{ severity: "critical", title: "Diethyl ether (GHS category 1, NFPA class IA) is stored in FR-1, whose interior has ignition sources" }],
      sourceUnitCode: "FR-1",
    };
    expect(previewVerdict(facts)).toBe("raises");
    expect(verdictSentence(facts)).toBe(
      "Moving it here would make a high finding critical: open containers in FSR-1 could reach 120 % LFL together. 1 more would be new or worse. 1 finding about diethyl ether is already open here. Moving it out clears a critical finding at FR-1: diethyl ether (GHS category 1, NFPA class IA) is stored in FR-1, whose interior has ignition sources.",
    );
    expect(verdictSentence({ ...base, raised: [{ severity: "high", title: "Diethyl ether in FR-1 could reach 40 % LFL", isNew: false, previous: { severity: "high" } }] })).toBe(
      "Storing this here would make a high finding worse: diethyl ether in FR-1 could reach 40 % LFL.",
    );
  });

  it("says nothing is flagged about it only when nothing is, and counts what concerns other contents", () => {
    expect(previewVerdict(base)).toBe("no_findings");
    expect(verdictSentence({ ...base, contentName: "water", otherStandingCount: 9 })).toBe(
      "Storing this here would raise no finding, and none is open at FR-1 about water. 9 open findings at FR-1 or in its room concern other contents.",
    );
    // An edit that empties the bottle clears what stood about it.
    const emptied = { ...base, mode: "edit" as const, current: [{ ...etherCritical, outcome: "cleared" as const }] };
    expect(previewVerdict(emptied)).toBe("no_findings");
    expect(verdictSentence(emptied)).toBe("Saving these changes would raise no finding and would clear the one open at FR-1 about diethyl ether.");
  });
});
