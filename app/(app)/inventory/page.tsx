import type { Metadata } from "next";
import Link from "next/link";
import { buttonClass } from "@/components/ui/button";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { recentContainers } from "@/db/queries/inventory";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { LabelLookup } from "./label-lookup";
import { formatCount, formatQuantity } from "@/lib/format/numbers";

export const metadata: Metadata = { title: "Inventory" };

export default async function InventoryPage() {
  const { user } = await requirePagePermission("inventory.read");
  const rows = recentContainers();
  return (
    <div className="space-y-5">
      <PageHeader
        title="Inventory"
        description="Containers of volatile liquids by storage unit: what is stored where, how much, and who owns it."
        actions={
          can(user.role, "containers.write") || can(user.role, "containers.import") ? (
            <>
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
          ) : undefined
        }
      />
      <LabelLookup />
      {rows.length === 0 ? (
        <EmptyState title="No containers are logged yet">Containers are logged against a storage unit with their substance or mixture, amount and owner.</EmptyState>
      ) : (
        <Card title={`Recently changed containers (${formatCount(rows.length)})`}>
          <div className="-mx-4 -my-4 overflow-x-auto">
            <table className="w-full min-w-[640px] text-sm">
              <thead>
                <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                  <th scope="col" className="px-4 py-2 font-medium">Label</th>
                  <th scope="col" className="px-4 py-2 font-medium">Contents</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Amount</th>
                  <th scope="col" className="px-4 py-2 font-medium">State</th>
                  <th scope="col" className="px-4 py-2 font-medium">Location</th>
                  <th scope="col" className="px-4 py-2 font-medium">Owner</th>
                </tr>
              </thead>
              <tbody className="tabular">
                {rows.map((c) => (
                  <tr key={c.id} className="border-b border-ink-100 last:border-0">
                    <td className="px-4 py-2 font-mono">
                      <Link href={`/inventory/${c.id}`} className="text-accent-800 hover:underline">
                        {c.label}
                      </Link>
                    </td>
                    <td className="px-4 py-2">{c.substanceName ?? c.mixtureName}</td>
                    <td className="px-4 py-2 text-right">{formatQuantity(c.amount, c.amountUnit)}</td>
                    <td className="px-4 py-2 capitalize">{c.state.replace("_", " ")}</td>
                    <td className="px-4 py-2 font-mono text-xs">{c.roomCode} / {c.unitCode}</td>
                    <td className="px-4 py-2">{c.ownerName ?? "—"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Card>
      )}
    </div>
  );
}
