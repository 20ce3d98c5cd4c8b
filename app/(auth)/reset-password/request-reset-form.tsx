"use client";
import { getFormProps } from "@conform-to/react";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { requestResetSchema } from "@/lib/users/schemas";
import { requestResetAction } from "../actions";

export function RequestResetForm() {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(requestResetSchema, requestResetAction, { id: "request-reset" });
  return (
    <form {...getFormProps(form)} action={dispatch} className="space-y-5" noValidate>
      <FormMessage id={form.errorId} errors={form.errors} success={lastResult?.message} />
      <TextField field={fields.email} label="E-mail address" type="email" autoComplete="username" autoFocus />
      <Button type="submit" className="w-full" disabled={pending}>
        {pending ? "Sending…" : "Send reset link"}
      </Button>
    </form>
  );
}
