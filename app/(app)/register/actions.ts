"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { findingStepFormSchema, registerViewSchema } from "@/lib/register/schemas";
import { applyFindingStep } from "@/lib/register/workflow";
import { saveRegisterView } from "@/lib/register/views";

export const saveRegisterViewAction = formAction({ action: "findings.work", schema: registerViewSchema }, async ({ user, input }) => {
  saveRegisterView(user, input.role, input.query);
  revalidatePath("/register");
  return `Saved as the default view for ${input.role.replace("_", " ")}s.`;
});


const STEP_DONE = {
  acknowledge: "Acknowledged.",
  start_mitigation: "Mitigation started.",
  resolve: "Resolved.",
  accept_risk: "Risk accepted until the review date.",
  comment: "Comment added.",
  assign: "Assigned.",
  reopen: "Re-opened.",
} as const;

/** Every step of the finding page; the step's own permission is checked by applyFindingStep. */
export const findingStepAction = formAction({ action: "findings.comment", schema: findingStepFormSchema }, async ({ user, input }) => {
  const { findingId, ...step } = input;
  applyFindingStep(user, findingId, step as Parameters<typeof applyFindingStep>[2]);
  revalidatePath(`/register/${findingId}`);
  return STEP_DONE[step.kind];
});
