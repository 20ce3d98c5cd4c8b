"use client";
import { getFormProps } from "@conform-to/react";
import { useState } from "react";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { ShownOnce } from "@/components/ui/shown-once";
import { FormMessage } from "@/components/ui/form-message";
import { apiKeyCreateFormSchema } from "@/lib/api-keys/schemas";
import { API_KEY_SCOPE_LABELS, API_KEY_SCOPES } from "@/lib/api-keys/scopes";
import { createApiKeyAction } from "./actions";

/** The new key, shown this once with a copy button. */
function NewKey({ value, onDone }: { value: string; onDone: () => void }) {
  return (
    <ShownOnce
      id="new-api-key"
      label="New API key"
      value={value}
      what="key"
      warning="Copy this key now. It will not be shown again: Headroom keeps only a hash of it."
      usage={
        <>
          Send it as the header <code className="font-mono">Authorization: Bearer &lt;key&gt;</code>.
        </>
      }
      doneLabel="I have stored the key"
      onDone={onDone}
    />
  );
}

export function ApiKeyCreateForm() {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(apiKeyCreateFormSchema, createApiKeyAction, { id: "api-key-new", defaultValue: { scopes: ["readings:write"] } });
  const [dismissed, setDismissed] = useState<string | null>(null);
  const newKey = lastResult?.status === "success" ? lastResult.message : undefined;
  const scopeErrors = fields.scopes.errors;
  return (
    <div className="space-y-4">
      {newKey && newKey !== dismissed ? <NewKey value={newKey} onDone={() => setDismissed(newKey)} /> : null}
      <form {...getFormProps(form)} action={dispatch} noValidate className="space-y-4">
        <FormMessage id={form.errorId} errors={form.errors} />
        <TextField field={fields.name} label="Name" hint="Where it is used, e.g. “Building B logger gateway”." autoComplete="off" />
        <fieldset className="space-y-2" aria-describedby={scopeErrors?.length ? `${fields.scopes.id}-error` : undefined}>
          <legend className="text-sm font-medium text-ink-800">Scopes</legend>
          {API_KEY_SCOPES.map((scope) => (
            <label key={scope} className="flex items-start gap-2 text-sm">
              <input
                type="checkbox"
                name={fields.scopes.name}
                value={scope}
                defaultChecked={(fields.scopes.initialValue as string[] | undefined)?.includes(scope) ?? false}
                className="mt-0.5 size-4 rounded border-ink-300 accent-accent-700"
              />
              <span>
                <span className="font-medium text-ink-900">{API_KEY_SCOPE_LABELS[scope].label}</span> <code className="font-mono text-xs text-ink-600">{scope}</code>
                <span className="block text-xs text-ink-600">{API_KEY_SCOPE_LABELS[scope].description}</span>
              </span>
            </label>
          ))}
          {scopeErrors?.length ? (
            <p id={`${fields.scopes.id}-error`} role="alert" className="flex items-start gap-1.5 text-sm text-sev-critical">
              <span aria-hidden="true">⚠</span>
              {scopeErrors.join(" ")}
            </p>
          ) : null}
        </fieldset>
        <Button type="submit" disabled={pending}>
          {pending ? "Creating…" : "Create key"}
        </Button>
      </form>
    </div>
  );
}
