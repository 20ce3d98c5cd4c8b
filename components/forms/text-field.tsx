"use client";
import { getInputProps, type FieldMetadata } from "@conform-to/react";
import type { InputHTMLAttributes } from "react";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { DateInput } from "@/components/forms/date-input";

/** A Conform-bound input with its label, hint and errors. */
export function TextField({
  field,
  label,
  hint,
  type = "text",
  ...rest
}: {
  field: FieldMetadata<string | number | undefined>;
  label: string;
  hint?: string;
  type?: "text" | "email" | "password" | "number" | "date" | "search";
} & Omit<InputHTMLAttributes<HTMLInputElement>, "type" | "name" | "id" | "form">) {
  const props = getInputProps(field, { type, ariaAttributes: true });
  return (
    <Field id={field.id} label={label} hint={hint} errors={field.errors}>
      {type === "date" ? (
        <DateInput {...props} key={props.key} {...rest} className={inputClass} aria-describedby={describedBy(field.id, hint, field.errors)} />
      ) : (
        <input {...props} key={props.key} {...rest} className={inputClass} aria-describedby={describedBy(field.id, hint, field.errors)} />
      )}
    </Field>
  );
}
