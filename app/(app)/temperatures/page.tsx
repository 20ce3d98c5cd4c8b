import type { Metadata } from "next";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { listSensorRows } from "@/lib/temperatures/sensors";
import { requirePagePermission } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Temperatures" };

export default async function TemperaturesPage() {
  await requirePagePermission("temperatures.read");
  const rows = listSensorRows();
  return (
    <div className="space-y-5">
      <PageHeader
        title="Temperatures"
        description="Temperature loggers in rooms and storage units. Their readings and excursions set each location's worst-case temperature."
      />
      {rows.length === 0 ? (
        <EmptyState title="No sensors are registered yet">A sensor belongs to one room or storage unit and is known by its logger&apos;s device id.</EmptyState>
      ) : (
        <Card title={`Sensors (${rows.length})`}>
          <ul className="divide-y divide-ink-100 text-sm">
            {rows.map((s) => (
              <li key={s.id} className="flex justify-between py-2">
                <span>
                  <span className="font-mono">{s.externalId}</span> {s.name}
                </span>
                <span className="font-mono text-xs text-ink-600">{s.unitCode ?? s.roomCode}</span>
              </li>
            ))}
          </ul>
        </Card>
      )}
    </div>
  );
}
