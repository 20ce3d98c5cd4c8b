"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { findingStepFormSchema } from "@/lib/register/schemas";
import { applyFindingStep } from "@/lib/register/workflow";

const STEP_DONE = {
  acknowledge: "Acknowledged.",
  start_mitigation: "Mitigation started.",
  resolve: "Resolved.",
  accept_risk: "Risk accepted until the review date.",
  comment: "Comment added.",
  assign: "Assigned.",
  reopen: "Re-opened.",
} as const;

/**
 * A workflow step from the finding page; the step's own permission is checked by applyFindingStep.
 * A resolve answers with what its re-assessment found (resolved, or the condition still holds).
 */
export const findingPageStepAction = formAction({ action: "findings.comment", schema: findingStepFormSchema }, async ({ user, input }) => {
  const { findingId, ...step } = input;
  const result = applyFindingStep(user, findingId, step as Parameters<typeof applyFindingStep>[2]);
  revalidatePath(`/register/${findingId}`);
  revalidatePath("/register");
  return result.message ?? STEP_DONE[step.kind];
});
