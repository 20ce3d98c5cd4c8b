/**
 * Field schemas shared by forms (Conform sends strings) and the JSON API (numbers, booleans, null).
 * An empty form field means "no value" (null); a key absent from a JSON PATCH means "unchanged"
 * (undefined). Messages name the unit and the allowed range.
 */
import { z } from "zod";

type NumberRule = { label: string; unit?: string; min?: number; max?: number; exclusiveMin?: number; integer?: boolean };

function describeRange(rule: NumberRule): string {
  const unit = rule.unit ? ` ${rule.unit}` : "";
  if (rule.exclusiveMin !== undefined && rule.max !== undefined) return `more than ${rule.exclusiveMin} and at most ${rule.max}${unit}`;
  if (rule.exclusiveMin !== undefined) return `more than ${rule.exclusiveMin}${unit}`;
  if (rule.min !== undefined && rule.max !== undefined) return `from ${rule.min} to ${rule.max}${unit}`;
  if (rule.min !== undefined) return `at least ${rule.min}${unit}`;
  if (rule.max !== undefined) return `at most ${rule.max}${unit}`;
  return "a number";
}

function checkNumber(value: number, rule: NumberRule, ctx: z.RefinementCtx): void {
  const range = describeRange(rule);
  if (!Number.isFinite(value)) ctx.addIssue({ code: "custom", message: `${rule.label} must be a number${rule.unit ? ` in ${rule.unit}` : ""}.` });
  else if (rule.integer && !Number.isInteger(value)) ctx.addIssue({ code: "custom", message: `${rule.label} must be a whole number.` });
  else if (
    (rule.min !== undefined && value < rule.min) ||
    (rule.max !== undefined && value > rule.max) ||
    (rule.exclusiveMin !== undefined && value <= rule.exclusiveMin)
  )
    ctx.addIssue({ code: "custom", message: `${rule.label} must be ${range}.` });
}

function toNumber(raw: unknown): unknown {
  if (typeof raw === "string") {
    const text = raw.trim();
    if (text === "") return null;
    return /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(text) ? Number(text) : Number.NaN;
  }
  return raw;
}

/** A number that may be left empty (null); absent stays undefined. */
export function optionalNumber(rule: NumberRule) {
  return z
    .union([z.number(), z.string(), z.null()], { error: `${rule.label} must be a number.` })
    .optional()
    .transform(toNumber)
    .superRefine((value, ctx) => {
      if (typeof value === "number") checkNumber(value, rule, ctx);
    }) as unknown as z.ZodType<number | null | undefined, string | number | null | undefined>;
}

/** A number that must be given. */
export function requiredNumber(rule: NumberRule) {
  return z
    .union([z.number(), z.string()], { error: `${rule.label} is required.` })
    .transform(toNumber)
    .superRefine((value, ctx) => {
      if (value === null || value === undefined) ctx.addIssue({ code: "custom", message: `${rule.label} is required.` });
      else checkNumber(value as number, rule, ctx);
    }) as unknown as z.ZodType<number, string | number>;
}

/** Yes/no from a select ("true"/"false"), a checkbox ("on") or JSON booleans. */
export function yesNo(label: string) {
  return z
    .union([z.boolean(), z.enum(["true", "false", "on", "yes", "no"])], { error: `${label}: choose yes or no.` })
    .optional()
    .transform((v) => (v === undefined ? undefined : v === true || v === "true" || v === "on" || v === "yes"));
}

/** Text that may be empty (null). */
export function optionalText(label: string, max = 2000) {
  return z
    .union([z.string(), z.null()])
    .optional()
    .transform((v) => (v === undefined ? undefined : v === null ? null : v.trim() === "" ? null : v.trim()))
    .refine((v) => v == null || v.length <= max, `${label} is at most ${max} characters.`);
}

export function requiredText(label: string, max = 200) {
  return z
    .string({ error: `${label} is required.` })
    .trim()
    .min(1, `${label} is required.`)
    .max(max, `${label} is at most ${max} characters.`);
}

/** A short code such as a room or unit code: letters, digits, dot, hyphen, slash, underscore. */
export function codeText(label: string) {
  return requiredText(label, 40).regex(/^[A-Za-z0-9][A-Za-z0-9 ._/-]*$/, `${label} may use letters, digits, spaces and . _ / - only.`);
}

/** A foreign key from a select (string) or JSON (number); empty means none. */
export function optionalId(label: string) {
  return z
    .union([z.number(), z.string(), z.null()])
    .optional()
    .transform((v) => (v === undefined ? undefined : v === null || v === "" ? null : Number(v)))
    .refine((v) => v == null || (Number.isInteger(v) && v > 0), `Choose a valid ${label}.`);
}

export function requiredId(label: string) {
  return z
    .union([z.number(), z.string()], { error: `Choose a ${label}.` })
    .transform((v) => (v === "" ? Number.NaN : Number(v)))
    .refine((v) => Number.isInteger(v) && v > 0, `Choose a ${label}.`);
}

/** A calendar date as YYYY-MM-DD (forms, API) → epoch ms at UTC midnight; empty → null. */
export function optionalDate(label: string) {
  return z
    .union([z.string(), z.null()])
    .optional()
    .transform((v, ctx) => {
      if (v === undefined) return undefined;
      if (v === null || v.trim() === "") return null;
      const text = v.trim();
      const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
      const ms = match ? Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])) : Number.NaN;
      if (!match || Number.isNaN(ms) || new Date(ms).toISOString().slice(0, 10) !== text) {
        ctx.addIssue({ code: "custom", message: `${label} must be a date like 2026-03-31.` });
        return z.NEVER;
      }
      return ms;
    });
}
