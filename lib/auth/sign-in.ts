import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { findUserByEmail, normaliseEmail } from "@/db/queries/users";
import { users, type User } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import { InvalidCredentialsError } from "@/lib/errors";
import { currentClientIp } from "@/lib/http/client-ip";
import { consumeAll, refund, refusal, resetLimit, signInKeys } from "@/lib/rate-limit";
import { SSO_ACCOUNT_MESSAGE, SSO_REQUIRED_MESSAGE, SsoRequiredError } from "@/lib/sso/errors";
import { readSsoSettings, requireSsoActive } from "@/lib/sso/settings";
import { sweepSessions } from "./session-store";
import { verifyPassword } from "./passwords";

export const SIGN_IN_REFUSED = "Too many failed sign-in attempts";

/**
 * Checks an e-mail address and password. Every failure — unknown address, wrong password,
 * deactivated or not yet activated account — gives the same error.
 *
 * Each attempt counts against two limits before the password is compared, so a refused attempt
 * costs no hashing: per address (RATE_LIMIT_SIGN_IN_IP) and per account from that address
 * (RATE_LIMIT_SIGN_IN_ACCOUNT_IP). Failures from one address never lock the owner out from
 * another. A successful sign-in is given back to the address's count and clears the account's.
 *
 * Single sign-on: an account that signs in through the institution is refused with a message that
 * says so, before any hashing. While single sign-on is required, every attempt but a correct one
 * for the break-glass administrator gets the same refusal pointing to the institution's sign-in.
 *
 * `clientIp` comes from the route handler; a server action leaves it out and the request's
 * headers are read.
 */
export async function signInWithPassword(
  email: string,
  password: string,
  context: { clientIp?: string; now?: number } = {},
): Promise<User> {
  const key = normaliseEmail(email);
  const ip = context.clientIp ?? (await currentClientIp());
  const now = context.now ?? Date.now();
  const outcome = await consumeAll([
    ["signInIp", signInKeys.ip(ip)],
    ["signInAccountIp", signInKeys.accountIp(key, ip)],
  ]);
  if (!outcome.allowed) throw refusal(outcome.retryAfterSeconds, SIGN_IN_REFUSED);
  const user = findUserByEmail(key);
  const sso = readSsoSettings();
  const breakGlass = user !== undefined && user.id === sso.breakGlassUserId;
  if (requireSsoActive(sso) && !breakGlass) throw new SsoRequiredError(SSO_REQUIRED_MESSAGE);
  if (user?.signInMethod === "sso") throw new SsoRequiredError(SSO_ACCOUNT_MESSAGE);
  const passwordMatches = await verifyPassword(password, user?.passwordHash);
  if (requireSsoActive(sso) && (!passwordMatches || !user?.active)) throw new SsoRequiredError(SSO_REQUIRED_MESSAGE);
  if (!user || !passwordMatches || !user.active) throw new InvalidCredentialsError();
  await refund("signInIp", signInKeys.ip(ip));
  await resetLimit("signInAccountIp", signInKeys.accountIp(key, ip));
  getDb().transaction((tx) => {
    tx.update(users).set({ lastSignInAt: new Date(now) }).where(eq(users.id, user.id)).run();
    recordAudit(tx, user, { action: "sign_in", entityType: "user", entityId: user.id, summary: `${user.email} signed in with a password`, after: { ip, method: "password" } });
  });
  sweepSessions(now);
  return user;
}
