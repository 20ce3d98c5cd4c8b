"use client";
import { getFormProps } from "@conform-to/react";
import { Check, Copy, TriangleAlert } from "lucide-react";
import { useRef, useState } from "react";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { apiKeyCreateFormSchema } from "@/lib/api-keys/schemas";
import { API_KEY_SCOPE_LABELS, API_KEY_SCOPES } from "@/lib/api-keys/scopes";
import { createApiKeyAction } from "./actions";

/** The new key, shown this once with a copy button. */
function NewKey({ value, onDone }: { value: string; onDone: () => void }) {
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<"yes" | "no" | null>(null);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(value);
      setCopied("yes");
    } catch {
      // No clipboard access (insecure context, denied): select the text for Ctrl+C instead.
      input.current?.select();
      setCopied("no");
    }
  };
  return (
    <div role="status" className="space-y-3 rounded-md border border-sev-moderate/40 bg-sev-moderate-bg px-3 py-3">
      <p className="flex items-start gap-2 text-sm font-medium text-ink-900">
        <TriangleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0 text-sev-moderate" />
        Copy this key now. It will not be shown again: Headroom keeps only a hash of it.
      </p>
      <label htmlFor="new-api-key" className="block text-xs font-medium text-ink-700">
        New API key
      </label>
      <div className="flex gap-2">
        <input
          ref={input}
          id="new-api-key"
          readOnly
          value={value}
          onFocus={(event) => event.target.select()}
          className="h-9 min-w-0 flex-1 rounded-md border border-ink-300 bg-white px-2 font-mono text-sm text-ink-950"
        />
        <Button size="sm" variant="secondary" onClick={copy}>
          {copied === "yes" ? <Check aria-hidden="true" className="size-4" /> : <Copy aria-hidden="true" className="size-4" />}
          {copied === "yes" ? "Copied" : "Copy"}
        </Button>
      </div>
      {copied === "no" ? <p className="text-xs text-ink-700">The browser refused the clipboard; the key is selected, press Ctrl+C (⌘C).</p> : null}
      <p className="text-xs text-ink-700">Send it as the header <code className="font-mono">Authorization: Bearer &lt;key&gt;</code>.</p>
      <Button size="sm" onClick={onDone}>
        I have stored the key
      </Button>
    </div>
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
