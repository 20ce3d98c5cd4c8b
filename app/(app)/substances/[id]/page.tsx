import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AuditTrail } from "@/components/audit-trail";
import { VaporPressureChart } from "@/components/charts/vapor-pressure-chart";
import { SdsAttachment } from "@/components/sds-attachment";
import { buttonClass } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { auditTrail } from "@/db/queries/audit";
import { can } from "@/lib/auth/permissions";
import { RetireSubstanceButton } from "./retire-button";
import { Caution } from "@/components/ui/caution";
import { Card, PageHeader } from "@/components/ui/card";
import { getSubstance } from "@/db/queries/substances";
import { requirePagePermission } from "@/lib/auth/page";
import { substanceSds } from "@/lib/files/service";
import { VAPOR_METHOD_LABELS } from "@/lib/format/labels";
import { formatNumber, formatQuantity, formatTempC } from "@/lib/format/numbers";
import { correlationCoefficients, correlationEquation } from "@/lib/format/correlations";
import { STANDARD_ATMOSPHERE_KPA, correlationHandovers } from "@/lib/hazard";
import { idParam } from "@/lib/http/paging";
import { classify, toVaporProperties, vaporAt, vaporPressureCurve } from "@/lib/substances/vapor";

export async function generateMetadata({ params }: { params: Promise<{ id: string }> }): Promise<Metadata> {
  const id = idParam((await params).id);
  const row = id ? getSubstance(id) : null;
  return { title: row ? row.name : "Substance" };
}

const PROPERTY_ROWS: { key: string; label: string; unit: string; digits?: number; temp?: boolean }[] = [
  { key: "molarMassGPerMol", label: "Molar mass", unit: "g/mol", digits: 4 },
  { key: "normalBoilingPointC", label: "Normal boiling point", unit: "°C", temp: true },
  { key: "meltingPointC", label: "Melting point", unit: "°C", temp: true },
  { key: "enthalpyOfVaporizationKJPerMol", label: "Enthalpy of vaporization (at Tb)", unit: "kJ/mol" },
  { key: "enthalpyOfSublimationKJPerMol", label: "Enthalpy of sublimation", unit: "kJ/mol" },
  { key: "liquidDensityKgPerM3", label: "Liquid density", unit: "kg/m³" },
  { key: "flashPointC", label: "Flash point (closed cup)", unit: "°C", temp: true },
  { key: "lflVolPercent", label: "Lower flammable limit", unit: "% vol", digits: 2 },
  { key: "uflVolPercent", label: "Upper flammable limit", unit: "% vol", digits: 3 },
  { key: "autoignitionTempC", label: "Autoignition temperature", unit: "°C", temp: true },
];

function rangeText(c: Record<string, unknown>): string {
  return `${formatTempC(c.tMinC as number)} … ${formatTempC(c.tMaxC as number)}`;
}

/** How the curve passes from one correlation to the next over −40 … 60 °C (the library keeps each step under 0.5 %). */
function handoverText(row: Parameters<typeof toVaporProperties>[0]): string | null {
  if (row.correlations.length === 0) return null;
  if (row.correlations.length === 1) return "One correlation draws the whole curve: no hand-over between correlations, so no step in it.";
  let handovers: ReturnType<typeof correlationHandovers>;
  try {
    handovers = correlationHandovers(toVaporProperties(row), -40, 60, 0.1);
  } catch {
    return null;
  }
  if (handovers.length === 0) return "The first correlation covers −40 … 60 °C: no hand-over between correlations there.";
  return handovers
    .map((h) => `From correlation ${h.fromIndex + 1} to ${h.toIndex + 1} at ${formatTempC(h.atC)}: the curve steps by ${h.stepPercent >= 0 ? "+" : "−"}${formatNumber(Math.abs(h.stepPercent), 2)} %.`)
    .join(" ");
}

export default async function SubstancePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ saved?: string }> }) {
  const { user } = await requirePagePermission("substances.read");
  const { saved } = await searchParams;
  const id = idParam((await params).id);
  const row = id ? getSubstance(id) : null;
  if (!row) notFound();
  const c = classify(row);
  let at20: ReturnType<typeof vaporAt> | null = null;
  let at20Error: string | null = null;
  try {
    at20 = vaporAt(row, 20);
  } catch (error) {
    at20Error = (error as Error).message;
  }
  const curve = vaporPressureCurve(row);
  const handovers = handoverText(row);
  const lflPressureKPa = row.lflVolPercent != null ? (row.lflVolPercent / 100) * STANDARD_ATMOSPHERE_KPA : null;
  const values = row as unknown as Record<string, number | null>;

  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/substances" className="text-accent-700 hover:underline">
          ← Substances
        </Link>
      </p>
      <PageHeader
        title={row.name}
        description={
          <span className="tabular">
            CAS {row.cas ?? "—"} · {row.formula ?? "—"}
            {row.synonyms.length ? ` · also ${row.synonyms.join(", ")}` : ""}
            {row.retiredAt ? " · retired: not offered for new containers" : ""}
          </span>
        }
        actions={
          can(user.role, "substances.write") ? (
            <>
              <Link href={`/substances/${row.id}/edit`} className={buttonClass("secondary")}>
                Correct values
              </Link>
              <RetireSubstanceButton id={row.id} retired={row.retiredAt != null} />
            </>
          ) : undefined
        }
      />
      {saved ? <FormMessage success="Saved. The previous values are in the history below." /> : null}

      <dl className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        <div className="rounded-lg border border-ink-200 bg-white px-4 py-3">
          <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">Psat at 20 °C</dt>
          <dd className="tabular mt-1 text-xl font-semibold">{at20 ? formatQuantity(at20.pressureKPa, "kPa") : "—"}</dd>
          <dd className="text-xs text-ink-600">{at20 ? `${VAPOR_METHOD_LABELS[at20.method] ?? at20.method}${at20.extrapolated ? ", extrapolated" : ""}` : at20Error}</dd>
        </div>
        <div className="rounded-lg border border-ink-200 bg-white px-4 py-3">
          <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">Saturated at 20 °C, 1 atm</dt>
          <dd className="tabular mt-1 text-xl font-semibold">{at20 ? formatQuantity(at20.saturatedConcentration.ppm, "ppm") : "—"}</dd>
          <dd className="tabular text-xs text-ink-600">
            {at20 && row.lflVolPercent ? `${formatNumber((at20.saturatedConcentration.volumePercent / row.lflVolPercent) * 100)} % LFL` : "no LFL"}
          </dd>
        </div>
        <div className="rounded-lg border border-ink-200 bg-white px-4 py-3">
          <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">Lower flammable temperature</dt>
          <dd className="tabular mt-1 text-xl font-semibold">{formatTempC(c.lowerFlammableTemperatureC)}</dd>
          <dd className="text-xs text-ink-600">where Psat/Patm = LFL at 101.3 kPa</dd>
        </div>
        <div className="rounded-lg border border-ink-200 bg-white px-4 py-3">
          <dt className="text-xs font-medium uppercase tracking-wide text-ink-600">Classification</dt>
          <dd className="mt-1 text-xl font-semibold">{c.ghsCategory ? `GHS Cat. ${c.ghsCategory}` : "Not GHS flammable"}</dd>
          <dd className="text-xs text-ink-600">{c.nfpaClass ? `NFPA 30 / OSHA class ${c.nfpaClass}` : "no flash point on record"}</dd>
        </div>
      </dl>

      <Card title="Vapor pressure, −40 … 60 °C">
        {curve.length ? (
          <VaporPressureChart
            points={curve}
            lflPressureKPa={lflPressureKPa}
            lflVolPercent={row.lflVolPercent}
            lowerFlammableTemperatureC={c.lowerFlammableTemperatureC}
            ambientPressureKPa={STANDARD_ATMOSPHERE_KPA}
            markTempC={{ tempC: 20, label: "20 °C" }}
          />
        ) : (
          <p className="text-sm text-ink-600">No vapor-pressure data: Headroom cannot compute this substance&apos;s curve.</p>
        )}
        {at20?.warnings.length ? <p className="mt-2 text-xs text-sev-moderate">{at20.warnings.join(" ")}</p> : null}
      </Card>

      <div className="grid gap-6 xl:grid-cols-2">
        <Card title="Properties and their sources">
          <table className="w-full text-sm">
            <tbody>
              {PROPERTY_ROWS.filter((p) => values[p.key] != null).map((p) => (
                <tr key={p.key} className="border-b border-ink-100 align-top last:border-0">
                  <th scope="row" className="py-2 pr-3 text-left font-normal text-ink-700">{p.label}</th>
                  <td className="tabular whitespace-nowrap py-2 pr-3 text-right font-medium">
                    {p.temp ? formatTempC(values[p.key]) : formatQuantity(values[p.key], p.unit, p.digits ?? 3)}
                  </td>
                  <td className="py-2 text-xs text-ink-600 [overflow-wrap:anywhere]">{row.sources[p.key] ?? "source not recorded"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Card>

        <div className="space-y-6">
          <Card title="Exposure limits">
            {row.exposureLimits.length === 0 ? (
              <p className="text-sm text-ink-600">None on record.</p>
            ) : (
              <table className="w-full text-sm">
                <tbody>
                  {row.exposureLimits.map((l) => (
                    <tr key={l.id} className="border-b border-ink-100 align-top last:border-0">
                      <th scope="row" className="py-2 pr-3 text-left font-medium">
                        {l.body} {l.kind}
                      </th>
                      <td className="tabular whitespace-nowrap py-2 pr-3 text-right">{formatQuantity(l.value, l.unit === "mg/m3" ? "mg/m³" : l.unit, 4)}</td>
                      <td className="py-2 text-xs text-ink-600 [overflow-wrap:anywhere]">
                        {l.note ? `${l.note} · ` : ""}
                        {l.source}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </Card>
          <Card title="Vapor-pressure correlations (in order of use)">
            <ol className="space-y-3 text-sm">
              {row.correlations.map((corr, index) => (
                <li key={index}>
                  <p className="font-medium">{correlationEquation(corr)}</p>
                  <p className="tabular text-xs text-ink-700 [overflow-wrap:anywhere]">{correlationCoefficients(corr)}</p>
                  <p className="tabular text-xs text-ink-700">valid {rangeText(corr)}</p>
                  {corr.source ? <p className="text-xs text-ink-600 [overflow-wrap:anywhere]">{corr.source}</p> : null}
                </li>
              ))}
            </ol>
            {handovers ? <p className="mt-3 text-xs text-ink-700">{handovers}</p> : null}
          </Card>
        </div>
      </div>

      <Card title="Safety data sheet">
        <SdsAttachment target={{ kind: "substance", id: row.id }} {...substanceSds(user, row.id)} />
      </Card>

      {row.alternatives.length || row.notes ? (
        <Card title="Other sources and notes">
          {row.alternatives.map((alt, i) => (
            <p key={i} className="tabular mb-2 text-sm text-ink-700 [overflow-wrap:anywhere]">
              {alt.source}: {alt.flashPointC != null ? `flash point ${formatTempC(alt.flashPointC)}; ` : ""}
              {alt.lflVolPercent != null ? `LFL ${formatNumber(alt.lflVolPercent, 2)} % vol; ` : ""}
              {alt.uflVolPercent != null ? `UFL ${formatNumber(alt.uflVolPercent, 3)} % vol; ` : ""}
              {alt.autoignitionC != null ? `autoignition ${formatTempC(alt.autoignitionC)}` : ""}
            </p>
          ))}
          {row.notes ? <p className="whitespace-pre-line text-sm text-ink-700">{row.notes}</p> : null}
        </Card>
      ) : null}
      <Card title="History">
        <AuditTrail events={auditTrail("substance", row.id)} />
      </Card>
      <Caution />
    </div>
  );
}
