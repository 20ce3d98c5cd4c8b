import "server-only";
import type { DbOrTx } from "@/db/client";
import type { Finding } from "@/db/schema";
import { buildSnapshots, loadAssessmentSettings, SnapshotLibrary } from "@/lib/assessment/service";
import { assessLocation, createAssessmentCache, type AssessmentSettings } from "@/lib/assessment/rules";
import type { ConditionCheck } from "./resolve-text";

export { conditionStillHoldsMessage, RESOLVED_CONFIRMED_MESSAGE, type ConditionCheck } from "./resolve-text";

/**
 * Runs the rules for the finding's own location (its storage unit, or its room's own rules) on
 * the inventory, temperatures and settings as they are now, writing nothing: does the condition
 * the finding records still hold? A location that no longer exists holds nothing. The library and
 * settings come back for the re-assessment that follows in the same transaction.
 */
export function checkFindingCondition(
  tx: DbOrTx,
  finding: Pick<Finding, "fingerprint" | "roomId" | "storageUnitId">,
  nowMs: number,
): { check: ConditionCheck; library: SnapshotLibrary; settings: AssessmentSettings } {
  const library = new SnapshotLibrary(tx);
  const settings = loadAssessmentSettings(tx);
  if (finding.roomId == null) return { check: { holds: false }, library, settings };
  const snapshot = buildSnapshots(tx, [finding.roomId], nowMs, library).find((s) =>
    finding.storageUnitId != null ? s.kind === "unit" && s.unit.id === finding.storageUnitId : s.kind === "room",
  );
  const candidate = snapshot ? assessLocation(snapshot, settings, { cache: createAssessmentCache() }).find((c) => c.fingerprint === finding.fingerprint) : undefined;
  const check: ConditionCheck = candidate
    ? { holds: true, title: candidate.title, value: candidate.value, limitValue: candidate.limitValue, ratio: candidate.ratio, unit: candidate.unit }
    : { holds: false };
  return { check, library, settings };
}
