/** The assessment rules by id, in words (client-safe). */
export const RULE_LABELS: Record<string, string> = {};
