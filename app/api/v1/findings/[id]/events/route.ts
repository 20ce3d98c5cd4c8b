import { NextResponse } from "next/server";
import { getFinding } from "@/db/queries/findings";
import { requireId } from "@/lib/http/params";
import { route } from "@/lib/http/route";
import { findingEventSchema } from "@/lib/register/schemas";
import { applyFindingStep } from "@/lib/register/workflow";

/**
 * The workflow: `{ kind: "acknowledge" | "start_mitigation" | "resolve" | "accept_risk" | "comment" |
 * "assign" | "reopen", … }`. Each step needs its own permission (accepting a risk: safety officers).
 * A resolve re-assesses the finding's location first and, while the condition still holds, leaves
 * the finding in its status and answers with a `message` saying so.
 */
export const POST = route({ action: "findings.comment", schema: findingEventSchema }, ({ user, scope, params, input }) => {
  const id = requireId(params, "That finding");
  const { message } = applyFindingStep(user, id, input);
  const { finding, events } = getFinding(user, scope, id)!;
  // A resolve re-assesses at once: `message` says whether the condition is gone or still holds.
  return NextResponse.json({ data: { ...finding, limit: finding.limitValue, events, ...(message ? { message } : {}) } }, { status: 201 });
});
