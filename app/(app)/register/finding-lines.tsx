import Link from "next/link";
import { SeverityBadge } from "@/components/ui/severity";
import type { FindingListRow } from "@/db/queries/findings";
import { formatDurationMin, formatNumber, formatTempC } from "@/lib/format/numbers";
import { valueWithScenario, type FindingLine } from "@/lib/register/grouping";
import { humaniseRule, STATUS_LABELS } from "@/lib/register/labels";
import { SelectBox } from "./selection";

function ratioText(f: FindingListRow): string {
  return f.ratio == null || !Number.isFinite(f.ratio) ? "" : `${formatNumber(f.ratio * 100)} % of the limit`;
}

function valueText(f: FindingListRow): string {
  if (f.value == null) return "—";
  return `${formatNumber(f.value)}${f.limit != null ? ` / ${formatNumber(f.limit)}` : ""} ${f.unit ?? ""}`.trim();
}

function locationHref(f: FindingListRow): string | null {
  const l = f.location;
  return l.storageUnitId ? `/locations/units/${l.storageUnitId}` : l.roomId ? `/locations/rooms/${l.roomId}` : null;
}

/** The soonest time to danger among a line's findings: "danger 3 h 10 min after a failure". */
function dangerText(findings: FindingListRow[]): string | null {
  let soonest: FindingListRow["timeToDanger"] = null;
  for (const f of findings) if (f.timeToDanger && (soonest === null || f.timeToDanger.minutes < soonest.minutes)) soonest = f.timeToDanger;
  if (soonest === null) return null;
  return soonest.minutes === 0 ? `at the ${soonest.threshold} already in control` : `${soonest.threshold} ${formatDurationMin(soonest.minutes)} after a failure`;
}

function statusText(status: string): string {
  return STATUS_LABELS[status as keyof typeof STATUS_LABELS] ?? status;
}

/**
 * One line per problem: the worst finding of the line with its location and values, the other
 * scenarios beneath it. Priority columns: severity, finding with location, value and worst case
 * stay on a tablet; status and rule join them on wider screens.
 */
export function FindingLinesTable({
  lines,
  ruleLabels,
  selectable,
  caption,
}: {
  lines: FindingLine<FindingListRow>[];
  ruleLabels: Record<string, string>;
  selectable: boolean;
  caption: string;
}) {
  return (
    <table className="w-full table-fixed border-collapse text-sm">
      <caption className="sr-only">{caption}</caption>
      <thead className="sticky top-0 bg-ink-50 text-left text-xs font-semibold text-ink-700">
        <tr>
          {selectable ? (
            <th scope="col" className="w-9 px-2 py-2">
              <span className="sr-only">Select</span>
            </th>
          ) : null}
          <th scope="col" className="w-26 px-2 py-2">
            Severity
          </th>
          <th scope="col" className="px-2 py-2">
            Problem and location
          </th>
          <th scope="col" className="w-36 px-2 py-2 text-right">
            Value / limit
          </th>
          <th scope="col" className="w-24 px-2 py-2 text-right">
            Worst case (°C)
          </th>
          <th scope="col" className="hidden w-32 px-2 py-2 xl:table-cell">
            Status
          </th>
          <th scope="col" className="hidden w-40 px-2 py-2 2xl:table-cell">
            Rule
          </th>
        </tr>
      </thead>
      <tbody>
        {lines.map((line) => {
          const f = line.lead;
          const href = locationHref(f);
          return (
            <tr key={line.key} className="border-t border-ink-200 align-top">
              {selectable ? (
                <td className="px-2 py-2.5">
                  <SelectBox ids={line.findingIds} label={`Select ${line.findingIds.length === 1 ? "this finding" : `the ${line.findingIds.length} findings of this line`}: ${f.title}`} />
                </td>
              ) : null}
              <td className="px-2 py-2.5">
                <SeverityBadge severity={f.severity} />
              </td>
              <th scope="row" className="min-w-0 px-2 py-2.5 text-left font-normal">
                <Link href={`/register/${f.id}`} className="font-medium break-words text-accent-800 underline-offset-2 hover:underline">
                  {f.title}
                </Link>
                <p className="mt-0.5 text-xs text-ink-600">
                  {href ? (
                    <Link href={href} className="text-accent-800 underline-offset-2 hover:underline">
                      {f.location.label}
                    </Link>
                  ) : (
                    f.location.label
                  )}
                  {f.substance || f.mixture ? ` · ${f.substance?.name ?? f.mixture?.name}` : ""}
                  {dangerText([f, ...line.others]) ? <span className="font-medium text-ink-800"> · {dangerText([f, ...line.others])}</span> : null}
                  <span className="xl:hidden"> · {statusText(f.status)}</span>
                </p>
                {line.others.length ? (
                  <details className="mt-1 text-xs text-ink-700">
                    <summary className="cursor-pointer text-ink-700">
                      {[f, ...line.others].map(valueWithScenario).join(" · ")}
                    </summary>
                    <ul className="mt-1 space-y-1 border-l-2 border-ink-200 pl-2">
                      {line.others.map((o) => (
                        <li key={o.id} className="flex flex-wrap items-center gap-2">
                          {selectable ? <SelectBox ids={[o.id]} label={`Select: ${o.title}`} /> : null}
                          <SeverityBadge severity={o.severity} />
                          <Link href={`/register/${o.id}`} className="text-accent-800 underline-offset-2 hover:underline">
                            {o.title}
                          </Link>
                          <span className="tabular text-ink-600">
                            {valueText(o)} · {formatTempC(o.worstCaseTempC)} · {statusText(o.status)}
                          </span>
                        </li>
                      ))}
                    </ul>
                  </details>
                ) : null}
              </th>
              <td className="tabular px-2 py-2.5 text-right">
                <span className="block">{valueText(f)}</span>
                {ratioText(f) ? <span className="block text-xs text-ink-600">{ratioText(f)}</span> : null}
              </td>
              <td className="tabular px-2 py-2.5 text-right" title={f.worstCaseSource ?? undefined}>
                {formatTempC(f.worstCaseTempC).replace(/ °C$/, "")}
              </td>
              <td className="hidden px-2 py-2.5 xl:table-cell">{statusText(f.status)}</td>
              <td className="hidden px-2 py-2.5 2xl:table-cell">{ruleLabels[f.rule] ?? humaniseRule(f.rule)}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
