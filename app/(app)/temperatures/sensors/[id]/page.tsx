import { Power, TriangleAlert, Upload } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AuditTrail } from "@/components/audit-trail";
import { TemperatureTraceChart } from "@/components/charts/temperature-trace-chart";
import { buttonClass } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { auditTrail } from "@/db/queries/audit";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatDateTime, formatTempC } from "@/lib/format/numbers";
import { idParam } from "@/lib/http/paging";
import { listExcursions } from "@/lib/temperatures/queries";
import { seriesQuerySchema } from "@/lib/temperatures/schemas";
import { readingSeries } from "@/lib/temperatures/series";
import { getSensor, sensorLocationOptions } from "@/lib/temperatures/sensors";
import { ExcursionList } from "../../excursion-list";
import { SensorEditForm } from "../../sensor-forms";
import { setRangeText } from "@/components/charts/temperature-trace-data";
import { PlaceFindings } from "@/app/(app)/locations/place-findings";

export const metadata: Metadata = { title: "Sensor" };

export default async function SensorPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ from?: string; to?: string }> }) {
  const { user } = await requirePagePermission("temperatures.read");
  const id = idParam((await params).id);
  const sensor = id ? getSensor(id) : null;
  if (!sensor) notFound();
  // "Show on the chart" links open the chart on a window; anything that does not parse shows the default year.
  const window = seriesQuerySchema.safeParse(await searchParams);
  const series = readingSeries(sensor.id, window.success && window.data.from != null && window.data.to != null ? { fromMs: window.data.from, toMs: window.data.to } : {});
  const excursionRows = listExcursions({ sensorId: sensor.id, limit: 200 });
  const mayEdit = can(user.role, "sensors.write");
  const { location } = series;
  const locationHref = sensor.storageUnitId != null ? `/locations/units/${sensor.storageUnitId}` : `/locations/rooms/${sensor.roomId}`;
  const locationText = sensor.storageUnitId != null ? `Unit ${sensor.unitCode} ${sensor.unitName}, room ${sensor.roomCode}` : `Room ${sensor.roomCode} ${sensor.roomName}`;
  const open = excursionRows.filter((e) => e.endAt == null).length;

  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/temperatures" className="text-accent-700 hover:underline">
          ← Temperatures
        </Link>
      </p>
      <PageHeader
        title={`${sensor.externalId} ${sensor.name}`}
        description={
          <>
            {sensor.siteName} ·{" "}
            <Link href={locationHref} className="text-accent-800 hover:underline">
              {locationText}
            </Link>
            {!sensor.active ? (
              <span className="ml-2 inline-flex items-center gap-1 font-medium text-ink-700">
                <Power aria-hidden="true" className="size-3.5" /> Switched off: new readings are refused
              </span>
            ) : null}
          </>
        }
        actions={
          can(user.role, "readings.upload") ? (
            <Link href={`/temperatures/upload?sensor=${sensor.id}`} className={buttonClass("secondary")}>
              <Upload aria-hidden="true" className="size-4" />
              Upload logger file
            </Link>
          ) : undefined
        }
      />

      <dl className="tabular grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {[
          ["Latest reading", sensor.lastReadingAt != null ? formatTempC(sensor.lastReadingTempC) : "none yet", sensor.lastReadingAt != null ? formatDateTime(sensor.lastReadingAt) : "readings arrive by API or file upload"],
          ["Set range", setRangeText(location.setMinC, location.setMaxC)?.replace(/^Set range /, "") ?? "none", `of the ${location.kind === "unit" ? "storage unit" : "room"}`],
          ["Excursion", location.thresholdC != null ? `above ${formatTempC(location.thresholdC)}` : "no threshold set", location.thresholdC != null ? `for at least ${location.minDurationMin ?? 0} min` : "so no excursions are detected"],
          ["Open excursions", String(open), open ? "see below" : "none"],
        ].map(([label, value, note]) => (
          <div key={label} className="rounded-lg border border-ink-200 bg-white px-4 py-3">
            <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">{label}</dt>
            <dd className="mt-1 flex items-center gap-1.5 text-lg font-semibold text-ink-950">
              {label === "Open excursions" && open ? <TriangleAlert aria-hidden="true" className="size-4 text-sev-high" /> : null}
              {value}
            </dd>
            <dd className="text-xs text-ink-600">{note}</dd>
          </div>
        ))}
      </dl>

      <div id="trace" className="scroll-mt-4">
        <Card title="Temperature trace">
          <TemperatureTraceChart key={`${series.fromMs}-${series.toMs}`} sensorId={sensor.id} initial={series} />
        </Card>
      </div>

      <PlaceFindings user={user} place={sensor.storageUnitId != null ? { kind: "unit", storageUnitId: sensor.storageUnitId } : { kind: "room", roomId: sensor.roomId! }} />

      <Card title={`Excursions (${excursionRows.length})`}>
        <ExcursionList rows={excursionRows} mayAcknowledge={can(user.role, "excursions.acknowledge")} showSensor={false} showLocation chartLinks emptyText="No excursions recorded for this sensor." />
      </Card>

      {mayEdit ? (
        <Card title="Edit sensor">
          <SensorEditForm
            locations={sensorLocationOptions()}
            values={{
              id: sensor.id,
              externalId: sensor.externalId,
              name: sensor.name,
              location: sensor.storageUnitId != null ? `unit:${sensor.storageUnitId}` : `room:${sensor.roomId}`,
              active: sensor.active,
            }}
          />
        </Card>
      ) : null}

      <Card title="History">
        <AuditTrail events={auditTrail("sensor", sensor.id)} />
      </Card>
    </div>
  );
}
