import "server-only";
import { getDb } from "@/db/client";
import { authorizeAction } from "@/lib/auth/guard";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, NotFoundError } from "@/lib/errors";
import type { BulkFindingEventInput, FindingEventInput } from "./schemas";
import { ACTION_FOR_STEP, applyFindingStep } from "./workflow";

export type BulkStepResult = { findingId: number; ok: true } | { findingId: number; ok: false; error: { code: string; message: string } };

/**
 * One workflow step on many findings in one transaction. The actor's role must allow the step
 * (else 403 for the whole request); then each finding goes through the one-finding step on its
 * own — visibility (a researcher's own containers, a facilities member's locations) and the
 * status it may start from are checked per finding, and a finding that is refused keeps nothing
 * of the step (its savepoint is rolled back) and gets its own error. Input that is wrong for
 * every finding (an inactive assignee, a review date in the past) fails the whole request with 400
 * and writes nothing.
 */
export function applyFindingStepToMany(actor: SessionUser, input: BulkFindingEventInput, nowMs = Date.now()): BulkStepResult[] {
  authorizeAction(actor, ACTION_FOR_STEP[input.kind]);
  const { findingIds, ...rest } = input;
  const step = rest as FindingEventInput;
  return getDb().transaction(() =>
    findingIds.map((findingId): BulkStepResult => {
      try {
        applyFindingStep(actor, findingId, step, nowMs);
        return { findingId, ok: true };
      } catch (error) {
        if (error instanceof NotFoundError || error instanceof ConflictError) {
          return { findingId, ok: false, error: { code: error.code, message: error.message } };
        }
        throw error;
      }
    }),
  );
}
