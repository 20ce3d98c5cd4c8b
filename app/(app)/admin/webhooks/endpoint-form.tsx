"use client";
import { getFormProps } from "@conform-to/react";
import { useEffect, useState } from "react";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { WEBHOOK_EVENT_LABELS, WEBHOOK_EVENT_TYPES } from "@/lib/webhooks/events";
import { webhookEndpointSchema, webhookEndpointUpdateSchema } from "@/lib/webhooks/schemas";
import { createWebhookEndpointAction, updateWebhookEndpointAction } from "./actions";
import { NewSecret } from "./new-secret";

type Existing = { id: number; url: string; description: string; events: string[]; allowPrivate: boolean };

/** Register an endpoint (the secret is shown once afterwards) or change one. */
export function EndpointForm({ existing, httpLoopback }: { existing?: Existing; httpLoopback: boolean }) {
  const editing = existing !== undefined;
  const { form, fields, pending, lastResult, dispatch } = useServerForm(
    editing ? webhookEndpointUpdateSchema : webhookEndpointSchema,
    editing ? updateWebhookEndpointAction : createWebhookEndpointAction,
    {
      id: editing ? `webhook-edit-${existing.id}` : "webhook-new",
      defaultValue: editing
        ? { id: existing.id, url: existing.url, description: existing.description, events: existing.events, allowPrivate: existing.allowPrivate ? "on" : undefined }
        : { events: [...WEBHOOK_EVENT_TYPES] },
    },
  );
  const [dismissed, setDismissed] = useState<string | null>(null);
  const message = lastResult?.status === "success" ? (lastResult as { message?: string }).message : undefined;
  const newSecret = !editing && message?.startsWith("whsec_") ? message : undefined;
  // A registered endpoint clears the form, so a second click does not register it twice.
  useEffect(() => {
    if (newSecret) form.reset();
    // eslint-disable-next-line react-hooks/exhaustive-deps -- once per new secret
  }, [newSecret]);
  const eventErrors = fields.events.errors;
  const initialEvents = (fields.events.initialValue as string[] | undefined) ?? [];
  return (
    <div className="space-y-4">
      {newSecret && newSecret !== dismissed ? <NewSecret id="new-webhook-secret" value={newSecret} onDone={() => setDismissed(newSecret)} /> : null}
      {editing && message ? (
        <p role="status" className="text-sm text-ok">
          {message}
        </p>
      ) : null}
      <form {...getFormProps(form)} action={dispatch} noValidate className="space-y-4">
        <FormMessage id={form.errorId} errors={form.errors} />
        {editing ? <input type="hidden" name="id" value={existing.id} /> : null}
        <TextField
          field={fields.url}
          label="Address (URL)"
          hint={`Where deliveries are POSTed. https:// only${httpLoopback ? "; http:// only to this machine (localhost)" : ""}.`}
          autoComplete="off"
          inputMode="url"
          spellCheck={false}
        />
        <TextField field={fields.description} label="Description" hint="Who receives it, e.g. “Building B alarm panel”." autoComplete="off" />
        <fieldset className="space-y-2" aria-describedby={eventErrors?.length ? `${fields.events.id}-error` : undefined}>
          <legend className="text-sm font-medium text-ink-800">Events it receives</legend>
          {WEBHOOK_EVENT_TYPES.map((type) => (
            <label key={type} className="flex items-start gap-2 text-sm">
              <input type="checkbox" name={fields.events.name} value={type} defaultChecked={initialEvents.includes(type)} className="mt-0.5 size-4 rounded border-ink-300 accent-accent-700" />
              <span>
                <span className="font-medium text-ink-900">{WEBHOOK_EVENT_LABELS[type].label}</span> <code className="font-mono text-xs text-ink-600">{type}</code>
                <span className="block text-xs text-ink-600">{WEBHOOK_EVENT_LABELS[type].description}</span>
              </span>
            </label>
          ))}
          {eventErrors?.length ? (
            <p id={`${fields.events.id}-error`} role="alert" className="flex items-start gap-1.5 text-sm text-sev-critical">
              <span aria-hidden="true">⚠</span>
              {eventErrors.join(" ")}
            </p>
          ) : null}
        </fieldset>
        <label className="flex items-start gap-2 text-sm">
          <input
            type="checkbox"
            name={fields.allowPrivate.name}
            defaultChecked={fields.allowPrivate.initialValue === "on"}
            className="mt-0.5 size-4 rounded border-ink-300 accent-accent-700"
          />
          <span>
            <span className="font-medium text-ink-900">Allow private addresses</span>
            <span className="block text-xs text-ink-600">
              Only for a receiver inside your own network (10.x, 192.168.x, localhost …). Cloud metadata addresses are refused regardless.
            </span>
          </span>
        </label>
        <Button type="submit" disabled={pending}>
          {pending ? "Checking the address…" : editing ? "Save changes" : "Register endpoint"}
        </Button>
      </form>
    </div>
  );
}
