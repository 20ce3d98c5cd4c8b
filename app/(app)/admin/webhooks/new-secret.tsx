"use client";
import { ShownOnce } from "@/components/ui/shown-once";

/** A signing secret, shown this once with a copy button (the server keeps it only encrypted). */
export function NewSecret({ value, onDone, id }: { value: string; onDone: () => void; id: string }) {
  return (
    <ShownOnce
      id={id}
      label="Signing secret"
      value={value}
      what="secret"
      warning="Copy this signing secret now and give it to the receiver. It will not be shown again."
      usage={
        <>
          The receiver verifies each delivery&apos;s <code className="font-mono">webhook-signature</code> header with it, using any Standard Webhooks library.
        </>
      }
      doneLabel="I have stored the secret"
      onDone={onDone}
    />
  );
}
