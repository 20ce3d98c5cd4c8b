import { describe, expect, it } from "vitest";
import { AUDIT_ENTITY_TYPES, auditActionLabel, auditChanges, auditEntityLabel, fieldLabel, formatAuditValue, humaniseField } from "@/lib/audit/format";
import { auditListQuerySchema } from "@/lib/audit/schemas";

describe("audit changes in words", () => {
  it("names the field and the codes: Status: Open → Risk accepted, and only what changed", () => {
    const changes = auditChanges(
      {
        entityType: "finding",
        before: { id: 2, status: "open", assigneeId: 7, mitigationPlan: null, riskAcceptedUntil: null },
        after: { id: 2, status: "risk_accepted", assigneeId: 7, mitigationPlan: null, riskAcceptedUntil: "2027-06-30T00:00:00.000Z" },
      },
      { user: { 7: "Sam Officer" } },
    );
    expect(changes).toEqual([
      { field: "status", label: "Status", before: "Open", after: "Risk accepted" },
      { field: "riskAcceptedUntil", label: "Risk accepted until", before: "—", after: "2027-06-30" },
    ]);
  });

  it("never lists an unchanged id or bookkeeping, and names referenced records", () => {
    const changes = auditChanges(
      {
        entityType: "container",
        before: { id: 2, storageUnitId: 4, amount: 2.5, updatedAt: "2026-03-01T10:00:00.000Z" },
        after: { id: 2, storageUnitId: 9, amount: 2.5, updatedAt: "2026-03-02T10:00:00.000Z" },
      },
      { storage_unit: { 4: "FR-1 Fridge" } },
    );
    expect(changes).toEqual([{ field: "storageUnitId", label: "Storage unit", before: "FR-1 Fridge", after: "#9" }]);
  });

  it("renders nested values as readable text, never JSON", () => {
    const [limits] = auditChanges({
      entityType: "substance",
      before: { exposureLimits: [{ kind: "TWA", value: 400, unit: "ppm", body: "BODY-A" }] },
      after: { exposureLimits: [{ kind: "TWA", value: 200, unit: "ppm", body: "BODY-A" }, { kind: "STEL", value: 500, unit: "ppm", body: "BODY-A" }] },
    });
    expect(limits.label).toBe("Exposure limits");
    expect(limits.before).toBe("Kind TWA, Value 400, Unit ppm, Body BODY-A");
    expect(limits.after).toBe("Kind TWA, Value 200, Unit ppm, Body BODY-A; Kind STEL, Value 500, Unit ppm, Body BODY-A");
    expect(limits.after).not.toMatch(/[{}"[\]]/);
    // A setting stored as a bare value counts as one field.
    expect(auditChanges({ entityType: "setting", before: 365, after: 90 })).toEqual([{ field: "value", label: "Value", before: "365", after: "90" }]);
    expect(auditChanges({ entityType: "setting", before: 365, after: 365 })).toEqual([]);
  });

  it("formats values: instants in UTC, yes/no, numbers without float noise, kinds by record type", () => {
    expect(formatAuditValue("2026-03-06T19:40:00.000Z", "acknowledgedAt")).toBe("2026-03-06 19:40 UTC");
    expect(formatAuditValue(true, "active")).toBe("Yes");
    expect(formatAuditValue(0.30000000000000004, "mixingFactor")).toBe("0.3");
    expect(formatAuditValue(22.456789, "designMaxTempC")).toBe("22.46");
    expect(formatAuditValue("flammable_storage_refrigerator", "kind", "storage_unit")).not.toMatch(/_/);
    expect(formatAuditValue("safety_officer", "role")).toBe("Safety officer");
    expect(formatAuditValue("in_use", "state")).not.toMatch(/_/);
    expect(formatAuditValue("digest", "alertExcursions")).toBe("In the daily digest");
    expect(formatAuditValue("", "notes")).toBe("—");
    expect(formatAuditValue([], "components")).toBe("none");
  });

  it("labels fields it has no entry for from their names, with units", () => {
    expect(humaniseField("lastSignInAt")).toBe("Last sign in at");
    expect(humaniseField("maxTempC")).toBe("Max temperature (°C)");
    expect(humaniseField("volumeM3")).toBe("Volume (m³)");
    expect(humaniseField("invitedById")).toBe("Invited by");
    expect(fieldLabel("acknowledgeComment")).toBe("Acknowledgement note");
  });
});

describe("record types and actions", () => {
  it("has a label and a filter for every record type the log holds", () => {
    for (const type of ["finding", "sensor", "excursion", "container", "storage_unit", "room", "user", "substance", "mixture", "site", "api_key", "setting", "session", "export", "location", "installation"]) {
      expect(AUDIT_ENTITY_TYPES).toContain(type);
      expect(auditEntityLabel(type)).not.toMatch(/_/);
      expect(auditListQuerySchema.safeParse({ entityType: type }).success).toBe(true);
    }
    expect(auditEntityLabel("storage_unit")).toBe("Storage unit");
    const unknown = auditListQuerySchema.safeParse({ entityType: "spaceship" });
    expect(unknown.success).toBe(false);
    expect(unknown.error!.issues[0].message).toMatch(/^Unknown record type: choose one of finding, container/);
    expect(auditActionLabel("risk_accepted")).toBe("Risk accepted");
    expect(auditActionLabel("mitigation_started")).toBe("Mitigation started");
    expect(auditActionLabel("some_new_step")).toBe("Some new step");
  });
});
