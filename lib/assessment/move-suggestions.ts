import "server-only";
import { and, inArray, notInArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers } from "@/db/schema";
import { scopeFor } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { toBaseAmount } from "@/lib/inventory/schemas";
import { saferPlacesThan, type StoragePlanItem } from "./storage-plan";

/** A move the finding page offers: a contributing container and the best place for it that is safer than where it stands. */
export type MoveSuggestion = {
  containerId: number;
  label: string;
  place: StoragePlanItem;
  /** "nothing raised", "already high there", "would raise moderate". */
  summary: string;
  /** The container's page with the Move dialog open and this unit chosen: nothing moves until the person confirms. */
  href: string;
};

/** At most this many of a finding's largest containers get a suggestion. */
const LARGEST = 2;

export function placeSummary(place: Pick<StoragePlanItem, "verdict" | "worstSeverity">): string {
  if (place.verdict === "no_findings" || !place.worstSeverity) return "nothing raised";
  return place.verdict === "already_flagged" ? `already ${place.worstSeverity} there` : `would raise ${place.worstSeverity}`;
}

/**
 * For a finding about a storage unit: the largest of its contributing containers still there that
 * this person may move (researchers: their own), each with the storage planner's best place that
 * is safer than the unit itself. None when no place is safer, or the person moves no containers.
 */
export function moveSuggestionsForFinding(user: SessionUser, finding: { storageUnitId: number | null; roomId: number | null }, containerIds: number[], nowMs = Date.now()): MoveSuggestion[] {
  const scope = scopeFor(user.role, "containers.write");
  if (scope === null || finding.storageUnitId == null || containerIds.length === 0) return [];
  const db = getDb();
  const unitId = finding.storageUnitId;
  const rows = db
    .select({ id: containers.id, label: containers.label, substanceId: containers.substanceId, mixtureId: containers.mixtureId, amount: containers.amount, amountUnit: containers.amountUnit, state: containers.state, storageUnitId: containers.storageUnitId, ownerId: containers.ownerId })
    .from(containers)
    .where(and(inArray(containers.id, [...new Set(containerIds)]), notInArray(containers.state, ["empty", "disposed"])))
    .all()
    .filter((c) => c.storageUnitId === unitId && (scope === "all" || c.ownerId === user.id))
    // Litres and kilograms side by side: a screening order of size, enough to pick the largest.
    .sort((a, b) => toBaseAmount(b.amount, b.amountUnit) - toBaseAmount(a.amount, a.amountUnit) || a.label.localeCompare(b.label))
    .slice(0, LARGEST);
  return rows.flatMap((c) => {
    const [place] = saferPlacesThan(
      db,
      { substanceId: c.substanceId, mixtureId: c.mixtureId, amount: c.amount, amountUnit: c.amountUnit, state: c.state, label: c.label, replacesContainerId: c.id },
      { unitId, nearRoomId: finding.roomId, excludeUnitIds: [unitId], limit: 1, nowMs },
    );
    if (!place) return [];
    return [{ containerId: c.id, label: c.label, place, summary: placeSummary(place), href: `/inventory/${c.id}?moveTo=${place.storageUnitId}` }];
  });
}
