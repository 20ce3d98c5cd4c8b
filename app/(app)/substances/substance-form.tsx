"use client";
import { ConfigForm, type FieldConfig, type FieldSection } from "@/components/forms/config-form";
import { PHYSICAL_STATES } from "@/db/enums";
import { substanceCreateSchema, substanceEditFormSchema } from "@/lib/substances/schemas";
import { createSubstanceAction, updateSubstanceAction } from "./actions";

const VALUES: [string, string][] = [
  ["molarMassGPerMol", "Molar mass (g/mol)"],
  ["normalBoilingPointC", "Normal boiling point (°C)"],
  ["meltingPointC", "Melting point (°C)"],
  ["enthalpyOfVaporizationKJPerMol", "Enthalpy of vaporization at Tb (kJ/mol)"],
  ["enthalpyOfSublimationKJPerMol", "Enthalpy of sublimation (kJ/mol)"],
  ["liquidDensityKgPerM3", "Liquid density (kg/m³)"],
  ["flashPointC", "Flash point, closed cup (°C)"],
  ["lflVolPercent", "Lower flammable limit (% vol)"],
  ["uflVolPercent", "Upper flammable limit (% vol)"],
  ["autoignitionTempC", "Autoignition temperature (°C)"],
];

const WAGNER_EXAMPLE = '[{"kind":"wagner","reducingTempK":508.1,"reducingPressureKPa":4692,"coefficients":[-7.67033,1.96469,-2.4438,-2.90162],"exponents":[1,1.5,2.5,5],"tMinC":-94.8,"tMaxC":234.95,"source":"…"}]';
const EXAMPLE = '[{"kind":"antoine","log":"log10","pressureUnit":"bar","temperatureUnit":"K","a":4.2184,"b":1197.01,"c":-45.09,"tMinC":-25.8,"tMaxC":77.5,"source":"…"}]';

const sections: FieldSection[] = [
  {
    legend: "Identity",
    fields: [
      { name: "name", label: "Name", kind: "text" },
      { name: "cas", label: "CAS number", kind: "text", hint: "Like 67-64-1; the last digit is checked." },
      { name: "formula", label: "Formula", kind: "text" },
      { name: "synonyms", label: "Synonyms", kind: "text", hint: "Separated by commas.", span: 2 },
      { name: "physicalState", label: "State at room temperature", kind: "select", options: PHYSICAL_STATES.map((s) => ({ value: s, label: s })) },
    ],
  },
  {
    legend: "Values and their sources",
    fields: VALUES.flatMap(([name, label]): FieldConfig[] => [
      { name, label, kind: "number" },
      { name: `sources.${name}`, label: "Source", kind: "text", span: 2, hint: "Handbook, standard or data sheet, with edition." },
    ]),
  },
  {
    legend: "Vapor-pressure correlations",
    fields: [
      {
        name: "correlations",
        label: "Correlations (JSON, in order of use)",
        kind: "textarea",
        span: 3,
        hint: `Antoine: log(P) = A − B/(T + C) with log, pressureUnit, temperatureUnit, a, b, c; DIPPR 101 with c1…c5; or Wagner: ln(P/Pc) = (Tc/T)·Σ nᵢ·τ^tᵢ with reducingTempK (Tc, K), reducingPressureKPa (Pc, kPa), coefficients and their exponents as published (e.g. [1, 1.5, 2.5, 5]), and line "solid-vapor" for a sublimation line. Each with tMinC, tMaxC and source. Examples: ${EXAMPLE} or ${WAGNER_EXAMPLE}`,
      },
      { name: "notes", label: "Notes", kind: "textarea", span: 3 },
    ],
  },
];

export function SubstanceForm({ mode, values }: { mode: "create" | "edit"; values?: Record<string, unknown> }) {
  return mode === "create" ? (
    <ConfigForm id="substance-new" schema={substanceCreateSchema} action={createSubstanceAction} sections={sections} defaultValue={{ physicalState: "liquid", ...values }} submitLabel="Add to the library" />
  ) : (
    <ConfigForm id={`substance-${values?.id}`} schema={substanceEditFormSchema} action={updateSubstanceAction} sections={sections} defaultValue={values} hidden={{ id: Number(values?.id) }} submitLabel="Save corrections" />
  );
}
