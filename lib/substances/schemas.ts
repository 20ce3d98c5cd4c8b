import { z } from "zod";
import { EXPOSURE_LIMIT_KINDS, EXPOSURE_LIMIT_UNITS, PHYSICAL_STATES } from "@/db/enums";
import { listQuerySchema } from "@/lib/http/list-query";
import { optionalNumber, optionalText, requiredNumber, requiredText } from "@/lib/validation/fields";

export const substanceListQuerySchema = listQuerySchema({
  sortable: ["name", "cas", "normalBoilingPointC", "flashPointC", "lflVolPercent", "molarMassGPerMol"],
  defaultSort: "name",
  filters: {
    q: z.string().trim().max(200, "q is at most 200 characters.").optional(),
    cas: z
      .string()
      .trim()
      .regex(/^\d{2,7}-\d{2}-\d$/, "cas must look like 67-64-1.")
      .optional(),
    ghs: z.enum(["1", "2", "3", "4", "none"], { error: "ghs must be 1, 2, 3, 4 or none." }).optional(),
  },
});

const TEMP_REQUIRED = "tempC is required, in °C (for example tempC=20).";

export const vaporPressureQuerySchema = z.object({
  tempC: z
    .string({ error: TEMP_REQUIRED })
    .trim()
    .min(1, TEMP_REQUIRED)
    .transform(Number)
    .refine(Number.isFinite, "tempC must be a number, in °C.")
    .refine((t) => t > -273.15, "tempC must be above absolute zero (−273.15 °C).")
    .refine((t) => t <= 500, "tempC above 500 °C is outside what Headroom assesses."),
  ambientPressureKPa: z
    .string()
    .optional()
    .transform((v) => (v === undefined || v.trim() === "" ? undefined : Number(v)))
    .refine((p) => p === undefined || Number.isFinite(p), "ambientPressureKPa must be a number, in kPa.")
    .refine((p) => p === undefined || (p >= 50 && p <= 120), "ambientPressureKPa must be between 50 and 120 kPa."),
});

// ----- writing substances (safety officers) ----------------------------------------------------

/** CAS registry number: digits-digits-check digit, where the check digit is Σ(digit × position from the right) mod 10. */
export function isValidCasNumber(cas: string): boolean {
  const match = /^(\d{2,7})-(\d{2})-(\d)$/.exec(cas);
  if (!match) return false;
  const digits = (match[1] + match[2]).split("").reverse();
  const sum = digits.reduce((total, d, i) => total + Number(d) * (i + 1), 0);
  return sum % 10 === Number(match[3]);
}

const n = (label: string, unit: string, min: number, max: number) => optionalNumber({ label, unit, min, max });

/** Property fields a safety officer edits; each one with a value needs a source. */
export const SUBSTANCE_VALUE_FIELDS = [
  "molarMassGPerMol",
  "normalBoilingPointC",
  "meltingPointC",
  "enthalpyOfVaporizationKJPerMol",
  "enthalpyOfSublimationKJPerMol",
  "liquidDensityKgPerM3",
  "flashPointC",
  "lflVolPercent",
  "uflVolPercent",
  "autoignitionTempC",
] as const;

const finiteList = (value: unknown): value is number[] => Array.isArray(value) && value.every((v) => typeof v === "number" && Number.isFinite(v));

/** A Wagner-type set: reducing point (Tc, Pc; the triple point for a sublimation line), nᵢ and their exponents tᵢ. */
function checkWagner(c: Record<string, unknown>, ctx: z.RefinementCtx): void {
  if (typeof c.reducingTempK !== "number" || !(c.reducingTempK > 0)) {
    ctx.addIssue({ code: "custom", path: ["reducingTempK"], message: "A Wagner correlation needs reducingTempK: the critical temperature in K (the triple point for a sublimation line)." });
  }
  if (typeof c.reducingPressureKPa !== "number" || !(c.reducingPressureKPa > 0)) {
    ctx.addIssue({ code: "custom", path: ["reducingPressureKPa"], message: "A Wagner correlation needs reducingPressureKPa: the critical pressure in kPa (the triple-point pressure for a sublimation line)." });
  }
  if (!finiteList(c.coefficients) || c.coefficients.length === 0 || c.coefficients.length > 8) {
    ctx.addIssue({ code: "custom", path: ["coefficients"], message: "A Wagner correlation needs coefficients: a list of 1 to 8 numbers, as published." });
  } else if (!finiteList(c.exponents) || c.exponents.length !== c.coefficients.length || c.exponents.some((t) => t <= 0)) {
    ctx.addIssue({
      code: "custom",
      path: ["exponents"],
      message: `A Wagner correlation needs exponents: one positive number per coefficient (${c.coefficients.length}), e.g. [1, 1.5, 2.5, 5] for the 2.5-5 form.`,
    });
  }
  if (c.line !== undefined && c.line !== "liquid-vapor" && c.line !== "solid-vapor") {
    ctx.addIssue({ code: "custom", path: ["line"], message: 'A Wagner line is "liquid-vapor" or "solid-vapor".' });
  }
}

const correlationSchema = z
  .object({
    kind: z.enum(["antoine", "dippr101", "wagner"], { error: 'A correlation kind is "antoine", "dippr101" or "wagner".' }),
    tMinC: z.number(),
    tMaxC: z.number(),
    source: z.string().trim().min(1, "Each correlation needs its source."),
  })
  .passthrough()
  .superRefine((c, ctx) => {
    if (c.kind === "wagner") checkWagner(c as Record<string, unknown>, ctx);
  });

const substanceFields = {
  cas: z
    .union([z.string(), z.null()])
    .optional()
    .transform((v) => (v == null || v.trim() === "" ? (v === undefined ? undefined : null) : v.trim()))
    .refine((v) => v == null || isValidCasNumber(v), "Enter a valid CAS number, like 67-64-1 (its last digit is a check digit)."),
  name: requiredText("Name", 120),
  synonyms: z
    .union([z.array(z.string()), z.string()])
    .optional()
    .transform((v) =>
      v === undefined ? undefined : (Array.isArray(v) ? v : v.split(/[,;\n]/)).map((s) => s.trim()).filter((s) => s.length > 0),
    ),
  formula: optionalText("Formula", 60),
  physicalState: z.enum(PHYSICAL_STATES).optional(),
  molarMassGPerMol: requiredNumber({ label: "Molar mass", unit: "g/mol", exclusiveMin: 0, max: 5000 }),
  normalBoilingPointC: n("Normal boiling point", "°C", -273, 1000),
  meltingPointC: n("Melting point", "°C", -273, 1000),
  enthalpyOfVaporizationKJPerMol: optionalNumber({ label: "Enthalpy of vaporization", unit: "kJ/mol", exclusiveMin: 0, max: 500 }),
  enthalpyOfSublimationKJPerMol: optionalNumber({ label: "Enthalpy of sublimation", unit: "kJ/mol", exclusiveMin: 0, max: 500 }),
  liquidDensityKgPerM3: optionalNumber({ label: "Liquid density", unit: "kg/m³", exclusiveMin: 0, max: 25_000 }),
  flashPointC: n("Flash point", "°C", -200, 500),
  lflVolPercent: optionalNumber({ label: "LFL", unit: "% vol", exclusiveMin: 0, max: 100 }),
  uflVolPercent: optionalNumber({ label: "UFL", unit: "% vol", exclusiveMin: 0, max: 100 }),
  autoignitionTempC: n("Autoignition temperature", "°C", -50, 1500),
  correlations: z
    .union([z.array(correlationSchema), z.string()])
    .optional()
    .transform((v, ctx) => {
      if (v === undefined || Array.isArray(v)) return v;
      if (v.trim() === "") return [];
      try {
        const parsed = z.array(correlationSchema).safeParse(JSON.parse(v));
        if (parsed.success) return parsed.data;
        ctx.addIssue({ code: "custom", message: parsed.error.issues[0]?.message ?? "Invalid correlations." });
      } catch {
        ctx.addIssue({ code: "custom", message: "Correlations must be a JSON list, like the example." });
      }
      return z.NEVER;
    }),
  sources: z.record(z.string(), z.string().trim().max(1000)).optional(),
  exposureLimits: z
    .array(
      z.object({
        kind: z.enum(EXPOSURE_LIMIT_KINDS),
        value: requiredNumber({ label: "Limit", exclusiveMin: 0, max: 1e6 }),
        unit: z.enum(EXPOSURE_LIMIT_UNITS),
        body: requiredText("Issuing body", 60),
        source: requiredText("Source", 1000),
        note: optionalText("Note", 200),
      }),
    )
    .optional(),
  notes: optionalText("Notes", 4000),
};

function sourcesCoverValues(value: Record<string, unknown>, ctx: z.RefinementCtx): void {
  const sources = (value.sources ?? {}) as Record<string, string>;
  for (const field of SUBSTANCE_VALUE_FIELDS) {
    if (value[field] != null && !sources[field]?.trim()) {
      ctx.addIssue({ code: "custom", path: [`sources.${field}`], message: "Give the source of this value." });
    }
  }
  const lfl = value.lflVolPercent as number | null | undefined;
  const ufl = value.uflVolPercent as number | null | undefined;
  if (lfl != null && ufl != null && ufl <= lfl) ctx.addIssue({ code: "custom", path: ["uflVolPercent"], message: "The UFL must be above the LFL." });
}

export const substanceCreateSchema = z.object(substanceFields).superRefine(sourcesCoverValues);
/** An update sends the whole edited record (the form shows every field), so the same rules apply. */
export const substanceUpdateSchema = z.object(substanceFields).superRefine(sourcesCoverValues);
/** The edit form: the whole record plus its id. */
export const substanceEditFormSchema = z
  .object({ ...substanceFields, id: z.coerce.number().int().positive() })
  .superRefine(sourcesCoverValues);
export const substanceRetireFormSchema = z.object({ id: z.coerce.number().int().positive(), retired: z.enum(["true", "false"]).transform((v) => v === "true") });
export type SubstanceWriteInput = z.output<typeof substanceCreateSchema>;
