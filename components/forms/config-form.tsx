"use client";
import { getFormProps, getInputProps, getSelectProps, getTextareaProps, type FieldMetadata } from "@conform-to/react";
import type { z } from "zod";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/auth/form-action";
import { DateInput } from "@/components/forms/date-input";

export type FieldConfig =
  | { name: string; label: string; kind: "text" | "number" | "date"; hint?: string; span?: 1 | 2 | 3 }
  | { name: string; label: string; kind: "textarea"; hint?: string; span?: 1 | 2 | 3 }
  | { name: string; label: string; kind: "select"; options: { value: string; label: string; group?: string }[]; placeholder?: string; hint?: string; span?: 1 | 2 | 3 }
  | { name: string; label: string; kind: "yesno"; hint?: string; span?: 1 | 2 | 3 };

export type FieldSection = { legend?: string; fields: FieldConfig[] };

type Action = (previous: FormState | undefined, formData: FormData) => Promise<FormState>;

// Columns follow the form's own width, not the window's, so a select keeps room for its longest
// choice (about 20 rem a column) whether the form fills the page or sits beside a panel.
const SPAN = { 1: "", 2: "@2xl/form:col-span-2", 3: "@2xl/form:col-span-2 @5xl/form:col-span-3" } as const;

function Control({ field, config }: { field: FieldMetadata<unknown>; config: FieldConfig }) {
  const aria = describedBy(field.id, config.hint, field.errors);
  if (config.kind === "textarea") {
    const props = getTextareaProps(field as FieldMetadata<string>, { ariaAttributes: true });
    return <textarea {...props} key={props.key} rows={3} className={`${inputClass} h-auto py-2`} aria-describedby={aria} />;
  }
  if (config.kind === "select" || config.kind === "yesno") {
    const props = getSelectProps(field as FieldMetadata<string>, { ariaAttributes: true });
    const options =
      config.kind === "yesno"
        ? [
            { value: "true", label: "Yes", group: undefined },
            { value: "false", label: "No", group: undefined },
          ]
        : config.options;
    const groups = [...new Set(options.map((o) => o.group))];
    const render = (list: typeof options) =>
      list.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ));
    return (
      <select {...props} key={props.key} className={inputClass} aria-describedby={aria}>
        {config.kind === "select" && config.placeholder !== undefined ? <option value="">{config.placeholder}</option> : null}
        {groups.length > 1 || groups[0]
          ? groups.map((g) => (
              <optgroup key={g ?? "other"} label={g ?? "Other"}>
                {render(options.filter((o) => o.group === g))}
              </optgroup>
            ))
          : render(options)}
      </select>
    );
  }
  const props = getInputProps(field as FieldMetadata<string>, { type: config.kind, ariaAttributes: true });
  if (config.kind === "date") return <DateInput {...props} key={props.key} className={inputClass} aria-describedby={aria} />;
  return <input {...props} key={props.key} step={config.kind === "number" ? "any" : undefined} className={inputClass} aria-describedby={aria} />;
}

/**
 * A form described by its fields, bound to one zod schema shared with its server action. Errors sit
 * under their fields; the form keeps what was typed after an error; success is confirmed.
 */
export function ConfigForm<S extends z.ZodObject>({
  id,
  schema,
  action,
  sections,
  defaultValue,
  hidden,
  submitLabel,
}: {
  id: string;
  schema: S;
  action: Action;
  sections: FieldSection[];
  defaultValue?: Record<string, unknown>;
  hidden?: Record<string, string | number>;
  submitLabel: string;
}) {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(schema, action, { id, defaultValue });
  const all = fields as unknown as Record<string, FieldMetadata<unknown>>;
  // "sources.flashPointC" → the flashPointC field of the sources fieldset.
  const fieldFor = (name: string): FieldMetadata<unknown> => {
    const [head, ...rest] = name.split(".");
    let field = all[head];
    for (const part of rest) field = (field as unknown as { getFieldset: () => Record<string, FieldMetadata<unknown>> }).getFieldset()[part];
    return field;
  };
  const success = lastResult?.status === "success" ? lastResult.message : undefined;
  return (
    <form {...getFormProps(form)} action={dispatch} noValidate className="@container/form space-y-6">
      <FormMessage id={form.errorId} errors={form.errors} success={success} />
      {Object.entries(hidden ?? {}).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      {sections.map((section, index) => (
        <fieldset key={section.legend ?? index} className="grid gap-4 @2xl/form:grid-cols-2 @5xl/form:grid-cols-3">
          {section.legend ? <legend className="mb-2 text-sm font-semibold text-ink-900">{section.legend}</legend> : null}
          {section.fields.map((config) => {
            const field = fieldFor(config.name);
            return (
              <div key={config.name} className={SPAN[config.span ?? 1]}>
                <Field id={field.id} label={config.label} hint={config.hint} errors={field.errors}>
                  <Control field={field} config={config} />
                </Field>
              </div>
            );
          })}
        </fieldset>
      ))}
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : submitLabel}
      </Button>
    </form>
  );
}
