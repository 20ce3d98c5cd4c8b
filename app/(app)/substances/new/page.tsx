import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { SubstanceForm } from "../substance-form";

export const metadata: Metadata = { title: "Add a substance" };

export default async function NewSubstancePage() {
  await requirePagePermission("substances.write");
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/substances" className="text-accent-700 hover:underline">
          ← Substances
        </Link>
      </p>
      <PageHeader title="Add a substance" description="Every value needs its source. Values you do not have can stay empty; the assessment says what it is missing." />
      <Card>
        <SubstanceForm mode="create" />
      </Card>
    </div>
  );
}
