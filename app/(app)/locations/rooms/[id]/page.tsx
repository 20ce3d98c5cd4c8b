import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AuditTrail } from "@/components/audit-trail";
import { ContainersTable } from "@/components/containers-table";
import { Card, PageHeader } from "@/components/ui/card";
import { auditTrail } from "@/db/queries/audit";
import { containersAt } from "@/db/queries/containers";
import { getRoom } from "@/db/queries/location-details";
import { activeUserOptions, siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ROOM_KIND_LABELS, STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";
import { formatCount, formatQuantity, formatTempC } from "@/lib/format/numbers";
import { idParam } from "@/lib/http/paging";
import { RoomForm, UnitForm } from "../../location-forms";
import { toFormValue } from "@/lib/objects";
import { LocationTemperatureCard } from "@/app/(app)/temperatures/location-temperature-card";
import { PlaceFindings } from "../../place-findings";

export const metadata: Metadata = { title: "Room" };

export default async function RoomPage({ params }: { params: Promise<{ id: string }> }) {
  const { user } = await requirePagePermission("locations.read");
  const id = idParam((await params).id);
  const room = id ? getRoom(id) : null;
  if (!room || room.retiredAt) notFound();
  const stored = containersAt({ roomId: room.id });
  const mayEdit = can(user.role, "locations.write");
  const people = mayEdit ? activeUserOptions() : [];
  const contacts = people.filter((p) => p.role === "facilities" || p.role === "safety_officer" || p.role === "admin").map((p) => ({ value: String(p.id), label: p.name }));
  const owners = people.map((p) => ({ value: String(p.id), label: p.name }));
  const sites = mayEdit ? siteOptions().map((s) => ({ value: String(s.id), label: s.name })) : [];
  const achText = room.airChangesPerHour == null ? "not recorded" : room.airChangesPerHour === 0 ? "no mechanical ventilation" : `${formatQuantity(room.airChangesPerHour, "air changes/h", 2)}`;

  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/locations" className="text-accent-700 hover:underline">
          ← Locations
        </Link>
      </p>
      <PageHeader
        title={`${room.code} ${room.name}`}
        description={`${room.siteName} · ${ROOM_KIND_LABELS[room.kind]} · ${formatCount(room.units.length)} storage units · ${formatCount(stored.length)} containers`}
      />

      <dl className="tabular grid gap-3 sm:grid-cols-2 lg:grid-cols-5">
        {[
          ["Volume", formatQuantity(room.volumeM3, "m³"), room.floorAreaM2 != null && room.heightM != null ? `${formatQuantity(room.floorAreaM2, "m²")} × ${formatQuantity(room.heightM, "m")}` : "floor area or height missing"],
          ["Ventilation", achText, `mixing factor ${formatQuantity(room.mixingFactor, "", 2)}`],
          ["Design maximum", formatTempC(room.designMaxTempC), room.setMaxC != null ? `set range ${formatTempC(room.setMinC)} … ${formatTempC(room.setMaxC)}` : "not temperature-controlled"],
          ["Sprinklered", room.sprinklered ? "Yes" : "No", "affects quantity limits"],
          ["Facilities contact", room.facilitiesContactName ?? "—", "receives excursion alerts"],
        ].map(([label, value, note]) => (
          <div key={label} className="rounded-lg border border-ink-200 bg-white px-4 py-3">
            <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">{label}</dt>
            <dd className="mt-1 text-lg font-semibold text-ink-950">{value}</dd>
            <dd className="text-xs text-ink-600">{note}</dd>
          </div>
        ))}
      </dl>

      <PlaceFindings user={user} place={{ kind: "room", roomId: room.id }} />
      <LocationTemperatureCard user={user} location={{ roomId: room.id }} />

      <Card title={`Storage units (${room.units.length})`}>
        <div className="-mx-4 -my-4 overflow-x-auto">
          <table className="w-full min-w-[640px] text-sm">
            <thead>
              <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                <th scope="col" className="px-4 py-2 font-medium">Unit</th>
                <th scope="col" className="px-4 py-2 font-medium">Kind</th>
                <th scope="col" className="px-4 py-2 text-right font-medium">Internal volume</th>
                <th scope="col" className="px-4 py-2 font-medium">Set range</th>
                <th scope="col" className="px-4 py-2 font-medium">Interior</th>
                <th scope="col" className="px-4 py-2 text-right font-medium">Containers</th>
              </tr>
            </thead>
            <tbody className="tabular">
              {room.units.map(({ unit, containerCount }) => (
                <tr key={unit.id} className="border-b border-ink-100 last:border-0">
                  <td className="px-4 py-2">
                    <Link href={`/locations/units/${unit.id}`} className="text-accent-800 hover:underline">
                      <span className="font-mono">{unit.code}</span> {unit.name}
                    </Link>
                  </td>
                  <td className="px-4 py-2">{STORAGE_UNIT_KIND_LABELS[unit.kind]}</td>
                  <td className="px-4 py-2 text-right">{formatQuantity(unit.internalVolumeL, "L")}</td>
                  <td className="px-4 py-2">{unit.setMaxC != null ? `${formatTempC(unit.setMinC)} … ${formatTempC(unit.setMaxC)}` : "—"}</td>
                  <td className="px-4 py-2 text-xs">{unit.ignitionSourceFree ? "Free of ignition sources" : "May hold ignition sources"}</td>
                  <td className="px-4 py-2 text-right">{formatCount(containerCount)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>

      <Card title={`Inventory (${formatCount(stored.length)} containers)`}>
        <ContainersTable rows={stored} />
      </Card>

      {mayEdit ? (
        <div className="grid gap-6 xl:grid-cols-2">
          <Card title="Edit room">
            <RoomForm
              mode="edit"
              sites={sites}
              contacts={contacts}
              values={Object.fromEntries(
                ["id", "siteId", "code", "name", "kind", "floorAreaM2", "heightM", "airChangesPerHour", "mixingFactor", "designMaxTempC", "sprinklered", "setMinC", "setMaxC", "excursionThresholdC", "excursionMinDurationMin", "facilitiesContactId", "notes"].map((k) => [k, toFormValue((room as Record<string, unknown>)[k])]),
              )}
            />
          </Card>
          <Card title="Add a storage unit">
            <UnitForm mode="create" roomId={room.id} owners={owners} />
          </Card>
        </div>
      ) : null}

      <Card title="History">
        <AuditTrail events={auditTrail("room", room.id)} />
      </Card>
    </div>
  );
}
