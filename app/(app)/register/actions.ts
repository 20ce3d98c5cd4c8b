"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { bulkFindingEventSchema, registerViewSchema } from "@/lib/register/schemas";
import { applyFindingStepToMany } from "@/lib/register/bulk";
import { saveRegisterView } from "@/lib/register/views";

export const saveRegisterViewAction = formAction({ action: "findings.work", schema: registerViewSchema }, async ({ user, input }) => {
  saveRegisterView(user, input.role, input.query);
  revalidatePath("/register");
  return `Saved as the default view for ${input.role.replace("_", " ")}s.`;
});


const BULK_DONE = {
  acknowledge: "acknowledged",
  start_mitigation: "put into mitigation",
  accept_risk: "risk accepted until the review date",
  comment: "commented",
  assign: "assigned",
} as const;

/** One step on the findings selected in the register, through the same service as the API. */
export const bulkFindingStepAction = formAction({ action: "findings.comment", schema: bulkFindingEventSchema }, async ({ user, input }) => {
  const results = applyFindingStepToMany(user, input);
  revalidatePath("/register");
  const done = results.filter((r) => r.ok).length;
  const refused = results.flatMap((r) => (r.ok ? [] : [`#${r.findingId}: ${r.error.message}`]));
  const head = `${done} of ${results.length} ${results.length === 1 ? "finding" : "findings"} ${BULK_DONE[input.kind]}.`;
  return refused.length ? `${head} Not done — ${refused.slice(0, 5).join(" ")}${refused.length > 5 ? ` (and ${refused.length - 5} more)` : ""}` : head;
});
