import "server-only";
import { and, desc, eq, inArray, isNull, or } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { containers, jobs, mixtureComponents, rooms, storageUnits, type Job } from "@/db/schema";
import { log } from "@/lib/log";
import { loadAssessmentSettings, reassessRooms, SnapshotLibrary } from "./service";
import { holdingWriteGate } from "@/lib/workers/write-gate";

export const REASSESS_JOB = "reassess";
/** Rooms per transaction: each batch commits on its own, so requests keep being served between them. */
const ROOMS_PER_BATCH = 25;

type JobPlan = { roomIds: number[]; reason: string };

/**
 * Queues a re-assessment of many locations (a setting or a substance changed) as a background job
 * with progress, in the caller's transaction so that it exists exactly when the change does. The
 * plan (rooms and reason) is kept in the job's `error` column until it starts.
 */
export function queueReassessment(tx: DbOrTx, plan: JobPlan, requestedById: number | null): Job {
  return tx.insert(jobs).values({ kind: REASSESS_JOB, status: "queued", progress: 0, total: plan.roomIds.length, error: JSON.stringify(plan), requestedById }).returning().get();
}

/** Every live room: for settings that touch every assessment. */
export function allRoomIds(tx: DbOrTx): number[] {
  return tx.select({ id: rooms.id }).from(rooms).where(isNull(rooms.retiredAt)).all().map((r) => r.id);
}

/** Rooms holding a substance, alone or in a mixture. */
export function roomsHoldingSubstance(tx: DbOrTx, substanceId: number): number[] {
  const mixtureIds = tx.select({ id: mixtureComponents.mixtureId }).from(mixtureComponents).where(eq(mixtureComponents.substanceId, substanceId)).all().map((m) => m.id);
  const held = tx
    .selectDistinct({ roomId: storageUnits.roomId })
    .from(containers)
    .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
    .where(mixtureIds.length ? or(eq(containers.substanceId, substanceId), inArray(containers.mixtureId, mixtureIds)) : eq(containers.substanceId, substanceId))
    .all();
  return held.map((r) => r.roomId);
}

/** Runs one queued job to the end, batch by batch; a failure is recorded on the job and logged. */
export async function runReassessmentJob(jobId: number, opts: { yieldBetweenBatches?: boolean } = {}): Promise<Job> {
  const db = getDb();
  const claimed = db.update(jobs).set({ status: "running", startedAt: new Date() }).where(and(eq(jobs.id, jobId), eq(jobs.status, "queued"))).returning().get();
  if (!claimed) return db.select().from(jobs).where(eq(jobs.id, jobId)).get()!;
  const plan = JSON.parse(claimed.error ?? '{"roomIds":[],"reason":""}') as JobPlan;
  try {
    const settings = loadAssessmentSettings(db);
    const library = new SnapshotLibrary(db);
    for (let i = 0; i < plan.roomIds.length; i += ROOMS_PER_BATCH) {
      const batch = plan.roomIds.slice(i, i + ROOMS_PER_BATCH);
      holdingWriteGate(() =>
        db.transaction((tx) => {
          reassessRooms(tx, batch, { reason: plan.reason, settings, library });
          tx.update(jobs).set({ progress: Math.min(plan.roomIds.length, i + batch.length) }).where(eq(jobs.id, jobId)).run();
        }),
      );
      if (opts.yieldBetweenBatches !== false) await new Promise((resolve) => setImmediate(resolve));
    }
    return db.update(jobs).set({ status: "done", error: null, progress: plan.roomIds.length, finishedAt: new Date() }).where(eq(jobs.id, jobId)).returning().get();
  } catch (error) {
    log.error({ err: error, jobId }, "re-assessment job failed");
    return db.update(jobs).set({ status: "failed", error: error instanceof Error ? error.message : String(error), finishedAt: new Date() }).where(eq(jobs.id, jobId)).returning().get();
  }
}

/**
 * Starts queued re-assessments, one after another, each in a worker thread (called after a change
 * and by the job timer): this thread only picks the next job. The worker writes the progress and
 * records a failure on the job; a worker that dies under a job leaves it to be marked here.
 */
export function kickReassessments(): void {
  const state = globalThis as unknown as { headroomReassessing?: boolean };
  if (state.headroomReassessing) return;
  state.headroomReassessing = true;
  void (async () => {
    try {
      // Loaded when needed: the worker threads load this module too, and never start a pool.
      const { runTask } = await import("@/lib/workers/pool");
      for (;;) {
        const next = getDb().select({ id: jobs.id }).from(jobs).where(and(eq(jobs.kind, REASSESS_JOB), eq(jobs.status, "queued"))).orderBy(jobs.id).limit(1).get();
        if (!next) break;
        try {
          await runTask("assessment.runJob", { jobId: next.id });
        } catch (error) {
          log.error({ err: error, jobId: next.id }, "re-assessment job stopped in its worker");
          const message = error instanceof Error ? error.message : String(error);
          getDb()
            .update(jobs)
            .set({ status: "failed", error: message, finishedAt: new Date() })
            .where(and(eq(jobs.id, next.id), inArray(jobs.status, ["queued", "running"])))
            .run();
        }
      }
    } catch (error) {
      log.error({ err: error }, "re-assessments stopped; the job timer starts them again");
    } finally {
      state.headroomReassessing = false;
    }
  })();
}

/** The latest re-assessment job, for the progress shown on the register. */
export function latestReassessment(): Job | undefined {
  return getDb().select().from(jobs).where(eq(jobs.kind, REASSESS_JOB)).orderBy(desc(jobs.id)).limit(1).get();
}
