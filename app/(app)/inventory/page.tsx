import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { SectionTabs } from "@/components/ui/section-tabs";
import { siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { ContainersTable } from "./containers-table";
import { LabelLookup } from "./label-lookup";

export const metadata: Metadata = { title: "Inventory" };

/** The list's address with or without the "mine" filter, keeping the other filters and dropping the page. */
function withMine(params: Record<string, string | string[] | undefined>, mine: boolean): string {
  const next = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (key === "mine" || key === "page" || typeof value !== "string") continue;
    next.set(key, value);
  }
  if (mine) next.set("mine", "1");
  const query = next.toString();
  return query ? `/inventory?${query}` : "/inventory";
}

export default async function InventoryPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { user } = await requirePagePermission("inventory.read");
  const params = await searchParams;
  const showMine = can(user.role, "containers.write");
  const mine = params.mine === "1" || params.mine === "true";
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
      {showMine ? (
        <SectionTabs
          label="Whose containers"
          current={mine ? "mine" : "all"}
          tabs={[
            { key: "all", href: withMine(params, false), label: "All containers" },
            { key: "mine", href: withMine(params, true), label: "My containers" },
          ]}
        />
      ) : null}
      <LabelLookup />
      <Suspense fallback={<p className="rounded-lg border border-ink-200 bg-white px-4 py-10 text-center text-sm text-ink-500">Loading containers…</p>}>
        <ContainersTable sites={siteOptions()} showMine={showMine} />
      </Suspense>
    </div>
  );
}
