import "server-only";
import fs from "node:fs";
import path from "node:path";
import { Piscina } from "piscina";
import { databasePath } from "@/db/client";
import { PROCESS_KEY } from "@/lib/assessment/process-key";
import { uploadDir } from "@/lib/config";
import { DomainError } from "@/lib/errors";
import { log } from "@/lib/log";
import { reviveError } from "./errors";
import { clearWriteGate, writeGateBuffer } from "./write-gate";
import type { Tasks } from "./tasks";
import type { TaskMessage, TaskOutcome } from "./worker";

/**
 * Worker threads for the heavy work (imports, big ingests, re-assessment, the export), so the
 * request thread stays free. One pool per process, cached on globalThis. See DEVELOPERS.md.
 */

/** Threads for a 2-core machine: the request thread keeps one core while two tasks run. */
const MAX_THREADS = 2;
/** An idle thread ends after this long; the next task starts one again (about a second). */
const IDLE_TIMEOUT_MS = 60_000;
/** A task beyond this heap ends its own thread, not the server. */
const DEFAULT_MAX_OLD_GENERATION_MB = 512;
/** Tasks waiting for a thread beyond this are refused with 503. */
const MAX_QUEUE = 64;

export type WorkerPoolOptions = {
  maxThreads?: number;
  maxOldGenerationSizeMb?: number;
  idleTimeoutMs?: number;
  /** A bundle to load instead of the usual entry (tests load a freshly built one). */
  bundle?: string;
};

/** The bundled entry production loads (scripts/build-workers.ts writes it after `next build`). */
export function workerBundlePath(): string {
  return path.join(process.cwd(), ".next", "workers", "worker.mjs");
}

/** The entry of the worker threads and the flags they start with. */
function workerEntry(): { filename: string; execArgv: string[] } {
  if (process.env.NODE_ENV === "production") {
    const filename = workerBundlePath();
    if (!fs.existsSync(filename)) {
      throw new Error(`The worker bundle ${filename} is missing: build the app with \`npm run build\` (or \`npx tsx scripts/build-workers.ts\` after \`next build\`).`);
    }
    return { filename, execArgv: [] };
  }
  return { filename: path.join(process.cwd(), "lib", "workers", "dev-entry.mjs"), execArgv: ["--conditions=react-server"] };
}

export function createWorkerPool(options: WorkerPoolOptions = {}): Piscina<TaskMessage, TaskOutcome> {
  const entry = options.bundle ? { filename: options.bundle, execArgv: [] } : workerEntry();
  const maxOldGenerationSizeMb = options.maxOldGenerationSizeMb ?? (Number(process.env.WORKER_MAX_OLD_GENERATION_MB) || DEFAULT_MAX_OLD_GENERATION_MB);
  const pool = new Piscina<TaskMessage, TaskOutcome>({
    filename: entry.filename,
    execArgv: entry.execArgv,
    minThreads: 0,
    maxThreads: options.maxThreads ?? MAX_THREADS,
    idleTimeout: options.idleTimeoutMs ?? IDLE_TIMEOUT_MS,
    maxQueue: MAX_QUEUE,
    // Tasks arrive by message: an idle worker's event loop keeps running (a task's MessagePort,
    // timers), instead of blocking in Atomics.wait.
    atomics: "disabled",
    resourceLimits: { maxOldGenerationSizeMb },
    // Assessments digest their inputs with this process's key; the threads use the same one.
    // …and raise the write gate (lib/workers/write-gate.ts) around their long write transactions.
    workerData: { assessmentKey: PROCESS_KEY, writeGate: writeGateBuffer() },
  });
  // A thread that fails with no task running is replaced; the event must not end the process.
  pool.on("error", (error) => {
    clearWriteGate();
    log.error({ err: error }, "a worker thread failed");
  });
  return pool;
}

const globalForPool = globalThis as unknown as { __headroomWorkerPool?: Piscina<TaskMessage, TaskOutcome> };

/** The process's pool, started on first use. */
export function workerPool(): Piscina<TaskMessage, TaskOutcome> {
  return (globalForPool.__headroomWorkerPool ??= createWorkerPool());
}

/** Stops the process's pool (tests and scripts); running tasks are ended. */
export async function closeWorkerPool(): Promise<void> {
  const pool = globalForPool.__headroomWorkerPool;
  globalForPool.__headroomWorkerPool = undefined;
  await pool?.destroy();
}

/** A worker thread stopped while running a task (out of memory, a crash): nothing it began is committed. */
export class WorkerStoppedError extends DomainError {
  constructor(
    readonly task: string,
    readonly reason: string,
    outOfMemory: boolean,
  ) {
    super(
      "worker_stopped",
      outOfMemory
        ? "This needed more memory than one task may use, so it was stopped and nothing was written. Try a smaller file."
        : "The work was stopped by an error on the server and nothing was written. The error was logged; try again.",
      outOfMemory ? 413 : 500,
    );
  }
}

export class ServerBusyError extends DomainError {
  constructor() {
    super("server_busy", "The server is busy with other imports and exports. Try again in a minute.", 503);
  }
}

export type TaskArgs<N extends keyof Tasks> = Parameters<Tasks[N]>[0];
export type TaskResult<N extends keyof Tasks> = Awaited<ReturnType<Tasks[N]>>;
type RunOptions = { transferList?: Transferable[]; signal?: AbortSignal; pool?: Piscina<TaskMessage, TaskOutcome> };

/**
 * Runs a task of lib/workers/tasks.ts in a worker thread. Resolves with its result; rejects with the
 * task's own error rebuilt as the same class (a DomainError keeps its code, status, fields and
 * extra properties), with WorkerStoppedError when the thread died under it, with ServerBusyError
 * when too many tasks wait.
 */
export async function runTask<N extends keyof Tasks>(name: N, args: TaskArgs<N>, options?: RunOptions): Promise<TaskResult<N>> {
  return runNamedTask(name, args, options) as Promise<TaskResult<N>>;
}

/** The same for any name (tests run the diagnostic tasks with it). */
export async function runNamedTask(name: string, args: unknown, options: RunOptions = {}): Promise<unknown> {
  const pool = options.pool ?? workerPool();
  const message: TaskMessage = { name, args, context: { databasePath: path.resolve(databasePath()), uploadDir: path.resolve(uploadDir()) } };
  let outcome: TaskOutcome;
  try {
    outcome = await pool.run(message, { transferList: options.transferList as never, signal: options.signal });
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    if (reason === "Task queue is at limit") throw new ServerBusyError();
    if (error instanceof Error && error.name === "AbortError") throw error;
    const outOfMemory = (error as { code?: string }).code === "ERR_WORKER_OUT_OF_MEMORY";
    // It may have died inside a write transaction (SQLite rolled it back): the gate must not stay up.
    clearWriteGate();
    log.error({ err: error, task: name }, "a worker thread stopped while running a task");
    throw new WorkerStoppedError(name, reason, outOfMemory);
  }
  if (outcome.ok) return outcome.value;
  throw reviveError(outcome.error, `worker task ${name}`);
}

/** Bytes to hand to a worker without a copy, when they own their whole buffer. */
export function transferable(bytes: Uint8Array): Transferable[] {
  return bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength && bytes.buffer instanceof ArrayBuffer ? [bytes.buffer] : [];
}
