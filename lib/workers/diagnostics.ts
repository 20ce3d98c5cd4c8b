/**
 * Tasks that exist to prove the pool's behaviour in tests: a long computation, a crash in the
 * middle of a write, memory that runs out, a domain error. The worker loads them only under vitest.
 */
import { getDb } from "@/db/client";
import { DomainError, ValidationError } from "@/lib/errors";
import { holdingWriteGate } from "./write-gate";

export const diagnosticTasks = {
  /** Keeps the worker's thread busy for `ms` without yielding; returns how many loops it made. */
  "diagnostics.busy": ({ ms }: { ms: number }) => {
    const until = performance.now() + ms;
    let loops = 0;
    while (performance.now() < until) loops++;
    return { loops };
  },
  /** Writes through the worker's own connection: a row in `settings`. */
  "diagnostics.write": ({ key, value }: { key: string; value: unknown }) => {
    getDb().$client.prepare("insert into settings (key, value) values (?, ?) on conflict (key) do update set value = excluded.value").run(key, JSON.stringify(value));
    return { key };
  },
  /** A long write: holds SQLite's write lock for `ms` (with the write gate raised unless `gate` is false), then commits a row. */
  "diagnostics.longWrite": ({ key, ms, gate = true }: { key: string; ms: number; gate?: boolean }) => {
    const sqlite = getDb().$client;
    const write = sqlite.transaction(() => {
      sqlite.prepare("insert into settings (key, value) values (?, '1') on conflict (key) do update set value = excluded.value").run(key);
      const until = performance.now() + ms;
      while (performance.now() < until) {
        // holding the lock
      }
    });
    if (gate) holdingWriteGate(() => write.immediate());
    else write.immediate();
    return { key };
  },
  /** Starts a write transaction (with the write gate raised), writes a row, and ends the thread before it commits. */
  "diagnostics.exitInTransaction": ({ key }: { key: string }) => {
    const sqlite = getDb().$client;
    holdingWriteGate(() => {
      sqlite.prepare("begin immediate").run();
      sqlite.prepare("insert into settings (key, value) values (?, '1')").run(key);
      process.exit(3);
    });
  },
  /** Allocates until the heap limit ends the thread. */
  "diagnostics.exhaustMemory": () => {
    const kept: number[][] = [];
    for (;;) kept.push(Array.from({ length: 1_000_000 }, (_, i) => i + kept.length));
  },
  /** Throws a typed error with extra properties, as the services do. */
  "diagnostics.fail": ({ kind }: { kind: "validation" | "domain" | "plain" }) => {
    if (kind === "validation") throw new ValidationError("Check the highlighted fields.", { amount: ["Enter an amount above 0 mL."] });
    if (kind === "domain") throw Object.assign(new DomainError("upload_not_found", "That upload has expired.", 404), { detail: { line: 7 } });
    throw new TypeError("Cannot read properties of undefined (reading 'id')");
  },
};
