import "server-only";
import { forbidden, redirect } from "next/navigation";
import { scopeFor, type Action, type Scope } from "./permissions";
import { getSessionUser, type SessionUser } from "./session";

/** For pages: the signed-in user, or a redirect to sign-in. */
export async function requirePageUser(): Promise<SessionUser> {
  const user = await getSessionUser();
  if (!user) redirect("/sign-in");
  return user;
}

/** For pages: the user and scope when the role may do the action; a 403 page otherwise. */
export async function requirePagePermission(action: Action): Promise<{ user: SessionUser; scope: Scope }> {
  const user = await requirePageUser();
  const scope = scopeFor(user.role, action);
  if (!scope) forbidden();
  return { user, scope };
}
