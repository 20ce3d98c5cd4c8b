"use client";
import { createContext, useActionState, useContext, useEffect, useId, useMemo, useRef, useState, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { MAX_BULK_FINDINGS, type BULK_EVENT_KINDS } from "@/lib/register/schemas";
import { selectedIds, selectionMark, toggleFindings } from "@/lib/register/selection";
import { bulkFindingStepAction } from "./actions";
import { DateInput } from "@/components/forms/date-input";

type BulkKind = (typeof BULK_EVENT_KINDS)[number];

type Selection = {
  selected: ReadonlySet<number>;
  toggle: (ids: readonly number[], on: boolean) => void;
  clear: () => void;
  /** Counts the steps taken on the selection, so a list read in the browser knows to read its page again. */
  stepsTaken: number;
  /** A step went through: clear the selection, the findings have changed. */
  stepTaken: () => void;
};

const SelectionContext = createContext<Selection | null>(null);

/** Holds which findings are selected on the register page, across lines, locations and pages. */
export function SelectionProvider({ children }: { children: ReactNode }) {
  const [selected, setSelected] = useState<ReadonlySet<number>>(new Set());
  const [stepsTaken, setStepsTaken] = useState(0);
  const value = useMemo<Selection>(
    () => ({
      selected,
      toggle: (ids, on) => setSelected((current) => toggleFindings(current, ids, on)),
      clear: () => setSelected(new Set()),
      stepsTaken,
      stepTaken: () => {
        setSelected(new Set());
        setStepsTaken((n) => n + 1);
      },
    }),
    [selected, stepsTaken],
  );
  return <SelectionContext.Provider value={value}>{children}</SelectionContext.Provider>;
}

/** How many steps were taken on selected findings (0 outside a selection). */
export function useStepsTaken(): number {
  return useContext(SelectionContext)?.stepsTaken ?? 0;
}

/** A checkbox for one finding, a line's findings or a location's: checked when all are, mixed when some are. */
export function SelectBox({ ids, label }: { ids: readonly number[]; label: string }) {
  const selection = useContext(SelectionContext);
  const ref = useRef<HTMLInputElement>(null);
  const mark = selection ? selectionMark(selection.selected, ids) : "none";
  const all = mark === "all";
  useEffect(() => {
    if (ref.current) ref.current.indeterminate = mark === "some";
  }, [mark]);
  if (!selection) return null;
  return (
    <input
      ref={ref}
      type="checkbox"
      aria-label={label}
      checked={all}
      disabled={ids.length === 0}
      onChange={(event) => selection.toggle(ids, event.target.checked)}
      className="size-4 rounded border-ink-400 accent-accent-700"
    />
  );
}

const KIND_LABELS: Record<BulkKind, string> = {
  acknowledge: "Acknowledge",
  assign: "Assign to a person",
  comment: "Add a comment",
  start_mitigation: "Start mitigation",
  accept_risk: "Accept the risk",
};

/**
 * The step to take on the selected findings, with the fields of that step. Each finding is
 * checked on the server on its own; those refused are listed in the message.
 */
export function BulkBar({ kinds, people }: { kinds: readonly BulkKind[]; people: { id: number; name: string }[] }) {
  const selection = useContext(SelectionContext);
  const id = useId();
  const [kind, setKind] = useState<BulkKind>(kinds[0]);
  const [state, dispatch, pending] = useActionState(bulkFindingStepAction, undefined);
  const lastHandled = useRef<unknown>(null);
  useEffect(() => {
    // After a step that went through, start a fresh selection (the lines have changed).
    if (state && state !== lastHandled.current && state.status === "success") {
      lastHandled.current = state;
      selection?.stepTaken();
    }
  }, [state, selection]);
  if (!selection || kinds.length === 0) return null;
  const ids = selectedIds(selection.selected);
  const errors = state?.error ?? {};
  const fieldErrors = (name: string) => errors[name] ?? undefined;
  const formErrors = [...(errors[""] ?? []), ...(errors.findingIds ?? [])];
  const tooMany = ids.length > MAX_BULK_FINDINGS;
  return (
    <section aria-label="Act on the selected findings" className="sticky top-14 z-[25] rounded-lg border border-accent-200 bg-accent-50/95 px-4 py-3 shadow-sm backdrop-blur lg:top-0">
      <form action={dispatch} className="flex flex-wrap items-end gap-3">
        {ids.map((findingId, i) => (
          <input key={findingId} type="hidden" name={`findingIds[${i}]`} value={findingId} />
        ))}
        <p className="min-w-40 text-sm font-medium text-ink-900" aria-live="polite">
          {ids.length === 0 ? "Select findings to act on several at once." : `${ids.length} ${ids.length === 1 ? "finding" : "findings"} selected`}
          {ids.length > 0 ? (
            <button type="button" onClick={selection.clear} className="ml-2 text-xs font-normal text-accent-800 underline underline-offset-2">
              Clear
            </button>
          ) : null}
        </p>
        <div className="w-52">
          <Field id={`${id}-kind`} label="Step">
            <select id={`${id}-kind`} name="kind" value={kind} onChange={(event) => setKind(event.target.value as BulkKind)} className={inputClass}>
              {kinds.map((k) => (
                <option key={k} value={k}>
                  {KIND_LABELS[k]}
                </option>
              ))}
            </select>
          </Field>
        </div>
        {kind === "assign" || kind === "start_mitigation" ? (
          <div className="w-56">
            <Field id={`${id}-assignee`} label={kind === "assign" ? "Person" : "Owner of the mitigation"} errors={fieldErrors("assigneeId")}>
              <select id={`${id}-assignee`} name="assigneeId" defaultValue="" className={inputClass}>
                <option value="">Choose a person</option>
                {people.map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.name}
                  </option>
                ))}
              </select>
            </Field>
          </div>
        ) : null}
        {kind === "start_mitigation" ? (
          <div className="min-w-64 flex-1">
            <Field id={`${id}-plan`} label="Mitigation plan" errors={fieldErrors("plan")}>
              <input id={`${id}-plan`} name="plan" maxLength={4000} className={inputClass} />
            </Field>
          </div>
        ) : null}
        {kind === "acknowledge" || kind === "comment" ? (
          <div className="min-w-64 flex-1">
            <Field id={`${id}-note`} label={kind === "comment" ? "Comment" : "Note (optional)"} errors={fieldErrors("note")}>
              <input id={`${id}-note`} name="note" maxLength={kind === "comment" ? 4000 : 2000} className={inputClass} />
            </Field>
          </div>
        ) : null}
        {kind === "accept_risk" ? (
          <>
            <div className="min-w-64 flex-1">
              <Field id={`${id}-justification`} label="Justification (one for all selected)" errors={fieldErrors("justification")}>
                <input id={`${id}-justification`} name="justification" maxLength={4000} className={inputClass} />
              </Field>
            </div>
            <div className="w-44">
              <Field id={`${id}-review`} label="Review date" errors={fieldErrors("reviewDate")}>
                <DateInput id={`${id}-review`} name="reviewDate" className={inputClass} />
              </Field>
            </div>
          </>
        ) : null}
        <Button type="submit" disabled={pending || ids.length === 0 || tooMany}>
          {pending ? "Working…" : `Apply to ${ids.length}`}
        </Button>
        <div className="basis-full empty:hidden">
          {tooMany ? <FormMessage errors={[`At most ${MAX_BULK_FINDINGS} findings at once: narrow the selection.`]} /> : null}
          <FormMessage errors={formErrors.length ? formErrors : undefined} success={state?.status === "success" ? state.message : undefined} />
        </div>
      </form>
    </section>
  );
}
