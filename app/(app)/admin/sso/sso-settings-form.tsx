"use client";
import { getFormProps, getInputProps, getSelectProps, getTextareaProps } from "@conform-to/react";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { ROLE_LABELS, ROLES } from "@/lib/auth/permissions";
import { ssoSettingsSchema, type SsoSettings } from "@/lib/sso/schemas";
import { saveSsoSettingsAction } from "./actions";

export function SsoSettingsForm({
  value,
  admins,
  providerConfigured,
}: {
  value: SsoSettings;
  admins: { id: number; name: string; email: string }[];
  providerConfigured: boolean;
}) {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(ssoSettingsSchema, saveSsoSettingsAction, {
    id: "sso-settings",
    defaultValue: {
      mappings: value.mappings,
      jitDomains: value.jitDomains.join("\n"),
      requireSso: value.requireSso ? "on" : undefined,
      breakGlassUserId: value.breakGlassUserId ? String(value.breakGlassUserId) : "",
    },
  });
  const success = lastResult?.status === "success" ? lastResult.message : undefined;
  const rules = fields.mappings.getFieldList();
  const jit = getTextareaProps(fields.jitDomains);
  const breakGlass = getSelectProps(fields.breakGlassUserId);
  return (
    <form {...getFormProps(form)} action={dispatch} className="space-y-6" noValidate>
      {/* The form's default button: Enter in a field saves (the rule buttons below also submit, with their own intent). */}
      <button type="submit" className="sr-only" tabIndex={-1} aria-hidden="true">
        Save
      </button>
      <FormMessage id={form.errorId} errors={form.errors} success={success} />

      <fieldset>
        <legend className="text-sm font-medium text-ink-900">Group rules</legend>
        <p className="mt-1 text-sm text-ink-600">
          At each sign-in the person&apos;s groups from the institution are compared with these rules from the top; the first rule that
          matches gives the role. No match: no access.
        </p>
        <FormMessage errors={fields.mappings.errors} />
        <ol className="mt-3 space-y-3">
          {rules.map((rule, index) => {
            const ruleFields = rule.getFieldset();
            const group = getInputProps(ruleFields.group, { type: "text" });
            const role = getSelectProps(ruleFields.role);
            return (
              <li key={rule.key} className="grid grid-cols-[2rem_minmax(0,1fr)_minmax(0,12rem)_auto] items-start gap-2">
                <span className="pt-2 text-sm tabular text-ink-500">{index + 1}.</span>
                <Field id={ruleFields.group.id} label={`Group of rule ${index + 1}`} errors={ruleFields.group.errors}>
                  <input {...group} key={group.key} className={inputClass} autoComplete="off" aria-describedby={describedBy(ruleFields.group.id, undefined, ruleFields.group.errors)} />
                </Field>
                <Field id={ruleFields.role.id} label={`Role of rule ${index + 1}`} errors={ruleFields.role.errors}>
                  <select {...role} key={role.key} className={inputClass}>
                    <option value="">Choose a role</option>
                    {ROLES.map((r) => (
                      <option key={r} value={r}>
                        {ROLE_LABELS[r]}
                      </option>
                    ))}
                  </select>
                </Field>
                <div className="flex gap-1 pt-6">
                  <Button type="submit" variant="ghost" size="sm" disabled={index === 0} aria-label={`Move rule ${index + 1} up`} {...form.reorder.getButtonProps({ name: fields.mappings.name, from: index, to: index - 1 })}>
                    ↑
                  </Button>
                  <Button type="submit" variant="ghost" size="sm" disabled={index === rules.length - 1} aria-label={`Move rule ${index + 1} down`} {...form.reorder.getButtonProps({ name: fields.mappings.name, from: index, to: index + 1 })}>
                    ↓
                  </Button>
                  <Button type="submit" variant="ghost" size="sm" aria-label={`Remove rule ${index + 1}`} {...form.remove.getButtonProps({ name: fields.mappings.name, index })}>
                    Remove
                  </Button>
                </div>
              </li>
            );
          })}
        </ol>
        <Button type="submit" variant="secondary" size="sm" className="mt-3" {...form.insert.getButtonProps({ name: fields.mappings.name, defaultValue: { group: "", role: "" } as never })}>
          Add a group rule
        </Button>
      </fieldset>

      <Field
        id={fields.jitDomains.id}
        label="Open accounts at first sign-in for these domains"
        hint="One per line, like lab.example.org. People with a verified address there get an account with their group's role without an invitation. Leave empty to admit invited people only."
        errors={fields.jitDomains.errors}
      >
        <textarea {...jit} key={jit.key} rows={3} className={`${inputClass} h-auto py-2`} aria-describedby={describedBy(fields.jitDomains.id, "hint", fields.jitDomains.errors)} />
      </Field>

      <fieldset className="space-y-3 rounded-md border border-ink-200 p-4">
        <legend className="px-1 text-sm font-medium text-ink-900">Require single sign-on</legend>
        <label className="flex items-start gap-2 text-sm text-ink-800">
          <input {...getInputProps(fields.requireSso, { type: "checkbox", value: "on" })} disabled={!providerConfigured} className="mt-0.5" />
          <span>
            Refuse password sign-in for everyone except the break-glass administrator below.
            {providerConfigured ? "" : " Not available: no provider is configured on this installation."}
          </span>
        </label>
        <Field
          id={fields.breakGlassUserId.id}
          label="Break-glass administrator"
          hint="An active administrator who keeps a password, for when the institution's sign-in is down. Keep the password in a safe place."
          errors={fields.breakGlassUserId.errors}
        >
          <select {...breakGlass} key={breakGlass.key} className={inputClass} aria-describedby={describedBy(fields.breakGlassUserId.id, "hint", fields.breakGlassUserId.errors)}>
            <option value="">None</option>
            {admins.map((a) => (
              <option key={a.id} value={String(a.id)}>
                {a.name} ({a.email})
              </option>
            ))}
          </select>
        </Field>
      </fieldset>

      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Save single sign-on settings"}
      </Button>
    </form>
  );
}
