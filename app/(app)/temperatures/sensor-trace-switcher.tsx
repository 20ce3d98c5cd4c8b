"use client";
import { useId, useState } from "react";
import { TemperatureTraceChart, type TraceOverlay } from "@/components/charts/temperature-trace-chart";
import { inputClass } from "@/components/ui/field";
import type { ReadingSeries } from "@/lib/temperatures/series";

/** The chart of one of a location's sensors, with a choice of sensor when there are several. */
export function SensorTraceSwitcher({
  sensors,
  initial,
  overlays,
}: {
  sensors: { id: number; label: string }[];
  initial: ReadingSeries | null;
  /** Model curves drawn dashed over a sensor's readings, by sensor id (a unit's fitted warm-up). */
  overlays?: Record<number, TraceOverlay[]>;
}) {
  const id = useId();
  const [sensorId, setSensorId] = useState(initial?.sensor.id ?? sensors[0]?.id);
  if (sensorId == null) return null;
  return (
    <div className="space-y-3">
      {sensors.length > 1 ? (
        <div className="flex flex-wrap items-center gap-2">
          <label htmlFor={id} className="whitespace-nowrap text-sm font-medium text-ink-800">
            Chart of sensor
          </label>
          <select id={id} className={`${inputClass} h-9 sm:max-w-sm`} value={sensorId} onChange={(event) => setSensorId(Number(event.target.value))}>
            {sensors.map((s) => (
              <option key={s.id} value={s.id}>
                {s.label}
              </option>
            ))}
          </select>
        </div>
      ) : null}
      <TemperatureTraceChart key={sensorId} sensorId={sensorId} initial={initial?.sensor.id === sensorId ? initial : null} overlays={overlays?.[sensorId]} />
    </div>
  );
}
