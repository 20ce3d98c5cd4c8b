import { NextResponse } from "next/server";
import { getFinding } from "@/db/queries/findings";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { findingEventSchema } from "@/lib/register/schemas";
import { applyFindingStep } from "@/lib/register/workflow";

/**
 * The workflow: `{ kind: "acknowledge" | "start_mitigation" | "resolve" | "accept_risk" | "comment" |
 * "assign" | "reopen", … }`. Each step needs its own permission (accepting a risk: safety officers).
 */
export const POST = route({ action: "findings.comment", schema: findingEventSchema }, ({ user, scope, params, input }) => {
  const id = requireId(params, "That finding");
  applyFindingStep(user, id, input);
  const { finding, events } = getFinding(user, scope, id)!;
  return NextResponse.json({ data: { ...finding, limit: finding.limitValue, events } }, { status: 201 });
});
