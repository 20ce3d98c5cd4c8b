"use client";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { Role } from "@/lib/auth/roles";
import { ROLE_LABELS, ROLES } from "@/lib/auth/permissions";
import { changeRoleAction, endUserSessionsAction, setActiveAction } from "./actions";

/** Role change and (de)activation for one user row; each answers under the row. */
export function UserRowActions({
  userId,
  name,
  role,
  active,
  isSelf,
  sessionCount,
}: {
  userId: number;
  name: string;
  role: Role;
  active: boolean;
  isSelf: boolean;
  sessionCount: number;
}) {
  const [roleState, changeRole, rolePending] = useActionState(changeRoleAction, undefined);
  const [activeState, toggleActive, activePending] = useActionState(setActiveAction, undefined);
  const [sessionsState, endSessions, sessionsPending] = useActionState(endUserSessionsAction, undefined);
  if (isSelf) return <span className="text-xs text-ink-500">This is you</span>;
  const message = [sessionsState, roleState, activeState].find((s) => s?.error || s?.message);
  const errorText = message?.error ? Object.values(message.error).flat().join(" ") : undefined;
  return (
    <div className="space-y-1.5">
      <div className="flex flex-wrap items-center gap-2 [&_button]:whitespace-nowrap">
        <form action={changeRole} className="flex items-center gap-2">
          <input type="hidden" name="userId" value={userId} />
          <label className="sr-only" htmlFor={`role-${userId}`}>
            Role of {name}
          </label>
          <div className="w-40 shrink-0">
            <select id={`role-${userId}`} name="role" defaultValue={role} className={`${inputClass} h-8 py-0`}>
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </select>
          </div>
          <Button type="submit" size="sm" variant="secondary" disabled={rolePending} aria-label={`Save role of ${name}`}>
            Save
          </Button>
        </form>
        <form action={toggleActive}>
          <input type="hidden" name="userId" value={userId} />
          <input type="hidden" name="active" value={active ? "false" : "true"} />
          <Button type="submit" size="sm" variant={active ? "danger" : "secondary"} disabled={activePending} aria-label={`${active ? "Deactivate" : "Reactivate"} ${name}`}>
            {active ? "Deactivate" : "Reactivate"}
          </Button>
        </form>
        {sessionCount > 0 ? (
          <form action={endSessions}>
            <input type="hidden" name="userId" value={userId} />
            <Button type="submit" size="sm" variant="secondary" disabled={sessionsPending} aria-label={`Sign ${name} out everywhere (${sessionCount} session${sessionCount === 1 ? "" : "s"})`}>
              Sign out everywhere
            </Button>
          </form>
        ) : null}
      </div>
      {errorText ? (
        <p role="alert" className="text-xs text-sev-critical">
          {errorText}
        </p>
      ) : message?.message ? (
        <p role="status" className="text-xs text-ok">
          {message.message}
        </p>
      ) : null}
    </div>
  );
}
