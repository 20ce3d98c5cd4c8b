import { CircleCheck } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { buttonClass } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { countExcursions, listExcursions } from "@/lib/temperatures/queries";
import { AcknowledgeSelected } from "./acknowledge-selected";
import { ExcursionList } from "./excursion-list";
import { SensorsTable } from "./sensors-table";

export const metadata: Metadata = { title: "Temperatures" };

export default async function TemperaturesPage() {
  const { user } = await requirePagePermission("temperatures.read");
  const mayAcknowledge = can(user.role, "excursions.acknowledge");
  // Every excursion nobody has acknowledged yet, ended or not (open ones first, then newest).
  const awaitingCount = countExcursions({ awaitingAcknowledgement: true });
  const awaiting = listExcursions({ awaitingAcknowledgement: true, limit: 200 });
  // Open excursions someone has acknowledged: still above the threshold at the latest reading.
  const openAcknowledged = listExcursions({ open: true, acknowledged: true, limit: 100 });
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
      <section id="awaiting-acknowledgement" aria-labelledby="awaiting-acknowledgement-heading" className="scroll-mt-6 rounded-lg border border-ink-200 bg-white">
        <header className="border-b border-ink-200 px-4 py-3">
          <h2 id="awaiting-acknowledgement-heading" className="text-sm font-semibold text-ink-900">
            Awaiting acknowledgement ({awaitingCount})
          </h2>
        </header>
        <div className="space-y-4 p-4">
          {awaitingCount === 0 ? (
            <p className="flex items-center gap-2 text-sm text-ink-700">
              <CircleCheck aria-hidden="true" className="size-4 text-ok" />
              Every excursion has been acknowledged.
            </p>
          ) : (
            <>
              <p className="text-sm text-ink-700">
                An excursion waits here, ended or not, until someone says what was found and what was done.
                {awaitingCount > awaiting.length ? ` The ${awaiting.length} most recent are listed.` : ""}
              </p>
              {mayAcknowledge ? <AcknowledgeSelected formId="acknowledge-selected" count={awaiting.length} /> : null}
              <div className="px-4 py-4">
                <ExcursionList rows={awaiting} mayAcknowledge={mayAcknowledge} selectFormId={mayAcknowledge ? "acknowledge-selected" : undefined} chartLinks />
              </div>
            </>
          )}
        </div>
      </section>
      {openAcknowledged.length > 0 ? (
        <Card title={`Open excursions, acknowledged (${openAcknowledged.length})`}>
          <ExcursionList rows={openAcknowledged} mayAcknowledge={mayAcknowledge} chartLinks />
        </Card>
      ) : null}
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
