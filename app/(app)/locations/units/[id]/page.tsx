import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AuditTrail } from "@/components/audit-trail";
import { ContainersTable } from "@/components/containers-table";
import { buttonClass } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { auditTrail } from "@/db/queries/audit";
import { containersAt } from "@/db/queries/containers";
import { getStorageUnit } from "@/db/queries/location-details";
import { activeUserOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";
import { formatCount, formatQuantity, formatTempC } from "@/lib/format/numbers";
import { idParam } from "@/lib/http/paging";
import { UnitForm } from "../../location-forms";
import { toFormValue } from "@/lib/objects";
import { LocationTemperatureCard } from "@/app/(app)/temperatures/location-temperature-card";
import { PlaceFindings } from "../../place-findings";
import { BrokenBottlesCard } from "@/components/register/broken-bottles-card";
import { brokenBottlesOfUnit } from "@/lib/assessment/broken-bottles";
import { fittedCurves } from "@/lib/temperatures/warm-up-store";
import { WarmUpCard, warmUpOverlays } from "./warm-up-card";

export const metadata: Metadata = { title: "Storage unit" };

export default async function UnitPage({ params }: { params: Promise<{ id: string }> }) {
  const { user } = await requirePagePermission("locations.read");
  const id = idParam((await params).id);
  const unit = id ? getStorageUnit(id) : null;
  if (!unit || unit.retiredAt) notFound();
  const stored = containersAt({ storageUnitId: unit.id });
  const mayEdit = can(user.role, "locations.write");
  const bottles = brokenBottlesOfUnit(unit);
  const warmUpCurves = can(user.role, "temperatures.read") ? fittedCurves(unit.id) : null;
  const owners = mayEdit ? activeUserOptions().map((p) => ({ value: String(p.id), label: p.name })) : [];
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href={`/locations/rooms/${unit.roomId}`} className="text-accent-700 hover:underline">
          ← {unit.roomCode} {unit.roomName}
        </Link>
      </p>
      <PageHeader
        title={`${unit.code} ${unit.name}`}
        description={`${unit.siteName} · room ${unit.roomCode} · ${STORAGE_UNIT_KIND_LABELS[unit.kind]}`}
        actions={
          can(user.role, "containers.write") ? (
            <Link href={`/inventory/new?storageUnitId=${unit.id}`} className={buttonClass("primary")}>
              Log a container here
            </Link>
          ) : undefined
        }
      />
      <dl className="tabular grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {[
          ["Internal volume", formatQuantity(unit.internalVolumeL, "L")],
          ["Set range", unit.setMaxC != null ? `${formatTempC(unit.setMinC)} … ${formatTempC(unit.setMaxC)}` : "not temperature-controlled"],
          ["Excursion", unit.excursionThresholdC != null ? `above ${formatTempC(unit.excursionThresholdC)} for ${unit.excursionMinDurationMin ?? "—"} min` : "—"],
          ["Interior", `${unit.ignitionSourceFree ? "free of ignition sources" : "may hold ignition sources"}${unit.ventilated ? ", ventilated" : ""}`],
        ].map(([label, value]) => (
          <div key={label} className="rounded-lg border border-ink-200 bg-white px-4 py-3">
            <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">{label}</dt>
            <dd className="mt-1 font-semibold text-ink-950">{value}</dd>
          </div>
        ))}
      </dl>
      <PlaceFindings user={user} place={{ kind: "unit", storageUnitId: unit.id }} />
      <LocationTemperatureCard user={user} location={{ storageUnitId: unit.id }} overlays={warmUpOverlays(warmUpCurves)} />
      <WarmUpCard user={user} unit={unit} curves={warmUpCurves} />
      {bottles ? <BrokenBottlesCard bottles={bottles} unitCode={unit.code} /> : null}

      <Card title={`Inventory (${formatCount(stored.length)} containers)`}>
        <ContainersTable rows={stored} showUnit={false} />
      </Card>
      {mayEdit ? (
        <Card title="Edit storage unit">
          <UnitForm
            mode="edit"
            roomId={unit.roomId}
            owners={owners}
            values={Object.fromEntries(
              ["id", "code", "name", "kind", "internalVolumeL", "setMinC", "setMaxC", "excursionThresholdC", "excursionMinDurationMin", "ventilated", "ignitionSourceFree", "ownerId", "notes", "warmUpTauMin", "warmUpTauNote"].map((k) => [k, toFormValue((unit as Record<string, unknown>)[k])]),
            )}
          />
        </Card>
      ) : null}
      <Card title="History">
        <AuditTrail events={auditTrail("storage_unit", unit.id)} />
      </Card>
    </div>
  );
}
