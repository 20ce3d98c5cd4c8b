import type { Metadata } from "next";
import { Suspense } from "react";
import { siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { LocationsHeader } from "./locations-header";
import { RoomsTable } from "./location-tables";
import { LocationsTabs } from "./locations-tabs";

export const metadata: Metadata = { title: "Locations" };

export default async function LocationsPage() {
  const { user } = await requirePagePermission("locations.read");
  return (
    <div>
      <LocationsHeader user={user} />
      <LocationsTabs current="rooms" />
      <Suspense fallback={<p className="text-sm text-ink-500">Loading rooms…</p>}>
        <RoomsTable sites={siteOptions()} />
      </Suspense>
    </div>
  );
}
