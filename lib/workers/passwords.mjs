/**
 * The password thread: bcryptjs hashing and comparing, off the request thread. Plain JavaScript so
 * that development, tests and `next start` load the same file with no build step. See
 * lib/auth/passwords.ts, which runs it in a one-thread pool.
 */
import bcrypt from "bcryptjs";

/** @param {{ op: "hash", password: string, cost: number } | { op: "compare", password: string, hash: string }} task */
export default function passwordTask(task) {
  if (task.op === "hash") return bcrypt.hashSync(task.password, task.cost);
  if (task.op === "compare") return bcrypt.compareSync(task.password, task.hash);
  throw new Error(`Unknown password task ${String(task.op)}`);
}
