import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { findUserByEmail, normaliseEmail } from "@/db/queries/users";
import { signInThrottles, users, type User } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import { InvalidCredentialsError, RateLimitedError } from "@/lib/errors";
import { verifyPassword } from "./passwords";

/** Lock-out: this many failures for one address within the window lock it for LOCK_MS. */
export const MAX_FAILED_SIGN_INS = 5;
export const FAILURE_WINDOW_MS = 15 * 60 * 1000;
export const LOCK_MS = 15 * 60 * 1000;

function registerFailure(key: string, now: number): void {
  const db = getDb();
  db.transaction((tx) => {
    const row = tx.select().from(signInThrottles).where(eq(signInThrottles.key, key)).get();
    const fresh = !row || row.firstFailureAt.getTime() < now - FAILURE_WINDOW_MS;
    const failureCount = fresh ? 1 : row.failureCount + 1;
    const lockedUntil = failureCount >= MAX_FAILED_SIGN_INS ? new Date(now + LOCK_MS) : null;
    tx.insert(signInThrottles)
      .values({ key, failureCount, firstFailureAt: new Date(now), lockedUntil })
      .onConflictDoUpdate({
        target: signInThrottles.key,
        set: fresh ? { failureCount, firstFailureAt: new Date(now), lockedUntil } : { failureCount, lockedUntil },
      })
      .run();
  });
}

/**
 * Checks an e-mail address and password. Every failure — unknown address, wrong password,
 * deactivated or not yet activated account — gives the same error, and counts toward the lock-out.
 */
export async function signInWithPassword(email: string, password: string, now = Date.now()): Promise<User> {
  const key = normaliseEmail(email);
  const db = getDb();
  const throttle = db.select().from(signInThrottles).where(eq(signInThrottles.key, key)).get();
  if (throttle?.lockedUntil && throttle.lockedUntil.getTime() > now) {
    throw new RateLimitedError(Math.ceil((throttle.lockedUntil.getTime() - now) / 1000));
  }
  const user = findUserByEmail(key);
  const passwordMatches = await verifyPassword(password, user?.passwordHash);
  if (!user || !passwordMatches || !user.active) {
    registerFailure(key, now);
    throw new InvalidCredentialsError();
  }
  db.transaction((tx) => {
    tx.delete(signInThrottles).where(eq(signInThrottles.key, key)).run();
    tx.update(users).set({ lastSignInAt: new Date(now) }).where(eq(users.id, user.id)).run();
    recordAudit(tx, user, { action: "sign_in", entityType: "user", entityId: user.id, summary: `${user.email} signed in` });
  });
  return user;
}
