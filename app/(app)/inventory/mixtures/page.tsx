import type { Metadata } from "next";
import Link from "next/link";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { getMixture, listMixtures } from "@/db/queries/mixtures";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatNumber } from "@/lib/format/numbers";
import { MixtureForm } from "./mixture-form";

export const metadata: Metadata = { title: "Mixtures" };

export default async function MixturesPage() {
  const { user } = await requirePagePermission("inventory.read");
  const { rows } = listMixtures({ page: 1, pageSize: 100, sort: "name", dir: "asc" });
  const mixtures = rows.map((row) => getMixture(row.id)!);
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/inventory" className="text-accent-700 hover:underline">
          ← Inventory
        </Link>
      </p>
      <PageHeader title="Mixtures" description="Solutions and waste streams defined by their components. Their vapor is assessed with Raoult's law and their LFL with Le Chatelier's rule." />
      <div className="grid gap-6 xl:grid-cols-2">
        <Card title={`Defined mixtures (${mixtures.length})`}>
          {mixtures.length === 0 ? (
            <EmptyState title="No mixtures yet" />
          ) : (
            <ul className="divide-y divide-ink-100">
              {mixtures.map((m) => (
                <li key={m.id} className="py-3 text-sm">
                  <p className="font-medium text-ink-900">{m.name}</p>
                  <p className="tabular text-xs text-ink-600">
                    {m.fractionBasis} fractions: {m.components.map((c) => `${c.name} ${formatNumber(c.fraction, 3)}`).join(" · ")}
                  </p>
                </li>
              ))}
            </ul>
          )}
        </Card>
        {can(user.role, "mixtures.write") ? (
          <Card title="Define a mixture">
            <MixtureForm />
          </Card>
        ) : null}
      </div>
    </div>
  );
}
