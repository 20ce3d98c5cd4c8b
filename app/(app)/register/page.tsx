import type { Metadata } from "next";
import Link from "next/link";
import { Caution } from "@/components/ui/caution";
import { Card, EmptyState, PageHeader } from "@/components/ui/card";
import { SeverityBadge } from "@/components/ui/severity";
import { listFindings } from "@/db/queries/findings";
import { SEVERITIES } from "@/db/schema";
import { requirePagePermission } from "@/lib/auth/page";
import { formatCount, formatDateTime, formatQuantity, formatTempC } from "@/lib/format/numbers";

export const metadata: Metadata = { title: "Register" };

export default async function RegisterPage({ searchParams }: { searchParams: Promise<{ severity?: string }> }) {
  const { user, scope } = await requirePagePermission("findings.read");
  const { severity } = await searchParams;
  const rows = listFindings(user, scope, { severity });
  return (
    <div className="space-y-5">
      <PageHeader
        title="Register"
        description={
          scope === "own"
            ? "Findings that touch your containers and the locations you look after."
            : "Every finding the assessment has raised, with its status. Findings are never deleted."
        }
      />
      <nav aria-label="Filter by severity" className="flex flex-wrap gap-2 text-sm">
        <Link href="/register" aria-current={!severity ? "page" : undefined} className={`rounded-full border px-3 py-1 ${!severity ? "border-accent-700 bg-accent-50 text-accent-800" : "border-ink-300 bg-white"}`}>
          All
        </Link>
        {SEVERITIES.map((s) => (
          <Link key={s} href={`/register?severity=${s}`} aria-current={severity === s ? "page" : undefined} className={`rounded-full border px-3 py-1 capitalize ${severity === s ? "border-accent-700 bg-accent-50 text-accent-800" : "border-ink-300 bg-white"}`}>
            {s}
          </Link>
        ))}
      </nav>
      {rows.length === 0 ? (
        <EmptyState title={severity ? `No ${severity} findings` : "The register is empty"}>
          Findings appear here when a location&apos;s worst case crosses a limit: a vapor concentration near the LFL or an exposure
          limit, a flammable liquid where ignition sources are, a liquid above its flash or boiling point, or a quantity over the
          configured limit.
        </EmptyState>
      ) : (
        <Card title={`${formatCount(rows.length)} finding${rows.length === 1 ? "" : "s"}`}>
          <div className="-mx-4 -my-4 overflow-x-auto">
            <table className="w-full min-w-[720px] text-sm">
              <thead>
                <tr className="border-b border-ink-200 text-left text-xs uppercase tracking-wide text-ink-600">
                  <th scope="col" className="px-4 py-2 font-medium">Severity</th>
                  <th scope="col" className="px-4 py-2 font-medium">Finding</th>
                  <th scope="col" className="px-4 py-2 font-medium">Status</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Value / limit</th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">Worst case</th>
                  <th scope="col" className="px-4 py-2 font-medium">Raised</th>
                </tr>
              </thead>
              <tbody className="tabular">
                {rows.map((f) => (
                  <tr key={f.id} className="border-b border-ink-100 last:border-0">
                    <td className="px-4 py-2"><SeverityBadge severity={f.severity} /></td>
                    <td className="px-4 py-2 text-ink-900">{f.title}</td>
                    <td className="px-4 py-2 capitalize text-ink-700">{f.status.replace("_", " ")}</td>
                    <td className="px-4 py-2 text-right">{f.ratio != null ? formatQuantity(f.ratio * 100, "%") : "—"}</td>
                    <td className="px-4 py-2 text-right">{formatTempC(f.worstCaseTempC)}</td>
                    <td className="px-4 py-2 text-xs text-ink-600">{formatDateTime(f.firstRaisedAt)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </Card>
      )}
      <Caution />
    </div>
  );
}
