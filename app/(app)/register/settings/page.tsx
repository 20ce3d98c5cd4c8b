import type { Metadata } from "next";
import Link from "next/link";
import type { ReactNode } from "react";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { SeverityBadge } from "@/components/ui/severity";
import type { Severity } from "@/db/enums";
import type { AssessmentSettings } from "@/lib/assessment/rules";
import { DEFAULT_REASONS } from "@/lib/assessment/rules/default-reasons";
import { loadAssessmentSettings } from "@/lib/assessment/service";
import { requirePagePermission } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { formatCount, formatNumber } from "@/lib/format/numbers";
import { ReassessmentBanner } from "../reassessment-banner";
import { SettingsForm } from "./settings-form";
import { WarmUpDefaultsCard } from "./warm-up-defaults-card";

export const metadata: Metadata = { title: "Thresholds and assumptions" };

type Group = { title: string; rows: [string, ReactNode][]; list?: string[]; source: string };

const percent = (fraction: number | null) => (fraction == null ? "not used" : `${formatNumber(fraction * 100)} %`);
const sev = (severity: Severity) => <SeverityBadge severity={severity} />;
const MODEL_LABELS: Record<AssessmentSettings["spill"]["evaporationModel"], string> = { "epa-rmp": "US EPA RMP (Eq. D-1)", "mackay-matsugu": "Mackay–Matsugu" };
const MISSING_LABELS: Record<string, string> = {
  "no-vapor-pressure-method": "No vapor-pressure method",
  "no-correlation": "No vapor-pressure correlation (estimate used)",
  "no-lfl": "No LFL",
  "no-flash-point": "No flash point",
  "no-room-volume": "No room volume",
  "no-air-changes": "No air-change rate",
  "no-unit-volume": "No unit volume",
  "no-worst-case": "No worst-case temperature",
  "no-density": "No density",
  "no-exposure-limit": "No exposure limit",
  "no-expansion-data": "No gas-expansion data",
  "calculation-failed": "A calculation failed",
};

function groups(s: AssessmentSettings): Group[] {
  return [
    {
      title: "Flammable vapor (share of the LFL)",
      rows: [
        ["Moderate from", percent(s.lfl.moderate)],
        ["High from", percent(s.lfl.high)],
        ["Critical from", percent(s.lfl.critical)],
        ["At most, inside a unit free of ignition sources", sev(s.lfl.ignitionFreeMaxSeverity)],
      ],
      source: s.lfl.source,
    },
    {
      title: "Flash point",
      rows: [
        ["Margin below the flash point", `${formatNumber(s.flashPoint.marginC)} °C`],
        ["At or above the flash point", sev(s.flashPoint.atOrAboveSeverity)],
        ["Within the margin", sev(s.flashPoint.withinMarginSeverity)],
        ["In a closed unit free of ignition sources, at most", sev(s.flashPoint.ignitionFreeSeverity)],
      ],
      source: s.flashPoint.source,
    },
    { title: "Boiling point", rows: [["At or above the boiling point", sev(s.boilingPoint.severity)]], source: s.boilingPoint.source },
    {
      title: "Flammable liquids near ignition sources",
      rows: [
        ["Category 1 and 2", sev(s.ignitionSource.category1And2Severity)],
        ["Category 3", sev(s.ignitionSource.category3Severity)],
      ],
      source: s.ignitionSource.source,
    },
    {
      title: "Spill assumptions",
      rows: [
        ["Pool depth", `${formatNumber(s.spill.poolDepthM * 100)} cm`],
        ["Pool limited to the floor area", s.spill.limitPoolToFloorArea ? "Yes" : "No"],
        ["Air speed over the pool", `${formatNumber(s.spill.airSpeedMPerS)} m/s`],
        ["Duration", `${formatNumber(s.spill.durationMin)} min`],
        ["Evaporation model", MODEL_LABELS[s.spill.evaporationModel]],
        ["Schmidt number (Mackay–Matsugu only)", formatNumber(s.spill.schmidtNumber)],
      ],
      source: s.spill.source,
    },
    {
      title: "Exposure",
      rows: [
        ["Action level (share of the TWA)", percent(s.exposure.twaActionFraction)],
        ["Above the action level", sev(s.exposure.actionSeverity)],
        ["Above the TWA", sev(s.exposure.twaSeverity)],
        ["Above the STEL", sev(s.exposure.stelSeverity)],
        ["Above a ceiling", sev(s.exposure.ceilingSeverity)],
        ["Above the IDLH", sev(s.exposure.idlhSeverity)],
        ["Needs no limit (CAS)", s.exposure.noLimitNeededCas.length ? <span className="font-mono">{s.exposure.noLimitNeededCas.join(", ")}</span> : "—"],
      ],
      source: s.exposure.source,
    },
    {
      title: "Oxygen (cryogens and compressed gases)",
      rows: [
        ["Normal air", `${formatNumber(s.oxygen.baselinePercent)} % O₂`],
        ["Deficient below", `${formatNumber(s.oxygen.deficiencyPercent)} % O₂`],
        ["Evacuate below", `${formatNumber(s.oxygen.evacuatePercent)} % O₂`],
        ["Deficient", sev(s.oxygen.deficiencySeverity)],
        ["Evacuate", sev(s.oxygen.evacuateSeverity)],
        ["Gas volumes at", `${formatNumber(s.oxygen.expansionReferenceTempC)} °C`],
      ],
      source: s.oxygen.source,
    },
    {
      title: "Carbon dioxide",
      rows: s.carbonDioxide.limits.map((limit) => [`${limit.body} ${limit.kind}`, `${formatCount(limit.valuePpm)} ppm`] as [string, ReactNode]),
      source: s.carbonDioxide.source,
    },
    {
      title: "Quantities",
      rows: [
        ["Early warning from", percent(s.quantities.warnFraction)],
        ["Near a limit", sev(s.quantities.warnSeverity)],
        ["Over a limit", sev(s.quantities.exceededSeverity)],
        ["Quantity limits", formatCount(s.quantities.limits.length)],
      ],
      list: s.quantities.limits.map((limit) => `${limit.name}: ${formatNumber(limit.maxVolumeL)} L${limit.sprinkleredMaxVolumeL != null ? ` (${formatNumber(limit.sprinkleredMaxVolumeL)} L sprinklered)` : ""}`),
      source: s.quantities.source,
    },
    {
      title: "Missing data",
      rows: Object.entries(s.missingData.severities).map(([kind, severity]) => [MISSING_LABELS[kind] ?? kind, sev(severity)] as [string, ReactNode]),
      source: s.missingData.source,
    },
  ];
}

/** The thresholds and assumptions every assessment applies; safety officers change them here. */
export default async function AssessmentSettingsPage() {
  const { user } = await requirePagePermission("findings.read");
  const settings = loadAssessmentSettings();
  const editable = can(user.role, "hazardSettings.write");
  return (
    <div className="space-y-5">
      <PageHeader
        title="Thresholds and assumptions"
        description="What the assessment counts as moderate, high or critical, and the assumptions behind its worst cases. They are the organisation's defaults until a safety officer changes them; every location is then re-assessed."
        actions={
          <Link href="/register" className="text-sm font-medium text-accent-700 underline-offset-2 hover:underline">
            Back to the register
          </Link>
        }
      />
      {editable ? (
        <Card title="Change the main thresholds">
          <SettingsForm settings={settings} progress={<ReassessmentBanner />} />
        </Card>
      ) : (
        <>
          <ReassessmentBanner />
          <p className="text-sm text-ink-600">Only safety officers and administrators can change these.</p>
        </>
      )}
      <div className="grid gap-4 lg:grid-cols-2">
        {groups(settings).map((group) => (
          <Card key={group.title} title={group.title}>
            <dl className="grid grid-cols-[minmax(0,1fr)_auto] gap-x-4 gap-y-1.5 text-sm">
              {group.rows.map(([label, value]) => (
                <div key={label} className="contents">
                  <dt className="text-ink-600">{label}</dt>
                  <dd className="tabular text-right font-medium text-ink-900">{value}</dd>
                </div>
              ))}
            </dl>
            {group.list?.length ? (
              <ul className="mt-2 list-disc space-y-0.5 pl-5 text-xs text-ink-700">
                {group.list.map((item) => (
                  <li key={item}>{item}</li>
                ))}
              </ul>
            ) : null}
            <p className="mt-3 border-t border-ink-100 pt-2 text-xs text-ink-600">
              <span className="font-semibold text-ink-700">Source: </span>
              {group.source}
            </p>
          </Card>
        ))}
      </div>
      <Card title="Why the defaults are what they are">
        <p className="mb-3 text-sm text-ink-700">
          Each default threshold with its reasoning and its source: a publication with its edition and clause, or common practice where no published rule sets the value. Your organisation&apos;s own values, once saved, replace the defaults above; local codes and the authority having jurisdiction prevail.
        </p>
        <div className="overflow-x-auto">
          <table className="w-full min-w-[40rem] border-collapse text-sm">
            <caption className="sr-only">Default thresholds, their reasoning and their sources</caption>
            <thead className="bg-ink-50 text-left text-xs font-semibold text-ink-700">
              <tr>
                <th scope="col" className="px-2 py-2">
                  Threshold
                </th>
                <th scope="col" className="px-2 py-2">
                  Default
                </th>
                <th scope="col" className="px-2 py-2">
                  Why
                </th>
                <th scope="col" className="px-2 py-2">
                  Source
                </th>
              </tr>
            </thead>
            <tbody>
              {DEFAULT_REASONS.map((reason) => (
                <tr key={`${reason.group}|${reason.threshold}`} className="border-t border-ink-200 align-top">
                  <th scope="row" className="px-2 py-2 text-left font-medium text-ink-900">
                    <span className="block text-xs font-normal text-ink-600">{reason.group}</span>
                    {reason.threshold}
                  </th>
                  <td className="tabular px-2 py-2 whitespace-nowrap">
                    {reason.severity ? <SeverityBadge severity={reason.severity} /> : null}
                    <span className="block text-xs text-ink-700">{reason.value}</span>
                  </td>
                  <td className="px-2 py-2 text-ink-800">{reason.reasoning}</td>
                  <td className="px-2 py-2 text-xs text-ink-700">{reason.source}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
      <WarmUpDefaultsCard />
      <Caution />
    </div>
  );
}
