import type { TraceModel } from "@/lib/register/trace-steps";
import { InputsTable, ResultLine, SourceNote, Warnings } from "./bits";
import { TraceSectionView } from "./sections";
import { StepList } from "./steps";

/**
 * The whole working of a finding, as stored in its trace: the rule's inputs, every engine part
 * (vapor pressure first) drawn by its kind, the rule's own steps and the result, the warnings,
 * and the long sources listed once. Server-rendered.
 */
export function TraceWorking({ model }: { model: TraceModel }) {
  const { rule } = model;
  if (!rule && model.parts.length === 0 && model.other.length === 0) {
    return <p className="text-sm text-ink-600">No trace was stored for this finding.</p>;
  }
  return (
    <div className="space-y-4">
      {rule ? (
        <header>
          <p className="text-sm font-semibold text-ink-900">{rule.title}</p>
          {rule.source || rule.citation !== null ? (
            <p className="text-xs text-ink-500">
              Method: <SourceNote source={rule.source} citation={rule.citation} />
            </p>
          ) : null}
        </header>
      ) : null}
      {rule ? <InputsTable values={rule.inputs} caption="What the rule put in" /> : null}
      {model.parts.length ? (
        <div className="space-y-3">
          <h3 className="text-xs font-semibold uppercase tracking-wide text-ink-600">The working</h3>
          {model.parts.map((section, i) => (
            <TraceSectionView key={i} section={section} />
          ))}
        </div>
      ) : null}
      {rule && rule.steps.length ? (
        <div className="space-y-2">
          <h3 className="text-xs font-semibold uppercase tracking-wide text-ink-600">The rule&apos;s steps</h3>
          <StepList steps={rule.steps} />
        </div>
      ) : null}
      {rule ? <ResultLine value={rule.result} prefix="Result:" /> : null}
      {rule ? <Warnings warnings={rule.warnings} /> : null}
      {model.other.length ? (
        <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[minmax(10rem,max-content)_1fr]">
          {model.other.map((row, i) => (
            <div key={i} className="contents">
              <dt className="text-ink-600">{row.label}</dt>
              <dd className="tabular text-ink-900">{row.text}</dd>
            </div>
          ))}
        </dl>
      ) : null}
      {model.sources.length ? (
        <div>
          <h3 className="text-xs font-semibold uppercase tracking-wide text-ink-600">Sources</h3>
          <ol className="mt-1 space-y-1 text-xs text-ink-600">
            {model.sources.map((source, i) => (
              <li key={i} id={`trace-source-${i + 1}`} className="break-words">
                <span className="tabular font-semibold">[{i + 1}]</span> {source}
              </li>
            ))}
          </ol>
        </div>
      ) : null}
    </div>
  );
}
