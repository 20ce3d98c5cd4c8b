import type { Metadata } from "next";
import { Suspense } from "react";
import { PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { ExportsTabs } from "../exports-tabs";
import { AuditTable } from "./audit-table";

export const metadata: Metadata = { title: "Audit log" };

export default async function AuditPage() {
  await requirePagePermission("audit.read");
  return (
    <div className="space-y-5">
      <PageHeader title="Exports and audit" description="Every create, update, move and retirement, with who, when, and the values before and after. Nothing here can be changed." />
      <ExportsTabs current="audit" />
      <Suspense fallback={<p className="text-sm text-ink-500">Loading the audit log…</p>}>
        <AuditTable />
      </Suspense>
    </div>
  );
}
