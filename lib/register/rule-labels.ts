import { ASSESSMENT_RULES } from "@/lib/assessment/rules/rule-ids";

/** The assessment rules by id, in words (client-safe: rule-ids.ts is plain data). */
export const RULE_LABELS: Record<string, string> = Object.fromEntries(ASSESSMENT_RULES.map((rule) => [rule.id, rule.label]));
