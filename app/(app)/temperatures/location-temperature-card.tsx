import { Power, TriangleAlert } from "lucide-react";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import type { TraceOverlay } from "@/components/charts/temperature-trace-chart";
import { Card } from "@/components/ui/card";
import type { SessionUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { formatDateTime, formatTempC } from "@/lib/format/numbers";
import { listExcursions, lookBackDays, worstCaseForRoom, worstCaseForUnit } from "@/lib/temperatures/queries";
import { readingSeries } from "@/lib/temperatures/series";
import { sensorsAt, type SensorListRow } from "@/lib/temperatures/sensors";
import { describeCandidate, type WorstCase } from "@/lib/temperatures/worst-case";
import { ExcursionList } from "./excursion-list";
import { SensorTraceSwitcher } from "./sensor-trace-switcher";

/** The description without its leading temperature, which the block shows large above it. */
function sourceText(worstCase: WorstCase): string {
  const lead = `${formatTempC(worstCase.tempC)}, `;
  const text = worstCase.description.startsWith(lead) ? worstCase.description.slice(lead.length) : worstCase.description;
  return text.charAt(0).toUpperCase() + text.slice(1);
}

function WorstCaseBlock({ title, note, worstCase }: { title: string; note: string; worstCase: WorstCase | null }) {
  const others = worstCase ? [...worstCase.candidates].sort((a, b) => b.tempC - a.tempC) : [];
  return (
    <div className="rounded-md border border-ink-200 bg-ink-50 px-4 py-3">
      <p className="text-xs font-medium uppercase tracking-wide text-ink-600">{title}</p>
      <p className="tabular mt-1 text-2xl font-semibold text-ink-950">{worstCase ? formatTempC(worstCase.tempC) : "—"}</p>
      <p className="tabular text-sm text-ink-800">{worstCase ? sourceText(worstCase) : "Not known: no design maximum, set range or readings."}</p>
      <p className="mt-1 text-xs text-ink-600">{note}</p>
      {others.length > 1 ? (
        <details className="mt-2 text-xs text-ink-700">
          <summary className="cursor-pointer font-medium text-accent-800">All {others.length} values considered</summary>
          <ul className="tabular mt-1 list-disc space-y-0.5 pl-5">
            {others.map((candidate, index) => (
              <li key={index}>{describeCandidate(candidate)}</li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}

function SensorLine({ sensor }: { sensor: SensorListRow }) {
  return (
    <li className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1 py-2 text-sm">
      <span>
        <Link href={`/temperatures/sensors/${sensor.id}`} className="font-mono font-medium text-accent-800 hover:underline">
          {sensor.externalId}
        </Link>{" "}
        <span className="text-ink-800">{sensor.name}</span>
        {!sensor.active ? (
          <span className="ml-2 inline-flex items-center gap-1 text-xs text-ink-600">
            <Power aria-hidden="true" className="size-3" /> Switched off
          </span>
        ) : null}
        {sensor.openExcursions > 0 ? (
          <span className="ml-2 inline-flex items-center gap-1 text-xs font-semibold text-sev-high">
            <TriangleAlert aria-hidden="true" className="size-3.5" /> Open excursion
          </span>
        ) : null}
      </span>
      <span className="tabular text-xs text-ink-600">
        {sensor.lastReadingAt != null ? (
          <>
            latest <span className="font-semibold text-ink-900">{formatTempC(sensor.lastReadingTempC)}</span> at {formatDateTime(sensor.lastReadingAt)}
          </>
        ) : (
          "no readings yet"
        )}
      </span>
    </li>
  );
}

/**
 * The Temperature card of a room or storage unit page: its worst-case temperature with where it
 * came from (both "in control" and "control lost" for a unit with a set range), its sensors with
 * a chart, and its excursions with the acknowledgement form for those who may give one.
 */
export function LocationTemperatureCard({
  user,
  location,
  overlays,
}: {
  user: SessionUser;
  location: { roomId: number } | { storageUnitId: number };
  /** Model curves drawn dashed over a sensor's readings, by sensor id (a unit's fitted warm-up). */
  overlays?: Record<number, TraceOverlay[]>;
}) {
  const onUnit = "storageUnitId" in location;
  const days = lookBackDays();
  const mayReadSensors = can(user.role, "temperatures.read");
  const blocks: { title: string; note: string; worstCase: WorstCase | null }[] = [];
  if (onUnit) {
    const unit = worstCaseForUnit(location.storageUnitId);
    if (unit.controlled) {
      blocks.push({
        title: "In control",
        note: `The unit working: the upper end of its set range and its sensors' highest reading in the last ${days} days outside its excursions (those count as control lost).`,
        worstCase: unit.inControl,
      });
      blocks.push({
        title: "Control lost",
        note: `The higher of its room's worst case (as if the unit had failed and warmed up to the room) and the highest peak of its excursions in the last ${days} days.`,
        worstCase: unit.controlLost,
      });
    } else {
      blocks.push({ title: "Worst case", note: `Not temperature-controlled, so at room temperature: the room's values and the unit's own readings in the last ${days} days.`, worstCase: unit.inControl });
    }
  } else {
    blocks.push({ title: "Worst case", note: `The highest of the design maximum, the room's sensors' highest reading in the last ${days} days and any open excursion.`, worstCase: worstCaseForRoom(location.roomId) });
  }

  const sensors = mayReadSensors ? sensorsAt(location) : [];
  const excursionRows = mayReadSensors ? listExcursions(onUnit ? { storageUnitId: location.storageUnitId, limit: 50 } : { inRoomId: location.roomId, limit: 50 }) : [];
  // The chart opens on what needs attention: an open excursion, else the latest excursion (the
  // list is open-first, newest-first), else the first sensor with readings.
  const ownIds = new Set(sensors.map((s) => s.id));
  const attentionId = excursionRows.find((e) => ownIds.has(e.sensorId))?.sensorId;
  const charted = sensors.find((s) => s.id === attentionId) ?? sensors.find((s) => s.lastReadingAt != null) ?? sensors[0];
  const initial = charted ? readingSeries(charted.id) : null;
  const openCount = excursionRows.filter((e) => e.endAt == null).length;
  const registerHref = `/temperatures/sensors/new?location=${onUnit ? `unit:${location.storageUnitId}` : `room:${location.roomId}`}`;

  return (
    <Card
      title="Temperature"
      action={
        can(user.role, "sensors.write") ? (
          <Link href={registerHref} className={buttonClass("secondary", "sm")}>
            Register a sensor here
          </Link>
        ) : undefined
      }
    >
      <div className="space-y-5">
        <div className={`grid gap-3 ${blocks.length > 1 ? "md:grid-cols-2" : ""}`}>
          {blocks.map((block) => (
            <WorstCaseBlock key={block.title} {...block} />
          ))}
        </div>

        {mayReadSensors ? (
          <>
            <section aria-labelledby="location-sensors-heading">
              <h3 id="location-sensors-heading" className="text-sm font-semibold text-ink-900">
                Sensors ({sensors.length})
              </h3>
              {sensors.length === 0 ? (
                <p className="mt-1 text-sm text-ink-600">No sensor is attached {onUnit ? "to this unit" : "to the room itself"}.</p>
              ) : (
                <ul className="divide-y divide-ink-100">
                  {sensors.map((sensor) => (
                    <SensorLine key={sensor.id} sensor={sensor} />
                  ))}
                </ul>
              )}
            </section>

            {sensors.length > 0 ? (
              <SensorTraceSwitcher sensors={sensors.map((s) => ({ id: s.id, label: `${s.externalId} ${s.name}` }))} initial={initial} overlays={overlays} />
            ) : null}

            <section aria-labelledby="location-excursions-heading" className="space-y-3">
              <h3 id="location-excursions-heading" className="flex items-center gap-2 text-sm font-semibold text-ink-900">
                Excursions ({excursionRows.length})
                {openCount > 0 ? (
                  <span className="inline-flex items-center gap-1 text-xs font-semibold text-sev-high">
                    <TriangleAlert aria-hidden="true" className="size-3.5" /> {openCount} open
                  </span>
                ) : null}
              </h3>
              <div className="rounded-md border border-ink-200 px-4 py-4">
                <ExcursionList
                  rows={excursionRows}
                  mayAcknowledge={can(user.role, "excursions.acknowledge")}
                  showLocation={!onUnit}
                  chartLinks
                  emptyText={`No excursions recorded ${onUnit ? "on this unit" : "in this room or its units"}.`}
                />
              </div>
            </section>
          </>
        ) : (
          <p className="text-xs text-ink-600">Sensors, readings and excursions are shown to facilities, safety officers, auditors and administrators.</p>
        )}
      </div>
    </Card>
  );
}
