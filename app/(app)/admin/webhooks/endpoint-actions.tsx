"use client";
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import type { FormState } from "@/lib/auth/form-action";
import { retryWebhookDeliveryAction, rotateWebhookSecretAction, setWebhookEndpointActiveAction } from "./actions";
import { NewSecret } from "./new-secret";

function firstError(state: FormState | undefined): string | undefined {
  return (state?.error ? Object.values(state.error).flat()[0] : undefined) ?? undefined;
}

function Feedback({ state }: { state: FormState | undefined }) {
  const error = firstError(state);
  if (error) {
    return (
      <p role="alert" className="text-xs text-sev-critical">
        {error}
      </p>
    );
  }
  return state?.message ? (
    <p role="status" className="text-xs text-ink-700">
      {state.message}
    </p>
  ) : null;
}

export function PauseEndpoint({ id, name, active }: { id: number; name: string; active: boolean }) {
  const [state, dispatch, pending] = useActionState(setWebhookEndpointActiveAction, undefined);
  return (
    <form action={dispatch} className="space-y-1">
      <input type="hidden" name="id" value={id} />
      <input type="hidden" name="active" value={active ? "false" : "true"} />
      <Button type="submit" size="sm" variant="secondary" disabled={pending} aria-label={`${active ? "Pause" : "Resume"} ${name}`}>
        {active ? "Pause" : "Resume"}
      </Button>
      <Feedback state={state} />
    </form>
  );
}

/** Rotating asks once more: the receiver must get the new secret, or it will refuse the deliveries that follow. */
export function RotateSecret({ id, name }: { id: number; name: string }) {
  const [confirming, setConfirming] = useState(false);
  const [dismissed, setDismissed] = useState<string | null>(null);
  const [state, dispatch, pending] = useActionState(rotateWebhookSecretAction, undefined);
  const secret = state?.status === "success" && state.message?.startsWith("whsec_") ? state.message : undefined;
  if (secret && secret !== dismissed) return <NewSecret id={`rotated-secret-${id}`} value={secret} onDone={() => { setDismissed(secret); setConfirming(false); }} />;
  if (!confirming) {
    return (
      <Button size="sm" variant="secondary" onClick={() => setConfirming(true)} aria-label={`Rotate the secret of ${name}`}>
        Rotate secret
      </Button>
    );
  }
  return (
    <form action={dispatch} className="space-y-2" role="group" aria-label={`Confirm rotating the secret of ${name}`}>
      <input type="hidden" name="id" value={id} />
      <p className="text-xs text-ink-800">
        Rotate the secret of “{name}”? Every delivery from now on, retries included, is signed with the new one; the receiver refuses them until it has it.
      </p>
      <div className="flex gap-2">
        <Button type="submit" size="sm" variant="danger" disabled={pending}>
          {pending ? "Rotating…" : "Yes, rotate"}
        </Button>
        <Button size="sm" variant="ghost" onClick={() => setConfirming(false)}>
          Cancel
        </Button>
      </div>
      <Feedback state={state} />
    </form>
  );
}

export function RetryDelivery({ id }: { id: number }) {
  const [state, dispatch, pending] = useActionState(retryWebhookDeliveryAction, undefined);
  return (
    <form action={dispatch} className="space-y-1">
      <input type="hidden" name="id" value={id} />
      <Button type="submit" size="sm" variant="secondary" disabled={pending}>
        {pending ? "Queuing…" : "Retry now"}
      </Button>
      <Feedback state={state} />
    </form>
  );
}
