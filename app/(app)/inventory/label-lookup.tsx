"use client";
import { useActionState } from "react";
import { ScanLine } from "lucide-react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { lookupLabelAction } from "./actions";

/** Scan a barcode (the scanner types it and presses Enter) or type a label to jump to the container. */
export function LabelLookup() {
  const [state, dispatch, pending] = useActionState(lookupLabelAction, undefined);
  const error = state?.error ? Object.values(state.error).flat()[0] : undefined;
  return (
    <form action={dispatch} className="flex flex-wrap items-start gap-2" role="search" aria-label="Find a container by label">
      <div className="min-w-64 flex-1">
        <label htmlFor="label-lookup" className="sr-only">
          Scan or type a label
        </label>
        <div className="relative">
          <ScanLine aria-hidden="true" className="pointer-events-none absolute left-3 top-2.5 size-5 text-ink-400" />
          <input
            id="label-lookup"
            name="label"
            autoComplete="off"
            placeholder="Scan or type a label"
            className={`${inputClass} pl-10 font-mono`}
            aria-invalid={error ? true : undefined}
            aria-describedby={error ? "label-lookup-error" : undefined}
          />
        </div>
        {error ? (
          <p id="label-lookup-error" role="alert" className="mt-1 text-sm text-sev-critical">
            {error}
          </p>
        ) : null}
      </div>
      <Button type="submit" variant="secondary" disabled={pending}>
        Find
      </Button>
    </form>
  );
}
