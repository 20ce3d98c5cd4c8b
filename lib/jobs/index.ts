import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { jobs } from "@/db/schema";
import { startDigestJob } from "@/lib/alerts/digest";
import { startBackupJob } from "@/lib/backup/job";
import { kickReassessments } from "@/lib/assessment/jobs";
import { startOutboxJob } from "@/lib/mail/deliver";
import { startSweepJob } from "@/lib/auth/sweep";
import { log } from "@/lib/log";
import { applySubstanceLibraryEdition } from "@/lib/substances/library-edition";
import { kickWarmUpFits } from "@/lib/temperatures/warm-up-jobs";

/** Background work of the server process, started once from instrumentation.ts. */
export function startJobs(): void {
  startOutboxJob();
  startDigestJob();
  startSweepJob();
  // A re-assessment that was running when the process stopped starts again from the beginning
  // (each batch is a transaction of its own, so running it twice is harmless).
  getDb().update(jobs).set({ status: "queued", progress: 0 }).where(eq(jobs.status, "running")).run();
  // A new edition of the substance library reaches the substances nobody edited (and queues a re-assessment).
  try {
    applySubstanceLibraryEdition(getDb());
  } catch (error) {
    log.error({ err: error }, "the substance library could not be brought up to its edition");
  }
  const timer = setInterval(kickReassessments, 30_000);
  timer.unref?.();
  kickReassessments();
  // Units whose excursion ended are fitted again (their warm-up τ) in the background.
  const fits = setInterval(kickWarmUpFits, 30_000);
  fits.unref?.();
  kickWarmUpFits();
  const backup = startBackupJob();
  log.info({ jobs: ["outbox", "daily-digest", "re-assessment", "warm-up-fits", ...(backup ? ["nightly-backup"] : [])] }, "background jobs started");
}
