import "server-only";
import { and, desc, eq, inArray, or, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers, findings, rooms, storageUnits, substances, SEVERITIES, type Severity } from "@/db/schema";
import type { Scope } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";

/**
 * Which findings a user may see. "own" means: a researcher's own containers (or units they own);
 * facilities staff, the rooms they are the contact for and the units they own.
 */
export function findingsVisibleTo(user: SessionUser, scope: Scope): SQL | undefined {
  if (scope === "all") return undefined;
  const db = getDb();
  if (user.role === "researcher") {
    return or(
      inArray(findings.containerId, db.select({ id: containers.id }).from(containers).where(eq(containers.ownerId, user.id))),
      inArray(findings.storageUnitId, db.select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.ownerId, user.id))),
    );
  }
  return or(
    inArray(findings.roomId, db.select({ id: rooms.id }).from(rooms).where(eq(rooms.facilitiesContactId, user.id))),
    inArray(findings.storageUnitId, db.select({ id: storageUnits.id }).from(storageUnits).where(eq(storageUnits.ownerId, user.id))),
  );
}

export function listFindings(user: SessionUser, scope: Scope, filter: { severity?: string } = {}) {
  const severity = SEVERITIES.includes(filter.severity as Severity) ? (filter.severity as Severity) : undefined;
  return getDb()
    .select({
      id: findings.id,
      title: findings.title,
      rule: findings.rule,
      severity: findings.severity,
      status: findings.status,
      ratio: findings.ratio,
      worstCaseTempC: findings.worstCaseTempC,
      firstRaisedAt: findings.firstRaisedAt,
      substanceName: substances.name,
    })
    .from(findings)
    .leftJoin(substances, eq(substances.id, findings.substanceId))
    .where(and(findingsVisibleTo(user, scope), severity ? eq(findings.severity, severity) : undefined))
    .orderBy(desc(findings.firstRaisedAt))
    .limit(200)
    .all();
}
