import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Card, PageHeader } from "@/components/ui/card";
import { getSubstance } from "@/db/queries/substances";
import { requirePagePermission } from "@/lib/auth/page";
import { idParam } from "@/lib/http/paging";
import { SUBSTANCE_VALUE_FIELDS } from "@/lib/substances/schemas";
import { SubstanceForm } from "../../substance-form";

export const metadata: Metadata = { title: "Correct a substance" };

export default async function EditSubstancePage({ params }: { params: Promise<{ id: string }> }) {
  await requirePagePermission("substances.write");
  const id = idParam((await params).id);
  const row = id ? getSubstance(id) : null;
  if (!row) notFound();
  const values: Record<string, unknown> = {
    id: row.id,
    name: row.name,
    cas: row.cas ?? "",
    formula: row.formula ?? "",
    synonyms: row.synonyms.join(", "),
    physicalState: row.physicalState,
    correlations: JSON.stringify(row.correlations, null, 1),
    notes: row.notes ?? "",
    sources: row.sources,
  };
  for (const field of SUBSTANCE_VALUE_FIELDS) {
    const value = (row as unknown as Record<string, number | null>)[field];
    values[field] = value == null ? "" : String(value);
  }
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href={`/substances/${row.id}`} className="text-accent-700 hover:underline">
          ← {row.name}
        </Link>
      </p>
      <PageHeader title={`Correct ${row.name}`} description="The previous values stay in the history below the substance's page. Exposure limits are kept as they are." />
      <Card>
        <SubstanceForm mode="edit" values={values} />
      </Card>
    </div>
  );
}
