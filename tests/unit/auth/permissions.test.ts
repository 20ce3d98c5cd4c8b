import { describe, expect, it } from "vitest";
import { ACTIONS, can, navigationFor, ROLES, scopeFor, type Action, type Role, type Scope } from "@/lib/auth/permissions";

/**
 * The expected matrix, written out independently of lib/auth/permissions.ts from PRODUCT.md's
 * role table: every role × every action is asserted, so a change to one cell fails here.
 * Columns: admin, safety_officer, researcher, facilities, auditor ("-" = not allowed).
 */
const EXPECTED: Record<Action, [string, string, string, string, string]> = {
  "overview.read": ["all", "all", "all", "all", "all"],
  "profile.update": ["all", "all", "all", "all", "all"],
  "sessions.own": ["all", "all", "all", "all", "all"],
  "users.manage": ["all", "-", "-", "-", "-"],
  "users.endSessions": ["all", "-", "-", "-", "-"],
  "apiKeys.manage": ["all", "-", "-", "-", "-"],
  "settings.manage": ["all", "-", "-", "-", "-"],
  "mail.view": ["all", "-", "-", "-", "-"],
  "webhooks.manage": ["all", "-", "-", "-", "-"],
  "locations.read": ["all", "all", "all", "all", "all"],
  "locations.write": ["all", "all", "-", "all", "-"],
  "locations.import": ["all", "all", "-", "all", "-"],
  "temperatures.read": ["all", "all", "-", "all", "all"],
  "sensors.write": ["all", "all", "-", "all", "-"],
  "readings.upload": ["all", "all", "-", "all", "-"],
  "excursions.acknowledge": ["all", "all", "-", "all", "-"],
  "substances.read": ["all", "all", "all", "all", "all"],
  "substances.write": ["all", "all", "-", "-", "-"],
  "inventory.read": ["all", "all", "all", "all", "all"],
  "containers.write": ["all", "all", "own", "-", "-"],
  "containers.import": ["all", "all", "-", "-", "-"],
  "mixtures.write": ["all", "all", "all", "-", "-"],
  "files.upload": ["all", "all", "own", "-", "-"],
  "hazardSettings.write": ["all", "all", "-", "-", "-"],
  "findings.read": ["all", "all", "own", "own", "all"],
  "findings.acknowledge": ["all", "all", "own", "own", "-"],
  "findings.comment": ["all", "all", "own", "own", "-"],
  "findings.work": ["all", "all", "-", "-", "-"],
  "findings.acceptRisk": ["-", "all", "-", "-", "-"],
  "assessments.preview": ["all", "all", "all", "all", "-"],
  "exports.download": ["all", "all", "-", "-", "all"],
  "audit.read": ["all", "all", "-", "-", "all"],
};

const ROLE_ORDER: Role[] = ["admin", "safety_officer", "researcher", "facilities", "auditor"];

describe("permission matrix", () => {
  it("covers exactly the actions the expected table lists", () => {
    expect([...ACTIONS].sort()).toEqual(Object.keys(EXPECTED).sort());
    expect([...ROLES].sort()).toEqual([...ROLE_ORDER].sort());
  });

  for (const action of Object.keys(EXPECTED) as Action[]) {
    for (const [index, role] of ROLE_ORDER.entries()) {
      const expected = EXPECTED[action][index];
      it(`${role} × ${action} → ${expected}`, () => {
        expect(scopeFor(role, action)).toBe(expected === "-" ? null : (expected as Scope));
        expect(can(role, action)).toBe(expected !== "-");
      });
    }
  }

  it("the auditor can change nothing: every allowed auditor action is a read or a download", () => {
    const allowed = ACTIONS.filter((action) => can("auditor", action));
    expect(allowed.sort()).toEqual(
      ["audit.read", "exports.download", "findings.read", "inventory.read", "locations.read", "overview.read", "profile.update", "sessions.own", "substances.read", "temperatures.read"].sort(),
    );
  });
});

describe("navigation per role", () => {
  const labels = (role: Role) => navigationFor(role).map((item) => item.label);

  it("shows each role the areas it may open", () => {
    expect(labels("admin")).toEqual(["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances", "Exports", "Admin"]);
    expect(labels("safety_officer")).toEqual(["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances", "Exports"]);
    expect(labels("researcher")).toEqual(["Overview", "Register", "Inventory", "Locations", "Substances"]);
    expect(labels("facilities")).toEqual(["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances"]);
    expect(labels("auditor")).toEqual(["Overview", "Register", "Inventory", "Locations", "Temperatures", "Substances", "Exports"]);
  });
});
