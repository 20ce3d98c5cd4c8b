import { parseWithZod } from "@conform-to/zod/v4";
import { describe, expect, it } from "vitest";
import { containerEditFormSchema } from "@/lib/inventory/schemas";
import { roomEditFormSchema, storageUnitEditFormSchema } from "@/lib/locations/schemas";
import { withClearedFields } from "@/lib/validation/cleared-fields";

function form(entries: Record<string, string>): FormData {
  const data = new FormData();
  for (const [k, v] of Object.entries(entries)) data.append(k, v);
  return data;
}

function parsed(schema: Parameters<typeof withClearedFields>[0], data: FormData): Record<string, unknown> {
  const submission = parseWithZod(data, { schema });
  if (submission.status !== "success") throw new Error(JSON.stringify(submission.reply()));
  return withClearedFields(schema, data, submission.value as Record<string, unknown>);
}

const room = { id: "7", siteId: "1", code: "B-014", name: "Solvent store", kind: "storeroom", sprinklered: "no" };

describe("an edit form's emptied optional field reads as cleared", () => {
  it("turns an emptied design maximum and facilities contact into null", () => {
    const value = parsed(roomEditFormSchema, form({ ...room, designMaxTempC: "", facilitiesContactId: "", notes: "  " }));
    expect(value.designMaxTempC).toBeNull();
    expect(value.facilitiesContactId).toBeNull();
    expect(value.notes).toBeNull();
  });

  it("leaves a field the form did not send undefined (unchanged)", () => {
    const value = parsed(roomEditFormSchema, form(room));
    expect(value).not.toHaveProperty("designMaxTempC");
    expect(value.heightM).toBeUndefined();
  });

  it("keeps values the form sent", () => {
    const value = parsed(roomEditFormSchema, form({ ...room, designMaxTempC: "32.5", heightM: "3" }));
    expect(value.designMaxTempC).toBe(32.5);
    expect(value.heightM).toBe(3);
    expect(value.code).toBe("B-014");
  });

  it("clears a unit's τ and its note together", () => {
    const value = parsed(
      storageUnitEditFormSchema,
      form({ id: "3", roomId: "2", code: "FZ-1", name: "Freezer", kind: "freezer_minus_20", ventilated: "no", ignitionSourceFree: "yes", warmUpTauMin: "", warmUpTauNote: "" }),
    );
    expect(value.warmUpTauMin).toBeNull();
    expect(value.warmUpTauNote).toBeNull();
  });

  it("never nulls a field whose schema refuses null", () => {
    // A container's amount unit is optional in the edit form but has no "none".
    const value = parsed(containerEditFormSchema, form({ id: "12", amountUnit: "", notes: "" }));
    expect(value.amountUnit).toBeUndefined();
    expect(value.notes).toBeNull();
  });

  it("lets a container switch from a substance to a mixture", () => {
    const value = parsed(containerEditFormSchema, form({ id: "12", substanceId: "", mixtureId: "4" }));
    expect(value.substanceId).toBeNull();
    expect(value.mixtureId).toBe(4);
  });
});
