import "server-only";
import bcrypt from "bcryptjs";
import { bcryptCost } from "@/lib/config";
import { RateLimitedError } from "@/lib/errors";

/**
 * bcryptjs runs on this thread. Its promise API yields to the event loop between slices of
 * rounds (setImmediate after at most 100 ms), but every pending hash runs one slice per turn of
 * the loop, so sixteen at once hold a request for 16 × 100 ms at a time. One hash at a time keeps
 * the wait of any other request to one slice; the rest wait their turn, at most this many.
 */
export const MAX_WAITING_HASHES = 64;

let running = false;
const waiting: Array<() => void> = [];

async function oneAtATime<T>(work: () => Promise<T>): Promise<T> {
  if (running) {
    if (waiting.length >= MAX_WAITING_HASHES) {
      throw new RateLimitedError(10, "Too many people are signing in at once. Try again in a moment.");
    }
    await new Promise<void>((resolve) => waiting.push(resolve));
  }
  running = true;
  try {
    return await work();
  } finally {
    const next = waiting.shift();
    if (next) next();
    else running = false;
  }
}

export function hashPassword(password: string): Promise<string> {
  return oneAtATime(() => bcrypt.hash(password, bcryptCost()));
}

// A hash of a random string, compared against when the e-mail address is unknown, so that a
// failed sign-in takes as long whether or not the account exists.
let dummyHash: string | undefined;

export async function verifyPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    dummyHash ??= await bcrypt.hash("headroom-no-such-account", bcryptCost());
    await oneAtATime(() => bcrypt.compare(password, dummyHash!));
    return false;
  }
  return oneAtATime(() => bcrypt.compare(password, hash));
}
