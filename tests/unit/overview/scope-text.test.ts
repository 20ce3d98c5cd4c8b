import { describe, expect, it } from "vitest";
import { overviewAudience, overviewHeadline } from "@/lib/overview/scope-text";

const none = { urgent: 0, totalOpen: 0, openExcursions: 0, responsibleFor: 3 };

describe("overviewAudience", () => {
  it("follows the role and its scope of the register", () => {
    expect(overviewAudience("admin", "all")).toBe("register");
    expect(overviewAudience("safety_officer", "all")).toBe("register");
    expect(overviewAudience("auditor", "all")).toBe("auditor");
    expect(overviewAudience("researcher", "own")).toBe("researcher");
    expect(overviewAudience("facilities", "own")).toBe("facilities");
  });
});

describe("overviewHeadline", () => {
  it("speaks of the whole register only to those who see it whole", () => {
    expect(overviewHeadline("register", none)).toBe("Nothing in the register needs attention right now.");
    expect(overviewHeadline("researcher", none)).toBe("Nothing of yours needs attention right now.");
    expect(overviewHeadline("facilities", none)).toBe("Nothing in your rooms and units needs attention right now.");
  });

  it("says so when a person has nothing of their own yet, rather than that all is well", () => {
    expect(overviewHeadline("researcher", { ...none, responsibleFor: 0 })).toBe("You have no containers or storage units of your own yet, so nothing in the register is yours.");
    expect(overviewHeadline("facilities", { ...none, responsibleFor: 0 })).toBe("You are not the contact for any room and own no storage unit, so nothing in the register is yours.");
  });

  it("does not tell a researcher all is well while their containers add to findings recorded on others'", () => {
    expect(overviewHeadline("researcher", { ...none, contributedElsewhere: 2 })).toBe(
      "None of your own findings is open, but your containers add to 2 open findings recorded on other people's containers.",
    );
  });

  it("names the scope of the findings counted", () => {
    expect(overviewHeadline("researcher", { ...none, urgent: 1, totalOpen: 2 })).toBe("1 critical or high finding on your containers needs attention.");
    expect(overviewHeadline("register", { ...none, urgent: 3, totalOpen: 5 })).toBe("3 critical or high findings need attention.");
    expect(overviewHeadline("facilities", { ...none, openExcursions: 2 })).toBe("2 temperature excursions in your rooms and units are still open.");
    expect(overviewHeadline("researcher", { ...none, totalOpen: 1 })).toBe("No critical or high findings on your containers; 1 lower-severity finding is open.");
    expect(overviewHeadline("register", { ...none, totalOpen: 1200 })).toBe("No critical or high findings; 1,200 lower-severity findings are open.");
  });

  it("gives auditors figures, not a call to act", () => {
    expect(overviewHeadline("auditor", { ...none, urgent: 2, totalOpen: 7, openExcursions: 1 })).toBe("The register holds 7 open findings, 2 of them critical or high; 1 temperature excursion is open.");
    expect(overviewHeadline("auditor", none)).toBe("The register holds no open findings; no temperature excursion is open.");
  });
});
