"use client";
import { Check, Copy, TriangleAlert } from "lucide-react";
import { useRef, useState } from "react";
import { Button } from "@/components/ui/button";

/** A signing secret, shown this once with a copy button (the server keeps it only encrypted). */
export function NewSecret({ value, onDone, id }: { value: string; onDone: () => void; id: string }) {
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
        Copy this signing secret now and give it to the receiver. It will not be shown again.
      </p>
      <label htmlFor={id} className="block text-xs font-medium text-ink-700">
        Signing secret
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
      {copied === "no" ? <p className="text-xs text-ink-700">The browser refused the clipboard; the secret is selected, press Ctrl+C (⌘C).</p> : null}
      <p className="text-xs text-ink-700">The receiver verifies each delivery&apos;s <code className="font-mono">webhook-signature</code> header with it, using any Standard Webhooks library.</p>
      <Button size="sm" onClick={onDone}>
        I have stored the secret
      </Button>
    </div>
  );
}
