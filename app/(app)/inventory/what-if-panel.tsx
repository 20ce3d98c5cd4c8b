"use client";
import { useEffect, useRef, useState } from "react";
import { Caution } from "@/components/ui/caution";
import { SEVERITY_STYLE, SeverityBadge } from "@/components/ui/severity";
import type { Severity } from "@/db/enums";
import { formatCount, formatNumber } from "@/lib/format/numbers";

export type PreviewFinding = {
  rule: string;
  severity: Severity;
  scenario: string;
  title: string;
  ratio: number | null;
  unit: string | null;
  isNew: boolean;
  previous: { severity: Severity; ratio: number | null } | null;
};

type Request = { storageUnitId: number; substanceId?: number; mixtureId?: number; amount: number; amountUnit: string; containerId?: number; state?: string };

/** The stored container an edit form changes: its unit (the edit form has no unit field) and id. */
export type EditedContainer = { id: number; storageUnitId: number };

type State =
  | { kind: "idle" }
  | { kind: "loading" }
  | { kind: "done"; findings: PreviewFinding[] }
  | { kind: "error"; message: string };

const DEBOUNCE_MS = 400;
const SHOWN = 6;

/** Reads what the preview needs from the form; null until every part is filled in. */
export function previewRequestFrom(data: FormData, edited?: EditedContainer): Request | null {
  const text = (name: string) => {
    const value = data.get(name);
    return typeof value === "string" ? value.trim() : "";
  };
  const storageUnitId = edited ? edited.storageUnitId : Number(text("storageUnitId"));
  const substanceId = Number(text("substanceId"));
  const mixtureId = Number(text("mixtureId"));
  const amount = Number(text("amount"));
  const amountUnit = text("amountUnit");
  if (!Number.isInteger(storageUnitId) || storageUnitId <= 0) return null;
  if (!text("amount") || !Number.isFinite(amount) || amount <= 0 || !amountUnit) return null;
  const extra = edited ? { containerId: edited.id, ...(text("state") ? { state: text("state") } : {}) } : text("state") ? { state: text("state") } : {};
  if (Number.isInteger(substanceId) && substanceId > 0) return { storageUnitId, substanceId, amount, amountUnit, ...extra };
  if (Number.isInteger(mixtureId) && mixtureId > 0) return { storageUnitId, mixtureId, amount, amountUnit, ...extra };
  return null;
}

/** "new", or "worse than now (was high, 40 %)". */
export function changeNote(finding: PreviewFinding): string {
  if (finding.isNew || !finding.previous) return "new";
  const parts = [SEVERITY_STYLE[finding.previous.severity].label.toLowerCase()];
  if (finding.previous.ratio != null && Number.isFinite(finding.previous.ratio)) parts.push(`${formatNumber(finding.previous.ratio * 100)} %`);
  return `worse than now (was ${parts.join(", ")})`;
}

/**
 * "Before you save": what storing this container here would raise, from the what-if API. Advice
 * only — it never blocks saving. Follows the form's fields (also those a picker sets in a hidden
 * input), waits for typing to settle and drops answers to questions no longer asked.
 */
export function WhatIfPanel({ formId, edited: editedProp }: { formId: string; edited?: EditedContainer }) {
  const editedId = editedProp?.id;
  const editedUnitId = editedProp?.storageUnitId;
  const [request, setRequest] = useState<Request | null>(null);
  // The answer, tagged with the question it answers: a newer question shows "checking" until answered.
  const [answer, setAnswer] = useState<{ key: string; state: State }>({ key: "null", state: { kind: "idle" } });
  const lastKey = useRef("");

  useEffect(() => {
    const form = document.getElementById(formId);
    if (!(form instanceof HTMLFormElement)) return;
    const read = () => {
      const edited = editedId != null && editedUnitId != null ? { id: editedId, storageUnitId: editedUnitId } : undefined;
      const next = previewRequestFrom(new FormData(form), edited);
      const key = JSON.stringify(next);
      if (key === lastKey.current) return;
      lastKey.current = key;
      setRequest(next);
    };
    read();
    form.addEventListener("input", read);
    form.addEventListener("change", read);
    // A picker writes its choice into a hidden input without an input event; React reflects the
    // value as an attribute, and switching substance ↔ mixture swaps elements.
    const observer = new MutationObserver(read);
    observer.observe(form, { subtree: true, childList: true, attributes: true, attributeFilter: ["value"] });
    return () => {
      form.removeEventListener("input", read);
      form.removeEventListener("change", read);
      observer.disconnect();
    };
  }, [formId, editedId, editedUnitId]);

  useEffect(() => {
    if (!request) return;
    const key = JSON.stringify(request);
    const setState = (state: State) => setAnswer({ key, state });
    const controller = new AbortController();
    const timer = setTimeout(async () => {
      try {
        const response = await fetch("/api/v1/assessments/preview", {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify(request),
          signal: controller.signal,
        });
        const body = (await response.json().catch(() => null)) as { data?: { findings: PreviewFinding[] }; error?: { message?: string } } | null;
        if (controller.signal.aborted) return;
        if (!response.ok || !body?.data) {
          const message = response.status === 403 ? "Your role cannot preview assessments." : (body?.error?.message ?? `The preview is not available right now (${response.status}).`);
          setState({ kind: "error", message });
          return;
        }
        setState({ kind: "done", findings: body.data.findings });
      } catch {
        if (!controller.signal.aborted) setState({ kind: "error", message: "The preview is not available right now." });
      }
    }, DEBOUNCE_MS);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [request]);

  const state: State = !request ? { kind: "idle" } : answer.key === JSON.stringify(request) ? answer.state : { kind: "loading" };
  return (
    <section aria-labelledby={`${formId}-whatif`} className="space-y-3 rounded-lg border border-ink-200 bg-ink-50 px-4 py-3">
      <h2 id={`${formId}-whatif`} className="text-sm font-semibold text-ink-900">
        Before you save
      </h2>
      <div aria-live="polite" aria-busy={state.kind === "loading"} className="text-sm text-ink-700">
        <PanelBody state={state} editing={editedId != null} />
      </div>
      <Caution />
    </section>
  );
}

function PanelBody({ state, editing }: { state: State; editing: boolean }) {
  if (state.kind === "idle") {
    return <p className="text-ink-600">{editing ? "Give the substance or mixture and the amount to see what these changes would raise." : "Choose the storage unit, the substance or mixture and the amount to see what storing it here would raise."}</p>;
  }
  if (state.kind === "loading") return <p className="text-ink-600">Checking what this would raise…</p>;
  if (state.kind === "error") return <p className="text-ink-600">{state.message} You can still save.</p>;
  if (state.findings.length === 0) return <p>Nothing new would be raised here.</p>;
  const shown = state.findings.slice(0, SHOWN);
  const more = state.findings.length - shown.length;
  return (
    <div className="space-y-2">
      <p>
        {editing ? "Saving these changes would raise" : "Storing this here would raise"} {state.findings.length === 1 ? "1 finding" : `${formatCount(state.findings.length)} findings`}. You can still save; the register will list{" "}
        {state.findings.length === 1 ? "it" : "them"}.
      </p>
      <ul className="space-y-2">
        {shown.map((finding, index) => (
          <li key={`${finding.rule}-${finding.scenario}-${index}`} className="flex flex-wrap items-start gap-2 rounded-md border border-ink-200 bg-white px-3 py-2">
            <SeverityBadge severity={finding.severity} />
            <span className="min-w-0 flex-1 text-ink-900">{finding.title}</span>
            <span className={`text-xs ${finding.isNew ? "font-semibold text-ink-800" : "text-ink-600"}`}>{changeNote(finding)}</span>
          </li>
        ))}
      </ul>
      {more > 0 ? <p className="text-xs text-ink-600">and {formatCount(more)} more</p> : null}
    </div>
  );
}
