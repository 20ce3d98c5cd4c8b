"use client";
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { revokeApiKeyAction } from "./actions";

/** Revoke asks once more: a revoked key cannot be brought back, and loggers using it stop at once. */
export function RevokeApiKey({ id, name }: { id: number; name: string }) {
  const [confirming, setConfirming] = useState(false);
  const [state, dispatch, pending] = useActionState(revokeApiKeyAction, undefined);
  const error = state?.error ? Object.values(state.error).flat()[0] : undefined;
  if (!confirming) {
    return (
      <Button size="sm" variant="danger" onClick={() => setConfirming(true)} aria-label={`Revoke ${name}`}>
        Revoke
      </Button>
    );
  }
  return (
    <form action={dispatch} className="space-y-2" role="group" aria-label={`Confirm revoking ${name}`}>
      <input type="hidden" name="id" value={id} />
      <p className="text-xs text-ink-800">Revoke “{name}”? Loggers using it are refused at once; this cannot be undone.</p>
      <div className="flex gap-2">
        <Button type="submit" size="sm" variant="danger" disabled={pending}>
          {pending ? "Revoking…" : "Yes, revoke"}
        </Button>
        <Button size="sm" variant="ghost" onClick={() => setConfirming(false)}>
          Cancel
        </Button>
      </div>
      {error ? (
        <p role="alert" className="text-xs text-sev-critical">
          {error}
        </p>
      ) : null}
    </form>
  );
}
