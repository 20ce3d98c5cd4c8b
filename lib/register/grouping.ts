/**
 * One line per problem: the findings of one rule about one subject (a substance, a mixture, "open
 * containers together", a limit) at one location, whatever the scenario (in control, control
 * lost, the room's worst case, a spill), shown together and headed by the worst. Every finding
 * stays in the data; this only arranges a view. Pure, so client components may import it.
 */
import type { Scenario, Severity } from "@/db/enums";
import { formatQuantity } from "@/lib/format/numbers";

export type GroupableFinding = {
  id: number;
  /** rule | location | subject | scenario (lib/assessment/rules/fingerprint.ts). */
  fingerprint: string;
  scenario: Scenario | string;
  severity: Severity;
  ratio: number | null;
  value: number | null;
  unit: string | null;
};

export type FindingLine<T extends GroupableFinding> = {
  /** The fingerprint without its scenario: rule | location | subject. */
  key: string;
  /** The worst finding of the line: highest severity, then highest ratio. */
  lead: T;
  /** The line's other findings, worst first. */
  others: T[];
  findingIds: number[];
};

const RANK: Record<Severity, number> = { critical: 4, high: 3, moderate: 2, low: 1 };

/** The same problem under every scenario: the fingerprint without its last part (the scenario). */
export function findingGroupKey(fingerprint: string): string {
  const cut = fingerprint.lastIndexOf("|");
  return cut > 0 ? fingerprint.slice(0, cut) : fingerprint;
}

/** Worse first: severity, then ratio (a finding without a ratio after one with), then the larger value, then id. */
export function compareWorstFirst(a: GroupableFinding, b: GroupableFinding): number {
  if (RANK[a.severity] !== RANK[b.severity]) return RANK[b.severity] - RANK[a.severity];
  if (a.ratio !== b.ratio) {
    if (a.ratio === null) return 1;
    if (b.ratio === null) return -1;
    return b.ratio - a.ratio;
  }
  if (a.value !== null && b.value !== null && a.value !== b.value && a.unit !== "% O₂") return b.value - a.value;
  return a.id - b.id;
}

/**
 * The findings as lines, worst line first (by its lead). Lines keep no finding twice and lose none:
 * the findings of all lines together are exactly the input.
 */
export function groupFindings<T extends GroupableFinding>(rows: readonly T[]): FindingLine<T>[] {
  const byKey = new Map<string, T[]>();
  for (const row of rows) {
    const key = findingGroupKey(row.fingerprint);
    const members = byKey.get(key);
    if (members) members.push(row);
    else byKey.set(key, [row]);
  }
  const lines: FindingLine<T>[] = [];
  for (const [key, members] of byKey) {
    const sorted = [...members].sort(compareWorstFirst);
    lines.push({ key, lead: sorted[0], others: sorted.slice(1), findingIds: sorted.map((f) => f.id) });
  }
  return lines.sort((a, b) => compareWorstFirst(a.lead, b.lead) || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
}

/** How each scenario reads after a value ("2,210 % LFL in control"). */
export const SCENARIO_PHRASES: Record<Scenario, string> = {
  in_control: "in control",
  control_lost: "if control is lost",
  room_worst_case: "at the room's worst case",
  spill: "after a spill",
};

function scenarioPhrase(scenario: string): string {
  return SCENARIO_PHRASES[scenario as Scenario] ?? scenario.replace(/_/g, " ");
}

/** One finding's value with its scenario: "4,630 % LFL if control is lost"; the scenario alone without a value. */
export function valueWithScenario(finding: GroupableFinding): string {
  if (finding.value === null) return scenarioPhrase(finding.scenario);
  return `${formatQuantity(finding.value, finding.unit ?? "")} ${scenarioPhrase(finding.scenario)}`;
}

/** The line's values, worst first: "4,630 % LFL if control is lost · 2,210 % LFL in control". */
export function lineValues(line: FindingLine<GroupableFinding>): string {
  return [line.lead, ...line.others].map(valueWithScenario).join(" · ");
}
