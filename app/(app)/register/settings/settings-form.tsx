"use client";
import { useRouter } from "next/navigation";
import { useState, type ChangeEvent, type FormEvent, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, inputClass } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { SEVERITIES, type Severity } from "@/db/enums";
import type { AssessmentSettings } from "@/lib/assessment/rules";

const SEVERITY_WORDS: Record<Severity, string> = { critical: "Critical", high: "High", moderate: "Moderate", low: "Low" };

/**
 * One editable setting: its API path, how it is shown (a % of a fraction, cm of metres…) and read
 * back. Numbers are checked here first; the server's schema has the last word.
 */
type FieldSpec =
  | { kind: "number"; path: string; label: string; unit: string; toShown: (s: AssessmentSettings) => number; fromShown: (s: AssessmentSettings, shown: number) => AssessmentSettings }
  | { kind: "severity"; path: string; label: string; hint?: string; toShown: (s: AssessmentSettings) => Severity; fromShown: (s: AssessmentSettings, shown: Severity) => AssessmentSettings }
  | { kind: "source"; path: string; label: string; toShown: (s: AssessmentSettings) => string; fromShown: (s: AssessmentSettings, shown: string) => AssessmentSettings };

const round = (value: number) => Number(value.toPrecision(12));

const SOURCE_HINT = "Where these values come from. Say so when you change one: it is printed with every finding they grade and in the audit workbook.";

const FIELDS: { legend: string; fields: FieldSpec[] }[] = [
  {
    legend: "Flammable vapor (share of the LFL)",
    fields: [
      ...(["moderate", "high", "critical"] as const).map(
        (level): FieldSpec => ({
          kind: "number",
          path: `lfl.${level}`,
          label: `${level[0].toUpperCase()}${level.slice(1)} from`,
          unit: "% LFL",
          toShown: (s) => round(s.lfl[level] * 100),
          fromShown: (s, shown) => ({ ...s, lfl: { ...s.lfl, [level]: round(shown / 100) } }),
        }),
      ),
      {
        kind: "severity",
        path: "lfl.ignitionFreeMaxSeverity",
        label: "At most, inside a unit free of ignition sources",
        hint: "Rated cabinets and flammable-storage or explosion-proof refrigerators. Choose critical to grade them like any other unit.",
        toShown: (s) => s.lfl.ignitionFreeMaxSeverity,
        fromShown: (s, shown) => ({ ...s, lfl: { ...s.lfl, ignitionFreeMaxSeverity: shown } }),
      },
      { kind: "source", path: "lfl.source", label: "Source of these values", toShown: (s) => s.lfl.source, fromShown: (s, shown) => ({ ...s, lfl: { ...s.lfl, source: shown } }) },
    ],
  },
  {
    legend: "Flash point",
    fields: [
      {
        kind: "number",
        path: "flashPoint.marginC",
        label: "Margin below the flash point",
        unit: "°C",
        toShown: (s) => s.flashPoint.marginC,
        fromShown: (s, shown) => ({ ...s, flashPoint: { ...s.flashPoint, marginC: shown } }),
      },
      {
        kind: "severity",
        path: "flashPoint.ignitionFreeSeverity",
        label: "In a closed unit free of ignition sources",
        hint: "Flammable-storage and explosion-proof refrigerators, closed flammable-liquid cabinets: above the flash point is information there (the closed-space rule grades the vapor).",
        toShown: (s) => s.flashPoint.ignitionFreeSeverity,
        fromShown: (s, shown) => ({ ...s, flashPoint: { ...s.flashPoint, ignitionFreeSeverity: shown } }),
      },
      { kind: "source", path: "flashPoint.source", label: "Source of these values", toShown: (s) => s.flashPoint.source, fromShown: (s, shown) => ({ ...s, flashPoint: { ...s.flashPoint, source: shown } }) },
    ],
  },
  {
    legend: "Spill assumptions",
    fields: [
      {
        kind: "number",
        path: "spill.poolDepthM",
        label: "Pool depth",
        unit: "cm",
        toShown: (s) => round(s.spill.poolDepthM * 100),
        fromShown: (s, shown) => ({ ...s, spill: { ...s.spill, poolDepthM: round(shown / 100) } }),
      },
      {
        kind: "number",
        path: "spill.durationMin",
        label: "Duration",
        unit: "min",
        toShown: (s) => s.spill.durationMin,
        fromShown: (s, shown) => ({ ...s, spill: { ...s.spill, durationMin: shown } }),
      },
      {
        kind: "number",
        path: "spill.airSpeedMPerS",
        label: "Air speed over the pool",
        unit: "m/s",
        toShown: (s) => s.spill.airSpeedMPerS,
        fromShown: (s, shown) => ({ ...s, spill: { ...s.spill, airSpeedMPerS: shown } }),
      },
      { kind: "source", path: "spill.source", label: "Source of these values", toShown: (s) => s.spill.source, fromShown: (s, shown) => ({ ...s, spill: { ...s.spill, source: shown } }) },
    ],
  },
];
const ALL_FIELDS = FIELDS.flatMap((group) => group.fields);

type ApiError = { error?: { code?: string; message?: string; fields?: Record<string, string[]> } };

/**
 * The main thresholds as a form. Saving sends the whole settings object (the fields here merged
 * into the current one) and the server re-assesses every location; `progress` shows that job.
 */
export function SettingsForm({ settings, progress }: { settings: AssessmentSettings; progress: ReactNode }) {
  const router = useRouter();
  const [values, setValues] = useState<Record<string, string>>(() => Object.fromEntries(ALL_FIELDS.map((f) => [f.path, String(f.toShown(settings))])));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const [formError, setFormError] = useState<string | undefined>();
  const [saved, setSaved] = useState(false);
  const [pending, setPending] = useState(false);

  const submit = async (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    setSaved(false);
    setFormError(undefined);
    const errors: Record<string, string[]> = {};
    let next = settings;
    for (const field of ALL_FIELDS) {
      const text = values[field.path].trim();
      if (field.kind === "number") {
        const shown = Number(text.replace(",", "."));
        if (!text || !Number.isFinite(shown)) errors[field.path] = [`Enter a number in ${field.unit}.`];
        else next = field.fromShown(next, shown);
      } else if (field.kind === "severity") {
        if (!(SEVERITIES as readonly string[]).includes(text)) errors[field.path] = ["Choose a severity."];
        else next = field.fromShown(next, text as Severity);
      } else if (!text) errors[field.path] = ["Say where the values come from."];
      else next = field.fromShown(next, text);
    }
    setFieldErrors(errors);
    if (Object.keys(errors).length) return;
    setPending(true);
    try {
      const response = await fetch("/api/v1/settings/assessment", { method: "PUT", headers: { "content-type": "application/json" }, body: JSON.stringify(next) });
      const body = (await response.json().catch(() => null)) as ApiError | null;
      if (!response.ok) {
        const fields = body?.error?.fields ?? {};
        setFieldErrors(fields);
        const unplaced = Object.entries(fields).filter(([path]) => !ALL_FIELDS.some((f) => f.path === path));
        const message = response.status === 401 ? "Your session has ended. Sign in again, then save once more." : (body?.error?.message ?? `The server answered with an error (${response.status}).`);
        setFormError([message, ...unplaced.map(([path, list]) => `${path}: ${list.join(" ")}`)].join(" "));
        return;
      }
      setSaved(true);
      router.refresh();
    } catch {
      setFormError("The settings could not be sent. Check the connection and try again.");
    } finally {
      setPending(false);
    }
  };

  return (
    <form onSubmit={submit} noValidate className="space-y-5">
      <FormMessage errors={formError ? [formError] : undefined} success={saved ? "Saved. Re-assessing every location…" : undefined} />
      {saved ? progress : null}
      {FIELDS.map((group) => (
        <fieldset key={group.legend} className="grid gap-4 sm:grid-cols-3">
          <legend className="mb-2 text-sm font-semibold text-ink-900">{group.legend}</legend>
          {group.fields.map((field) => {
            const id = `setting-${field.path.replace(".", "-")}`;
            const errors = fieldErrors[field.path];
            const common = {
              id,
              name: field.path,
              value: values[field.path],
              "aria-invalid": errors?.length ? true : undefined,
              onChange: (event: ChangeEvent<HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>) => setValues((v) => ({ ...v, [field.path]: event.target.value })),
            };
            if (field.kind === "source") {
              return (
                <div key={field.path} className="sm:col-span-3">
                  <Field id={id} label={field.label} hint={SOURCE_HINT} errors={errors}>
                    <textarea {...common} rows={3} maxLength={4000} className={`${inputClass} h-auto py-2`} aria-describedby={describedBy(id, SOURCE_HINT, errors)} />
                  </Field>
                </div>
              );
            }
            if (field.kind === "severity") {
              return (
                <Field key={field.path} id={id} label={field.label} hint={field.hint} errors={errors}>
                  <select {...common} className={inputClass} aria-describedby={describedBy(id, field.hint, errors)}>
                    {SEVERITIES.map((severity) => (
                      <option key={severity} value={severity}>
                        {SEVERITY_WORDS[severity]}
                      </option>
                    ))}
                  </select>
                </Field>
              );
            }
            return (
              <Field key={field.path} id={id} label={`${field.label} (${field.unit})`} errors={errors}>
                <input {...common} type="number" step="any" inputMode="decimal" className={inputClass} aria-describedby={describedBy(id, undefined, errors)} />
              </Field>
            );
          })}
        </fieldset>
      ))}
      <p className="text-xs text-ink-600">Saving re-assesses every location in the background; the register updates as it goes.</p>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Save and re-assess"}
      </Button>
    </form>
  );
}
