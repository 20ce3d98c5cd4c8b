/** Words for the register's codes. Pure, so client components may import it. */
import type { FindingStatus, Scenario } from "@/db/enums";

export const STATUS_LABELS: Record<FindingStatus, string> = {
  open: "Open",
  acknowledged: "Acknowledged",
  mitigating: "Mitigating",
  resolved: "Resolved",
  risk_accepted: "Risk accepted",
};

export const SCENARIO_LABELS: Record<Scenario, string> = {
  room_worst_case: "Room at its worst case",
  in_control: "Unit in control",
  control_lost: "Control lost (unit at room temperature)",
  spill: "Spill in the room",
};

/** "enclosure-lfl" → "Enclosure lfl" for a rule this build does not name (the rule list names its own). */
export function humaniseRule(rule: string): string {
  const text = rule.replace(/[-_]+/g, " ").trim();
  return text.charAt(0).toUpperCase() + text.slice(1);
}
