"use client";
import { getFormProps, getTextareaProps } from "@conform-to/react";
import { useState } from "react";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { excursionAcknowledgeFormSchema } from "@/lib/temperatures/schemas";
import { acknowledgeExcursionAction } from "./actions";

const HINT = "What was found and what was done, e.g. “Door left ajar after delivery; closed, stock checked.”";

/** "Acknowledge" opens a comment box; the comment is required and kept with the excursion. */
export function AcknowledgeExcursion({ excursionId, describedById }: { excursionId: number; describedById?: string }) {
  const [open, setOpen] = useState(false);
  const { form, fields, pending, lastResult, dispatch } = useServerForm(excursionAcknowledgeFormSchema, acknowledgeExcursionAction, { id: `acknowledge-${excursionId}` });
  const panelId = `acknowledge-${excursionId}-panel`;
  if (lastResult?.status === "success") return <FormMessage success={lastResult.message} />;
  if (!open) {
    return (
      <Button size="sm" variant="secondary" aria-expanded={false} aria-controls={panelId} aria-describedby={describedById} onClick={() => setOpen(true)}>
        Acknowledge
      </Button>
    );
  }
  const comment = getTextareaProps(fields.comment, { ariaAttributes: true });
  return (
    <form {...getFormProps(form)} id={form.id} action={dispatch} noValidate className="min-w-64 space-y-2" aria-describedby={describedById}>
      <div id={panelId} className="space-y-2">
        <FormMessage id={form.errorId} errors={form.errors} />
        <input type="hidden" name="excursionId" value={excursionId} />
        <Field id={fields.comment.id} label="Comment" hint={HINT} errors={fields.comment.errors}>
          <textarea {...comment} key={comment.key} rows={3} autoFocus className={`${inputClass} h-auto py-2`} aria-describedby={describedBy(fields.comment.id, HINT, fields.comment.errors)} />
        </Field>
        <div className="flex gap-2">
          <Button type="submit" size="sm" disabled={pending}>
            {pending ? "Saving…" : "Save acknowledgement"}
          </Button>
          <Button size="sm" variant="ghost" onClick={() => setOpen(false)}>
            Cancel
          </Button>
        </div>
      </div>
    </form>
  );
}
