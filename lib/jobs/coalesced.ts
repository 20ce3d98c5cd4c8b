import { log } from "@/lib/log";

/**
 * A background job that runs one pass at a time: a kick while a pass runs asks for one more pass
 * afterwards instead of a second pass at once, and a timer kicks it regularly. Its state lives on
 * globalThis so that a module loaded twice (route bundles, instrumentation) shares one job.
 * Errors are logged, never thrown. Under vitest it stays off unless `testsEnv` is set, so tests run
 * passes themselves.
 */
export type CoalescedJob = { kick(): void; start(intervalMs: number): void };

type JobState = { running: boolean; again: boolean; timer?: ReturnType<typeof setInterval> };

export function coalescedJob(name: string, options: { testsEnv: string; pass: () => Promise<{ more: boolean } | void> }): CoalescedJob {
  const key = `__headroomJob_${name}`;
  const store = globalThis as unknown as Record<string, JobState | undefined>;
  const state = (): JobState => (store[key] ??= { running: false, again: false });

  const kick = (): void => {
    if (process.env.VITEST && !process.env[options.testsEnv]) return;
    const s = state();
    if (s.running) {
      s.again = true;
      return;
    }
    s.running = true;
    void (async () => {
      try {
        do {
          s.again = false;
          const result = await options.pass();
          if (result?.more) s.again = true;
        } while (s.again);
      } catch (error) {
        log.error({ job: name, err: error }, "job run failed");
      } finally {
        s.running = false;
      }
    })();
  };

  const start = (intervalMs: number): void => {
    const s = state();
    if (s.timer) return;
    s.timer = setInterval(kick, intervalMs);
    s.timer.unref?.();
    kick();
  };

  return { kick, start };
}
