"use client";
import { getFormProps, getInputProps, getSelectProps, getTextareaProps, type FieldMetadata } from "@conform-to/react";
import { useCallback, useEffect, useState } from "react";
import { z } from "zod";
import { useServerForm } from "@/components/forms/use-server-form";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { requiredId } from "@/lib/validation/fields";
import { STILL_HOLDS_PREFIX } from "@/lib/register/resolve-text";
import { FINDING_STEP_SCHEMAS } from "@/lib/register/schemas";
import { findingPageStepAction } from "./actions";
import { DateInput } from "@/components/forms/date-input";

type Step = keyof typeof FINDING_STEP_SCHEMAS;
type Person = { id: number; name: string };

const STEP_LABEL: Record<Step, string> = {
  acknowledge: "Acknowledge",
  start_mitigation: "Start mitigation",
  resolve: "Resolve",
  accept_risk: "Accept the risk",
  comment: "Comment",
  assign: "Assign",
  reopen: "Re-open",
};

const FIELDS: Record<Step, { name: string; label: string; kind: "textarea" | "person" | "date"; hint?: string }[]> = {
  acknowledge: [{ name: "note", label: "Note (optional)", kind: "textarea" }],
  start_mitigation: [
    { name: "plan", label: "Mitigation plan", kind: "textarea", hint: "What will be done, e.g. move the bottle to the flammable-storage refrigerator." },
    { name: "assigneeId", label: "Owner of the mitigation", kind: "person" },
  ],
  resolve: [{ name: "note", label: "Resolution note", kind: "textarea", hint: "What was done. Headroom re-assesses the location when you save: if the condition still holds, the finding stays open and you are told why." }],
  accept_risk: [
    { name: "justification", label: "Justification", kind: "textarea", hint: "Why the risk is acceptable and what controls are in place." },
    { name: "reviewDate", label: "Review date", kind: "date", hint: "At most three years ahead; the finding re-opens for review then." },
  ],
  comment: [{ name: "note", label: "Comment", kind: "textarea" }],
  assign: [{ name: "assigneeId", label: "Assign to", kind: "person" }],
  reopen: [{ name: "note", label: "Reason", kind: "textarea" }],
};

function StepForm({ step, findingId, people, onSaved }: { step: Step; findingId: number; people: Person[]; onSaved: (message: string) => void }) {
  const schema = FINDING_STEP_SCHEMAS[step].extend({ findingId: requiredId("finding") });
  const { form, fields, pending, lastResult, dispatch } = useServerForm(schema as unknown as z.ZodObject, findingPageStepAction, { id: `finding-step-${step}`, defaultValue: { kind: step, findingId } });
  const all = fields as unknown as Record<string, FieldMetadata<string>>;
  // Saved: the form closes (its text goes with it) and the outcome shows above the steps; the
  // page's history, refreshed by the action, shows the new event. After an error the form stays
  // open with what was typed.
  const saved = lastResult?.status === "success" ? (lastResult.message ?? "Saved.") : null;
  useEffect(() => {
    if (saved !== null) onSaved(saved);
  }, [lastResult, saved, onSaved]);
  return (
    <form {...getFormProps(form)} action={dispatch} noValidate className="space-y-4">
      <FormMessage id={form.errorId} errors={form.errors} />
      <input type="hidden" name="kind" value={step} />
      <input type="hidden" name="findingId" value={findingId} />
      {FIELDS[step].map((config) => {
        const field = all[config.name];
        const aria = describedBy(field.id, config.hint, field.errors);
        return (
          <Field key={config.name} id={field.id} label={config.label} hint={config.hint} errors={field.errors}>
            {config.kind === "textarea" ? (
              <textarea {...getTextareaProps(field, { ariaAttributes: true })} key={field.key} rows={3} className={`${inputClass} h-auto py-2`} aria-describedby={aria} />
            ) : config.kind === "person" ? (
              <select {...getSelectProps(field, { ariaAttributes: true })} key={field.key} className={inputClass} aria-describedby={aria}>
                <option value="">Choose a person</option>
                {people.map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.name}
                  </option>
                ))}
              </select>
            ) : (
              <DateInput {...getInputProps(field, { type: "date", ariaAttributes: true })} key={field.key} className={inputClass} aria-describedby={aria} />
            )}
          </Field>
        );
      })}
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : `Save: ${STEP_LABEL[step].toLowerCase()}`}
      </Button>
    </form>
  );
}

/** The workflow steps this person may take on this finding now, one at a time. */
export function FindingSteps({ findingId, steps, people }: { findingId: number; steps: Step[]; people: Person[] }) {
  const [open, setOpen] = useState<Step | null>(null);
  const [outcome, setOutcome] = useState<string | null>(null);
  const onSaved = useCallback((message: string) => {
    setOutcome(message);
    setOpen(null);
  }, []);
  const choose = (step: Step) => {
    setOutcome(null);
    setOpen(open === step ? null : step);
  };
  const stillHolds = outcome?.startsWith(STILL_HOLDS_PREFIX) ?? false;
  return (
    <div className="space-y-4">
      {outcome ? (
        stillHolds ? (
          <div role="alert" className="flex gap-2 rounded-md border border-sev-high/30 bg-sev-high-bg px-3 py-2.5 text-sm text-ink-900">
            <span aria-hidden="true">⚠</span>
            <p>{outcome}</p>
          </div>
        ) : (
          <FormMessage success={outcome} />
        )
      ) : null}
      {steps.length === 0 ? (
        <p className="text-sm text-ink-600">There is nothing you can do on this finding in its present status.</p>
      ) : (
        <div className="flex flex-wrap gap-2" role="group" aria-label="Workflow steps">
          {steps.map((step) => (
            <Button key={step} variant={open === step ? "primary" : "secondary"} aria-pressed={open === step} onClick={() => choose(step)}>
              {STEP_LABEL[step]}
            </Button>
          ))}
        </div>
      )}
      {open ? <StepForm key={open} step={open} findingId={findingId} people={people} onSaved={onSaved} /> : null}
    </div>
  );
}
