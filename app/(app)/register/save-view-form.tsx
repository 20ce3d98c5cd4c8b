"use client";
import { getFormProps, getSelectProps } from "@conform-to/react";
import { useSearchParams } from "next/navigation";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { registerViewSchema } from "@/lib/register/schemas";
import { saveRegisterViewAction } from "./actions";

const ROLE_OPTIONS = [
  { value: "safety_officer", label: "Safety officers" },
  { value: "researcher", label: "Researchers" },
  { value: "facilities", label: "Facilities" },
  { value: "auditor", label: "Auditors" },
  { value: "admin", label: "Administrators" },
];

/** Saves the filters and sort on screen as what a role sees first. */
export function SaveViewForm() {
  const searchParams = useSearchParams();
  const query = new URLSearchParams([...searchParams.entries()].filter(([key]) => key !== "page")).toString();
  const { form, fields, pending, lastResult, dispatch } = useServerForm(registerViewSchema, saveRegisterViewAction, { id: "register-view", defaultValue: { role: "safety_officer" } });
  return (
    <form {...getFormProps(form)} action={dispatch} noValidate className="flex flex-wrap items-end gap-3">
      <input type="hidden" name="query" value={query} />
      <div className="w-56">
        <Field id={fields.role.id} label="Save this view as the default for" errors={fields.role.errors}>
          <select {...getSelectProps(fields.role)} key={fields.role.key} className={inputClass}>
            {ROLE_OPTIONS.map((o) => (
              <option key={o.value} value={o.value}>
                {o.label}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? "Saving…" : "Save default view"}
      </Button>
      <div className="basis-full">
        <FormMessage id={form.errorId} errors={[...(form.errors ?? []), ...(fields.query.errors ?? [])]} success={lastResult?.status === "success" ? lastResult.message : undefined} />
      </div>
    </form>
  );
}
