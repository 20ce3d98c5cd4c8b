"use client";
import { getFormProps, getInputProps, getSelectProps, type FieldMetadata } from "@conform-to/react";
import { SubstancePicker } from "@/components/forms/substance-picker";
import { TextField } from "@/components/forms/text-field";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { FRACTION_SUM_TOLERANCE } from "@/lib/mixtures/fractions";
import { mixtureCreateSchema } from "@/lib/mixtures/schemas";
import { createMixtureAction } from "./actions";

const ROWS = 6;

export function MixtureForm() {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(mixtureCreateSchema, createMixtureAction, { id: "mixture-new", defaultValue: { fractionBasis: "mass" } });
  const componentsField = fields.components as unknown as FieldMetadata<unknown> & { errors?: string[] };
  const list = (componentsField as unknown as { getFieldList: () => FieldMetadata<{ substanceId: string; fraction: string }>[] }).getFieldList();
  const basis = getSelectProps(fields.fractionBasis as FieldMetadata<string>, { ariaAttributes: true });
  return (
    <form {...getFormProps(form)} action={dispatch} noValidate className="space-y-5">
      <FormMessage id={form.errorId} errors={form.errors} success={lastResult?.status === "success" ? lastResult.message : undefined} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField field={fields.name as FieldMetadata<string>} label="Name" hint="For example: Halogenated solvent waste, lab 2.115" />
        <Field id={fields.fractionBasis.id} label="Fractions are" errors={fields.fractionBasis.errors}>
          <select {...basis} key={basis.key} className={inputClass} aria-describedby={describedBy(fields.fractionBasis.id, undefined, fields.fractionBasis.errors)}>
            <option value="mass">mass fractions</option>
            <option value="mole">mole fractions</option>
          </select>
        </Field>
      </div>
      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold text-ink-900">Components</legend>
        <p className="text-xs text-ink-600">Fractions between 0 and 1 that add up to 1 (within ±{FRACTION_SUM_TOLERANCE}). Leave unused rows empty.</p>
        {componentsField.errors?.length ? (
          <p role="alert" className="text-sm text-sev-critical">
            ⚠ {componentsField.errors.join(" ")}
          </p>
        ) : null}
        {Array.from({ length: ROWS }, (_, index) => {
          const row = list[index]?.getFieldset();
          const fractionName = `components[${index}].fraction`;
          const fractionProps = row ? getInputProps(row.fraction as FieldMetadata<string>, { type: "number", ariaAttributes: true }) : { name: fractionName, id: `fraction-${index}` };
          return (
            <div key={index} className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_10rem]">
              <SubstancePicker name={`components[${index}].substanceId`} label={`Component ${index + 1}`} errors={row?.substanceId.errors} />
              <Field id={fractionProps.id ?? `fraction-${index}`} label="Fraction" errors={row?.fraction.errors}>
                <input {...fractionProps} name={fractionName} step="any" min="0" max="1" className={inputClass} />
              </Field>
            </div>
          );
        })}
      </fieldset>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Define mixture"}
      </Button>
    </form>
  );
}
