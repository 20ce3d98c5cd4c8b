"use client";
import { CircleCheck } from "lucide-react";
import Link from "next/link";
import { useEffect, useRef, useState } from "react";
import { Caution } from "@/components/ui/caution";
import { SEVERITY_STYLE, SeverityBadge } from "@/components/ui/severity";
import type { FindingStatus, Severity } from "@/db/enums";
import { formatCount, formatNumber } from "@/lib/format/numbers";
import { SaferPlaces, type SaferPlace } from "./safer-places";

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

/** A finding standing where the container would go, about the same substance or its group. */
export type PreviewCurrentFinding = {
  id: number;
  severity: Severity;
  status: FindingStatus;
  title: string;
  ratio: number | null;
  outcome: "unchanged" | "worse" | "better" | "cleared";
  canOpen: boolean;
};

export type PreviewVerdict = "raises" | "already_flagged" | "no_findings";

/** The answer of POST /api/v1/assessments/preview, as far as the screens read it. */
export type PreviewData = {
  findings: PreviewFinding[];
  current: PreviewCurrentFinding[];
  verdict: PreviewVerdict;
  verdictSentence: string;
  cleared: { id: number; severity: Severity; title: string; canOpen: boolean }[];
  /** Safer places, best first (empty when nothing is flagged here). */
  alternatives?: SaferPlace[];
};

/** What a chosen safer place does: sets the unit where it is chosen (`onChoose`), or links to where it is (`hrefFor`). */
export type ChoosePlace = { onChoose?: (unitId: number) => void; hrefFor?: (unitId: number) => string };

export type PreviewRequest = { storageUnitId: number; substanceId?: number; mixtureId?: number; amount?: number; amountUnit?: string; containerId?: number; state?: string };

/** The stored container an edit form changes: its unit (the edit form has no unit field) and id. */
export type EditedContainer = { id: number; storageUnitId: number };

export type WhatIfState =
  | { kind: "idle" }
  | { kind: "loading" }
  | { kind: "done"; data: PreviewData }
  | { kind: "error"; message: string };

const DEBOUNCE_MS = 400;
const SHOWN = 6;

const STATUS_WORDS: Record<FindingStatus, string> = {
  open: "open",
  acknowledged: "acknowledged",
  mitigating: "being mitigated",
  resolved: "resolved",
  risk_accepted: "risk accepted",
};

/** Reads what the preview needs from the form; null until every part is filled in. */
export function previewRequestFrom(data: FormData, edited?: EditedContainer): PreviewRequest | null {
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

/** What the change does to a finding already standing, in words ("stays", "gets worse"…). */
export function outcomeNote(finding: PreviewCurrentFinding): string {
  const status = finding.status === "open" ? "" : `${STATUS_WORDS[finding.status]}; `;
  const effect = { unchanged: "stays", worse: "gets worse", better: "eases", cleared: "would clear" }[finding.outcome];
  return `${status}${effect}`;
}

/** The severity that colours the verdict: the worst finding it speaks of, none when nothing is flagged. */
export function verdictSeverity(data: PreviewData): Severity | null {
  const order: Severity[] = ["critical", "high", "moderate", "low"];
  const list = data.verdict === "raises" ? data.findings : data.verdict === "already_flagged" ? data.current.filter((f) => f.outcome !== "cleared") : [];
  return order.find((severity) => list.some((f) => f.severity === severity)) ?? null;
}

/**
 * Asks the what-if API about a request, once typing has settled, and drops answers to questions
 * no longer asked (a newer question shows "loading" until answered).
 */
export function useWhatIf(request: PreviewRequest | null): WhatIfState {
  const [answer, setAnswer] = useState<{ key: string; state: WhatIfState }>({ key: "null", state: { kind: "idle" } });
  const key = JSON.stringify(request);
  useEffect(() => {
    if (!request) return;
    const setState = (state: WhatIfState) => setAnswer({ key: JSON.stringify(request), state });
    const controller = new AbortController();
    const timer = setTimeout(async () => {
      try {
        const response = await fetch("/api/v1/assessments/preview", {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify(request),
          signal: controller.signal,
        });
        const body = (await response.json().catch(() => null)) as { data?: PreviewData; error?: { message?: string } } | null;
        if (controller.signal.aborted) return;
        if (!response.ok || !body?.data) {
          const message = body?.error?.message ?? (response.status === 403 ? "Your role cannot preview this." : `The preview is not available right now (${response.status}).`);
          setState({ kind: "error", message });
          return;
        }
        setState({ kind: "done", data: body.data });
      } catch {
        if (!controller.signal.aborted) setState({ kind: "error", message: "The preview is not available right now." });
      }
    }, DEBOUNCE_MS);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
    // The key stands for the request's contents: a new object with the same fields asks nothing new.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [key]);
  if (!request) return { kind: "idle" };
  return answer.key === key ? answer.state : { kind: "loading" };
}

/**
 * "Before you save": what storing this container here would raise, and what is already flagged
 * here about it, from the what-if API. Advice only — it never blocks saving. Follows the form's
 * fields (also those a picker sets in a hidden input).
 */
export function WhatIfPanel({ formId, edited: editedProp }: { formId: string; edited?: EditedContainer }) {
  const editedId = editedProp?.id;
  const editedUnitId = editedProp?.storageUnitId;
  const [request, setRequest] = useState<PreviewRequest | null>(null);
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

  const state = useWhatIf(request);
  const editing = editedId != null;
  // A new container's unit is the form's own choice; an edited one moves through its Move dialog.
  const choose: ChoosePlace = editing
    ? { hrefFor: (unitId) => `/inventory/${editedId}?moveTo=${unitId}` }
    : {
        onChoose: (unitId) => {
          const form = document.getElementById(formId);
          const select = form instanceof HTMLFormElement ? form.elements.namedItem("storageUnitId") : null;
          if (!(select instanceof HTMLSelectElement)) return;
          select.value = String(unitId);
          select.dispatchEvent(new Event("input", { bubbles: true }));
          select.dispatchEvent(new Event("change", { bubbles: true }));
        },
      };
  return (
    <section aria-labelledby={`${formId}-whatif`} className="space-y-3 rounded-lg border border-ink-200 bg-ink-50 px-4 py-3">
      <h2 id={`${formId}-whatif`} className="text-sm font-semibold text-ink-900">
        Before you save
      </h2>
      <div aria-live="polite" aria-busy={state.kind === "loading"} className="text-sm text-ink-700">
        <WhatIfBody
          state={state}
          idleText={editing ? "Give the substance or mixture and the amount to see what these changes would raise." : "Choose the storage unit, the substance or mixture and the amount to see what storing it here would raise."}
          afterword={`You can still save; the register lists what is raised.`}
          choose={choose}
        />
      </div>
      <Caution />
    </section>
  );
}

/** The what-if's state in words: waiting, checking, an error, or the verdict. */
export function WhatIfBody({ state, idleText, afterword, choose }: { state: WhatIfState; idleText: string; afterword?: string; choose?: ChoosePlace }) {
  if (state.kind === "idle") return <p className="text-ink-600">{idleText}</p>;
  if (state.kind === "loading") return <p className="text-ink-600">Checking what this would raise…</p>;
  if (state.kind === "error") return <p className="text-ink-600">{state.message}{afterword ? ` ${afterword}` : ""}</p>;
  return <WhatIfVerdict data={state.data} afterword={afterword} choose={choose} />;
}

function FindingLink({ id, title, canOpen }: { id: number; title: string; canOpen: boolean }) {
  if (!canOpen) return <span className="min-w-0 flex-1 text-ink-900">{title}</span>;
  return (
    <Link href={`/register/${id}`} className="min-w-0 flex-1 text-accent-800 underline-offset-2 hover:underline">
      {title}
    </Link>
  );
}

/**
 * The verdict: coloured by the worst severity it speaks of (with the word and icon beside the
 * colour), its sentence, what would be new or worse, what already stands here (linked to the
 * register), and for a move what leaves the old place.
 */
export function WhatIfVerdict({ data, afterword, choose }: { data: PreviewData; afterword?: string; choose?: ChoosePlace }) {
  const severity = verdictSeverity(data);
  const style = severity ? SEVERITY_STYLE[severity] : null;
  const Icon = style ? style.icon : CircleCheck;
  const heading = data.verdict === "raises" ? "Would raise findings here" : data.verdict === "already_flagged" ? "Already flagged here" : "Nothing flagged about this here";
  const standing = data.current.filter((f) => f.outcome !== "cleared");
  const raised = data.findings.slice(0, SHOWN);
  const moreRaised = data.findings.length - raised.length;
  const current = standing.slice(0, SHOWN);
  const moreCurrent = standing.length - current.length;
  return (
    <div className="space-y-3" data-verdict={data.verdict}>
      <div className={`flex gap-2.5 rounded-md border px-3 py-2.5 ${style ? `${style.border} ${style.bg}` : "border-ink-200 bg-white"}`}>
        <Icon aria-hidden="true" className={`mt-0.5 size-5 shrink-0 ${style ? style.text : "text-ok"}`} strokeWidth={2.25} />
        <div className="min-w-0 space-y-1">
          <p className={`font-semibold ${style ? style.text : "text-ink-900"}`}>
            {heading}
            {style ? <span className="sr-only"> (severity {style.label.toLowerCase()})</span> : null}
          </p>
          <p className="text-ink-900">{data.verdictSentence}</p>
        </div>
      </div>
      {/* Right under the verdict: where it could go instead, before the details of this place. */}
      {data.alternatives?.length ? <SaferPlaces places={data.alternatives} onChoose={choose?.onChoose} hrefFor={choose?.hrefFor} /> : null}
      {raised.length > 0 ? (
        <div className="space-y-1.5">
          <h3 className="text-xs font-semibold tracking-wide text-ink-700 uppercase">New or worse</h3>
          <ul className="space-y-2">
            {raised.map((finding, index) => (
              <li key={`${finding.rule}-${finding.scenario}-${index}`} className="flex flex-wrap items-start gap-2 rounded-md border border-ink-200 bg-white px-3 py-2">
                <SeverityBadge severity={finding.severity} />
                <span className="min-w-0 flex-1 text-ink-900">{finding.title}</span>
                <span className={`text-xs ${finding.isNew ? "font-semibold text-ink-800" : "text-ink-600"}`}>{changeNote(finding)}</span>
              </li>
            ))}
          </ul>
          {moreRaised > 0 ? <p className="text-xs text-ink-600">and {formatCount(moreRaised)} more</p> : null}
        </div>
      ) : null}
      {current.length > 0 ? (
        <div className="space-y-1.5">
          <h3 className="text-xs font-semibold tracking-wide text-ink-700 uppercase">Already open here</h3>
          <ul className="space-y-2">
            {current.map((finding) => (
              <li key={finding.id} className="flex flex-wrap items-start gap-2 rounded-md border border-ink-200 bg-white px-3 py-2">
                <SeverityBadge severity={finding.severity} />
                <FindingLink id={finding.id} title={finding.title} canOpen={finding.canOpen} />
                <span className="text-xs text-ink-600">{outcomeNote(finding)}</span>
              </li>
            ))}
          </ul>
          {moreCurrent > 0 ? <p className="text-xs text-ink-600">and {formatCount(moreCurrent)} more</p> : null}
        </div>
      ) : null}
      {data.cleared.length > 0 ? (
        <div className="space-y-1.5">
          <h3 className="text-xs font-semibold tracking-wide text-ink-700 uppercase">Cleared where it is now</h3>
          <ul className="space-y-2">
            {data.cleared.slice(0, SHOWN).map((finding) => (
              <li key={finding.id} className="flex flex-wrap items-start gap-2 rounded-md border border-ink-200 bg-white px-3 py-2">
                <SeverityBadge severity={finding.severity} />
                <FindingLink id={finding.id} title={finding.title} canOpen={finding.canOpen} />
              </li>
            ))}
          </ul>
        </div>
      ) : null}
      {afterword && data.verdict !== "no_findings" ? <p className="text-xs text-ink-600">{afterword}</p> : null}
    </div>
  );
}
