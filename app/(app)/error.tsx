"use client";
import { Button } from "@/components/ui/button";

export default function AreaError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div role="alert" className="rounded-lg border border-sev-critical/30 bg-white p-8">
      <h1 className="text-lg font-semibold text-ink-950">This page could not be shown</h1>
      <p className="mt-1 text-sm text-ink-600">
        The error was logged{error.digest ? ` (reference ${error.digest})` : ""}. Nothing you entered was saved unless you saw a confirmation.
      </p>
      <Button className="mt-5" variant="secondary" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}
