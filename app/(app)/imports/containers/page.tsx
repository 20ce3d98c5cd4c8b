import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { CONTAINER_COLUMNS } from "@/lib/imports";
import { ColumnReference, TemplateLinks } from "../column-reference";
import { ImportPanel } from "../import-panel";

export const metadata: Metadata = { title: "Import containers" };

export default async function ImportContainersPage() {
  await requirePagePermission("containers.import");
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/inventory" className="text-accent-700 hover:underline">
          ← Inventory
        </Link>
      </p>
      <PageHeader
        title="Import containers"
        description="One row per container, keyed by its label. A label already in Headroom updates that container: cells left empty keep its current values, and a new storage unit is recorded as a move. Every row is written, or none."
      />
      <TemplateLinks kind="containers" />
      <ImportPanel kind="containers" doneHref="/inventory" doneLabel="Go to the inventory" />
      <Card title="Columns">
        <ColumnReference columns={CONTAINER_COLUMNS} caption="Columns of a container import file" />
      </Card>
    </div>
  );
}
