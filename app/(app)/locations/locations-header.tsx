import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { sitesWithRoomCounts } from "@/db/queries/overview";
import type { SessionUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { formatCount, formatQuantity } from "@/lib/format/numbers";

/** The Locations header: what the area is, each site with its pressure, and the writer's actions. */
export function LocationsHeader({ user }: { user: SessionUser }) {
  const sites = sitesWithRoomCounts();
  return (
    <>
      <PageHeader
        title="Locations"
        description="Room volume and ventilation set how far a spill's vapor is diluted; a unit's set range and rating set what may be stored in it."
        actions={
          <>
            {can(user.role, "locations.import") ? (
              <Link href="/imports/locations" className={buttonClass("secondary")}>
                Import locations
              </Link>
            ) : null}
            {can(user.role, "locations.write") ? (
              <Link href="/locations/rooms/new" className={buttonClass("primary")}>
                Add a room
              </Link>
            ) : null}
          </>
        }
      />
      <ul className="tabular mb-5 flex flex-wrap gap-3 text-sm">
        {sites.map((site) => (
          <li key={site.id} className="rounded-md border border-ink-200 bg-white px-3 py-2">
            <span className="font-medium text-ink-900">{site.name}</span>
            <span className="text-ink-600"> · {formatCount(site.rooms)} rooms · {formatQuantity(site.atmosphericPressureKPa, "kPa", 4)}</span>
          </li>
        ))}
      </ul>
    </>
  );
}
