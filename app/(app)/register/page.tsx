import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { Suspense } from "react";
import { Caution } from "@/components/ui/caution";
import { buttonClass } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { SEVERITY_STYLE } from "@/components/ui/severity";
import { countFindingsBySeverity, findingLinesAt, listFindingLinesPage, listFindingLocations } from "@/db/queries/findings";
import { activeUserOptions, siteOptions, storageUnitOptions } from "@/db/queries/options";
import { SEVERITIES } from "@/db/schema";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatCount } from "@/lib/format/numbers";
import { RULE_SHORT_LABELS } from "@/lib/register/rule-labels";
import { BULK_EVENT_KINDS, findingListQuerySchema, type RegisterViewKind } from "@/lib/register/schemas";
import { ACTION_FOR_STEP } from "@/lib/register/workflow";
import { ByLocation } from "./by-location";
import { RegisterFilterBar, type LocationGroup } from "./filter-bar";
import { FindingLinesTable } from "./finding-lines";
import { BulkBar, SelectionProvider } from "./selection";
import { defaultRegisterView } from "@/lib/register/views";
import { ReassessmentBanner } from "./reassessment-banner";
import { registerFilters } from "./register-columns";
import { RegisterTable } from "./register-table";
import { SaveViewForm } from "./save-view-form";

export const metadata: Metadata = { title: "Register" };

const VIEW_TABS: { key: RegisterViewKind; label: string }[] = [
  { key: "lines", label: "One line per problem" },
  { key: "locations", label: "By location" },
  { key: "flat", label: "Every finding" },
];

const MAX_LOCATIONS_SHOWN = 200;

export default async function RegisterPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { user, scope } = await requirePagePermission("findings.read");
  const raw = Object.fromEntries(Object.entries(await searchParams).flatMap(([k, v]) => (typeof v === "string" ? [[k, v]] : [])));
  // No filters in the URL: open the role's default view (a safety officer may have saved another).
  if (Object.keys(raw).length === 0) redirect(`/register?${defaultRegisterView(user.role).query}`);
  const parsed = findingListQuerySchema.safeParse(raw);
  const query = parsed.success ? parsed.data : findingListQuerySchema.parse({});
  const view: RegisterViewKind = query.view ?? "lines";
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
  const locationGroups: LocationGroup[] = [];
  for (const unit of storageUnitOptions()) {
    let group = locationGroups.find((g) => g.room.value === String(unit.roomId));
    if (!group) {
      group = { room: { value: String(unit.roomId), label: `${unit.roomCode} ${unit.roomName}` }, units: [] };
      locationGroups.push(group);
    }
    group.units.push({ value: String(unit.id), label: `${unit.code} ${unit.name}` });
  }
  const withView = (next: RegisterViewKind) => {
    const params = new URLSearchParams(raw);
    params.set("view", next);
    params.delete("page");
    return `/register?${params.toString()}`;
  };
  const withPage = (page: number) => {
    const params = new URLSearchParams(raw);
    params.set("page", String(page));
    return `/register?${params.toString()}`;
  };
  // Steps on many findings: those the role may take at all (each finding is checked on its own).
  const bulkKinds = BULK_EVENT_KINDS.filter((kind) => can(user.role, ACTION_FOR_STEP[kind]));
  const people = can(user.role, "findings.work") ? activeUserOptions().filter((p) => p.role !== "auditor").map((p) => ({ id: p.id, name: p.name })) : [];
  const selectable = bulkKinds.length > 0;

  const withSort = (sort: "severity" | "timeToDanger") => {
    const params = new URLSearchParams(raw);
    params.delete("page");
    params.set("sort", sort);
    params.set("dir", sort === "timeToDanger" ? "asc" : "desc");
    return `/register?${params.toString()}`;
  };

  function linesView() {
    const { lines, total, findings } = listFindingLinesPage(user, scope, query);
    const pages = Math.max(1, Math.ceil(total / query.pageSize));
    const soonest = query.sort === "timeToDanger";
    return (
      <section aria-label="Findings, one line per problem" className="rounded-lg border border-ink-200 bg-white">
        <div className="flex flex-wrap items-baseline justify-between gap-2 border-b border-ink-200 px-3 py-2 text-sm text-ink-700">
          <p>
            {formatCount(total)} {total === 1 ? "line" : "lines"} for {formatCount(findings)} {findings === 1 ? "finding" : "findings"}: the scenarios of one problem (in control, control lost, spill) share a line, headed by the worst.
          </p>
          <p className="flex gap-3 whitespace-nowrap">
            <span className="text-ink-600">Order:</span>
            <Link href={withSort("severity")} aria-current={soonest ? undefined : "true"} className={soonest ? "text-accent-800 hover:underline" : "font-semibold text-ink-950"}>
              worst first
            </Link>
            <Link href={withSort("timeToDanger")} aria-current={soonest ? "true" : undefined} className={soonest ? "font-semibold text-ink-950" : "text-accent-800 hover:underline"}>
              soonest after a failure
            </Link>
          </p>
        </div>
        {lines.length === 0 ? (
          <p className="px-4 py-10 text-center text-sm text-ink-500">No finding matches these filters.</p>
        ) : (
          <div className="overflow-x-auto">
            <FindingLinesTable lines={lines} ruleLabels={RULE_SHORT_LABELS} selectable={selectable} caption={soonest ? "Findings, one line per problem, soonest danger after a failure first" : "Findings, one line per problem, worst first"} />
          </div>
        )}
        {pages > 1 ? (
          <nav aria-label="Pages" className="flex items-center justify-between gap-3 border-t border-ink-200 px-3 py-2 text-sm">
            <span className="text-ink-600">
              Page {query.page} of {pages}
            </span>
            <span className="flex gap-2">
              {query.page > 1 ? (
                <Link href={withPage(query.page - 1)} className={buttonClass("secondary", "sm")}>
                  Previous
                </Link>
              ) : null}
              {query.page < pages ? (
                <Link href={withPage(query.page + 1)} className={buttonClass("secondary", "sm")}>
                  Next
                </Link>
              ) : null}
            </span>
          </nav>
        ) : null}
      </section>
    );
  }

  function locationsView() {
    const all = listFindingLocations(user, scope, query);
    const shown = all.slice(0, MAX_LOCATIONS_SHOWN);
    const linesByLocation = findingLinesAt(user, scope, query, shown);
    const idsByLocation = new Map([...linesByLocation].map(([key, lines]) => [key, lines.flatMap((l) => l.findingIds)]));
    const findings = all.reduce((n, l) => n + l.total, 0);
    return (
      <section aria-label="Findings by location" className="space-y-2">
        <p className="text-sm text-ink-700">
          {formatCount(all.length)} {all.length === 1 ? "location" : "locations"} with {formatCount(findings)} {findings === 1 ? "finding" : "findings"}, worst first.
          {all.length > shown.length ? ` The first ${formatCount(shown.length)} are shown: narrow the filters to see the others.` : ""}
        </p>
        <ByLocation locations={shown} linesByLocation={linesByLocation} idsByLocation={idsByLocation} ruleLabels={RULE_SHORT_LABELS} selectable={selectable} />
      </section>
    );
  }
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
      <nav aria-label="Register views" className="flex flex-wrap gap-x-6 gap-y-2 border-b border-ink-200">
        {VIEW_TABS.map((tab) => (
          <Link
            key={tab.key}
            href={withView(tab.key)}
            aria-current={view === tab.key ? "page" : undefined}
            className={`border-b-2 px-1 pb-2 text-sm font-medium ${view === tab.key ? "border-accent-700 text-accent-800" : "border-transparent text-ink-600 hover:text-ink-900"}`}
          >
            {tab.label}
          </Link>
        ))}
      </nav>
      <SelectionProvider>
        {view === "flat" ? (
          <>
            {selectable ? <BulkBar kinds={bulkKinds} people={people} /> : null}
            <Suspense fallback={<p className="rounded-lg border border-ink-200 bg-white px-4 py-10 text-center text-sm text-ink-500">Loading the register…</p>}>
              <RegisterTable filters={registerFilters(ruleOptions, sites, locationGroups)} ruleLabels={RULE_SHORT_LABELS} selectable={selectable} />
            </Suspense>
          </>
        ) : (
          <>
            <Suspense fallback={null}>
              <RegisterFilterBar locations={locationGroups} rules={ruleOptions} showMine={user.role !== "auditor"} />
            </Suspense>
            {selectable ? <BulkBar kinds={bulkKinds} people={people} /> : null}
            {view === "lines" ? linesView() : locationsView()}
          </>
        )}
      </SelectionProvider>
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
