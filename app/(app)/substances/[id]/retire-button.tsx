"use client";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { retireSubstanceAction } from "../actions";

export function RetireSubstanceButton({ id, retired }: { id: number; retired: boolean }) {
  const [state, dispatch, pending] = useActionState(retireSubstanceAction, undefined);
  const error = state?.error ? Object.values(state.error).flat()[0] : undefined;
  return (
    <form action={dispatch} className="inline-flex items-center gap-2">
      <input type="hidden" name="id" value={id} />
      <input type="hidden" name="retired" value={retired ? "false" : "true"} />
      <Button type="submit" variant={retired ? "secondary" : "danger"} disabled={pending}>
        {retired ? "Restore to the library" : "Retire"}
      </Button>
      {error ? <span role="alert" className="text-sm text-sev-critical">{error}</span> : null}
    </form>
  );
}
