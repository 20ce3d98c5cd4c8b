import { describe, expect, it } from "vitest";
import { assessLocation, findingFingerprint } from "@/lib/assessment/rules";
import { CAS, container, substance, unitSnapshot } from "./fixtures";

describe("fingerprints", () => {
  it("are the canonical string rule | location | subject | scenario", () => {
    expect(findingFingerprint({ rule: "enclosure-lfl", location: { kind: "unit", id: 12 }, subject: { kind: "substance", id: 5 }, scenario: "control_lost" })).toBe(
      "enclosure-lfl|unit:12|substance:5|control_lost",
    );
    expect(findingFingerprint({ rule: "quantity-limit", location: { kind: "room", id: 3 }, subject: { kind: "quantity-limit", id: 7 }, scenario: "room_worst_case" })).toBe(
      "quantity-limit|room:3|limit:7|room_worst_case",
    );
    expect(
      findingFingerprint({ rule: "missing-data", location: { kind: "unit", id: 1 }, subject: { kind: "substance", id: 9 }, scenario: "in_control", detail: "no-lfl" }),
    ).toBe("missing-data|unit:1|substance:9/no-lfl|in_control");
  });

  it("keep their separators unambiguous whatever a key holds", () => {
    expect(findingFingerprint({ rule: "quantity-limit", location: { kind: "room", id: 3 }, subject: { kind: "quantity-limit", id: "a|b" }, scenario: "room_worst_case" })).toBe(
      "quantity-limit|room:3|limit:a%7Cb|room_worst_case",
    );
  });

  it("differ by rule, location, subject and scenario", () => {
    const base = { rule: "flash-point", location: { kind: "unit", id: 12 }, subject: { kind: "substance", id: 5 }, scenario: "in_control" } as const;
    const variants = [
      base,
      { ...base, rule: "boiling-point" },
      { ...base, location: { kind: "room", id: 12 } },
      { ...base, location: { kind: "unit", id: 13 } },
      { ...base, subject: { kind: "mixture", id: 5 } },
      { ...base, subject: { kind: "substance", id: 6 } },
      { ...base, scenario: "control_lost" },
    ] as const;
    expect(new Set(variants.map((variant) => findingFingerprint(variant))).size).toBe(variants.length);
  });

  it("stay the same when the amounts and the worst-case temperature change, so re-assessment finds the same finding", () => {
    const ether = substance(CAS.diethylEther);
    const before = assessLocation(unitSnapshot([container(ether, 0.5, "L", "opened", { containerId: 1 }), container(ether, 0.25, "L", "opened", { containerId: 2 })]));
    const after = assessLocation(
      unitSnapshot([container(ether, 0.1, "L", "opened", { containerId: 1 }), container(ether, 0.25, "L", "opened", { containerId: 2 })], {
        worstCase: { inControl: null, controlLost: null },
        setRange: null,
        kind: "flammable_cabinet",
      }),
    );
    const key = (f: { fingerprint: string }) => f.fingerprint;
    const common = before.map(key).filter((fp) => after.map(key).includes(fp));
    expect(common).toContain("enclosure-lfl|unit:12|substance:7|in_control");
    expect(common).toContain("enclosure-lfl|unit:12|open-containers|in_control");
    // every fingerprint of one run is distinct
    expect(new Set(before.map(key)).size).toBe(before.length);
  });
});
