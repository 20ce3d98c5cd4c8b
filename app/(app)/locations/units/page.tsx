import type { Metadata } from "next";
import { Suspense } from "react";
import { siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { LocationsHeader } from "../locations-header";
import { UnitsTable } from "../location-tables";
import { LocationsTabs } from "../locations-tabs";

export const metadata: Metadata = { title: "Storage units" };

export default async function StorageUnitsPage() {
  const { user } = await requirePagePermission("locations.read");
  return (
    <div>
      <LocationsHeader user={user} />
      <LocationsTabs current="units" />
      <Suspense fallback={<p className="text-sm text-ink-500">Loading storage units…</p>}>
        <UnitsTable sites={siteOptions()} />
      </Suspense>
    </div>
  );
}
