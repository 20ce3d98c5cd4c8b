import type { Metadata } from "next";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePagePermission } from "@/lib/auth/page";
import { ExportsTabs } from "./exports-tabs";

export const metadata: Metadata = { title: "Exports" };

const SHEETS = [
  ["Summary", "open findings by severity and site, the date of the assessment"],
  ["Findings", "every finding with its value, limit, ratio, worst-case temperature and calculation trace"],
  ["Inventory", "every container with its location, amount and owner"],
  ["Locations", "rooms and storage units with their worst-case temperatures and where they came from"],
  ["Excursions", "temperature excursions with start, end and peak"],
  ["Substances", "the property data used, with the source of every value"],
  ["Methods", "the methods, assumptions and cautions behind the numbers"],
] as const;

export default async function ExportsPage() {
  await requirePagePermission("exports.download");
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
        <p className="mt-4 text-sm text-ink-600">The download is available once the register has been assessed.</p>
      </Card>
      <Caution />
    </div>
  );
}
