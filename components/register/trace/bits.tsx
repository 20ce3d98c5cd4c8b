import type { ShownValue } from "@/lib/register/trace-steps";

/** A value's source inline, or its citation number pointing at the trace's source list. */
export function SourceNote({ source, citation }: { source: string | null; citation: number | null }) {
  if (citation !== null) {
    return (
      <a href={`#trace-source-${citation}`} className="text-accent-700 hover:underline">
        [{citation}]
      </a>
    );
  }
  return source ? <>{source}</> : null;
}

/** The inputs of one part: name and symbol, value with unit, source. */
export function InputsTable({ values, caption = "Inputs" }: { values: ShownValue[]; caption?: string }) {
  if (values.length === 0) return null;
  return (
    <table className="w-full text-sm">
      <caption className="mb-1 text-left text-xs font-semibold uppercase tracking-wide text-ink-600">{caption}</caption>
      <tbody>
        {values.map((v, i) => (
          <tr key={i} className="border-b border-ink-100 align-top last:border-0">
            <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-700">
              {v.label}
              {v.symbol && v.symbol !== v.label ? <span className="ml-1 font-mono text-xs text-ink-500">{v.symbol}</span> : null}
            </th>
            <td className="tabular whitespace-nowrap py-1 pr-3 text-right font-medium text-ink-900">{v.text}</td>
            <td className="py-1 text-xs text-ink-500">
              <SourceNote source={v.source} citation={v.citation} />
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** A formula in symbols and with the numbers put in. */
export function Formula({ formula, substituted }: { formula: string | null; substituted: string | null }) {
  if (!formula && !substituted) return null;
  return (
    <div className="mt-1 space-y-0.5 font-mono text-xs">
      {formula ? <p className="text-ink-700">{formula}</p> : null}
      {substituted && substituted !== formula ? <p className="break-words text-ink-600">{substituted}</p> : null}
    </div>
  );
}

export function ResultLine({ value, prefix = "→" }: { value: ShownValue | null; prefix?: string }) {
  if (!value) return null;
  return (
    <p className="mt-1 text-sm text-ink-900">
      {prefix} {value.label}
      {value.symbol && value.symbol !== value.label ? <span className="ml-1 font-mono text-xs text-ink-500">{value.symbol}</span> : null}:{" "}
      <span className="tabular font-semibold">{value.text}</span>
      {value.source || value.citation !== null ? (
        <span className="ml-1 text-xs text-ink-500">
          (<SourceNote source={value.source} citation={value.citation} />)
        </span>
      ) : null}
    </p>
  );
}

export function Warnings({ warnings }: { warnings: string[] }) {
  if (warnings.length === 0) return null;
  return (
    <ul className="space-y-0.5 text-xs text-sev-moderate">
      {warnings.map((w, i) => (
        <li key={i} className="flex gap-1.5">
          <span aria-hidden="true">⚠</span>
          <span>
            <span className="sr-only">Warning: </span>
            {w}
          </span>
        </li>
      ))}
    </ul>
  );
}
