import type { Metadata } from "next";
import { Suspense } from "react";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { can } from "@/lib/auth/permissions";
import { requirePagePermission } from "@/lib/auth/page";
import { SubstancesTable } from "./substances-table";

export const metadata: Metadata = { title: "Substances" };

export default async function SubstancesPage() {
  const { user } = await requirePagePermission("substances.read");
  return (
    <div className="space-y-5">
      <PageHeader
        title="Substances"
        description="The substance library: physical properties, flammability and exposure limits, each value with its source."
        actions={
          can(user.role, "substances.write") ? (
            <Link href="/substances/new" className={buttonClass("primary")}>
              Add a substance
            </Link>
          ) : undefined
        }
      />
      {/* The table reads its state from the URL on the client; the fallback covers the first paint. */}
      <Suspense fallback={<p className="rounded-lg border border-ink-200 bg-white px-4 py-10 text-center text-sm text-ink-500">Loading substances…</p>}>
        <SubstancesTable />
      </Suspense>
    </div>
  );
}
