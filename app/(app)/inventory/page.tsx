import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ContainersTable } from "./containers-table";
import { LabelLookup } from "./label-lookup";

export const metadata: Metadata = { title: "Inventory" };

export default async function InventoryPage() {
  const { user } = await requirePagePermission("inventory.read");
  return (
    <div className="space-y-5">
      <PageHeader
        title="Inventory"
        description="Containers of volatile liquids by storage unit: what is stored where, how much, and who owns it."
        actions={
          <>
            <Link href="/inventory/mixtures" className={buttonClass("secondary")}>
              Mixtures
            </Link>
            {can(user.role, "containers.import") ? (
              <Link href="/imports/containers" className={buttonClass("secondary")}>
                Import containers
              </Link>
            ) : null}
            {can(user.role, "containers.write") ? (
              <Link href="/inventory/new" className={buttonClass("primary")}>
                Log a container
              </Link>
            ) : null}
          </>
        }
      />
      <LabelLookup />
      <Suspense fallback={<p className="rounded-lg border border-ink-200 bg-white px-4 py-10 text-center text-sm text-ink-500">Loading containers…</p>}>
        <ContainersTable sites={siteOptions()} showMine={can(user.role, "containers.write")} />
      </Suspense>
    </div>
  );
}
