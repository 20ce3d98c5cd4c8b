/** The assessment rules: stable ids (stored on every finding) with the labels people read (short ones for tables). */
export const ASSESSMENT_RULES = [
  { id: "enclosure-lfl", short: "Closed space vs LFL", label: "Vapor in a closed unit or unventilated room as a fraction of the LFL" },
  { id: "ignition-source-unit", short: "Ignition sources", label: "Flammable liquid where the interior has ignition sources" },
  { id: "flash-point", short: "Flash point", label: "Worst-case temperature at or near the flash point" },
  { id: "boiling-point", short: "Boiling point", label: "Worst-case temperature at or above the boiling point" },
  { id: "spill-exposure", short: "Spill vs exposure limits", label: "Spill in a ventilated room against the exposure limits" },
  { id: "spill-lfl", short: "Spill vs LFL", label: "Spill in a ventilated room as a fraction of the LFL" },
  { id: "quantity-limit", short: "Quantity limit", label: "Flammable-liquid quantity against a configured limit" },
  { id: "oxygen-depletion", short: "Oxygen after release", label: "Oxygen after the release of the cryogen and dry-ice inventory" },
  { id: "co2-exposure", short: "CO₂ from dry ice", label: "Carbon dioxide from dry ice against its exposure limits" },
  { id: "missing-data", short: "Missing data", label: "Data missing for an assessment" },
] as const;

export type RuleId = (typeof ASSESSMENT_RULES)[number]["id"];

export const RULE_IDS: readonly RuleId[] = ASSESSMENT_RULES.map((rule) => rule.id);

const LABELS = new Map<string, string>(ASSESSMENT_RULES.map((rule) => [rule.id, rule.label]));

export function ruleLabel(rule: RuleId): string {
  return LABELS.get(rule) ?? rule;
}
