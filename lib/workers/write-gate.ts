import { workerData } from "node:worker_threads";

/**
 * SQLite lets one connection write at a time. The long write transactions (an import's commit, a
 * big batch of readings, a re-assessment batch) run in worker threads; a write on the request
 * thread that meets one waits in better-sqlite3's busy handler, which sleeps synchronously: the
 * whole server would stop answering until the worker commits (seconds for a million readings).
 *
 * The gate is a counter in memory shared with the pool's threads (handed over in workerData). A
 * worker raises it around each long write transaction; the request thread, before it writes, waits
 * for it to come down without blocking (other requests go on meanwhile), and skips writes that can
 * wait (a session's last-seen time). A thread that dies holding it is cleared by the pool.
 */

/** The longest a request thread's write waits for the workers; past it, it writes and SQLite's busy timeout applies. */
export const MAX_GATE_WAIT_MS = 30_000;

const globalForGate = globalThis as unknown as { __headroomWriteGate?: SharedArrayBuffer };

/** The gate of this process (created by the request thread; handed to each pool thread in workerData). */
export function writeGateBuffer(): SharedArrayBuffer {
  return (globalForGate.__headroomWriteGate ??= new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT));
}

function gate(): Int32Array {
  // In a pool thread, the request thread's gate; anywhere else (the server, scripts, tests) this process's own.
  const inherited = (workerData as { writeGate?: unknown } | null)?.writeGate;
  return new Int32Array(inherited instanceof SharedArrayBuffer ? inherited : writeGateBuffer());
}

/** Runs a (synchronous) write transaction with the gate raised. */
export function holdingWriteGate<T>(work: () => T): T {
  const counter = gate();
  Atomics.add(counter, 0, 1);
  try {
    return work();
  } finally {
    Atomics.sub(counter, 0, 1);
    Atomics.notify(counter, 0);
  }
}

/** Whether a worker is inside a long write transaction now. */
export function writeGateRaised(): boolean {
  return Atomics.load(gate(), 0) > 0;
}

/** Atomics.waitAsync (Node ≥ 16; its types come with the ES2024 library). */
const waitAsync = (Atomics as unknown as {
  waitAsync: (array: Int32Array, index: number, value: number, timeoutMs: number) => { async: false; value: string } | { async: true; value: Promise<string> };
}).waitAsync;

/** Resolves once no worker is inside a long write transaction (at most `maxWaitMs`). Never blocks the thread. */
export async function workerWritesDone(maxWaitMs: number = MAX_GATE_WAIT_MS): Promise<void> {
  const counter = gate();
  const deadline = performance.now() + maxWaitMs;
  for (;;) {
    const holders = Atomics.load(counter, 0);
    const remaining = deadline - performance.now();
    if (holders <= 0 || remaining <= 0) return;
    const waited = waitAsync(counter, 0, holders, remaining);
    if (waited.async) await waited.value;
  }
}

/** After a pool thread died (perhaps holding the gate): nobody is writing any more. */
export function clearWriteGate(): void {
  const counter = gate();
  Atomics.store(counter, 0, 0);
  Atomics.notify(counter, 0);
}
