import type { ReactNode } from "react";

/** A labelled control with its hint and errors linked through aria-describedby. */
export function Field({
  id,
  label,
  hint,
  errors,
  children,
}: {
  id: string;
  label: string;
  hint?: string;
  errors?: string[];
  children: ReactNode;
}) {
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium text-ink-800">
        {label}
      </label>
      {children}
      {hint && !errors?.length ? (
        <p id={`${id}-hint`} className="text-xs text-ink-600">
          {hint}
        </p>
      ) : null}
      {errors?.length ? (
        <p id={`${id}-error`} className="flex items-start gap-1.5 text-sm text-sev-critical" role="alert">
          <span aria-hidden="true">⚠</span>
          <span>{errors.join(" ")}</span>
        </p>
      ) : null}
    </div>
  );
}

export const inputClass =
  "block h-10 w-full rounded-md border border-ink-300 bg-white px-3 text-sm text-ink-900 shadow-xs placeholder:text-ink-400 focus:border-accent-600 focus:outline-none focus:ring-2 focus:ring-accent-200 aria-[invalid=true]:border-sev-critical";

export function describedBy(id: string, hint?: string, errors?: string[]): string | undefined {
  if (errors?.length) return `${id}-error`;
  return hint ? `${id}-hint` : undefined;
}
