import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { outcomeNote, verdictSeverity, WhatIfVerdict, type PreviewData } from "@/app/(app)/inventory/what-if-panel";

const flagged: PreviewData = {
  findings: [],
  current: [
    { id: 49, severity: "critical", status: "open", title: "Diethyl ether in FR-1 could reach 4,630 % LFL if the refrigerator fails (control lost, 28.0 °C)", ratio: 46.3, outcome: "unchanged", canOpen: true },
    { id: 52, severity: "moderate", status: "risk_accepted", title: "Diethyl ether in FR-1 is above its flash point of −45.0 °C", ratio: null, outcome: "unchanged", canOpen: false },
  ],
  verdict: "already_flagged",
  verdictSentence: "Already critical here: diethyl ether in FR-1 could reach 4,630 % LFL if the refrigerator fails (control lost, 28.0 °C). Storing more keeps it so.",
  cleared: [],
};

describe("the what-if's verdict on screen", () => {
  it("shows an already flagged place in the worst severity's colour with the word, the sentence and links to the register", () => {
    expect(verdictSeverity(flagged)).toBe("critical");
    const html = renderToStaticMarkup(createElement(WhatIfVerdict, { data: flagged, afterword: "You can still save." }));
    expect(html).toContain("Already flagged here");
    expect(html).toContain("(severity critical)");
    expect(html).toContain("text-sev-critical");
    expect(html).toContain(flagged.verdictSentence);
    expect(html).toContain('href="/register/49"');
    // One the person may not open is listed without a link.
    expect(html).not.toContain('href="/register/52"');
    expect(html).toContain("risk accepted; stays");
    expect(html).not.toMatch(/Nothing new/i);
  });

  it("shows nothing flagged without a severity", () => {
    const none: PreviewData = { findings: [], current: [], verdict: "no_findings", verdictSentence: "Storing this here would raise no finding, and none is open at SH-2 about water.", cleared: [] };
    expect(verdictSeverity(none)).toBeNull();
    expect(renderToStaticMarkup(createElement(WhatIfVerdict, { data: none }))).toContain("Nothing flagged about this here");
    expect(outcomeNote({ ...flagged.current[0], outcome: "worse" })).toBe("gets worse");
  });
});
