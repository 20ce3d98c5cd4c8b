import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { applyFindingStepToMany } from "@/lib/register/bulk";
import { bulkFindingEventSchema } from "@/lib/register/schemas";

/**
 * One step on many findings: `{ findingIds: [1–500 ids], kind: "acknowledge" | "assign" | "comment" |
 * "start_mitigation" | "accept_risk", … }` with the fields of one finding's step →
 * `{ data: [{ findingId, ok, error? }] }`, in one transaction. Each finding is checked on its own
 * (a researcher only acts on findings on their containers); a refused finding keeps nothing.
 */
export const POST = route({ action: "findings.comment", schema: bulkFindingEventSchema }, ({ user, input }) => {
  return NextResponse.json({ data: applyFindingStepToMany(user, input) });
});
