import "server-only";
import type Database from "better-sqlite3";
import { RateLimiterRes, RateLimiterSQLite } from "rate-limiter-flexible";
import { getDb } from "@/db/client";
import { rateLimitSettings, type RateLimitName } from "@/lib/config";
import { minutesText, RateLimitedError } from "@/lib/errors";
import { workerWritesDone } from "@/lib/workers/write-gate";

/**
 * Limits on abuse, counted in the database (table `rate_limits`, created by a migration) so that
 * they survive a restart. One limiter per limit and connection; each counts a fixed window from
 * its first point (rate-limiter-flexible's SQLite store on the app's own better-sqlite3
 * connection).
 */
export const RATE_LIMIT_TABLE = "rate_limits";

const limiters = new WeakMap<Database.Database, Map<string, RateLimiterSQLite>>();

function limiter(name: RateLimitName): RateLimiterSQLite {
  const client = getDb().$client;
  const { points, durationSeconds } = rateLimitSettings()[name];
  let byName = limiters.get(client);
  if (!byName) limiters.set(client, (byName = new Map()));
  const cacheKey = `${name}:${points}:${durationSeconds}`;
  let found = byName.get(cacheKey);
  if (!found) {
    found = new RateLimiterSQLite({
      storeClient: client,
      storeType: "better-sqlite3",
      tableName: RATE_LIMIT_TABLE,
      tableCreated: true,
      clearExpiredByTimeout: false,
      keyPrefix: name,
      points,
      duration: durationSeconds,
    });
    byName.set(cacheKey, found);
  }
  return found;
}

export type LimitOutcome = { allowed: true } | { allowed: false; retryAfterSeconds: number };

/** Counts one use against a limit; over it, says how long until the window ends. */
export async function consume(name: RateLimitName, key: string | number): Promise<LimitOutcome> {
  // Counting is a write: wait (without blocking) while a worker is inside a long write.
  await workerWritesDone();
  try {
    await limiter(name).consume(String(key));
    return { allowed: true };
  } catch (error) {
    if (error instanceof RateLimiterRes) return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil(error.msBeforeNext / 1000)) };
    throw error;
  }
}

/** Counts one use against each limit (all of them, so a refusal still counts); the first refusal wins. */
export async function consumeAll(uses: ReadonlyArray<readonly [RateLimitName, string | number]>): Promise<LimitOutcome> {
  let refused: LimitOutcome = { allowed: true };
  for (const [name, key] of uses) {
    const outcome = await consume(name, key);
    if (!outcome.allowed && (refused.allowed || outcome.retryAfterSeconds > refused.retryAfterSeconds)) refused = outcome;
  }
  return refused;
}

const MESSAGES: Partial<Record<RateLimitName, string>> = {
  readingsKey: "This API key sent too many batches of readings",
  whatIfUser: "Too many what-if checks",
  exportUser: "Too many exports",
  importUser: "Too many imports and previews",
  invitationAddress: "Too many invitations to this address",
  invitationIp: "Too many invitations",
  webhookSaveUser: "Too many webhook endpoints saved",
};

/**
 * The one check the handlers call: counts one use of `name` for `key` and throws
 * RateLimitedError (429 with Retry-After) when the limit is used up.
 */
export async function limit(name: RateLimitName, key: string | number, message?: string): Promise<void> {
  const outcome = await consume(name, key);
  if (!outcome.allowed) throw refusal(outcome.retryAfterSeconds, message ?? MESSAGES[name]);
}

export function refusal(retryAfterSeconds: number, what?: string): RateLimitedError {
  return new RateLimitedError(retryAfterSeconds, what ? `${what}. Try again in ${minutesText(retryAfterSeconds)}.` : undefined);
}

/** Forgets a key's count (a successful sign-in clears that account's failures from that address). */
export async function resetLimit(name: RateLimitName, key: string | number): Promise<void> {
  await workerWritesDone();
  await limiter(name).delete(String(key));
}

/** Gives back one counted use, never below zero (a successful sign-in does not count). */
export async function refund(name: RateLimitName, key: string | number): Promise<void> {
  await workerWritesDone();
  const current = await limiter(name).get(String(key));
  if (current && current.consumedPoints > 0) await limiter(name).reward(String(key), 1);
}

/** Deletes counters whose window ended (the periodic sweep). */
export function sweepRateLimits(now = Date.now()): number {
  return getDb().$client.prepare(`DELETE FROM ${RATE_LIMIT_TABLE} WHERE expire IS NOT NULL AND expire < ?`).run(now).changes;
}

/** Per address and per account-and-address keys for sign-in. */
export const signInKeys = {
  ip: (ip: string) => ip,
  accountIp: (email: string, ip: string) => `${email}|${ip}`,
};
