import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { listSensorRows } from "@/lib/temperatures/sensors";
import { CsvUploadPanel, type SensorOption } from "./csv-upload-panel";

export const metadata: Metadata = { title: "Upload a logger file" };

export default async function UploadReadingsPage({ searchParams }: { searchParams: Promise<{ sensor?: string }> }) {
  await requirePagePermission("readings.upload");
  const { sensor } = await searchParams;
  const sensors: SensorOption[] = listSensorRows()
    .filter((s) => s.active)
    .map((s) => ({ id: s.id, label: `${s.externalId} — ${s.name}${s.unitCode || s.roomCode ? ` (${s.unitCode ?? s.roomCode})` : ""}` }));
  const preselected = sensors.find((s) => String(s.id) === sensor)?.id ?? null;
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/temperatures" className="text-accent-700 hover:underline">
          ← Temperatures
        </Link>
      </p>
      <PageHeader
        title="Upload a logger file"
        description="Readings exported by a temperature logger as CSV: choose which columns hold the time and the temperature, the unit and the time zone of the logger's clock, check the preview, then import. Every reading is stored, or none; a reading already stored is not stored twice. Your choices are remembered for the sensor's next file."
      />
      <CsvUploadPanel sensors={sensors} initialSensorId={preselected} />
    </div>
  );
}
