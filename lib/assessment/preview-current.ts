import "server-only";
import { and, eq, inArray, isNull, or } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import type { FindingStatus, Scenario, Severity } from "@/db/enums";
import { findings, mixtureComponents } from "@/db/schema";
import { findingsVisibleTo } from "@/db/queries/findings";
import { scopeFor } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";

/** The register's statuses of a finding whose condition still holds: everything but resolved. */
export const STANDING_STATUSES = ["open", "acknowledged", "mitigating", "risk_accepted"] as const satisfies readonly FindingStatus[];

export type StandingFinding = {
  id: number;
  fingerprint: string;
  rule: string;
  severity: Severity;
  status: FindingStatus;
  scenario: Scenario;
  title: string;
  value: number | null;
  limitValue: number | null;
  ratio: number | null;
  unit: string | null;
  roomId: number | null;
  storageUnitId: number | null;
  substanceId: number | null;
  mixtureId: number | null;
};

/**
 * The findings standing in the register at a storage unit and among its room's own findings (the
 * room-wide rules: spills, quantities, oxygen), through findings_unit_subject_rule_idx and
 * findings_room_unit_idx.
 */
export function standingFindingsAt(db: DbOrTx, unit: { id: number; roomId: number }): StandingFinding[] {
  return db
    .select({
      id: findings.id,
      fingerprint: findings.fingerprint,
      rule: findings.rule,
      severity: findings.severity,
      status: findings.status,
      scenario: findings.scenario,
      title: findings.title,
      value: findings.value,
      limitValue: findings.limitValue,
      ratio: findings.ratio,
      unit: findings.unit,
      roomId: findings.roomId,
      storageUnitId: findings.storageUnitId,
      substanceId: findings.substanceId,
      mixtureId: findings.mixtureId,
    })
    .from(findings)
    .where(
      and(
        inArray(findings.status, [...STANDING_STATUSES]),
        eq(findings.conditionHolds, true),
        or(eq(findings.storageUnitId, unit.id), and(eq(findings.roomId, unit.roomId), isNull(findings.storageUnitId))),
      ),
    )
    .all();
}

/** The substances of each of these mixtures. */
export function componentsOfMixtures(db: DbOrTx, mixtureIds: number[]): Map<number, Set<number>> {
  const result = new Map<number, Set<number>>();
  if (mixtureIds.length === 0) return result;
  for (const row of db.select({ mixtureId: mixtureComponents.mixtureId, substanceId: mixtureComponents.substanceId }).from(mixtureComponents).where(inArray(mixtureComponents.mixtureId, mixtureIds)).all()) {
    const set = result.get(row.mixtureId) ?? new Set<number>();
    set.add(row.substanceId);
    result.set(row.mixtureId, set);
  }
  return result;
}

/** Which of these findings the person may open in the register (the same rule as the register's list). */
export function findingIdsVisibleTo(db: DbOrTx, user: SessionUser, ids: number[]): Set<number> {
  if (ids.length === 0) return new Set();
  const scope = scopeFor(user.role, "findings.read");
  if (scope === null) return new Set();
  if (scope === "all") return new Set(ids);
  const visible = findingsVisibleTo(user, scope);
  return new Set(
    db
      .select({ id: findings.id })
      .from(findings)
      .where(and(inArray(findings.id, ids), visible))
      .all()
      .map((row) => row.id),
  );
}
