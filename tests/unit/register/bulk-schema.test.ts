import { parseWithZod } from "@conform-to/zod/v4";
import { describe, expect, it } from "vitest";
import { bulkFindingEventSchema } from "@/lib/register/schemas";

/** The register's bulk form posts `findingIds[0]`, `findingIds[1]`, … with the step's fields. */
function form(entries: [string, string][]): FormData {
  const data = new FormData();
  for (const [key, value] of entries) data.append(key, value);
  return data;
}

describe("bulkFindingEventSchema", () => {
  it("reads the register's form: ids as a list, the step's own fields", () => {
    const parsed = parseWithZod(form([["findingIds[0]", "12"], ["findingIds[1]", "40"], ["kind", "accept_risk"], ["justification", "Rated unit."], ["reviewDate", "2027-06-01"]]), { schema: bulkFindingEventSchema });
    expect(parsed.status).toBe("success");
    expect(parsed.status === "success" && parsed.value).toEqual({ findingIds: [12, 40], kind: "accept_risk", justification: "Rated unit.", reviewDate: Date.parse("2027-06-01T00:00:00Z") });
    const ack = parseWithZod(form([["findingIds[0]", "7"], ["kind", "acknowledge"], ["note", ""]]), { schema: bulkFindingEventSchema });
    expect(ack.status === "success" && ack.value).toEqual({ findingIds: [7], kind: "acknowledge" });
  });

  it("reads JSON from the API and refuses what no step allows, with the field to blame", () => {
    expect(bulkFindingEventSchema.safeParse({ findingIds: [1, 2], kind: "comment", note: "Checked on the walk-round." }).success).toBe(true);
    const issues = (value: unknown) => bulkFindingEventSchema.safeParse(value).error?.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    expect(issues({ findingIds: [], kind: "acknowledge" })).toEqual(["findingIds: Choose at least one finding."]);
    expect(issues({ findingIds: [1, 1], kind: "acknowledge" })).toEqual(["findingIds: Name each finding once."]);
    expect(issues({ findingIds: [0], kind: "acknowledge" })).toEqual(["findingIds.0: Choose a finding (a positive whole number)."]);
    expect(issues({ findingIds: Array.from({ length: 501 }, (_, i) => i + 1), kind: "acknowledge" })).toEqual(["findingIds: At most 500 findings at once."]);
    expect(issues({ findingIds: [1], kind: "resolve", note: "x" })).toEqual(["kind: kind must be one of acknowledge, start_mitigation, accept_risk, comment, assign."]);
    expect(issues({ findingIds: [1], kind: "start_mitigation", assigneeId: 3 })).toEqual(["plan: Mitigation plan is required."]);
  });
});
