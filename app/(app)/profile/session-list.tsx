"use client";
import { useActionState } from "react";
import { priorityCellClass, SecondaryValues, TABLE_CONTAINER_CLASS } from "@/components/data-table/priority";
import { Button } from "@/components/ui/button";
import type { FormState } from "@/lib/auth/form-action";
import { endSessionAction, signOutElsewhereAction } from "./actions";

export type SessionItem = { id: number; device: string; ip: string | null; createdAt: string; lastSeenAt: string; current: boolean };

function Outcome({ state }: { state: FormState | undefined }) {
  const errorText = state?.error ? Object.values(state.error).flat().join(" ") : undefined;
  if (errorText) {
    return (
      <p role="alert" className="text-xs text-sev-critical">
        {errorText}
      </p>
    );
  }
  return state?.message ? (
    <p role="status" className="text-xs text-ok">
      {state.message}
    </p>
  ) : null;
}

function EndSession({ item }: { item: SessionItem }) {
  const [state, action, pending] = useActionState(endSessionAction, undefined);
  return (
    <form action={action} className="space-y-1">
      <input type="hidden" name="sessionId" value={item.id} />
      <Button type="submit" size="sm" variant="secondary" disabled={pending} aria-label={`End the session in ${item.device}, last active ${item.lastSeenAt}`}>
        End session
      </Button>
      <Outcome state={state} />
    </form>
  );
}

/** One's sessions with "this device" marked; each other one can be signed out, or all of them at once. */
export function SessionList({ items }: { items: SessionItem[] }) {
  const [state, signOutElsewhere, pending] = useActionState(signOutElsewhereAction, undefined);
  const others = items.filter((item) => !item.current).length;
  return (
    <div className="space-y-4">
      <div className={`${TABLE_CONTAINER_CLASS} -mx-4 overflow-x-auto`}>
        <table className="w-full text-sm">
          <thead>
            <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
              <th scope="col" className="px-4 py-2 font-medium">Browser</th>
              <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Address</th>
              <th scope="col" className={`px-4 py-2 font-medium ${priorityCellClass(2)}`}>Signed in</th>
              <th scope="col" className="px-4 py-2 font-medium">Last active</th>
              <th scope="col" className="px-4 py-2 font-medium">
                <span className="sr-only">End</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {items.map((item) => (
              <tr key={item.id} className="border-b border-ink-100 align-top last:border-0">
                <th scope="row" className="px-4 py-3 text-left font-normal text-ink-900">
                  {item.device}
                  <SecondaryValues
                    items={[
                      { key: "ip", label: "Address", value: item.ip ?? "—", priority: 2 },
                      { key: "signedIn", label: "Signed in", value: item.createdAt, priority: 2 },
                    ]}
                  />
                </th>
                <td className={`tabular px-4 py-3 text-ink-700 ${priorityCellClass(2)}`}>{item.ip ?? "—"}</td>
                <td className={`tabular whitespace-nowrap px-4 py-3 text-ink-700 ${priorityCellClass(2)}`}>{item.createdAt}</td>
                <td className="tabular whitespace-nowrap px-4 py-3 text-ink-700">{item.lastSeenAt}</td>
                <td className="px-4 py-3">
                  {item.current ? <span className="text-xs font-medium text-ok">● This device</span> : <EndSession item={item} />}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <form action={signOutElsewhere} className="space-y-1.5">
        <Button type="submit" variant="danger" disabled={pending || others === 0}>
          Sign out everywhere else
        </Button>
        <Outcome state={state} />
      </form>
    </div>
  );
}
