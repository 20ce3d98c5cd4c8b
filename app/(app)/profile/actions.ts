"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { alertPreferencesSchema } from "@/lib/users/schemas";
import { updateAlertPreferences } from "@/lib/users/service";

export const updateAlertPreferencesAction = formAction({ action: "profile.update", schema: alertPreferencesSchema }, async ({ user, input }) => {
  updateAlertPreferences(user, input);
  revalidatePath("/profile");
  return "Saved your alert choices.";
});
