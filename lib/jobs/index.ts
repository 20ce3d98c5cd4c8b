import "server-only";
import { startOutboxJob } from "@/lib/mail/deliver";
import { log } from "@/lib/log";

/** Background work of the server process, started once from instrumentation.ts. */
export function startJobs(): void {
  startOutboxJob();
  log.info({ jobs: ["outbox"] }, "background jobs started");
}
