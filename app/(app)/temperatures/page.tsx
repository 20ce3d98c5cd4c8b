import { CircleCheck } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { buttonClass } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { listExcursions } from "@/lib/temperatures/queries";
import { ExcursionList } from "./excursion-list";
import { SensorsTable } from "./sensors-table";

export const metadata: Metadata = { title: "Temperatures" };

export default async function TemperaturesPage() {
  const { user } = await requirePagePermission("temperatures.read");
  const open = listExcursions({ open: true, limit: 100 });
  return (
    <div className="space-y-6">
      <PageHeader
        title="Temperatures"
        description="Temperature loggers in rooms and storage units. Their readings and excursions set each location's worst-case temperature. Times are UTC."
        actions={
          <>
            {can(user.role, "readings.upload") ? (
              <Link href="/temperatures/upload" className={buttonClass("secondary")}>
                Upload logger file
              </Link>
            ) : null}
            {can(user.role, "sensors.write") ? (
              <Link href="/temperatures/sensors/new" className={buttonClass("primary")}>
                Register sensor
              </Link>
            ) : null}
          </>
        }
      />
      <Card title={`Open excursions (${open.length})`}>
        {open.length === 0 ? (
          <p className="flex items-center gap-2 text-sm text-ink-700">
            <CircleCheck aria-hidden="true" className="size-4 text-ok" />
            No location is above its excursion threshold at its latest reading.
          </p>
        ) : (
          <ExcursionList rows={open} mayAcknowledge={can(user.role, "excursions.acknowledge")} chartLinks />
        )}
      </Card>
      <section aria-labelledby="sensors-heading" className="space-y-3">
        <h2 id="sensors-heading" className="text-lg font-semibold text-ink-950">
          Sensors
        </h2>
        <Suspense fallback={<p className="text-sm text-ink-500">Loading sensors…</p>}>
          <SensorsTable />
        </Suspense>
      </section>
    </div>
  );
}
