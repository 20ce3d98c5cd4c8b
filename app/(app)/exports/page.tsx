import type { Metadata } from "next";
import { Download } from "lucide-react";
import { buttonClass } from "@/components/ui/button";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { siteOptions } from "@/db/queries/options";
import { requirePagePermission } from "@/lib/auth/page";
import { ExportsTabs } from "./exports-tabs";

export const metadata: Metadata = { title: "Exports" };

const SHEETS = [
  ["Summary", "findings by severity and status, containers, locations and open excursions, when and by whom it was made, and the caution"],
  ["Findings", "every finding with its value, limit, ratio, worst-case temperature and where it came from"],
  ["Finding traces", "each finding's calculation in one cell, a line per step: inputs with their sources, formulas, the numbers put in, results and warnings"],
  ["Trace sources", "the long sources the traces cite as [S…], each written out once"],
  ["Inventory", "every container in storage with its location, amount and owner"],
  ["Locations", "rooms and storage units with their worst-case temperatures (in control and control lost) and where they came from"],
  ["Excursions", "temperature excursions with start, end, duration, peak and acknowledgement"],
  ["Substances", "the property data used, with the source of every value, and the exposure limits"],
  ["Methods and cautions", "the methods, assumptions, settings and cautions behind the numbers"],
] as const;

export default async function ExportsPage() {
  await requirePagePermission("exports.download");
  const sites = siteOptions();
  return (
    <div className="space-y-5">
      <PageHeader title="Exports and audit" description="The register as an Excel workbook for audits: numbers as numbers, units in the headers, frozen header rows and filters." />
      <ExportsTabs current="workbook" />
      <Card title="Register workbook">
        <p className="mb-3 text-sm text-ink-700">The workbook holds these sheets:</p>
        <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-[10rem_minmax(0,1fr)]">
          {SHEETS.map(([name, what]) => (
            <div key={name} className="contents">
              <dt className="font-medium text-ink-900">{name}</dt>
              <dd className="text-ink-700">{what}</dd>
            </div>
          ))}
        </dl>
        <p className="mt-3 text-sm text-ink-600">
          Every sheet has a frozen header row and filters; numbers are numbers with their units in the headers, and times are in UTC. Findings are
          shown as last assessed.
        </p>
        {/* A plain GET form: the browser downloads the file and stays on this page, with or without JavaScript. */}
        <form method="get" action="/api/v1/exports/register.xlsx" className="mt-4 flex flex-wrap items-end gap-3 border-t border-ink-200 pt-4">
          <div className="w-full max-w-xs space-y-1.5">
            <label htmlFor="export-site" className="block text-sm font-medium text-ink-800">
              Site
            </label>
            <select id="export-site" name="siteId" defaultValue="" className={inputClass}>
              <option value="">All sites</option>
              {sites.map((site) => (
                <option key={site.id} value={site.id}>
                  {site.name}
                </option>
              ))}
            </select>
          </div>
          <button type="submit" className={buttonClass("primary")}>
            <Download aria-hidden="true" className="size-4" />
            Download register workbook (.xlsx)
          </button>
        </form>
      </Card>
      <Caution />
    </div>
  );
}
