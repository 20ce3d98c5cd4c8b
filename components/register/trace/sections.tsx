import type { ReactNode } from "react";
import type { CorrelationView, TraceSection } from "@/lib/register/trace-steps";
import { InputsTable, ResultLine, SourceNote, Warnings } from "./bits";
import { StepList } from "./steps";

function SectionFrame({ section, children }: { section: TraceSection; children: ReactNode }) {
  return (
    <section className="space-y-3 rounded-md border border-ink-200 p-3">
      <header>
        <h3 className="text-sm font-semibold text-ink-900">{section.title}</h3>
        {section.source || section.citation !== null ? (
          <p className="text-xs text-ink-500">
            Method: <SourceNote source={section.source} citation={section.citation} />
          </p>
        ) : null}
      </header>
      {children}
      <ResultLine value={section.result} prefix="Result:" />
      <Warnings warnings={section.warnings} />
    </section>
  );
}

/** The correlation used: its equation, coefficients, valid range (and whether T lies in it), source; T and Psat. */
export function CorrelationBox({ correlation }: { correlation: CorrelationView }) {
  return (
    <div className="rounded-md border border-accent-200 bg-accent-50 p-3 text-sm">
      <p className="font-medium text-ink-900">Vapor pressure: {correlation.name}</p>
      {correlation.equation ? <p className="mt-1 font-mono text-xs text-ink-700">{correlation.equation}</p> : null}
      {correlation.coefficients.length ? (
        <dl className="mt-2 flex flex-wrap gap-x-5 gap-y-1">
          {correlation.coefficients.map((c) => (
            <div key={c.label} className="flex gap-1.5">
              <dt className="font-mono text-xs text-ink-600">{c.symbol ?? c.label} =</dt>
              <dd className="tabular text-xs font-semibold text-ink-900">{c.text}</dd>
            </div>
          ))}
        </dl>
      ) : null}
      {correlation.range ? (
        <p className="mt-1 text-xs text-ink-700">
          Valid range: <span className="tabular">{correlation.range}</span>
          {correlation.inRange === true ? " — the temperature lies inside it." : correlation.inRange === false ? " — the temperature lies outside it: the value is extrapolated." : null}
        </p>
      ) : null}
      {correlation.source || correlation.citation !== null ? (
        <p className="mt-1 text-xs text-ink-500">
          Coefficients: <SourceNote source={correlation.source} citation={correlation.citation} />
        </p>
      ) : null}
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
        {correlation.temperature ? (
          <>
            <dt className="text-ink-600">Temperature T</dt>
            <dd className="tabular font-medium text-ink-900">
              {correlation.temperature.text}
              {correlation.temperature.source ? <span className="ml-1 text-xs font-normal text-ink-500">({correlation.temperature.source})</span> : null}
            </dd>
          </>
        ) : null}
        {correlation.pressure ? (
          <>
            <dt className="text-ink-600">Saturation vapor pressure Psat</dt>
            <dd className="tabular font-semibold text-ink-900">{correlation.pressure.text}</dd>
          </>
        ) : null}
      </dl>
      {correlation.substituted ? <p className="mt-1 break-words font-mono text-xs text-ink-600">{correlation.substituted}</p> : null}
    </div>
  );
}

/** A saturated concentration: the correlation, then y, ppm, Vm and mg/m³. */
export function VaporPressureSection({ section }: { section: TraceSection }) {
  return (
    <SectionFrame section={section}>
      {section.correlation ? <CorrelationBox correlation={section.correlation} /> : null}
      <InputsTable values={section.inputs} />
      <StepList steps={section.steps} />
    </SectionFrame>
  );
}

/** The closed-enclosure bound: the saturated and the all-evaporated concentration, and which one sets it. */
export function EnclosureBoundSection({ section }: { section: TraceSection }) {
  const bound = section.bound;
  return (
    <SectionFrame section={section}>
      {section.correlation ? <CorrelationBox correlation={section.correlation} /> : null}
      <InputsTable values={section.inputs} />
      <StepList steps={section.steps} />
      {bound ? (
        <p className="rounded-md bg-ink-50 px-3 py-2 text-sm text-ink-900">
          {bound.limitedBy === "saturation" ? (
            <>
              <span className="font-semibold">Saturation-limited:</span> the air saturates ({bound.saturated}) before the liquid runs out (all of it evaporated would give {bound.inventory}); the bound is {bound.used}.
            </>
          ) : (
            <>
              <span className="font-semibold">Inventory-limited:</span> all the liquid evaporates ({bound.inventory}) before the air saturates ({bound.saturated}); the bound is {bound.used}.
            </>
          )}
        </p>
      ) : null}
    </SectionFrame>
  );
}

/** Each substance's concentration as a share of its LFL, and the sum (Le Chatelier's rule, additive form). */
export function LflFractionSection({ section }: { section: TraceSection }) {
  const shares = section.shares;
  return (
    <SectionFrame section={section}>
      {shares ? (
        <table className="w-full text-sm">
          <caption className="mb-1 text-left text-xs font-semibold uppercase tracking-wide text-ink-600">Share of each substance</caption>
          <thead>
            <tr className="border-b border-ink-200 text-left text-xs text-ink-600">
              <th scope="col" className="py-1 pr-3 font-medium">Substance</th>
              <th scope="col" className="py-1 pr-3 text-right font-medium">Cᵢ</th>
              <th scope="col" className="py-1 pr-3 text-right font-medium">LFLᵢ</th>
              <th scope="col" className="py-1 text-right font-medium">Cᵢ/LFLᵢ</th>
            </tr>
          </thead>
          <tbody>
            {shares.rows.map((row) => (
              <tr key={row.name} className="border-b border-ink-100">
                <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-800">{row.name}</th>
                <td className="tabular py-1 pr-3 text-right">{row.concentration}</td>
                <td className="tabular py-1 pr-3 text-right">{row.limit}</td>
                <td className="tabular py-1 text-right font-medium">
                  {row.share} <span className="text-xs text-ink-500">({row.sharePercentLfl})</span>
                </td>
              </tr>
            ))}
          </tbody>
          {shares.sum ? (
            <tfoot>
              <tr>
                <th scope="row" colSpan={3} className="py-1 pr-3 text-right font-semibold text-ink-900">Sum Σ Cᵢ/LFLᵢ</th>
                <td className="tabular py-1 text-right font-semibold text-ink-900">{shares.sum}</td>
              </tr>
            </tfoot>
          ) : null}
        </table>
      ) : (
        <InputsTable values={section.inputs} />
      )}
      <StepList steps={section.steps} />
    </SectionFrame>
  );
}

/** Le Chatelier's mixing rule or Raoult's law: one row per component. */
export function MixtureTableSection({ section }: { section: TraceSection }) {
  const table = section.table;
  return (
    <SectionFrame section={section}>
      {table ? (
        <table className="w-full text-sm">
          <thead>
            <tr className="border-b border-ink-200 text-left text-xs text-ink-600">
              {table.head.map((h, i) => (
                <th key={h} scope="col" className={`py-1 pr-3 font-medium ${i > 0 ? "text-right" : ""}`}>
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {table.rows.map((row, r) => (
              <tr key={r} className="border-b border-ink-100">
                {row.map((cell, i) =>
                  i === 0 ? (
                    <th key={i} scope="row" className="py-1 pr-3 text-left font-normal text-ink-800">{cell}</th>
                  ) : (
                    <td key={i} className="tabular py-1 pr-3 text-right">{cell}</td>
                  ),
                )}
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
      <InputsTable values={section.inputs.filter((v) => !table || !/^(x|P|LFL)\d/.test(v.symbol ?? ""))} />
      <StepList steps={section.steps} />
    </SectionFrame>
  );
}

export function GenericSection({ section }: { section: TraceSection }) {
  return (
    <SectionFrame section={section}>
      <InputsTable values={section.inputs} />
      <StepList steps={section.steps} />
    </SectionFrame>
  );
}

/** One part of the calculation, drawn by its kind. */
export function TraceSectionView({ section }: { section: TraceSection }) {
  switch (section.kind) {
    case "vapor-pressure":
      return <VaporPressureSection section={section} />;
    case "enclosure-bound":
      return <EnclosureBoundSection section={section} />;
    case "lfl-fraction":
      return <LflFractionSection section={section} />;
    case "le-chatelier":
    case "raoult":
      return <MixtureTableSection section={section} />;
    default:
      return <GenericSection section={section} />;
  }
}
