/** The assessment rules: stable ids (stored on every finding) with the labels people read. */
export const ASSESSMENT_RULES = [
  { id: "enclosure-lfl", label: "Vapor in a closed unit or unventilated room as a fraction of the LFL" },
  { id: "ignition-source-unit", label: "Flammable liquid where the interior has ignition sources" },
  { id: "flash-point", label: "Worst-case temperature at or near the flash point" },
  { id: "boiling-point", label: "Worst-case temperature at or above the boiling point" },
  { id: "spill-exposure", label: "Spill in a ventilated room against the exposure limits" },
  { id: "spill-lfl", label: "Spill in a ventilated room as a fraction of the LFL" },
  { id: "quantity-limit", label: "Flammable-liquid quantity against a configured limit" },
  { id: "oxygen-depletion", label: "Oxygen after the release of the cryogen and dry-ice inventory" },
  { id: "co2-exposure", label: "Carbon dioxide from dry ice against its exposure limits" },
  { id: "missing-data", label: "Data missing for an assessment" },
] as const;

export type RuleId = (typeof ASSESSMENT_RULES)[number]["id"];

export const RULE_IDS: readonly RuleId[] = ASSESSMENT_RULES.map((rule) => rule.id);

const LABELS = new Map<string, string>(ASSESSMENT_RULES.map((rule) => [rule.id, rule.label]));

export function ruleLabel(rule: RuleId): string {
  return LABELS.get(rule) ?? rule;
}
