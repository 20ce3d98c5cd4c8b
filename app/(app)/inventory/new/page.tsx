import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { activeUserOptions, mixtureOptions, storageUnitOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { createContainerAction } from "../actions";
import { ContainerForm } from "../container-form";

export const metadata: Metadata = { title: "Log a container" };

export default async function NewContainerPage({ searchParams }: { searchParams: Promise<{ storageUnitId?: string }> }) {
  const { scope } = await requirePagePermission("containers.write");
  const { storageUnitId } = await searchParams;
  return (
    <div className="space-y-5">
      <p className="text-sm">
        <Link href="/inventory" className="text-accent-700 hover:underline">
          ← Inventory
        </Link>
      </p>
      <PageHeader title="Log a container" description="Scan or type its label, find what it holds, and say where it is stored." />
      <Card>
        <ContainerForm
          mode="create"
          action={createContainerAction}
          values={{ storageUnitId: storageUnitId ? Number(storageUnitId) : undefined }}
          units={storageUnitOptions()}
          people={activeUserOptions()}
          mixtures={mixtureOptions()}
          canChooseOwner={scope === "all"}
        />
      </Card>
    </div>
  );
}
