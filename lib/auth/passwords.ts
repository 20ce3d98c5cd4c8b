import "server-only";
import path from "node:path";
import { Piscina } from "piscina";
import { bcryptCost } from "@/lib/config";
import { RateLimitedError } from "@/lib/errors";

/**
 * Passwords are hashed and compared (bcryptjs) in a thread of their own, one at a time: a burst of
 * sign-ins never holds the request thread (bcrypt at cost 12 is about a quarter of a second of CPU
 * per password), and never takes more than one core from everything else. At most this many wait
 * for the thread; beyond them a sign-in is refused with 429.
 */
export const MAX_WAITING_HASHES = 64;
/** The thread stays for a while after its last hash, so that a sign-in does not start one each time. */
const IDLE_TIMEOUT_MS = 10 * 60_000;

type PasswordTask = { op: "hash"; password: string; cost: number } | { op: "compare"; password: string; hash: string };

const globalForPasswords = globalThis as unknown as { __headroomPasswordPool?: Piscina<PasswordTask, string | boolean> };

function passwordPool(): Piscina<PasswordTask, string | boolean> {
  return (globalForPasswords.__headroomPasswordPool ??= new Piscina<PasswordTask, string | boolean>({
    // Plain JavaScript, loaded as it is in development, tests and production alike.
    filename: path.join(process.cwd(), "lib", "workers", "passwords.mjs"),
    minThreads: 0,
    maxThreads: 1,
    idleTimeout: IDLE_TIMEOUT_MS,
    maxQueue: MAX_WAITING_HASHES,
    atomics: "disabled",
  }));
}

async function run<T extends string | boolean>(task: PasswordTask): Promise<T> {
  try {
    return (await passwordPool().run(task)) as T;
  } catch (error) {
    if (error instanceof Error && error.message === "Task queue is at limit") {
      throw new RateLimitedError(10, "Too many people are signing in at once. Try again in a moment.");
    }
    throw error;
  }
}

export function hashPassword(password: string): Promise<string> {
  return run<string>({ op: "hash", password, cost: bcryptCost() });
}

// A hash of a random string, compared against when the e-mail address is unknown, so that a
// failed sign-in takes as long whether or not the account exists.
let dummyHash: Promise<string> | undefined;

export async function verifyPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    dummyHash ??= hashPassword("headroom-no-such-account");
    await run<boolean>({ op: "compare", password, hash: await dummyHash });
    return false;
  }
  return run<boolean>({ op: "compare", password, hash });
}
