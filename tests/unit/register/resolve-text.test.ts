import { describe, expect, it } from "vitest";
import { conditionStillHoldsMessage, STILL_HOLDS_PREFIX } from "@/lib/register/resolve-text";

// An invented enclosure finding: 4134.9 % LFL against the LFL itself (100 %).
const check = { holds: true as const, title: "Diethyl ether in FR-9 could reach 4130 % LFL if the refrigerator fails (control lost, 25.0 °C)", value: 4134.9, limitValue: 100, ratio: 41.349, unit: "% LFL" };

describe("what a person is told when the condition still holds", () => {
  it("states the condition with the numbers re-assessed now and the way on", () => {
    expect(conditionStillHoldsMessage(check, "open", null)).toBe(
      `${STILL_HOLDS_PREFIX} Diethyl ether in FR-9 could reach 4130 % LFL if the refrigerator fails (control lost, 25.0 °C) (re-assessed now: 4134.9 % LFL against a limit of 100 % LFL), so the finding stays open. ` +
        "Record what changed in Headroom first (move, use up or dispose of the container, or correct the location's data), then resolve it again; if it is to stay as it is, accept the risk with a justification and a review date.",
    );
  });

  it("says which status the finding keeps", () => {
    expect(conditionStillHoldsMessage(check, "acknowledged", null)).toContain("so the finding stays open (acknowledged).");
    expect(conditionStillHoldsMessage(check, "mitigating", null)).toContain("so the finding stays open (being mitigated).");
    expect(conditionStillHoldsMessage(check, "risk_accepted", new Date("2027-03-01T00:00:00Z"))).toContain("so the finding stays as it was: risk accepted until 2027-03-01.");
  });

  it("leaves the numbers out of a temperature comparison, whose title states them", () => {
    const flash = { ...check, title: "Acetone in FR-9 is above its flash point of −20.0 °C", value: -20, limitValue: 8, ratio: null, unit: "°C" };
    expect(conditionStillHoldsMessage(flash, "open", null)).toMatch(/^The condition still holds: Acetone in FR-9 is above its flash point of −20\.0 °C, so the finding stays open\./);
  });
});
