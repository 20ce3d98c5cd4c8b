"use client";
import { getFormProps, getTextareaProps } from "@conform-to/react";
import { useState } from "react";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { excursionsAcknowledgeFormSchema } from "@/lib/temperatures/schemas";
import { acknowledgeExcursionsAction } from "./actions";

const HINT = "One note for every ticked excursion: what was found and what was done, e.g. “Compressor replaced 2026-03-09; stock checked.”";

/**
 * Acknowledge the ticked excursions at once. The checkboxes sit in the list below and belong to
 * this form through their `form` attribute.
 */
export function AcknowledgeSelected({ formId, count }: { formId: string; count: number }) {
  const { form, fields, pending, lastResult, dispatch } = useServerForm(excursionsAcknowledgeFormSchema, acknowledgeExcursionsAction, { id: formId });
  const [allTicked, setAllTicked] = useState(false);
  const note = getTextareaProps(fields.note, { ariaAttributes: true });
  const boxes = () => document.querySelectorAll<HTMLInputElement>(`input[type=checkbox][name=excursionIds][form="${formId}"]`);
  const tickAll = (checked: boolean) => {
    for (const box of boxes()) box.checked = checked;
    setAllTicked(checked);
  };
  return (
    <form {...getFormProps(form)} id={form.id} action={dispatch} noValidate className="space-y-3 rounded-md border border-ink-200 bg-ink-50 p-3">
      <FormMessage id={form.errorId} errors={[...(form.errors ?? []), ...(fields.excursionIds.errors ?? [])]} success={lastResult?.status === "success" ? lastResult.message : undefined} />
      <label className="flex items-center gap-2 text-sm text-ink-800">
        <input type="checkbox" checked={allTicked} onChange={(event) => tickAll(event.target.checked)} className="size-4 accent-accent-700" />
        Tick all {count} listed below
      </label>
      <Field id={fields.note.id} label="Note (optional)" hint={HINT} errors={fields.note.errors}>
        <textarea {...note} key={note.key} rows={2} className={`${inputClass} h-auto py-2`} aria-describedby={describedBy(fields.note.id, HINT, fields.note.errors)} />
      </Field>
      <Button type="submit" size="sm" disabled={pending}>
        {pending ? "Saving…" : "Acknowledge the ticked excursions"}
      </Button>
    </form>
  );
}
