import "server-only";
import { and, asc, count, desc, eq, inArray, or, sql as rawSql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { getDb } from "@/db/client";
import { containers, findingEvents, findings, findingTraces, mixtures, rooms, sites, storageUnits, substances, users, type Severity } from "@/db/schema";
import type { FindingListQuery } from "@/lib/register/schemas";
import { lastAssessedAt } from "@/lib/register/store";
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

// ---------------------------------------------------------------------------------------------
// The register list and one finding
// ---------------------------------------------------------------------------------------------


const SEVERITY_ORDER = rawSql`case ${findings.severity} when 'critical' then 4 when 'high' then 3 when 'moderate' then 2 else 1 end`;
const STATUS_ORDER = rawSql`case ${findings.status} when 'open' then 1 when 'acknowledged' then 2 when 'mitigating' then 3 when 'risk_accepted' then 4 else 5 end`;

export type FindingListRow = {
  id: number;
  rule: string;
  severity: Severity;
  status: string;
  scenario: string;
  title: string;
  value: number | null;
  limit: number | null;
  ratio: number | null;
  unit: string | null;
  worstCaseTempC: number | null;
  worstCaseSource: string | null;
  firstRaisedAt: Date;
  updatedAt: Date;
  location: { siteId: number | null; siteName: string | null; roomId: number | null; roomCode: string | null; storageUnitId: number | null; unitCode: string | null; label: string };
  substance: { id: number; name: string; cas: string | null } | null;
  mixture: { id: number; name: string } | null;
  containerId: number | null;
  assignee: { id: number; name: string } | null;
};

function findingFilters(user: SessionUser, scope: Scope, query: Partial<FindingListQuery>): SQL | undefined {
  const like = (q: string) => `%${q.toLowerCase().replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
  return and(
    findingsVisibleTo(user, scope),
    query.severity?.length ? inArray(findings.severity, query.severity) : undefined,
    query.status?.length ? inArray(findings.status, query.status) : undefined,
    query.scenario?.length ? inArray(findings.scenario, query.scenario) : undefined,
    query.siteId ? eq(findings.siteId, query.siteId) : undefined,
    query.roomId ? eq(findings.roomId, query.roomId) : undefined,
    query.storageUnitId ? eq(findings.storageUnitId, query.storageUnitId) : undefined,
    query.rule ? eq(findings.rule, query.rule) : undefined,
    query.q ? rawSql`lower(${findings.title}) like ${like(query.q)} escape '\\'` : undefined,
  );
}

export function listFindingsPage(user: SessionUser, scope: Scope, query: FindingListQuery): { rows: FindingListRow[]; total: number } {
  const db = getDb();
  const assignee = alias(users, "assignee");
  const where = findingFilters(user, scope, query);
  const dir = query.dir === "desc" ? desc : asc;
  const order: SQL[] = {
    severity: [dir(SEVERITY_ORDER), desc(findings.ratio)],
    status: [dir(STATUS_ORDER), desc(SEVERITY_ORDER)],
    rule: [dir(findings.rule), desc(SEVERITY_ORDER)],
    location: [dir(rooms.code), dir(storageUnits.code)],
    ratio: [rawSql`${findings.ratio} ${rawSql.raw(query.dir)} nulls last`],
    worstCaseTempC: [rawSql`${findings.worstCaseTempC} ${rawSql.raw(query.dir)} nulls last`],
    age: [query.dir === "desc" ? asc(findings.firstRaisedAt) : desc(findings.firstRaisedAt)],
    updated: [dir(findings.updatedAt)],
  }[query.sort].map((o) => o as SQL);
  const total = db.select({ n: count() }).from(findings).where(where).get()?.n ?? 0;
  const rows = db
    .select({
      id: findings.id,
      rule: findings.rule,
      severity: findings.severity,
      status: findings.status,
      scenario: findings.scenario,
      title: findings.title,
      value: findings.value,
      limit: findings.limitValue,
      ratio: findings.ratio,
      unit: findings.unit,
      worstCaseTempC: findings.worstCaseTempC,
      worstCaseSource: findings.worstCaseSource,
      firstRaisedAt: findings.firstRaisedAt,
      updatedAt: findings.updatedAt,
      siteId: findings.siteId,
      siteName: sites.name,
      roomId: findings.roomId,
      roomCode: rooms.code,
      storageUnitId: findings.storageUnitId,
      unitCode: storageUnits.code,
      substanceId: substances.id,
      substanceName: substances.name,
      cas: substances.cas,
      mixtureId: mixtures.id,
      mixtureName: mixtures.name,
      containerId: findings.containerId,
      assigneeId: assignee.id,
      assigneeName: assignee.name,
    })
    .from(findings)
    .leftJoin(sites, eq(sites.id, findings.siteId))
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, findings.storageUnitId))
    .leftJoin(substances, eq(substances.id, findings.substanceId))
    .leftJoin(mixtures, eq(mixtures.id, findings.mixtureId))
    .leftJoin(assignee, eq(assignee.id, findings.assigneeId))
    .where(where)
    .orderBy(...order, asc(findings.id))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .all();
  return {
    total,
    rows: rows.map((r) => ({
      id: r.id,
      rule: r.rule,
      severity: r.severity,
      status: r.status,
      scenario: r.scenario,
      title: r.title,
      value: r.value,
      limit: r.limit,
      ratio: r.ratio,
      unit: r.unit,
      worstCaseTempC: r.worstCaseTempC,
      worstCaseSource: r.worstCaseSource,
      firstRaisedAt: r.firstRaisedAt,
      updatedAt: r.updatedAt,
      location: {
        siteId: r.siteId,
        siteName: r.siteName,
        roomId: r.roomId,
        roomCode: r.roomCode,
        storageUnitId: r.storageUnitId,
        unitCode: r.unitCode,
        label: [r.roomCode, r.unitCode].filter(Boolean).join(" › ") || "—",
      },
      substance: r.substanceId ? { id: r.substanceId, name: r.substanceName!, cas: r.cas } : null,
      mixture: r.mixtureId ? { id: r.mixtureId, name: r.mixtureName! } : null,
      containerId: r.containerId,
      assignee: r.assigneeId ? { id: r.assigneeId, name: r.assigneeName! } : null,
    })),
  };
}

/** Open findings per severity within the same filters (the register's counts). */
export function countFindingsBySeverity(user: SessionUser, scope: Scope, query: Partial<FindingListQuery>): Record<Severity, number> {
  const counts = { critical: 0, high: 0, moderate: 0, low: 0 } as Record<Severity, number>;
  const rows = getDb()
    .select({ severity: findings.severity, n: count() })
    .from(findings)
    .where(findingFilters(user, scope, { ...query, severity: undefined }))
    .groupBy(findings.severity)
    .all();
  for (const row of rows) counts[row.severity] = row.n;
  return counts;
}

export function getFinding(user: SessionUser, scope: Scope, id: number) {
  const db = getDb();
  const row = db
    .select({ finding: findings, trace: findingTraces.trace, roomAssessedAt: rooms.assessedAt })
    .from(findings)
    .leftJoin(findingTraces, eq(findingTraces.findingId, findings.id))
    .leftJoin(rooms, eq(rooms.id, findings.roomId))
    .where(and(eq(findings.id, id), findingsVisibleTo(user, scope)))
    .get();
  if (!row) return null;
  const finding = { ...row.finding, lastEvaluatedAt: lastAssessedAt(row.finding, row.roomAssessedAt), trace: row.trace ?? null };
  const actor = alias(users, "actor");
  const events = db
    .select({ id: findingEvents.id, kind: findingEvents.kind, fromStatus: findingEvents.fromStatus, toStatus: findingEvents.toStatus, note: findingEvents.note, data: findingEvents.data, at: findingEvents.at, actorId: findingEvents.actorId, actorName: actor.name })
    .from(findingEvents)
    .leftJoin(actor, eq(actor.id, findingEvents.actorId))
    .where(eq(findingEvents.findingId, id))
    .orderBy(asc(findingEvents.at), asc(findingEvents.id))
    .all();
  return { finding, events };
}
