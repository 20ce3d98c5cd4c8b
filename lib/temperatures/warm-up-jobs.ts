import "server-only";
import { and, eq, inArray } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { jobs } from "@/db/schema";
import { kickReassessments } from "@/lib/assessment/jobs";
import { log } from "@/lib/log";
import { holdingWriteGate } from "@/lib/workers/write-gate";
import { refitUnitWarmUp } from "./warm-up-store";

export const WARM_UP_FIT_JOB = "warm_up_fit";

type Plan = { unitId: number };

/**
 * Queues a fit of these units' warm-up (an excursion of theirs has ended), in the caller's
 * transaction; a unit already waiting for one is not queued twice. The fit reads the readings of
 * the unit's failures, so it runs in the background (`kickWarmUpFits`), not on the request.
 */
export function queueWarmUpFits(tx: DbOrTx, unitIds: readonly number[]): number[] {
  const queued: number[] = [];
  for (const unitId of [...new Set(unitIds)]) {
    const plan = JSON.stringify({ unitId } satisfies Plan);
    const waiting = tx.select({ id: jobs.id }).from(jobs).where(and(eq(jobs.kind, WARM_UP_FIT_JOB), eq(jobs.status, "queued"), eq(jobs.error, plan))).get();
    if (waiting) continue;
    queued.push(tx.insert(jobs).values({ kind: WARM_UP_FIT_JOB, status: "queued", progress: 0, total: 1, error: plan }).returning({ id: jobs.id }).get().id);
  }
  return queued;
}

/** Runs one queued fit: the unit's τ fitted again, stored when it changed, and its room queued for re-assessment then. */
export function runWarmUpFitJob(jobId: number): { status: string; reassessmentJobId: number | null } {
  const db = getDb();
  const claimed = db.update(jobs).set({ status: "running", startedAt: new Date() }).where(and(eq(jobs.id, jobId), eq(jobs.status, "queued"))).returning().get();
  if (!claimed) return { status: "skipped", reassessmentJobId: null };
  try {
    const { unitId } = JSON.parse(claimed.error ?? "{}") as Plan;
    const outcome = holdingWriteGate(() => db.transaction((tx) => refitUnitWarmUp(tx, unitId)));
    db.update(jobs).set({ status: "done", error: null, progress: 1, finishedAt: new Date() }).where(eq(jobs.id, jobId)).run();
    log.info(
      { jobId, unitId, tauMin: outcome.fit?.tauMin ?? null, rmsErrorC: outcome.fit?.rmsErrorC ?? null, stored: outcome.stored !== null, rejected: outcome.rejected.length },
      "warm-up fit",
    );
    return { status: "done", reassessmentJobId: outcome.reassessmentJobId };
  } catch (error) {
    log.error({ err: error, jobId }, "warm-up fit failed");
    db.update(jobs).set({ status: "failed", error: error instanceof Error ? error.message : String(error), finishedAt: new Date() }).where(eq(jobs.id, jobId)).run();
    return { status: "failed", reassessmentJobId: null };
  }
}

/**
 * Runs the queued fits one after another in a worker thread (called by the job timer), then starts
 * the re-assessments they queued.
 */
export function kickWarmUpFits(): void {
  const state = globalThis as unknown as { headroomFittingWarmUps?: boolean };
  if (state.headroomFittingWarmUps) return;
  state.headroomFittingWarmUps = true;
  void (async () => {
    let reassess = false;
    try {
      // Loaded when needed: the worker threads load this module too, and never start a pool.
      const { runTask } = await import("@/lib/workers/pool");
      for (;;) {
        const next = getDb().select({ id: jobs.id }).from(jobs).where(and(eq(jobs.kind, WARM_UP_FIT_JOB), eq(jobs.status, "queued"))).orderBy(jobs.id).limit(1).get();
        if (!next) break;
        try {
          const result = await runTask("temperatures.fitWarmUp", { jobId: next.id });
          if (result.reassessmentJobId !== null) reassess = true;
        } catch (error) {
          log.error({ err: error, jobId: next.id }, "warm-up fit stopped in its worker");
          getDb()
            .update(jobs)
            .set({ status: "failed", error: error instanceof Error ? error.message : String(error), finishedAt: new Date() })
            .where(and(eq(jobs.id, next.id), inArray(jobs.status, ["queued", "running"])))
            .run();
        }
      }
    } catch (error) {
      log.error({ err: error }, "warm-up fits stopped; the job timer starts them again");
    } finally {
      state.headroomFittingWarmUps = false;
      if (reassess) kickReassessments();
    }
  })();
}
