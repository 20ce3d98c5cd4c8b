import { describe, expect, it } from "vitest";
import { auditActionLabel, auditChanges, formatAuditValue } from "@/lib/audit/format";

describe("single sign-on in the audit log's words", () => {
  it("names the actions and the method", () => {
    expect(auditActionLabel("sign_in_refused")).toBe("Sign-in refused");
    expect(auditActionLabel("link_sso")).toBe("Linked to single sign-on");
    expect(formatAuditValue("sso", "method")).toBe("Single sign-on");
    expect(formatAuditValue("password", "method")).toBe("Password");
    expect(formatAuditValue("no_group", "reason")).toBe("No group rule matches");
  });

  it("shows a settings change field by field", () => {
    const before = { mappings: [], jitDomains: [], requireSso: false, breakGlassUserId: null };
    const after = { mappings: [{ group: "lab-staff", role: "researcher" }], jitDomains: ["lab.example.org"], requireSso: true, breakGlassUserId: 3 };
    expect(auditChanges({ entityType: "setting", before, after }, { user: { 3: "Dana Whitlock" } })).toEqual([
      { field: "mappings", label: "Group rules", before: "none", after: "Group lab-staff, Role Researcher" },
      { field: "jitDomains", label: "Accounts made at first sign-in for", before: "none", after: "lab.example.org" },
      { field: "requireSso", label: "Single sign-on required", before: "No", after: "Yes" },
      { field: "breakGlassUserId", label: "Break-glass administrator", before: "—", after: "Dana Whitlock" },
    ]);
  });
});
