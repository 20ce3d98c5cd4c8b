import "server-only";
import { and, eq, inArray, isNull, or, type SQL } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { findingEvents, findings, findingTraces, traceSources, type Finding, type FindingStatus, type Scenario, type Severity } from "@/db/schema";
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
  trace: unknown;
};

export type FindingChange = { kind: "raised" | "reopened" | "escalated"; finding: Finding };
export type ReconcileResult = { raised: number; updated: number; resolved: number; reopened: number; unchanged: number; changes: FindingChange[] };

const SEVERITY_RANK: Record<Severity, number> = { critical: 3, high: 2, moderate: 1, low: 0 };
const WORKING: FindingStatus[] = ["open", "acknowledged", "mitigating"];

type ExistingFinding = Pick<
  Finding,
  "id" | "fingerprint" | "severity" | "status" | "title" | "roomId" | "storageUnitId" | "value" | "limitValue" | "ratio" | "worstCaseTempC" | "worstCaseSource" | "conditionHolds" | "riskAcceptedUntil" | "resolvedAt"
>;

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
    this.tx
      .insert(findingTraces)
      .values({ findingId, trace: stored, text, sourceIds, writtenAt: this.now })
      .onConflictDoUpdate({ target: findingTraces.findingId, set: { trace: stored, text, sourceIds, writtenAt: this.now } })
      .run();
  }
}

/** Findings that belong to these locations: rooms' own findings and their units'. */
export function findingsScope(scope: { roomIds: number[]; storageUnitIds: number[] }): SQL | undefined {
  const parts: SQL[] = [];
  if (scope.roomIds.length) parts.push(and(inArray(findings.roomId, scope.roomIds), isNull(findings.storageUnitId))!);
  if (scope.storageUnitIds.length) parts.push(inArray(findings.storageUnitId, scope.storageUnitIds));
  return parts.length ? or(...parts) : undefined;
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
  const result: ReconcileResult = { raised: 0, updated: 0, resolved: 0, reopened: 0, unchanged: 0, changes: [] };
  const where = findingsScope(scope);
  // Only what the comparison needs: not the people's fields (assignee, plan), which a re-assessment never changes.
  const columns = {
    id: findings.id,
    fingerprint: findings.fingerprint,
    severity: findings.severity,
    status: findings.status,
    title: findings.title,
    roomId: findings.roomId,
    storageUnitId: findings.storageUnitId,
    value: findings.value,
    limitValue: findings.limitValue,
    ratio: findings.ratio,
    worstCaseTempC: findings.worstCaseTempC,
    worstCaseSource: findings.worstCaseSource,
    conditionHolds: findings.conditionHolds,
    riskAcceptedUntil: findings.riskAcceptedUntil,
    resolvedAt: findings.resolvedAt,
  };
  const existing = new Map<string, ExistingFinding>();
  if (where) for (const row of tx.select(columns).from(findings).where(where).all()) existing.set(row.fingerprint, row);
  // A candidate may belong to a location outside the scope given (it should not, but its fingerprint is unique).
  const missing = candidates.filter((c) => !existing.has(c.fingerprint)).map((c) => c.fingerprint);
  for (let i = 0; i < missing.length; i += 500) {
    for (const row of tx.select(columns).from(findings).where(inArray(findings.fingerprint, missing.slice(i, i + 500))).all()) existing.set(row.fingerprint, row);
  }
  const seen = new Set<string>();
  const traces = new TraceWriter(tx, now);
  // Findings the assessment confirms unchanged: only their "last assessed" time moves (no trace rebuilt).
  const unchangedIds: number[] = [];
  const event = (findingId: number, kind: (typeof findingEvents.$inferInsert)["kind"], fromStatus: FindingStatus | null, toStatus: FindingStatus | null, note: string, data?: Record<string, unknown>) =>
    tx.insert(findingEvents).values({ findingId, kind, fromStatus, toStatus, note, data: data ?? null, actorId: null, at: now }).run();

  for (const candidate of candidates) {
    if (seen.has(candidate.fingerprint)) continue;
    seen.add(candidate.fingerprint);
    const values = {
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
      lastEvaluatedAt: now,
    };
    const before = existing.get(candidate.fingerprint);
    if (!before) {
      const row = tx.insert(findings).values({ ...values, fingerprint: candidate.fingerprint, status: "open", conditionHolds: true, firstRaisedAt: now }).returning().get();
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
      const row = tx
        .update(findings)
        .set({ ...values, status: "open", conditionHolds: true, resolvedAt: null, riskAcceptedUntil: reviewPassed ? null : before.riskAcceptedUntil, updatedAt: now })
        .where(eq(findings.id, before.id))
        .returning()
        .get();
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
      before.title !== candidate.title;
    if (!anyChange) {
      unchangedIds.push(before.id);
      result.unchanged += 1;
      continue;
    }
    const row = tx.update(findings).set({ ...values, updatedAt: now }).where(eq(findings.id, before.id)).returning().get();
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
      if (SEVERITY_RANK[candidate.severity] > SEVERITY_RANK[before.severity] && WORKING.includes(before.status)) result.changes.push({ kind: "escalated", finding: row });
    } else {
      result.unchanged += 1;
    }
  }

  for (let i = 0; i < unchangedIds.length; i += 500) {
    tx.update(findings).set({ lastEvaluatedAt: now }).where(inArray(findings.id, unchangedIds.slice(i, i + 500))).run();
  }

  for (const [fingerprint, before] of existing) {
    if (seen.has(fingerprint) || !before.conditionHolds) continue;
    if (!isInScope(before, scope)) continue;
    const wasWorked = before.status !== "resolved";
    tx.update(findings)
      .set({ status: "resolved", conditionHolds: false, resolvedAt: wasWorked ? now : before.resolvedAt ?? now, lastEvaluatedAt: now, updatedAt: now })
      .where(eq(findings.id, before.id))
      .run();
    if (wasWorked) {
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

function isInScope(finding: ExistingFinding, scope: { roomIds: number[]; storageUnitIds: number[] }): boolean {
  if (finding.storageUnitId != null) return scope.storageUnitIds.includes(finding.storageUnitId);
  return finding.roomId != null && scope.roomIds.includes(finding.roomId);
}
