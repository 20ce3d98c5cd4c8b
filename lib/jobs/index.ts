import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { jobs } from "@/db/schema";
import { checkCrossingAlerts } from "@/lib/alerts/crossing-alerts";
import { startDigestJob } from "@/lib/alerts/digest";
import { workerWritesDone } from "@/lib/workers/write-gate";
import { startBackupJob } from "@/lib/backup/job";
import { kickReassessments } from "@/lib/assessment/jobs";
import { kickOutbox, startOutboxJob } from "@/lib/mail/deliver";
import { startSweepJob } from "@/lib/auth/sweep";
import { log } from "@/lib/log";
import { applySubstanceLibraryEdition } from "@/lib/substances/library-edition";
import { kickWarmUpFits } from "@/lib/temperatures/warm-up-jobs";
import { startWebhookJob } from "@/lib/webhooks/deliver";

/** Background work of the server process, started once from instrumentation.ts. */
export function startJobs(): void {
  startOutboxJob();
  // Webhooks: signed deliveries from their outbox, with retries (lib/webhooks/deliver.ts).
  startWebhookJob();
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
  startCrossingWatch();
  const backup = startBackupJob();
  log.info({ jobs: ["outbox", "webhooks", "daily-digest", "re-assessment", "warm-up-fits", "crossing-watch", ...(backup ? ["nightly-backup"] : [])] }, "background jobs started");
}

/** How often open excursions are projected for crossings less than an hour away. */
const CROSSING_WATCH_MS = 2 * 60_000;
const globalWatch = globalThis as { headroomCrossingWatch?: ReturnType<typeof setInterval>; headroomCrossingBusy?: boolean };

/** Every two minutes: warn when an open excursion's projected crossing is less than an hour away (lib/alerts/crossing-alerts.ts). */
function startCrossingWatch(): void {
  if (globalWatch.headroomCrossingWatch) return;
  const run = async () => {
    if (globalWatch.headroomCrossingBusy) return;
    globalWatch.headroomCrossingBusy = true;
    try {
      // A worker committing a long batch holds SQLite's write lock: wait for it without blocking the thread.
      await workerWritesDone();
      const queued = checkCrossingAlerts(getDb());
      if (queued > 0) {
        log.info({ queued }, "projected crossings within the hour: warnings queued");
        kickOutbox();
      }
    } catch (error) {
      log.error({ err: error }, "the crossing watch failed; it runs again in two minutes");
    } finally {
      globalWatch.headroomCrossingBusy = false;
    }
  };
  globalWatch.headroomCrossingWatch = setInterval(() => void run(), CROSSING_WATCH_MS);
  globalWatch.headroomCrossingWatch.unref?.();
}
