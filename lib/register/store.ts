import "server-only";
import { eq } from "drizzle-orm";
import { preparedOn, type DbOrTx } from "@/db/client";
import { findingEvents, traceSources, type Finding, type FindingStatus, type Scenario, type Severity } from "@/db/schema";
import type { TimeToDanger } from "@/lib/assessment/rules/types";
import { citingWith, traceText } from "./trace-text";

/** What an assessment rule says about one location under one scenario (see lib/assessment). */
export type FindingCandidate = {
  fingerprint: string;
  rule: string;
  severity: Severity;
  scenario: Scenario;
  title: string;
  siteId: number | null;
  roomId: number | null;
  storageUnitId: number | null;
  containerId: number | null;
  substanceId: number | null;
  mixtureId: number | null;
  value: number | null;
  limitValue: number | null;
  ratio: number | null;
  unit: string | null;
  worstCaseTempC: number | null;
  worstCaseSource: string | null;
  /** Control-lost findings: when after a failure the contents cross the next severity threshold (see db/schema.ts findings). */
  timeToDanger?: TimeToDanger | null;
  trace: unknown;
};

export type { TimeToDanger };

export type FindingChange = { kind: "raised" | "reopened" | "escalated"; finding: Finding; fromSeverity?: Severity };
/** `resolvedIds`: the findings re-assessment resolved that were being worked (for webhooks). */
export type ReconcileResult = { raised: number; updated: number; resolved: number; reopened: number; unchanged: number; changes: FindingChange[]; resolvedIds?: number[] };

const SEVERITY_RANK: Record<Severity, number> = { critical: 3, high: 2, moderate: 1, low: 0 };
const WORKING: FindingStatus[] = ["open", "acknowledged", "mitigating"];

/**
 * What the comparison needs, read straight from SQLite (for 36,000 findings the query builder's row
 * mapping costs more than the query): not the people's fields (assignee, plan), which a
 * re-assessment never changes, nor the trace.
 */
const EXISTING_SELECT = `select id, fingerprint, severity, status, title, room_id as roomId, storage_unit_id as storageUnitId, value,
  limit_value as limitValue, ratio, worst_case_temp_c as worstCaseTempC, worst_case_source as worstCaseSource,
  time_to_danger_min as timeToDangerMin, time_to_danger_threshold as timeToDangerThreshold, time_to_danger_temp_c as timeToDangerTempC,
  condition_holds as conditionHolds, risk_accepted_until as riskAcceptedUntil, resolved_at as resolvedAt from findings`;

type ExistingRow = Omit<ExistingFinding, "conditionHolds" | "riskAcceptedUntil" | "resolvedAt"> & { conditionHolds: number; riskAcceptedUntil: number | null; resolvedAt: number | null };

function toExisting(row: ExistingRow): ExistingFinding {
  return {
    ...row,
    conditionHolds: row.conditionHolds === 1,
    riskAcceptedUntil: row.riskAcceptedUntil == null ? null : new Date(row.riskAcceptedUntil),
    resolvedAt: row.resolvedAt == null ? null : new Date(row.resolvedAt),
  };
}

type ExistingFinding = Pick<
  Finding,
  "id" | "fingerprint" | "severity" | "status" | "title" | "roomId" | "storageUnitId" | "value" | "limitValue" | "ratio" | "worstCaseTempC" | "worstCaseSource"
  | "timeToDangerMin" | "timeToDangerThreshold" | "timeToDangerTempC" | "conditionHolds" | "riskAcceptedUntil" | "resolvedAt"
>;

/**
 * When a finding was last assessed: its own last write, or — while its condition holds — the last
 * assessment of its room, which confirmed it unchanged (rooms.assessedAt).
 */
export function lastAssessedAt(finding: { conditionHolds: boolean; lastEvaluatedAt: Date }, roomAssessedAt: Date | null): Date {
  if (!finding.conditionHolds || roomAssessedAt == null) return finding.lastEvaluatedAt;
  return roomAssessedAt.getTime() > finding.lastEvaluatedAt.getTime() ? roomAssessedAt : finding.lastEvaluatedAt;
}

/** A value that moved by less than this (relative) is the same finding, updated without an event. */
const SIGNIFICANT_CHANGE = 0.01;

function significantlyDifferent(a: number | null, b: number | null): boolean {
  if (a == null || b == null) return a !== b;
  const scale = Math.max(Math.abs(a), Math.abs(b), 1e-12);
  return Math.abs(a - b) / scale > SIGNIFICANT_CHANGE;
}

/**
 * Writes findings' traces (their own table, see db/schema.ts findingTraces) with the readable text
 * the workbook shows, citing long sources by their trace_sources id. One per reconcile: it
 * remembers the source ids it has looked up.
 */
export class TraceWriter {
  private readonly sourceIds = new Map<string, number>();
  constructor(
    private readonly tx: DbOrTx,
    private readonly now: Date,
  ) {}

  private sourceId(text: string): number {
    const known = this.sourceIds.get(text);
    if (known !== undefined) return known;
    const id =
      this.tx.select({ id: traceSources.id }).from(traceSources).where(eq(traceSources.text, text)).get()?.id ??
      this.tx.insert(traceSources).values({ text }).returning({ id: traceSources.id }).get().id;
    this.sourceIds.set(text, id);
    return id;
  }

  write(findingId: number, trace: unknown): void {
    const stored = trace ?? {};
    const citing = citingWith((text) => this.sourceId(text));
    const text = traceText(stored, citing.cite);
    const sourceIds = citing.ids();
    preparedOn(
      this.tx,
      // traceText's text is XML-safe, hence text_xml_safe = 1.
      `insert into finding_traces (finding_id, trace, text, text_xml_safe, source_ids, written_at) values (?, ?, ?, 1, ?, ?)
         on conflict (finding_id) do update set trace = excluded.trace, text = excluded.text, text_xml_safe = 1, source_ids = excluded.source_ids, written_at = excluded.written_at`,
    ).run(findingId, JSON.stringify(stored), text, JSON.stringify(sourceIds), this.now.getTime());
  }
}

/**
 * Brings the register in line with a fresh assessment of some locations, in the caller's
 * transaction. By fingerprint (rule + location + substance + scenario):
 * - a new condition is raised (status open, event "raised");
 * - one that holds again after it had resolved itself re-opens (event "reopened");
 * - one that still holds is updated in place; a change of severity or a value moving by more than
 *   1 % is an "updated" event;
 * - one that no longer holds resolves itself with an event saying why ("auto_resolved"); a person's
 *   status (acknowledged, mitigating, risk accepted) is kept in the event's data.
 * A risk accepted until a review date stays accepted while the date is ahead; once it has passed
 * the finding re-opens for review. One marked resolved by a person while its condition still holds
 * re-opens too (accepting the risk is the way to keep such a finding closed). Findings are never deleted.
 */
export function reconcileFindings(
  tx: DbOrTx,
  scope: { roomIds: number[]; storageUnitIds: number[] },
  candidates: FindingCandidate[],
  opts: { nowMs?: number; reason?: string } = {},
): ReconcileResult {
  const now = new Date(opts.nowMs ?? Date.now());
  const result: ReconcileResult = { raised: 0, updated: 0, resolved: 0, reopened: 0, unchanged: 0, changes: [], resolvedIds: [] };
  const existing = new Map<string, ExistingFinding>();
  const add = (rows: unknown[]) => {
    for (const row of rows as ExistingRow[]) existing.set(row.fingerprint, toExisting(row));
  };
  if (scope.storageUnitIds.length) add(preparedOn(tx, `${EXISTING_SELECT} where storage_unit_id in (select value from json_each(?))`).all(JSON.stringify(scope.storageUnitIds)));
  // Through findings_room_unit_idx: the rooms' own findings (unit null) without reading their units'.
  if (scope.roomIds.length) add(preparedOn(tx, `${EXISTING_SELECT} where room_id in (select value from json_each(?)) and storage_unit_id is null`).all(JSON.stringify(scope.roomIds)));
  // A candidate may belong to a location outside the scope given (it should not, but its fingerprint is unique).
  const missing = candidates.filter((c) => !existing.has(c.fingerprint)).map((c) => c.fingerprint);
  if (missing.length) add(preparedOn(tx, `${EXISTING_SELECT} where fingerprint in (select value from json_each(?))`).all(JSON.stringify(missing)));
  const seen = new Set<string>();
  const traces = new TraceWriter(tx, now);
  const insertEvent = preparedOn(tx, "insert into finding_events (finding_id, kind, from_status, to_status, note, data, actor_id, at) values (?, ?, ?, ?, ?, ?, null, ?)");
  const event = (findingId: number, kind: (typeof findingEvents.$inferInsert)["kind"], fromStatus: FindingStatus | null, toStatus: FindingStatus | null, note: string, data?: Record<string, unknown>) =>
    insertEvent.run(findingId, kind, fromStatus, toStatus, note, data ? JSON.stringify(data) : null, now.getTime());

  for (const candidate of candidates) {
    if (seen.has(candidate.fingerprint)) continue;
    seen.add(candidate.fingerprint);
    const before = existing.get(candidate.fingerprint);
    if (!before) {
      const row = insertFinding(tx, candidate, now);
      traces.write(row.id, candidate.trace);
      event(row.id, "raised", null, "open", `Raised: ${candidate.title}`, { value: candidate.value, limit: candidate.limitValue, ratio: candidate.ratio, unit: candidate.unit, severity: candidate.severity });
      result.raised += 1;
      result.changes.push({ kind: "raised", finding: row });
      continue;
    }
    const reviewPassed = before.status === "risk_accepted" && before.riskAcceptedUntil != null && before.riskAcceptedUntil.getTime() <= now.getTime();
    const returned = !before.conditionHolds;
    // Resolved by a person while the condition still holds: the register says what is true.
    const stillHolds = before.conditionHolds && before.status === "resolved";
    if (returned || reviewPassed || stillHolds) {
      const row = updateFinding(tx, before.id, candidate, now, { reopen: true, clearRiskAcceptance: reviewPassed });
      traces.write(row.id, candidate.trace);
      const note = returned
        ? `Re-opened: the condition holds again — ${candidate.title}${opts.reason ? ` (after: ${opts.reason})` : ""}.`
        : stillHolds
          ? `Re-opened: it was marked resolved, but re-assessment still finds the condition — ${candidate.title}. If it is to stay, accept the risk with a justification.`
          : `Re-opened for review: the risk was accepted until ${before.riskAcceptedUntil!.toISOString().slice(0, 10)}, and the condition still holds.`;
      event(row.id, "reopened", before.status, "open", note, { value: candidate.value, ratio: candidate.ratio, severity: candidate.severity });
      result.reopened += 1;
      result.changes.push({ kind: "reopened", finding: row });
      continue;
    }
    const severityChanged = before.severity !== candidate.severity;
    const valueChanged = significantlyDifferent(before.value, candidate.value) || significantlyDifferent(before.ratio, candidate.ratio);
    const anyChange =
      severityChanged ||
      before.value !== candidate.value ||
      before.ratio !== candidate.ratio ||
      before.limitValue !== candidate.limitValue ||
      before.worstCaseTempC !== candidate.worstCaseTempC ||
      before.worstCaseSource !== candidate.worstCaseSource ||
      before.timeToDangerMin !== (candidate.timeToDanger?.minutes ?? null) ||
      before.timeToDangerThreshold !== (candidate.timeToDanger?.threshold ?? null) ||
      before.timeToDangerTempC !== (candidate.timeToDanger?.tempC ?? null) ||
      before.title !== candidate.title;
    if (!anyChange) {
      result.unchanged += 1;
      continue;
    }
    const row = updateFinding(tx, before.id, candidate, now, { reopen: false, clearRiskAcceptance: false });
    traces.write(row.id, candidate.trace);
    if (severityChanged || valueChanged) {
      const note = severityChanged
        ? `Severity ${before.severity} → ${candidate.severity}: ${candidate.title}`
        : `Re-assessed: ${candidate.title}`;
      event(row.id, "updated", before.status, before.status, note, {
        before: { value: before.value, ratio: before.ratio, severity: before.severity, worstCaseTempC: before.worstCaseTempC },
        after: { value: candidate.value, ratio: candidate.ratio, severity: candidate.severity, worstCaseTempC: candidate.worstCaseTempC },
        ...(opts.reason ? { reason: opts.reason } : {}),
      });
      result.updated += 1;
      if (SEVERITY_RANK[candidate.severity] > SEVERITY_RANK[before.severity] && WORKING.includes(before.status)) result.changes.push({ kind: "escalated", finding: row, fromSeverity: before.severity });
    } else {
      result.unchanged += 1;
    }
  }

  // The findings confirmed unchanged were assessed now too: one write per room (see rooms.assessedAt).
  if (scope.roomIds.length) preparedOn(tx, "update rooms set assessed_at = ? where id in (select value from json_each(?))").run(now.getTime(), JSON.stringify(scope.roomIds));

  const resolveFinding = preparedOn(tx, "update findings set status = 'resolved', condition_holds = 0, resolved_at = ?, last_evaluated_at = ?, updated_at = ? where id = ?");
  const scopeRooms = new Set(scope.roomIds);
  const scopeUnits = new Set(scope.storageUnitIds);
  for (const [fingerprint, before] of existing) {
    if (seen.has(fingerprint) || !before.conditionHolds) continue;
    if (!isInScope(before, scopeRooms, scopeUnits)) continue;
    const wasWorked = before.status !== "resolved";
    resolveFinding.run((wasWorked ? now : (before.resolvedAt ?? now)).getTime(), now.getTime(), now.getTime(), before.id);
    if (wasWorked) {
      result.resolvedIds!.push(before.id);
      event(
        before.id,
        "auto_resolved",
        before.status,
        "resolved",
        `Resolved by re-assessment: the condition no longer holds${opts.reason ? ` after ${opts.reason}` : ""}.`,
        { lastValue: before.value, lastRatio: before.ratio, statusBefore: before.status },
      );
    }
    result.resolved += 1;
  }
  return result;
}

/**
 * A new finding, straight through SQLite (a first assessment raises tens of thousands: the query
 * builder's statement building costs several times the insert), returned as the row it wrote.
 */
function insertFinding(tx: DbOrTx, candidate: FindingCandidate, now: Date): Finding {
  const values = writtenValues(candidate, now);
  const at = now.getTime();
  const { id } = preparedOn(
    tx,
    `insert into findings (fingerprint, rule, severity, status, scenario, title, site_id, room_id, storage_unit_id, container_id, substance_id, mixture_id,
       value, limit_value, ratio, unit, worst_case_temp_c, worst_case_source, time_to_danger_min, time_to_danger_threshold, time_to_danger_temp_c,
       condition_holds, first_raised_at, last_evaluated_at, created_at, updated_at)
     values (?, ?, ?, 'open', ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, ?, ?, ?, ?) returning id`,
  ).get(
    candidate.fingerprint,
    values.rule,
    values.severity,
    values.scenario,
    values.title,
    values.siteId,
    values.roomId,
    values.storageUnitId,
    values.containerId,
    values.substanceId,
    values.mixtureId,
    values.value,
    values.limitValue,
    values.ratio,
    values.unit,
    values.worstCaseTempC,
    values.worstCaseSource,
    values.timeToDangerMin,
    values.timeToDangerThreshold,
    values.timeToDangerTempC,
    at,
    at,
    at,
    at,
  ) as { id: number };
  return {
    ...values,
    id,
    fingerprint: candidate.fingerprint,
    status: "open",
    conditionHolds: true,
    assigneeId: null,
    mitigationPlan: null,
    riskAcceptedUntil: null,
    firstRaisedAt: now,
    resolvedAt: null,
    createdAt: now,
    updatedAt: now,
  };
}

type FindingRow = {
  id: number;
  fingerprint: string;
  rule: string;
  severity: Severity;
  status: FindingStatus;
  scenario: Scenario;
  title: string;
  site_id: number | null;
  room_id: number | null;
  storage_unit_id: number | null;
  container_id: number | null;
  substance_id: number | null;
  mixture_id: number | null;
  value: number | null;
  limit_value: number | null;
  ratio: number | null;
  unit: string | null;
  worst_case_temp_c: number | null;
  worst_case_source: string | null;
  time_to_danger_min: number | null;
  time_to_danger_threshold: string | null;
  time_to_danger_temp_c: number | null;
  condition_holds: number;
  assignee_id: number | null;
  mitigation_plan: string | null;
  risk_accepted_until: number | null;
  first_raised_at: number;
  last_evaluated_at: number;
  resolved_at: number | null;
  created_at: number;
  updated_at: number;
};

const dateOrNull = (ms: number | null) => (ms == null ? null : new Date(ms));

function toFinding(row: FindingRow): Finding {
  return {
    id: row.id,
    fingerprint: row.fingerprint,
    rule: row.rule,
    severity: row.severity,
    status: row.status,
    scenario: row.scenario,
    title: row.title,
    siteId: row.site_id,
    roomId: row.room_id,
    storageUnitId: row.storage_unit_id,
    containerId: row.container_id,
    substanceId: row.substance_id,
    mixtureId: row.mixture_id,
    value: row.value,
    limitValue: row.limit_value,
    ratio: row.ratio,
    unit: row.unit,
    worstCaseTempC: row.worst_case_temp_c,
    worstCaseSource: row.worst_case_source,
    timeToDangerMin: row.time_to_danger_min,
    timeToDangerThreshold: row.time_to_danger_threshold,
    timeToDangerTempC: row.time_to_danger_temp_c,
    conditionHolds: row.condition_holds === 1,
    assigneeId: row.assignee_id,
    mitigationPlan: row.mitigation_plan,
    riskAcceptedUntil: dateOrNull(row.risk_accepted_until),
    firstRaisedAt: new Date(row.first_raised_at),
    lastEvaluatedAt: new Date(row.last_evaluated_at),
    resolvedAt: dateOrNull(row.resolved_at),
    createdAt: new Date(row.created_at),
    updatedAt: new Date(row.updated_at),
  };
}

/**
 * A finding brought in line with its candidate (straight through SQLite, like insertFinding);
 * `reopen` opens it again (condition holds, not resolved), `clearRiskAcceptance` ends an accepted
 * risk whose review date has passed. Returns the row as written.
 */
function updateFinding(tx: DbOrTx, id: number, candidate: FindingCandidate, now: Date, opts: { reopen: boolean; clearRiskAcceptance: boolean }): Finding {
  const at = now.getTime();
  const row = preparedOn(
    tx,
    `update findings set rule = ?, severity = ?, scenario = ?, title = ?, site_id = ?, room_id = ?, storage_unit_id = ?, container_id = ?,
       substance_id = ?, mixture_id = ?, value = ?, limit_value = ?, ratio = ?, unit = ?, worst_case_temp_c = ?, worst_case_source = ?,
       time_to_danger_min = ?, time_to_danger_threshold = ?, time_to_danger_temp_c = ?,
       last_evaluated_at = ?, updated_at = ?,
       status = case when ? then 'open' else status end,
       condition_holds = case when ? then 1 else condition_holds end,
       resolved_at = case when ? then null else resolved_at end,
       risk_accepted_until = case when ? then null else risk_accepted_until end
     where id = ? returning *`,
  ).get(
    candidate.rule,
    candidate.severity,
    candidate.scenario,
    candidate.title,
    candidate.siteId,
    candidate.roomId,
    candidate.storageUnitId,
    candidate.containerId,
    candidate.substanceId,
    candidate.mixtureId,
    candidate.value,
    candidate.limitValue,
    candidate.ratio,
    candidate.unit,
    candidate.worstCaseTempC,
    candidate.worstCaseSource,
    candidate.timeToDanger?.minutes ?? null,
    candidate.timeToDanger?.threshold ?? null,
    candidate.timeToDanger?.tempC ?? null,
    at,
    at,
    opts.reopen ? 1 : 0,
    opts.reopen ? 1 : 0,
    opts.reopen ? 1 : 0,
    opts.clearRiskAcceptance ? 1 : 0,
    id,
  ) as FindingRow;
  return toFinding(row);
}

function writtenValues(candidate: FindingCandidate, now: Date) {
  return {
    rule: candidate.rule,
    severity: candidate.severity,
    scenario: candidate.scenario,
    title: candidate.title,
    siteId: candidate.siteId,
    roomId: candidate.roomId,
    storageUnitId: candidate.storageUnitId,
    containerId: candidate.containerId,
    substanceId: candidate.substanceId,
    mixtureId: candidate.mixtureId,
    value: candidate.value,
    limitValue: candidate.limitValue,
    ratio: candidate.ratio,
    unit: candidate.unit,
    worstCaseTempC: candidate.worstCaseTempC,
    worstCaseSource: candidate.worstCaseSource,
    timeToDangerMin: candidate.timeToDanger?.minutes ?? null,
    timeToDangerThreshold: candidate.timeToDanger?.threshold ?? null,
    timeToDangerTempC: candidate.timeToDanger?.tempC ?? null,
    lastEvaluatedAt: now,
  };
}

function isInScope(finding: ExistingFinding, roomIds: Set<number>, storageUnitIds: Set<number>): boolean {
  if (finding.storageUnitId != null) return storageUnitIds.has(finding.storageUnitId);
  return finding.roomId != null && roomIds.has(finding.roomId);
}
