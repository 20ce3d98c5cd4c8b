"use client";
import { getFormProps } from "@conform-to/react";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/auth/form-action";
import { setPasswordSchema } from "@/lib/users/schemas";

export function SetPasswordForm({
  token,
  action,
  email,
  defaultName,
  submitLabel,
}: {
  token: string;
  action: (previous: FormState | undefined, formData: FormData) => Promise<FormState>;
  email: string;
  defaultName?: string;
  submitLabel: string;
}) {
  const { form, fields, pending, dispatch } = useServerForm(setPasswordSchema, action, {
    id: "set-password",
    defaultValue: { name: defaultName },
  });
  return (
    <form {...getFormProps(form)} action={dispatch} className="space-y-5" noValidate>
      <FormMessage id={form.errorId} errors={form.errors} />
      <input type="hidden" name="token" value={token} />
      <div className="space-y-1.5">
        <p className="block text-sm font-medium text-ink-800">E-mail address</p>
        <p className="rounded-md border border-ink-200 bg-ink-100 px-3 py-2 text-sm text-ink-700">{email}</p>
      </div>
      {defaultName !== undefined ? <TextField field={fields.name} label="Your name" autoComplete="name" /> : null}
      <TextField
        field={fields.password}
        label="New password"
        type="password"
        autoComplete="new-password"
        hint="At least 12 characters. A short sentence works well."
      />
      <TextField field={fields.confirmPassword} label="Repeat the new password" type="password" autoComplete="new-password" />
      <Button type="submit" className="w-full" disabled={pending}>
        {pending ? "Saving…" : submitLabel}
      </Button>
    </form>
  );
}
