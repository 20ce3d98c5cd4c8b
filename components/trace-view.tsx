import type { ReactNode } from "react";
import { formatNumber } from "@/lib/format/numbers";

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };
type TraceValueLike = { name: string; symbol?: string; value: number | string | boolean; unit?: string; source?: string };
type TraceStepLike = { description: string; formula?: string; substituted?: string; result?: TraceValueLike };
type TraceLike = { method: string; source?: string; inputs?: TraceValueLike[]; steps?: TraceStepLike[]; result?: TraceValueLike; warnings?: string[] };

function isObject(value: unknown): value is Record<string, Json> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}
function isTraceValue(value: unknown): value is TraceValueLike {
  return isObject(value) && typeof value.name === "string" && "value" in value;
}
function isTrace(value: unknown): value is TraceLike {
  return isObject(value) && typeof value.method === "string" && (Array.isArray(value.steps) || Array.isArray(value.inputs));
}

function valueText(v: TraceValueLike): string {
  const number = typeof v.value === "number" ? formatNumber(v.value, 4) : String(v.value);
  return v.unit ? `${number} ${v.unit}` : number;
}

function ValueRow({ v }: { v: TraceValueLike }) {
  return (
    <tr className="border-b border-ink-100 last:border-0 align-top">
      <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-700">
        {v.name}
        {v.symbol ? <span className="ml-1 font-mono text-xs text-ink-500">{v.symbol}</span> : null}
      </th>
      <td className="tabular py-1 pr-3 text-right font-medium text-ink-900 whitespace-nowrap">{valueText(v)}</td>
      <td className="py-1 text-xs text-ink-500">{v.source ?? ""}</td>
    </tr>
  );
}

function TraceBlock({ trace, depth }: { trace: TraceLike; depth: number }) {
  return (
    <section className={`space-y-3 ${depth > 0 ? "rounded-md border border-ink-200 p-3" : ""}`}>
      <header>
        <p className="text-sm font-semibold text-ink-900">{trace.method}</p>
        {trace.source ? <p className="text-xs text-ink-500">Method: {trace.source}</p> : null}
      </header>
      {trace.inputs?.length ? (
        <table className="w-full text-sm">
          <caption className="mb-1 text-left text-xs font-semibold uppercase tracking-wide text-ink-600">Inputs</caption>
          <tbody>{trace.inputs.map((v, i) => <ValueRow key={i} v={v} />)}</tbody>
        </table>
      ) : null}
      {trace.steps?.length ? (
        <ol className="space-y-2 text-sm">
          {trace.steps.map((step, i) => (
            <li key={i} className="rounded-md bg-ink-50 px-3 py-2">
              <p className="text-ink-800">
                <span className="tabular mr-2 text-xs font-semibold text-ink-500">Step {i + 1}</span>
                {step.description}
              </p>
              {step.formula ? <p className="mt-1 font-mono text-xs text-ink-700">{step.formula}</p> : null}
              {step.substituted ? <p className="font-mono text-xs text-ink-600">= {step.substituted}</p> : null}
              {step.result ? <p className="mt-1 text-sm font-medium text-ink-900">→ {step.result.name}: {valueText(step.result)}</p> : null}
            </li>
          ))}
        </ol>
      ) : null}
      {trace.result ? (
        <p className="text-sm">
          <span className="font-semibold">Result:</span> {trace.result.name} = {valueText(trace.result)}
        </p>
      ) : null}
      {trace.warnings?.length ? (
        <ul className="list-disc space-y-0.5 pl-5 text-xs text-sev-moderate">
          {trace.warnings.map((w, i) => (
            <li key={i}>{w}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

function humanKey(key: string): string {
  const text = key.replace(/([a-z])([A-Z])/g, "$1 $2").replace(/[-_]+/g, " ");
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function Node({ value, depth, label }: { value: Json; depth: number; label?: string }): ReactNode {
  if (isTrace(value)) return <TraceBlock trace={value} depth={depth} />;
  if (isTraceValue(value)) {
    return (
      <table className="text-sm">
        <tbody>
          <ValueRow v={value} />
        </tbody>
      </table>
    );
  }
  if (Array.isArray(value)) {
    if (value.every((v) => typeof v !== "object" || v === null)) return <p className="text-sm text-ink-800">{value.map(String).join(", ") || "—"}</p>;
    return (
      <div className="space-y-3">
        {value.map((item, i) => (
          <Node key={i} value={item} depth={depth + 1} />
        ))}
      </div>
    );
  }
  if (isObject(value)) {
    const entries = Object.entries(value);
    const simple = entries.filter(([, v]) => typeof v !== "object" || v === null);
    const nested = entries.filter(([, v]) => typeof v === "object" && v !== null);
    return (
      <div className={`space-y-3 ${depth > 0 && label ? "" : ""}`}>
        {simple.length ? (
          <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[minmax(10rem,max-content)_1fr]">
            {simple.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-600">{humanKey(k)}</dt>
                <dd className="tabular text-ink-900">{typeof v === "number" ? formatNumber(v, 4) : String(v)}</dd>
              </div>
            ))}
          </dl>
        ) : null}
        {nested.map(([k, v]) => (
          <div key={k} className="space-y-2">
            <p className="text-xs font-semibold uppercase tracking-wide text-ink-600">{humanKey(k)}</p>
            <Node value={v as Json} depth={depth + 1} label={k} />
          </div>
        ))}
      </div>
    );
  }
  return <p className="text-sm">{String(value)}</p>;
}

/**
 * A finding's calculation trace as readable steps with units: every input with its source, every
 * formula with the numbers put in, every intermediate result — so an auditor can redo it by hand.
 */
export function TraceView({ trace }: { trace: unknown }) {
  if (trace == null) return <p className="text-sm text-ink-600">No trace was stored for this finding.</p>;
  return <Node value={trace as Json} depth={0} />;
}
