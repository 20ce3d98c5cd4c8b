import { Scale } from "lucide-react";

/** The standing caution shown on every assessment screen and export. */
export const CAUTION_TEXT =
  "Screening estimates from physical models, not air monitoring. Limits and quantity rules differ between jurisdictions: the local code and the authority having jurisdiction prevail. Decisions belong to qualified people.";

export function Caution({ className = "" }: { className?: string }) {
  return (
    <aside className={`flex gap-2 rounded-md border border-ink-200 bg-white px-3 py-2 text-xs text-ink-600 ${className}`} aria-label="Caution">
      <Scale aria-hidden="true" className="mt-0.5 size-3.5 shrink-0 text-ink-500" />
      <p>{CAUTION_TEXT}</p>
    </aside>
  );
}
