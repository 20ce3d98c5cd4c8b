/**
 * What a person is told when they resolve a finding and the re-assessment that follows at once
 * (lib/register/workflow.ts) has spoken. Pure, so the finding page's form can tell the two answers
 * apart.
 */
import type { FindingStatus } from "@/db/enums";
import { formatTraceValue } from "./trace-steps";

/** What the rules say now about one finding's condition. */
export type ConditionCheck =
  | { holds: false }
  | { holds: true; title: string; value: number | null; limitValue: number | null; ratio: number | null; unit: string | null };

/** Every "still holds" answer starts so. */
export const STILL_HOLDS_PREFIX = "The condition still holds:";

function stays(status: FindingStatus, riskAcceptedUntil: Date | null): string {
  switch (status) {
    case "open":
      return "stays open";
    case "acknowledged":
      return "stays open (acknowledged)";
    case "mitigating":
      return "stays open (being mitigated)";
    case "risk_accepted":
      return riskAcceptedUntil ? `stays as it was: risk accepted until ${riskAcceptedUntil.toISOString().slice(0, 10)}` : "stays as it was: risk accepted";
    default:
      return "is not resolved";
  }
}

/**
 * What the person who tried to resolve a finding is told when its condition still holds, in
 * plain words: the condition as the rules state it now, the numbers, what happens to the
 * finding, and the two ways on.
 */
export function conditionStillHoldsMessage(check: Extract<ConditionCheck, { holds: true }>, status: FindingStatus, riskAcceptedUntil: Date | null): string {
  const numbers =
    // Only a value set against a limit (a ratio) reads as "x against a limit of y"; a temperature comparison's title says it.
    check.value != null && check.limitValue != null && check.ratio != null
      ? ` (re-assessed now: ${formatTraceValue(check.value, check.unit)} against a limit of ${formatTraceValue(check.limitValue, check.unit)})`
      : "";
  return (
    `${STILL_HOLDS_PREFIX} ${check.title}${numbers}, so the finding ${stays(status, riskAcceptedUntil)}. ` +
    "Record what changed in Headroom first (move, use up or dispose of the container, or correct the location's data), then resolve it again; " +
    "if it is to stay as it is, accept the risk with a justification and a review date."
  );
}

export const RESOLVED_CONFIRMED_MESSAGE = "Resolved. Re-assessed now: the condition no longer holds.";
