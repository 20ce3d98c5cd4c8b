import { ASSESSMENT_RULES } from "@/lib/assessment/rules/rule-ids";

/** The assessment rules by id, in words (client-safe: rule-ids.ts is plain data). */
export const RULE_LABELS: Record<string, string> = Object.fromEntries(ASSESSMENT_RULES.map((rule) => [rule.id, rule.label]));

/** The same, short enough for a table column and a filter. */
export const RULE_SHORT_LABELS: Record<string, string> = Object.fromEntries(ASSESSMENT_RULES.map((rule) => [rule.id, rule.short]));
