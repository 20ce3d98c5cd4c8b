import { randomUUID } from "node:crypto";
import { isMainThread, workerData } from "node:worker_threads";

/**
 * Changes with every start of the process, so an input key written by another process, or by an
 * earlier version of the rules, never matches: after a deploy every room is assessed afresh. The
 * worker threads of lib/workers/pool.ts receive the key of the process that started them, so a
 * room assessed in a worker counts as assessed for the request thread too, and the other way round.
 */
const fromParent = !isMainThread && typeof workerData?.assessmentKey === "string" ? (workerData.assessmentKey as string) : null;

export const PROCESS_KEY: string = fromParent ?? randomUUID();
