import Link from "next/link";
import { SEVERITY_STYLE, SeverityBadge } from "@/components/ui/severity";
import type { FindingListRow, LocationSummary } from "@/db/queries/findings";
import { SEVERITIES } from "@/db/enums";
import { formatCount } from "@/lib/format/numbers";
import type { FindingLine } from "@/lib/register/grouping";
import { FindingLinesTable } from "./finding-lines";
import { SelectBox } from "./selection";

/**
 * Each room (its own findings) and storage unit with its worst severity, its counts per severity
 * and its worst finding; opening one shows its findings, one line per problem.
 */
export function ByLocation({
  locations,
  linesByLocation,
  idsByLocation,
  ruleLabels,
  selectable,
}: {
  locations: LocationSummary[];
  linesByLocation: Map<string, FindingLine<FindingListRow>[]>;
  idsByLocation: Map<string, number[]>;
  ruleLabels: Record<string, string>;
  selectable: boolean;
}) {
  if (locations.length === 0) {
    return <p className="rounded-lg border border-ink-200 bg-white px-4 py-10 text-center text-sm text-ink-500">No finding matches these filters.</p>;
  }
  return (
    <ul className="space-y-2" aria-label="Findings by location">
      {locations.map((l) => {
        const key = l.storageUnitId !== null ? `unit:${l.storageUnitId}` : `room:${l.roomId}`;
        const lines = linesByLocation.get(key) ?? [];
        const ids = idsByLocation.get(key) ?? [];
        return (
          <li key={key} className="rounded-lg border border-ink-200 bg-white">
            <details>
              <summary className="flex cursor-pointer flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2.5">
                {selectable ? <SelectBox ids={ids} label={`Select the ${ids.length} findings in ${l.label}`} /> : null}
                <SeverityBadge severity={l.worst} />
                <span className="min-w-40 font-semibold text-ink-950">
                  {l.label}
                  <span className="ml-1.5 text-xs font-normal text-ink-600">{l.unitName ?? l.roomName}</span>
                </span>
                <span className="tabular flex flex-wrap gap-x-3 text-xs text-ink-700">
                  {SEVERITIES.filter((s) => l.counts[s] > 0).map((s) => (
                    <span key={s} className={SEVERITY_STYLE[s].text}>
                      {formatCount(l.counts[s])} {SEVERITY_STYLE[s].label.toLowerCase()}
                    </span>
                  ))}
                  <span className="text-ink-500">
                    {formatCount(l.total)} {l.total === 1 ? "finding" : "findings"} on {formatCount(lines.length)} {lines.length === 1 ? "line" : "lines"}
                  </span>
                </span>
                <span className="basis-full text-sm text-ink-800">
                  Worst:{" "}
                  <Link href={`/register/${l.top.id}`} className="text-accent-800 underline-offset-2 hover:underline">
                    {l.top.title}
                  </Link>
                </span>
              </summary>
              <div className="overflow-x-auto border-t border-ink-200">
                <FindingLinesTable lines={lines} ruleLabels={ruleLabels} selectable={selectable} caption={`Findings in ${l.label}, one line per problem`} />
              </div>
            </details>
          </li>
        );
      })}
    </ul>
  );
}
