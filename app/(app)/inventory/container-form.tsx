"use client";
import { getFormProps, getInputProps, getSelectProps, getTextareaProps } from "@conform-to/react";
import { useState } from "react";
import { SubstancePicker } from "@/components/forms/substance-picker";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/auth/form-action";
import { AMOUNT_UNITS, CONTAINER_KIND_LABELS, CONTAINER_STATE_LABELS } from "@/lib/format/container-labels";
import { containerCreateSchema, containerEditFormSchema } from "@/lib/inventory/schemas";
import { StorageUnitOptions, type StorageUnitChoice } from "./storage-unit-options";
import { WhatIfPanel } from "./what-if-panel";
import { DateInput } from "@/components/forms/date-input";

type Person = { id: number; name: string };

export type ContainerFormValues = {
  id?: number;
  label?: string;
  substance?: { id: number; name: string; cas: string | null } | null;
  mixtureId?: number | null;
  amount?: number;
  amountUnit?: string;
  capacity?: number | null;
  capacityUnit?: string | null;
  containerKind?: string;
  state?: string;
  storageUnitId?: number;
  ownerId?: number | null;
  receivedAt?: string | null;
  openedAt?: string | null;
  expiresAt?: string | null;
  notes?: string | null;
};

type Action = (previous: FormState | undefined, formData: FormData) => Promise<FormState>;

/** Logging a new container, or editing one (then its location changes through "Move"). */
export function ContainerForm({
  mode,
  action,
  values = {},
  units,
  people,
  mixtures,
  canChooseOwner,
}: {
  mode: "create" | "edit";
  action: Action;
  values?: ContainerFormValues;
  units: StorageUnitChoice[];
  people: Person[];
  mixtures: { id: number; name: string }[];
  canChooseOwner: boolean;
}) {
  const schema = mode === "create" ? containerCreateSchema : containerEditFormSchema;
  const { form, fields, pending, lastResult, dispatch } = useServerForm(schema, action, {
    id: mode === "create" ? "container-new" : `container-${values.id}`,
    defaultValue: {
      ...values,
      substance: undefined,
      substanceId: values.substance?.id,
      amountUnit: values.amountUnit ?? "L",
      containerKind: values.containerKind ?? "glass_bottle",
      state: values.state ?? "sealed",
    },
  });
  const [content, setContent] = useState<"substance" | "mixture">(values.mixtureId ? "mixture" : "substance");
  const f = fields as unknown as Record<string, Parameters<typeof getInputProps>[0] & { errors?: string[]; id: string }>;
  const input = (name: string, type: "text" | "number" | "date" = "text") => {
    const props = getInputProps(f[name], { type, ariaAttributes: true });
    if (type === "date") return <DateInput {...props} key={props.key} className={inputClass} aria-describedby={describedBy(f[name].id, undefined, f[name].errors)} />;
    return <input {...props} key={props.key} step={type === "number" ? "any" : undefined} className={inputClass} aria-describedby={describedBy(f[name].id, undefined, f[name].errors)} />;
  };
  const select = (name: string, options: [string, string][], placeholder?: string) => {
    const props = getSelectProps(f[name], { ariaAttributes: true });
    return (
      <select {...props} key={props.key} className={inputClass} aria-describedby={describedBy(f[name].id, undefined, f[name].errors)}>
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map(([value, label]) => (
          <option key={value} value={value}>
            {label}
          </option>
        ))}
      </select>
    );
  };
  const success = lastResult?.status === "success" ? lastResult.message : undefined;

  return (
    <form {...getFormProps(form)} action={dispatch} noValidate className="space-y-6">
      <FormMessage id={form.errorId} errors={form.errors} success={success} />
      {values.id ? <input type="hidden" name="id" value={values.id} /> : null}

      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-ink-900">Container</legend>
        <Field id={f.label.id} label="Label or barcode" errors={f.label.errors} hint="Scan the barcode or type the label.">
          {(() => {
            const props = getInputProps(f.label, { type: "text", ariaAttributes: true });
            return (
              <input
                {...props}
                key={props.key}
                className={`${inputClass} font-mono`}
                autoFocus={mode === "create"}
                autoComplete="off"
                aria-describedby={describedBy(f.label.id, "hint", f.label.errors)}
                onKeyDown={(event) => {
                  // Scanners end with Enter: move on to the next field instead of submitting.
                  if (event.key === "Enter") {
                    event.preventDefault();
                    const next = (event.currentTarget.form?.querySelector("#" + CSS.escape(`${f.label.id}-next`)) as HTMLElement | null) ?? null;
                    (next ?? event.currentTarget.form?.querySelector<HTMLElement>("input[type=search]"))?.focus();
                  }
                }}
              />
            );
          })()}
        </Field>
        <Field id={f.containerKind.id} label="Kind of container" errors={f.containerKind.errors}>
          {select("containerKind", Object.entries(CONTAINER_KIND_LABELS))}
        </Field>
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="mb-2 text-sm font-semibold text-ink-900">Contents</legend>
        <div role="radiogroup" aria-label="The container holds" className="flex gap-4 text-sm">
          {(["substance", "mixture"] as const).map((kind) => (
            <label key={kind} className="flex items-center gap-2">
              <input type="radio" name="content-kind" checked={content === kind} onChange={() => setContent(kind)} />
              {kind === "substance" ? "A substance from the library" : "A mixture"}
            </label>
          ))}
        </div>
        {content === "substance" ? (
          <SubstancePicker name="substanceId" label="Substance" errors={f.substanceId.errors} defaultValue={values.substance ?? null} />
        ) : (
          <Field id={f.mixtureId.id} label="Mixture" errors={f.mixtureId.errors}>
            {select("mixtureId", mixtures.map((m) => [String(m.id), m.name]), "Choose a mixture")}
          </Field>
        )}
        {content === "mixture" ? <input type="hidden" name="substanceId" value="" /> : <input type="hidden" name="mixtureId" value="" />}
        <div className="grid gap-4 sm:grid-cols-4">
          <Field id={f.amount.id} label="Amount" errors={f.amount.errors}>
            {input("amount", "number")}
          </Field>
          <Field id={f.amountUnit.id} label="Unit" errors={f.amountUnit.errors}>
            {select("amountUnit", AMOUNT_UNITS.map((u) => [u, u]))}
          </Field>
          <Field id={f.capacity.id} label="Capacity (optional)" errors={f.capacity.errors}>
            {input("capacity", "number")}
          </Field>
          <Field id={f.capacityUnit.id} label="Capacity unit" errors={f.capacityUnit.errors}>
            {select("capacityUnit", AMOUNT_UNITS.map((u) => [u, u]), "—")}
          </Field>
        </div>
      </fieldset>

      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-ink-900">Where and whose</legend>
        {mode === "create" ? (
          <Field id={f.storageUnitId.id} label="Storage unit" errors={f.storageUnitId.errors}>
            {(() => {
              const props = getSelectProps(f.storageUnitId, { ariaAttributes: true });
              return (
                <select {...props} key={props.key} className={inputClass} aria-describedby={describedBy(f.storageUnitId.id, undefined, f.storageUnitId.errors)}>
                  <option value="">Choose a storage unit</option>
                  <StorageUnitOptions units={units} />
                </select>
              );
            })()}
          </Field>
        ) : null}
        {canChooseOwner ? (
          <Field id={f.ownerId.id} label="Owner" errors={f.ownerId.errors}>
            {select("ownerId", people.map((p) => [String(p.id), p.name]), "Me")}
          </Field>
        ) : null}
        <Field id={f.state.id} label="State" errors={f.state.errors}>
          {select("state", Object.entries(CONTAINER_STATE_LABELS).filter(([s]) => s !== "disposed"))}
        </Field>
      </fieldset>

      <fieldset className="grid gap-4 sm:grid-cols-3">
        <legend className="mb-2 text-sm font-semibold text-ink-900">Dates</legend>
        <Field id={f.receivedAt.id} label="Received on" errors={f.receivedAt.errors}>
          {input("receivedAt", "date")}
        </Field>
        <Field id={f.openedAt.id} label="Opened on" errors={f.openedAt.errors}>
          {input("openedAt", "date")}
        </Field>
        <Field id={f.expiresAt.id} label="Expires on" errors={f.expiresAt.errors}>
          {input("expiresAt", "date")}
        </Field>
      </fieldset>

      <Field id={f.notes.id} label="Notes (optional)" errors={f.notes.errors}>
        {(() => {
          const props = getTextareaProps(f.notes as never, { ariaAttributes: true });
          return <textarea {...props} key={props.key} rows={2} className={`${inputClass} h-auto py-2`} />;
        })()}
      </Field>

      {/* The what-if adds a new container; an edited one is already counted where it stands. */}
      {mode === "create" ? (
        <WhatIfPanel formId={form.id} />
      ) : values.id != null && values.storageUnitId != null ? (
        <WhatIfPanel formId={form.id} edited={{ id: values.id, storageUnitId: values.storageUnitId }} />
      ) : null}

      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : mode === "create" ? "Log container" : "Save changes"}
      </Button>
    </form>
  );
}
