import "server-only";
import { startDigestJob } from "@/lib/alerts/digest";
import { startOutboxJob } from "@/lib/mail/deliver";
import { log } from "@/lib/log";

/** Background work of the server process, started once from instrumentation.ts. */
export function startJobs(): void {
  startOutboxJob();
  startDigestJob();
  log.info({ jobs: ["outbox", "daily-digest"] }, "background jobs started");
}
