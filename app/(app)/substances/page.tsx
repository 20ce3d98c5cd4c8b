import type { Metadata } from "next";
import Link from "next/link";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { listSubstancesBrief } from "@/db/queries/inventory";
import { requirePagePermission } from "@/lib/auth/page";
import { formatQuantity, formatTempC } from "@/lib/format/numbers";

export const metadata: Metadata = { title: "Substances" };

export default async function SubstancesPage() {
  await requirePagePermission("substances.read");
  const rows = listSubstancesBrief();
  return (
    <div className="space-y-5">
      <PageHeader title="Substances" description="The substance library: physical properties, flammability and exposure limits, each value with its source." />
      {rows.length === 0 ? (
        <EmptyState title="The substance library is empty" />
      ) : (
        <Card title={`${rows.length} substances`}>
          <div className="-mx-4 -my-4 overflow-x-auto">
            <table className="w-full min-w-[640px] text-sm">
              <thead className="sticky top-0 bg-white">
                <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                  <th scope="col" className="px-4 py-2 font-medium">Name</th>
                  <th scope="col" className="px-4 py-2 font-medium">CAS number</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Boiling point (°C)</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Flash point (°C)</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">LFL (% vol)</th>
                </tr>
              </thead>
              <tbody className="tabular">
                {rows.map((s) => (
                  <tr key={s.id} className="border-b border-ink-100 last:border-0">
                    <td className="px-4 py-2 font-medium">
                      <Link href={`/substances/${s.id}`} className="text-accent-800 hover:underline">
                        {s.name}
                      </Link>
                    </td>
                    <td className="px-4 py-2 font-mono text-xs">{s.cas ?? "—"}</td>
                    <td className="px-4 py-2 text-right">{formatTempC(s.normalBoilingPointC)}</td>
                    <td className="px-4 py-2 text-right">{formatTempC(s.flashPointC)}</td>
                    <td className="px-4 py-2 text-right">{formatQuantity(s.lflVolPercent, "%", 2)}</td>
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
