/**
 * The entry of the worker threads (piscina calls the default export once per task). Production
 * loads it bundled (`.next/workers/worker.mjs`, scripts/build-workers.ts); development, tests and
 * scripts load the TypeScript through tsx (`lib/workers/dev-entry.mjs`).
 */
import { serializeError, type SerializedError } from "./errors";
import { tasks } from "./tasks";

/** What the main thread sends: the task, its arguments, and the files this process works on. */
export type TaskMessage = { name: string; args: unknown; context: { databasePath: string; uploadDir: string } };
export type TaskOutcome = { ok: true; value: unknown } | { ok: false; error: SerializedError };

type AnyTask = (args: never) => unknown;
let table: Record<string, AnyTask> | undefined;

async function taskTable(): Promise<Record<string, AnyTask>> {
  if (!table) {
    const diagnostics = process.env.VITEST ? (await import("./diagnostics")).diagnosticTasks : {};
    table = { ...tasks, ...diagnostics };
  }
  return table;
}

export default async function runTaskInWorker({ name, args, context }: TaskMessage): Promise<TaskOutcome> {
  // db/client and lib/config read these; the worker's environment is its own copy.
  process.env.DATABASE_PATH = context.databasePath;
  process.env.UPLOAD_DIR = context.uploadDir;
  try {
    const task = (await taskTable())[name];
    if (!task) throw new Error(`No worker task is called “${name}”.`);
    return { ok: true, value: await task(args as never) };
  } catch (error) {
    return { ok: false, error: serializeError(error) };
  }
}
