"use client";
import { getSelectProps, type FieldMetadata } from "@conform-to/react";
import { describedBy, Field, inputClass } from "@/components/ui/field";

export function SelectField({
  field,
  label,
  options,
  hint,
  placeholder,
}: {
  field: FieldMetadata<string | undefined>;
  label: string;
  options: { value: string; label: string }[];
  hint?: string;
  placeholder?: string;
}) {
  const props = getSelectProps(field, { ariaAttributes: true });
  return (
    <Field id={field.id} label={label} hint={hint} errors={field.errors}>
      <select {...props} key={props.key} className={inputClass} aria-describedby={describedBy(field.id, hint, field.errors)}>
        {placeholder ? <option value="">{placeholder}</option> : null}
        {options.map((option) => (
          <option key={option.value} value={option.value}>
            {option.label}
          </option>
        ))}
      </select>
    </Field>
  );
}
