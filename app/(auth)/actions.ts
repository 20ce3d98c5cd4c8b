"use server";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/auth/form-action";
import { safeRedirectPath } from "@/lib/http/redirects";
import { endSession, startSession } from "@/lib/auth/session";
import { signInWithPassword } from "@/lib/auth/sign-in";
import { requestPasswordReset, setPasswordWithToken } from "@/lib/users/service";
import { requestResetSchema, setPasswordSchema, signInSchema } from "@/lib/users/schemas";

export const signInAction = formAction({ action: "public", schema: signInSchema }, async ({ input }) => {
  const user = await signInWithPassword(input.email, input.password);
  await startSession(user);
  redirect(safeRedirectPath(input.next));
});

export const requestResetAction = formAction({ action: "public", schema: requestResetSchema }, async ({ input }) => {
  requestPasswordReset(input.email);
  return "If an account exists for that address, a link to reset its password is on its way. It expires in 60 minutes.";
});

export const acceptInvitationAction = formAction({ action: "public", schema: setPasswordSchema }, async ({ input }) => {
  const user = await setPasswordWithToken("invitation", input);
  await startSession(user);
  redirect("/");
});

export const resetPasswordAction = formAction({ action: "public", schema: setPasswordSchema }, async ({ input }) => {
  await setPasswordWithToken("password_reset", input);
  redirect("/sign-in?reset=1");
});

export async function signOutAction(): Promise<void> {
  await endSession();
  redirect("/sign-in");
}
