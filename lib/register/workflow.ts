import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { findingsVisibleTo } from "@/db/queries/findings";
import { findingEvents, findings, users, type Finding, type FindingStatus } from "@/db/schema";
import { auditSnapshot } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import { authorizeAction } from "@/lib/auth/guard";
import type { Action } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, NotFoundError, ValidationError } from "@/lib/errors";
import { reassessRooms } from "@/lib/assessment/service";
import { queueFindingResolvedByPerson } from "@/lib/webhooks/domain-events";
import { checkFindingCondition, conditionStillHoldsMessage, RESOLVED_CONFIRMED_MESSAGE } from "./resolve-check";
import { MAX_RISK_ACCEPTANCE_DAYS, type FindingEventInput } from "./schemas";

type Kind = FindingEventInput["kind"];

/** Who may take each step (the matrix decides; "own" is enforced by the query below). */
export const ACTION_FOR_STEP: Record<Kind, Action> = {
  acknowledge: "findings.acknowledge",
  comment: "findings.comment",
  start_mitigation: "findings.work",
  resolve: "findings.work",
  assign: "findings.work",
  reopen: "findings.work",
  accept_risk: "findings.acceptRisk",
};

/** The statuses a step may start from; comments and assignment go with any status. */
export const ALLOWED_FROM: Partial<Record<Kind, FindingStatus[]>> = {
  acknowledge: ["open"],
  start_mitigation: ["open", "acknowledged"],
  resolve: ["open", "acknowledged", "mitigating", "risk_accepted"],
  accept_risk: ["open", "acknowledged", "mitigating"],
  reopen: ["resolved", "risk_accepted"],
};

const STATUS_LABEL: Record<FindingStatus, string> = {
  open: "open",
  acknowledged: "acknowledged",
  mitigating: "being mitigated",
  resolved: "resolved",
  risk_accepted: "risk accepted",
};

const EVENT_KIND = {
  acknowledge: "acknowledged",
  start_mitigation: "mitigation_started",
  resolve: "resolved",
  accept_risk: "risk_accepted",
  comment: "comment",
  assign: "assigned",
  reopen: "reopened",
} as const;

/** The finding after a step, with what to tell the person who took it (set for a resolve). */
export type FindingStepResult = Finding & { message?: string };

/**
 * One workflow step on a finding, with its event and an audit record in one transaction. The step's
 * own permission is checked here (after the route's), and a researcher or facilities member can
 * only touch findings on what they own or look after.
 *
 * Resolving re-assesses at once. "Resolve" says the condition is gone, so in the same transaction
 * the rules run again for the finding's location on the inventory, temperatures and settings as
 * they are now, and the register is brought in line with them (reassessRooms):
 * - the condition no longer holds: the finding is resolved with the person's note;
 * - it still holds: the finding is not resolved. It keeps its status (open, acknowledged, being
 *   mitigated, or risk accepted with its review date), its plan and its owner, so nothing the team
 *   was doing is lost; the history records the attempt with the person's note and the reason, and
 *   the person is told in plain words ("The condition still holds: … so the finding stays open")
 *   and what the two ways on are: record the change that removes the condition, or accept the
 *   risk. The returned `message` carries that text.
 */
export function applyFindingStep(actor: SessionUser, findingId: number, input: FindingEventInput, nowMs = Date.now()): FindingStepResult {
  const { scope } = authorizeAction(actor, ACTION_FOR_STEP[input.kind]);
  const now = new Date(nowMs);
  return getDb().transaction((tx) => {
    const before = tx.select().from(findings).where(and(eq(findings.id, findingId), findingsVisibleTo(actor, scope))).get();
    if (!before) throw new NotFoundError("No such finding, or it is not on a location you look after.");
    const allowed = ALLOWED_FROM[input.kind];
    if (allowed && !allowed.includes(before.status)) {
      throw new ConflictError(`This finding is ${STATUS_LABEL[before.status]}; it cannot be ${input.kind === "reopen" ? "re-opened" : `moved on by “${input.kind.replace("_", " ")}”`} from there.`);
    }
    let toStatus: FindingStatus = before.status;
    let eventKind: (typeof EVENT_KIND)[Kind] | "comment" = EVENT_KIND[input.kind];
    let message: string | undefined;
    let reassess: ReturnType<typeof checkFindingCondition> | null = null;
    let note: string | null = null;
    const changes: Partial<typeof findings.$inferInsert> = {};
    const data: Record<string, unknown> = {};
    const assignee = (id: number) => {
      const person = tx.select({ id: users.id, name: users.name, active: users.active, role: users.role }).from(users).where(eq(users.id, id)).get();
      if (!person || !person.active || person.role === "auditor") {
        throw new ValidationError("Choose an active person who can work on findings.", { assigneeId: ["Choose an active person who can work on findings."] });
      }
      return person;
    };
    switch (input.kind) {
      case "acknowledge":
        toStatus = "acknowledged";
        note = input.note ?? null;
        break;
      case "start_mitigation": {
        const person = assignee(input.assigneeId);
        toStatus = "mitigating";
        note = input.plan;
        Object.assign(changes, { mitigationPlan: input.plan, assigneeId: person.id });
        Object.assign(data, { assigneeId: person.id, assigneeName: person.name });
        break;
      }
      case "resolve": {
        reassess = checkFindingCondition(tx, before, nowMs);
        const { check } = reassess;
        if (check.holds) {
          message = conditionStillHoldsMessage(check, before.status, before.riskAcceptedUntil);
          eventKind = "comment";
          note = `Not resolved. ${message}\nResolution note: ${input.note}`;
          Object.assign(data, { resolveRefused: true, value: check.value, limit: check.limitValue, unit: check.unit });
        } else {
          message = RESOLVED_CONFIRMED_MESSAGE;
          toStatus = "resolved";
          note = input.note;
          Object.assign(changes, { resolvedAt: now, riskAcceptedUntil: null, conditionHolds: false });
        }
        break;
      }
      case "accept_risk": {
        const until = input.reviewDate!;
        if (until <= nowMs) throw new ValidationError("The review date must be in the future.", { reviewDate: ["The review date must be in the future."] });
        if (until > nowMs + MAX_RISK_ACCEPTANCE_DAYS * 86_400_000) {
          throw new ValidationError("Review an accepted risk at least every three years.", { reviewDate: ["Choose a review date within three years."] });
        }
        toStatus = "risk_accepted";
        note = input.justification;
        Object.assign(changes, { riskAcceptedUntil: new Date(until) });
        data.reviewDate = new Date(until).toISOString().slice(0, 10);
        break;
      }
      case "comment":
        note = input.note;
        break;
      case "assign": {
        const person = assignee(input.assigneeId);
        Object.assign(changes, { assigneeId: person.id });
        Object.assign(data, { assigneeId: person.id, assigneeName: person.name });
        note = `Assigned to ${person.name}`;
        break;
      }
      case "reopen":
        toStatus = "open";
        note = input.note;
        Object.assign(changes, { resolvedAt: null, riskAcceptedUntil: null });
        break;
    }
    const after = tx
      .update(findings)
      .set({ ...changes, status: toStatus, updatedAt: now })
      .where(eq(findings.id, before.id))
      .returning()
      .get();
    tx.insert(findingEvents)
      .values({ findingId: before.id, kind: eventKind, fromStatus: before.status, toStatus, note, actorId: actor.id, data: Object.keys(data).length ? data : null, at: now })
      .run();
    recordAudit(tx, actor, {
      action: eventKind === EVENT_KIND[input.kind] ? eventKind : "resolve_refused",
      entityType: "finding",
      entityId: before.id,
      summary: `${before.title}: ${input.kind.replace("_", " ")}${before.status !== toStatus ? ` (${STATUS_LABEL[before.status]} → ${STATUS_LABEL[toStatus]})` : ""}${note ? ` — ${note}` : ""}`,
      before: auditSnapshot({ status: before.status, assigneeId: before.assigneeId, mitigationPlan: before.mitigationPlan, riskAcceptedUntil: before.riskAcceptedUntil }),
      after: auditSnapshot({ status: after.status, assigneeId: after.assigneeId, mitigationPlan: after.mitigationPlan, riskAcceptedUntil: after.riskAcceptedUntil }),
    });
    if (toStatus === "resolved" && before.status !== "resolved") queueFindingResolvedByPerson(tx, after, now);
    if (reassess && before.roomId != null) {
      // The rest of the location in line too (values, other findings), in this transaction.
      reassessRooms(tx, [before.roomId], { nowMs, reason: `finding ${before.id} was marked resolved`, settings: reassess.settings, library: reassess.library });
      const current = tx.select().from(findings).where(eq(findings.id, before.id)).get() ?? after;
      return { ...current, message };
    }
    return after;
  });
}
