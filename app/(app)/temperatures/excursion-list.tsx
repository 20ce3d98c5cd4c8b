import { CircleCheck, TriangleAlert } from "lucide-react";
import Link from "next/link";
import { formatDateTime, formatDurationMin, formatTempC } from "@/lib/format/numbers";
import type { ExcursionRow } from "@/lib/temperatures/queries";
import { AcknowledgeExcursion } from "./acknowledge-excursion";

const HOUR_MS = 3_600_000;

/** A window around an excursion for the sensor page's chart: an hour either side, at least a day. */
export function excursionWindowHref(row: ExcursionRow, nowMs: number): string {
  const startMs = row.startAt.getTime();
  const endMs = row.endAt?.getTime() ?? Math.max(startMs + row.durationMin * 60_000, Math.min(nowMs, startMs + 24 * HOUR_MS));
  const padMs = Math.max(HOUR_MS, (24 * HOUR_MS - (endMs - startMs)) / 2);
  const params = new URLSearchParams({ from: new Date(startMs - padMs).toISOString(), to: new Date(endMs + padMs).toISOString() });
  return `/temperatures/sensors/${row.sensorId}?${params}#trace`;
}

function Location({ row }: { row: ExcursionRow }) {
  if (row.storageUnitId != null) {
    return (
      <Link href={`/locations/units/${row.storageUnitId}`} className="text-accent-800 hover:underline">
        <span className="font-mono">{row.unitCode}</span>
        {row.roomCode ? <span className="text-ink-600"> in {row.roomCode}</span> : null}
      </Link>
    );
  }
  if (row.roomId != null) {
    return (
      <Link href={`/locations/rooms/${row.roomId}`} className="text-accent-800 hover:underline">
        <span className="font-mono">{row.roomCode}</span>
      </Link>
    );
  }
  return <span>—</span>;
}

/**
 * Excursions as a list: open ones marked with an icon and the word "Open" (never colour alone),
 * with start, end, peak, duration and the acknowledgement or the form to give one.
 */
export function ExcursionList({
  rows,
  mayAcknowledge,
  showSensor = true,
  showLocation = true,
  chartLinks = false,
  selectFormId,
  emptyText = "No excursions recorded.",
}: {
  rows: ExcursionRow[];
  mayAcknowledge: boolean;
  /** Each excursion not yet acknowledged gets a checkbox belonging to this form (acknowledge several at once). */
  selectFormId?: string;
  showSensor?: boolean;
  showLocation?: boolean;
  chartLinks?: boolean;
  emptyText?: string;
}) {
  if (rows.length === 0) return <p className="text-sm text-ink-600">{emptyText}</p>;
  // eslint-disable-next-line react-hooks/purity -- a server component renders once per request
  const nowMs = Date.now();
  return (
    // The acknowledgement goes beside the excursion only where the list is wide enough for both.
    <ul className="@container/list -mx-4 -my-4 divide-y divide-ink-100">
      {rows.map((row) => {
        const open = row.endAt == null;
        const summaryId = `excursion-${row.id}-summary`;
        return (
          <li key={row.id} className={`grid gap-3 px-4 py-3 @4xl/list:grid-cols-[minmax(0,1fr)_minmax(16rem,22rem)] ${open ? "border-l-4 border-sev-high bg-sev-high-bg/60 pl-3" : ""}`}>
            <div className="tabular flex gap-3 text-sm">
              {selectFormId && mayAcknowledge && !row.acknowledgedAt ? (
                <input
                  type="checkbox"
                  name="excursionIds"
                  value={row.id}
                  form={selectFormId}
                  aria-label={`Select the excursion on sensor ${row.sensorExternalId} that started ${formatDateTime(row.startAt)}`}
                  className="mt-1 size-4 shrink-0 accent-accent-700"
                />
              ) : null}
              <div className="min-w-0 space-y-1">
                <p id={summaryId} className="flex flex-wrap items-center gap-x-2 gap-y-1">
                  {open ? (
                    <span className="inline-flex items-center gap-1 rounded border border-sev-high/40 bg-white px-1.5 py-0.5 text-xs font-semibold text-sev-high">
                      <TriangleAlert aria-hidden="true" className="size-3.5" strokeWidth={2.25} />
                      Open
                    </span>
                  ) : (
                    <span className="inline-flex items-center gap-1 rounded border border-ink-200 bg-white px-1.5 py-0.5 text-xs font-medium text-ink-700">
                      <CircleCheck aria-hidden="true" className="size-3.5" />
                      Ended
                    </span>
                  )}
                  <Link href={`/temperatures/excursions/${row.id}`} className="font-semibold text-ink-950 hover:underline">
                    Peak {formatTempC(row.peakTempC)}
                  </Link>
                  <span className="text-ink-700">
                    above {formatTempC(row.thresholdC)} for {formatDurationMin(row.durationMin)}
                    {open ? " so far" : ""}
                  </span>
                  {showSensor ? (
                    <span className="text-ink-700">
                      · sensor{" "}
                      <Link href={`/temperatures/sensors/${row.sensorId}`} className="font-mono text-accent-800 hover:underline">
                        {row.sensorExternalId}
                      </Link>
                    </span>
                  ) : null}
                  {showLocation ? (
                    <span className="text-ink-700">
                      · <Location row={row} />
                    </span>
                  ) : null}
                </p>
                <p className="text-xs text-ink-600">
                  Started {formatDateTime(row.startAt)} · {open ? "still above the threshold at the latest reading" : `ended ${formatDateTime(row.endAt)}`} · peak at {formatDateTime(row.peakAt)}
                  {chartLinks ? (
                    <>
                      {" "}
                      ·{" "}
                      <Link href={excursionWindowHref(row, nowMs)} className="whitespace-nowrap font-medium text-accent-800 hover:underline">
                        Show on the chart
                      </Link>
                    </>
                  ) : null}
                </p>
              </div>
            </div>
            <div className="text-sm">
              {row.acknowledgedAt ? (
                <div className="space-y-0.5">
                  <p className="flex items-center gap-1 text-xs font-medium text-ok">
                    <CircleCheck aria-hidden="true" className="size-3.5" />
                    Acknowledged by {row.acknowledgedByName ?? "a former user"}, {formatDateTime(row.acknowledgedAt)}
                  </p>
                  <blockquote className="border-l-2 border-ink-200 pl-2 text-ink-800">{row.acknowledgeComment}</blockquote>
                </div>
              ) : mayAcknowledge ? (
                <AcknowledgeExcursion excursionId={row.id} describedById={summaryId} />
              ) : (
                <p className="text-xs text-ink-600">Not acknowledged yet.</p>
              )}
            </div>
          </li>
        );
      })}
    </ul>
  );
}
