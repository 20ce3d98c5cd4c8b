import "server-only";
import { log } from "@/lib/log";
import { sweepRateLimits } from "@/lib/rate-limit";
import { sweepSessions } from "./session-store";

export const SWEEP_INTERVAL_MS = 10 * 60_000;

/** Deletes ended sessions and rate-limit counters whose window is over: now, then every ten minutes. */
export function startSweepJob(): void {
  const run = () => {
    try {
      const sessions = sweepSessions();
      const counters = sweepRateLimits();
      log.info({ job: "sweep", sessions, counters }, "job run");
    } catch (error) {
      log.error({ err: error, job: "sweep" }, "job failed");
    }
  };
  const timer = setInterval(run, SWEEP_INTERVAL_MS);
  timer.unref?.();
  run();
}
