import "server-only";
import { getDb, type DbOrTx } from "@/db/client";
import { brokenBottles, type BrokenBottle } from "./rules/broken-bottle";
import { buildSnapshots, loadAssessmentSettings } from "./service";

/** The broken-bottle times of one unit's contents, from the snapshot the assessment would read now; null when it does not apply. */
export function brokenBottlesOfUnit(unit: { id: number; roomId: number }, db: DbOrTx = getDb(), nowMs = Date.now()): BrokenBottle[] | null {
  const snapshot = buildSnapshots(db, [unit.roomId], nowMs).find((s) => s.kind === "unit" && s.unit.id === unit.id);
  if (!snapshot) return null;
  return brokenBottles(snapshot, loadAssessmentSettings(db));
}
