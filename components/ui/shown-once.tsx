"use client";
import { Check, Copy, TriangleAlert } from "lucide-react";
import { useRef, useState, type ReactNode } from "react";
import { Button } from "@/components/ui/button";

/**
 * A credential shown this once (an API key, a webhook signing secret), with a copy button. Where
 * the browser refuses the clipboard, the text is selected for Ctrl+C instead.
 */
export function ShownOnce({ id, label, value, warning, usage, what, doneLabel, onDone }: {
  id: string;
  /** The field's label, e.g. "New API key". */
  label: string;
  value: string;
  /** Why to copy it now, e.g. "Copy this key now. It will not be shown again: …". */
  warning: string;
  /** How the receiving side uses it. */
  usage: ReactNode;
  /** What it is, in "the … is selected", e.g. "key". */
  what: string;
  doneLabel: string;
  onDone: () => void;
}) {
  const input = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<"yes" | "no" | null>(null);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(value);
      setCopied("yes");
    } catch {
      // No clipboard access (insecure context, denied): select the text for Ctrl+C instead.
      input.current?.select();
      setCopied("no");
    }
  };
  return (
    <div role="status" className="space-y-3 rounded-md border border-sev-moderate/40 bg-sev-moderate-bg px-3 py-3">
      <p className="flex items-start gap-2 text-sm font-medium text-ink-900">
        <TriangleAlert aria-hidden="true" className="mt-0.5 size-4 shrink-0 text-sev-moderate" />
        {warning}
      </p>
      <label htmlFor={id} className="block text-xs font-medium text-ink-700">
        {label}
      </label>
      <div className="flex gap-2">
        <input
          ref={input}
          id={id}
          readOnly
          value={value}
          onFocus={(event) => event.target.select()}
          className="h-9 min-w-0 flex-1 rounded-md border border-ink-300 bg-white px-2 font-mono text-sm text-ink-950"
        />
        <Button size="sm" variant="secondary" onClick={copy}>
          {copied === "yes" ? <Check aria-hidden="true" className="size-4" /> : <Copy aria-hidden="true" className="size-4" />}
          {copied === "yes" ? "Copied" : "Copy"}
        </Button>
      </div>
      {copied === "no" ? <p className="text-xs text-ink-700">The browser refused the clipboard; the {what} is selected, press Ctrl+C (⌘C).</p> : null}
      <p className="text-xs text-ink-700">{usage}</p>
      <Button size="sm" onClick={onDone}>
        {doneLabel}
      </Button>
    </div>
  );
}
