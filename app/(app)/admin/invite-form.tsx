"use client";
import { getFormProps } from "@conform-to/react";
import { SelectField } from "@/components/forms/select-field";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { ROLE_LABELS, ROLES } from "@/lib/auth/permissions";
import { inviteUserSchema } from "@/lib/users/schemas";
import { inviteUserAction } from "./actions";

const roleOptions = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));

const methodOptions = [
  { value: "password", label: "Password (e-mailed link to set one)" },
  { value: "sso", label: "Their institution (single sign-on)" },
];

export function InviteForm({ sso = false }: { sso?: boolean }) {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(inviteUserSchema, inviteUserAction, { id: "invite-user" });
  const success = lastResult?.status === "success" ? lastResult.message : undefined;
  return (
    <form {...getFormProps(form)} action={dispatch} className="space-y-4" noValidate>
      <FormMessage id={form.errorId} errors={form.errors} success={success} />
      <TextField field={fields.name} label="Name" autoComplete="off" />
      <TextField field={fields.email} label="E-mail address" type="email" autoComplete="off" />
      <SelectField field={fields.role} label="Role" options={roleOptions} placeholder="Choose a role" />
      {sso ? <SelectField field={fields.signInMethod} label="Signs in with" options={methodOptions} /> : null}
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send invitation"}
      </Button>
    </form>
  );
}
