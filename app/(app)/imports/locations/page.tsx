import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { LOCATION_COLUMNS } from "@/lib/imports";
import { ColumnReference, TemplateLinks } from "../column-reference";
import { ImportPanel } from "../import-panel";

export const metadata: Metadata = { title: "Import locations" };

export default async function ImportLocationsPage() {
  await requirePagePermission("locations.import");
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/locations" className="text-accent-700 hover:underline">
          ← Locations
        </Link>
      </p>
      <PageHeader
        title="Import locations"
        description="One row per storage unit, with its site and room on every row; a row with the unit columns empty declares a room alone. New sites are created; rooms are matched by site and code, units by room and code, and cells left empty keep the current values. Every row is written, or none."
      />
      <TemplateLinks kind="locations" />
      <ImportPanel kind="locations" doneHref="/locations" doneLabel="Go to the locations" />
      <Card title="Columns">
        <ColumnReference columns={LOCATION_COLUMNS} caption="Columns of a location import file" />
      </Card>
    </div>
  );
}
