"use client";
import { useActionState, useEffect, useId, useRef, useState } from "react";
import { Button, buttonClass } from "@/components/ui/button";
import { Caution } from "@/components/ui/caution";
import { inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/auth/form-action";
import { moveContainerAction } from "../actions";
import { SaferPlaces } from "../safer-places";
import { StorageUnitOptions, type StorageUnitChoice } from "../storage-unit-options";
import { useWhatIf, WhatIfBody } from "../what-if-panel";

export type MovedContainer = {
  id: number;
  label: string;
  storageUnitId: number;
  roomCode: string;
  unitCode: string;
  /** What it holds: with it, the dialog suggests safer places before a unit is chosen. */
  contents?: { substanceId: number | null; mixtureId: number | null; amount: number; amountUnit: string };
};

function errorsOf(state: FormState | undefined): string[] | undefined {
  const errors = state?.error ? Object.values(state.error).flat().filter((m): m is string => Boolean(m)) : undefined;
  return errors?.length ? errors : undefined;
}

/**
 * Move a container: choose the storage unit, read the what-if for the move (what it would raise
 * there, what is already flagged there about its contents, what leaves the old place), then
 * confirm. A modal dialog: Escape or Cancel closes it, focus returns to the button that opened it.
 */
export function MoveDialog({ container, units, initialTarget }: { container: MovedContainer; units: StorageUnitChoice[]; initialTarget?: number }) {
  const dialogRef = useRef<HTMLDialogElement>(null);
  const openerRef = useRef<HTMLButtonElement>(null);
  const titleId = useId();
  const selectId = useId();
  // Opened from a suggestion (?moveTo=): the dialog opens with that unit chosen; nothing moves until the person confirms.
  const suggested = initialTarget != null && initialTarget !== container.storageUnitId && units.some((u) => u.id === initialTarget) ? initialTarget : null;
  const [open, setOpen] = useState(suggested != null);
  const [target, setTarget] = useState(suggested != null ? String(suggested) : "");
  const [state, dispatch, pending] = useActionState(moveContainerAction, undefined);
  // The action's answer before this opening of the dialog: only a newer one is shown in it.
  const [stateAtOpen, setStateAtOpen] = useState<FormState | undefined>(undefined);

  const targetId = Number(target);
  const request = open && Number.isInteger(targetId) && targetId > 0 ? { storageUnitId: targetId, containerId: container.id } : null;
  const whatIf = useWhatIf(request);
  // Before a unit is chosen: the places safer than where it stands (the what-if of the container as it is, there).
  const contents = container.contents;
  const hereRequest =
    open && !request && contents && (contents.substanceId != null || contents.mixtureId != null)
      ? {
          storageUnitId: container.storageUnitId,
          containerId: container.id,
          ...(contents.substanceId != null ? { substanceId: contents.substanceId } : { mixtureId: contents.mixtureId! }),
          amount: contents.amount,
          amountUnit: contents.amountUnit,
        }
      : null;
  const here = useWhatIf(hereRequest);
  const targetUnit = units.find((u) => u.id === targetId);

  useEffect(() => {
    if (suggested != null) dialogRef.current?.showModal();
  }, [suggested]);

  // A finished move closes the dialog and leaves its message on the page; an error stays in the dialog.
  useEffect(() => {
    if (state?.status === "success") dialogRef.current?.close();
  }, [state]);

  const openDialog = () => {
    setStateAtOpen(state);
    setOpen(true);
    dialogRef.current?.showModal();
  };
  const onClose = () => {
    setOpen(false);
    setTarget("");
    openerRef.current?.focus();
  };

  const fresh = state !== undefined && state !== stateAtOpen;
  const success = !open && state?.status === "success" ? state.message : undefined;
  const errors = open && fresh ? errorsOf(state) : undefined;

  return (
    <div className="space-y-2">
      <FormMessage success={success} />
      <p className="text-sm text-ink-700">
        Now in{" "}
        <span className="font-medium text-ink-900">
          {container.roomCode} / {container.unitCode}
        </span>
        .
      </p>
      <button ref={openerRef} type="button" className={buttonClass("secondary")} onClick={openDialog} aria-haspopup="dialog">
        Move…
      </button>
      <dialog
        ref={dialogRef}
        aria-labelledby={titleId}
        onClose={onClose}
        className="m-auto w-[min(40rem,calc(100vw-2rem))] max-h-[calc(100dvh-2rem)] overflow-y-auto rounded-lg border border-ink-200 bg-white p-0 text-ink-900 shadow-xl backdrop:bg-ink-900/40"
      >
        <form action={dispatch} className="space-y-4 px-5 py-4">
          <h2 id={titleId} className="text-base font-semibold text-ink-900">
            Move {container.label}
          </h2>
          <FormMessage errors={errors} />
          <input type="hidden" name="id" value={container.id} />
          <p className="text-sm text-ink-700">
            From {container.roomCode} / {container.unitCode}. Choose where it goes: you see what the move would raise or leave flagged before you confirm.
          </p>
          <div className="space-y-1.5">
            <label htmlFor={selectId} className="block text-sm font-medium text-ink-800">
              Move to
            </label>
            <select id={selectId} name="storageUnitId" value={target} onChange={(event) => setTarget(event.target.value)} className={inputClass} required>
              <option value="" disabled>
                Choose a storage unit
              </option>
              <StorageUnitOptions units={units.filter((u) => u.id !== container.storageUnitId)} />
            </select>
          </div>
          <section aria-label="What the move would change" className="space-y-3 rounded-lg border border-ink-200 bg-ink-50 px-4 py-3">
            <div aria-live="polite" aria-busy={whatIf.kind === "loading"} className="text-sm text-ink-700">
              {!request && here.kind === "loading" ? <p className="mb-2 text-ink-600">Looking for safer places…</p> : null}
              {!request && here.kind === "done" && here.data.alternatives?.length ? (
                <div className="mb-3">
                  <SaferPlaces places={here.data.alternatives} onChoose={(unitId) => setTarget(String(unitId))} />
                </div>
              ) : null}
              <WhatIfBody
                state={whatIf}
                idleText="Choose a storage unit to see what moving it there would raise."
                afterword="You can still move it; the register lists what is raised."
                choose={{ onChoose: (unitId) => setTarget(String(unitId)) }}
              />
            </div>
            <Caution />
          </section>
          <div className="flex flex-wrap justify-end gap-2">
            <Button variant="secondary" onClick={() => dialogRef.current?.close()}>
              Cancel
            </Button>
            <Button type="submit" disabled={pending || !targetUnit}>
              {pending ? "Moving…" : targetUnit ? `Move to ${targetUnit.roomCode} / ${targetUnit.code}` : "Move"}
            </Button>
          </div>
        </form>
      </dialog>
    </div>
  );
}
