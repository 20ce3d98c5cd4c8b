"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/auth/form-action";
import { endOtherSessions, endOwnSession } from "@/lib/auth/session-store";
import { alertPreferencesSchema, endSessionSchema, signOutElsewhereSchema } from "@/lib/users/schemas";
import { updateAlertPreferences } from "@/lib/users/service";

export const updateAlertPreferencesAction = formAction({ action: "profile.update", schema: alertPreferencesSchema }, async ({ user, input }) => {
  updateAlertPreferences(user, input);
  revalidatePath("/profile");
  return "Saved your alert choices.";
});

export const signOutElsewhereAction = formAction({ action: "sessions.own", schema: signOutElsewhereSchema }, async ({ user }) => {
  const ended = endOtherSessions(user);
  revalidatePath("/profile");
  return ended === 0 ? "You were signed in nowhere else." : `Signed out of ${ended} other session${ended === 1 ? "" : "s"}.`;
});

export const endSessionAction = formAction({ action: "sessions.own", schema: endSessionSchema }, async ({ user, input }) => {
  endOwnSession(user, input.sessionId);
  revalidatePath("/profile");
  return "That session has ended.";
});
