"use server";
import { revalidatePath } from "next/cache";
import { ROLE_LABELS } from "@/lib/auth/permissions";
import { formAction } from "@/lib/auth/form-action";
import { endAllSessionsOf } from "@/lib/auth/session-store";
import { changeRoleSchema, endUserSessionsSchema, inviteUserSchema, setActiveSchema } from "@/lib/users/schemas";
import { changeUserRole, inviteUser, setUserActive } from "@/lib/users/service";

export const inviteUserAction = formAction({ action: "users.manage", schema: inviteUserSchema }, async ({ user, input }) => {
  const invited = await inviteUser(user, input);
  revalidatePath("/admin");
  return `Invitation sent to ${invited.email} (${ROLE_LABELS[invited.role]}).`;
});

export const changeRoleAction = formAction({ action: "users.manage", schema: changeRoleSchema }, async ({ user, input }) => {
  const changed = changeUserRole(user, input.userId, input.role);
  revalidatePath("/admin");
  return `${changed.name} is now ${ROLE_LABELS[changed.role]}.`;
});

export const setActiveAction = formAction({ action: "users.manage", schema: setActiveSchema }, async ({ user, input }) => {
  const changed = setUserActive(user, input.userId, input.active);
  revalidatePath("/admin");
  return `${changed.name} is ${changed.active ? "active again" : "deactivated"}.`;
});

export const endUserSessionsAction = formAction({ action: "users.endSessions", schema: endUserSessionsSchema }, async ({ user, input }) => {
  const ended = endAllSessionsOf(user, input.userId);
  revalidatePath("/admin");
  return ended === 0 ? "No session to end." : `Ended ${ended} session${ended === 1 ? "" : "s"}; a new sign-in is needed.`;
});
