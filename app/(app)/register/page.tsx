import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { Suspense } from "react";
import { Caution } from "@/components/ui/caution";
import { buttonClass } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { SEVERITY_STYLE } from "@/components/ui/severity";
import { countFindingsBySeverity } from "@/db/queries/findings";
import { siteOptions } from "@/db/queries/options";
import { SEVERITIES } from "@/db/schema";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatCount } from "@/lib/format/numbers";
import { RULE_SHORT_LABELS } from "@/lib/register/rule-labels";
import { findingListQuerySchema } from "@/lib/register/schemas";
import { defaultRegisterView } from "@/lib/register/views";
import { ReassessmentBanner } from "./reassessment-banner";
import { registerFilters } from "./register-columns";
import { RegisterTable } from "./register-table";
import { SaveViewForm } from "./save-view-form";

export const metadata: Metadata = { title: "Register" };

export default async function RegisterPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { user, scope } = await requirePagePermission("findings.read");
  const raw = Object.fromEntries(Object.entries(await searchParams).flatMap(([k, v]) => (typeof v === "string" ? [[k, v]] : [])));
  // No filters in the URL: open the role's default view (a safety officer may have saved another).
  if (Object.keys(raw).length === 0) redirect(`/register?${defaultRegisterView(user.role).query}`);
  const parsed = findingListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : {};
  const counts = countFindingsBySeverity(user, scope, query);
  const total = SEVERITIES.reduce((sum, s) => sum + counts[s], 0);
  const withSeverity = (severity: string) => {
    const next = new URLSearchParams(raw);
    next.set("severity", severity);
    next.delete("page");
    return `/register?${next.toString()}`;
  };
  const ruleOptions = Object.entries(RULE_SHORT_LABELS).map(([value, label]) => ({ value, label }));
  const sites = siteOptions().map((s) => ({ value: String(s.id), label: s.name }));
  return (
    <div className="space-y-5">
      <PageHeader
        title="Register"
        description={
          scope === "own"
            ? "Findings on your containers and the locations you look after."
            : "Every finding the assessment has raised, with its status and history. Findings are never deleted."
        }
        actions={
          <Link href="/register/settings" className={buttonClass("secondary", "sm")}>
            Thresholds and assumptions
          </Link>
        }
      />
      <ReassessmentBanner />
      <section aria-label="Findings by severity in this view" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {SEVERITIES.map((severity) => {
          const style = SEVERITY_STYLE[severity];
          const Icon = style.icon;
          return (
            <Link key={severity} href={withSeverity(severity)} className={`rounded-lg border bg-white px-4 py-3 hover:shadow-sm ${counts[severity] > 0 ? style.border : "border-ink-200"}`}>
              <span className={`flex items-center gap-1.5 text-xs font-semibold uppercase tracking-wide ${style.text}`}>
                <Icon aria-hidden="true" className="size-4" strokeWidth={2.25} />
                {style.label}
              </span>
              <span className="tabular mt-1 block text-2xl font-semibold text-ink-950">{formatCount(counts[severity])}</span>
              <span className="block text-xs text-ink-600">of {formatCount(total)} in this view</span>
            </Link>
          );
        })}
      </section>
      <Suspense fallback={<p className="rounded-lg border border-ink-200 bg-white px-4 py-10 text-center text-sm text-ink-500">Loading the register…</p>}>
        <RegisterTable filters={registerFilters(ruleOptions, sites)} ruleLabels={RULE_SHORT_LABELS} />
      </Suspense>
      {can(user.role, "findings.work") ? (
        <Card title="Default views">
          <Suspense fallback={null}>
            <SaveViewForm />
          </Suspense>
        </Card>
      ) : null}
      <Caution />
    </div>
  );
}
