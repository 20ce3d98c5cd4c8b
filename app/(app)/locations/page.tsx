import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { locationsTree } from "@/db/queries/locations";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ROOM_KIND_LABELS, STORAGE_UNIT_KIND_LABELS } from "@/lib/format/labels";
import { formatCount, formatQuantity, formatTempC } from "@/lib/format/numbers";

export const metadata: Metadata = { title: "Locations" };

function setRange(min: number | null, max: number | null): string {
  if (min == null && max == null) return "—";
  return `${formatTempC(min)} … ${formatTempC(max)}`;
}

export default async function LocationsPage() {
  const { user } = await requirePagePermission("locations.read");
  const tree = locationsTree();
  const roomCount = tree.reduce((n, s) => n + s.rooms.length, 0);
  const unitCount = tree.reduce((n, s) => n + s.rooms.reduce((m, r) => m + r.units.length, 0), 0);
  return (
    <div className="space-y-6">
      <PageHeader
        title="Locations"
        description={`${formatCount(tree.length)} sites, ${formatCount(roomCount)} rooms and ${formatCount(unitCount)} storage units. Room volume and ventilation set how far a spill's vapor is diluted; a unit's set range and rating set what may be stored in it.`}
        actions={
          can(user.role, "locations.import") ? (
            <Link href="/imports/locations" className={buttonClass("secondary")}>
              Import locations
            </Link>
          ) : undefined
        }
      />
      {tree.length === 0 ? <EmptyState title="No sites yet" /> : null}
      {tree.map(({ site, rooms }) => (
        <section key={site.id} aria-labelledby={`site-${site.id}`} className="space-y-3">
          <h2 id={`site-${site.id}`} className="text-lg font-semibold text-ink-900">
            {site.name}
            <span className="tabular ml-2 text-sm font-normal text-ink-600">
              {site.address} · {formatQuantity(site.atmosphericPressureKPa, "kPa", 4)}
              {site.elevationM != null ? ` at ${formatQuantity(site.elevationM, "m", 3)} elevation` : ""}
            </span>
          </h2>
          {rooms.map(({ room, contactName, units }) => {
            const volumeM3 = room.floorAreaM2 != null && room.heightM != null ? room.floorAreaM2 * room.heightM : null;
            return (
              <Card
                key={room.id}
                title={
                  <Link href={`/locations/rooms/${room.id}`} className="hover:underline">
                    <span className="font-mono text-ink-700">{room.code}</span> {room.name}
                    <span className="ml-2 text-xs font-normal text-ink-600">{ROOM_KIND_LABELS[room.kind]}</span>
                  </Link>
                }
              >
                <dl className="tabular mb-4 grid grid-cols-2 gap-x-6 gap-y-2 text-sm sm:grid-cols-3 lg:grid-cols-6">
                  <div>
                    <dt className="text-xs text-ink-600">Volume</dt>
                    <dd>{formatQuantity(volumeM3, "m³")}</dd>
                  </div>
                  <div>
                    <dt className="text-xs text-ink-600">Ventilation</dt>
                    <dd>{formatQuantity(room.airChangesPerHour, "air changes/h", 2)}</dd>
                  </div>
                  <div>
                    <dt className="text-xs text-ink-600">Mixing factor</dt>
                    <dd>{formatQuantity(room.mixingFactor, "", 2)}</dd>
                  </div>
                  <div>
                    <dt className="text-xs text-ink-600">Design maximum</dt>
                    <dd>{formatTempC(room.designMaxTempC)}</dd>
                  </div>
                  <div>
                    <dt className="text-xs text-ink-600">Sprinklered</dt>
                    <dd>{room.sprinklered ? "Yes" : "No"}</dd>
                  </div>
                  <div>
                    <dt className="text-xs text-ink-600">Facilities contact</dt>
                    <dd>{contactName ?? "—"}</dd>
                  </div>
                </dl>
                <div className="-mx-4 -mb-4 overflow-x-auto border-t border-ink-200">
                  <table className="w-full min-w-[720px] text-sm">
                    <thead className="bg-ink-50">
                      <tr className="text-left text-xs uppercase tracking-wide text-ink-600">
                        <th scope="col" className="px-4 py-2 font-medium">Unit</th>
                        <th scope="col" className="px-4 py-2 font-medium">Kind</th>
                        <th scope="col" className="px-4 py-2 text-right font-medium">Internal volume</th>
                        <th scope="col" className="px-4 py-2 font-medium">Set range</th>
                        <th scope="col" className="px-4 py-2 font-medium">Interior</th>
                        <th scope="col" className="px-4 py-2 text-right font-medium">Containers</th>
                      </tr>
                    </thead>
                    <tbody className="tabular">
                      {units.map(({ unit, containerCount }) => (
                        <tr key={unit.id} className="border-t border-ink-100">
                          <td className="px-4 py-2">
                            <Link href={`/locations/units/${unit.id}`} className="text-accent-800 hover:underline">
                              <span className="font-mono">{unit.code}</span> {unit.name}
                            </Link>
                          </td>
                          <td className="px-4 py-2 text-ink-700">{STORAGE_UNIT_KIND_LABELS[unit.kind]}</td>
                          <td className="px-4 py-2 text-right">{formatQuantity(unit.internalVolumeL, "L")}</td>
                          <td className="px-4 py-2">{setRange(unit.setMinC, unit.setMaxC)}</td>
                          <td className="px-4 py-2 text-xs text-ink-700">
                            {unit.ignitionSourceFree ? "Free of ignition sources" : "May hold ignition sources"}
                            {unit.ventilated ? " · ventilated" : ""}
                          </td>
                          <td className="px-4 py-2 text-right">{formatCount(containerCount)}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </Card>
            );
          })}
        </section>
      ))}
    </div>
  );
}
