import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { countActiveAdmins, findUserByEmail, findUserById, normaliseEmail } from "@/db/queries/users";
import { sessions, userTokens, users, type Role, type User } from "@/db/schema";
import { invitationEmail, ssoInvitationEmail, ssoPasswordResetEmail } from "@/emails/invitation";
import { passwordResetEmail } from "@/emails/password-reset";
import { recordAudit, type AuditActor } from "@/lib/audit/record";
import { hashPassword } from "@/lib/auth/passwords";
import { ROLE_LABELS } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { findUsableToken, issueUserToken, markTokenUsed } from "@/lib/auth/tokens";
import { appUrl, oidcSettings } from "@/lib/config";
import { readSsoSettings, requireSsoActive } from "@/lib/sso/settings";
import { ConflictError, NotFoundError, ValidationError } from "@/lib/errors";
import { currentClientIp } from "@/lib/http/client-ip";
import { consume, limit } from "@/lib/rate-limit";
import { log } from "@/lib/log";
import { enqueueEmail } from "@/lib/mail/outbox";
import { kickOutbox } from "@/lib/mail/deliver";
import type { AlertPreferencesInput } from "./schemas";

export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;
export const PASSWORD_RESET_TTL_MS = 60 * 60 * 1000;

/**
 * Invites a person: the account exists at once without a password, and the invitation e-mail
 * is queued in the same transaction. Inviting an address that was invited but never activated
 * sends a fresh link (the old one stops working). A person invited for single sign-on gets no
 * link to set a password: the e-mail tells them to use "Sign in with your institution", and the
 * account is linked at their first sign-in there.
 */
export async function inviteUser(
  actor: SessionUser,
  input: { email: string; name: string; role: Role; signInMethod?: "password" | "sso" },
  context: { clientIp?: string } = {},
): Promise<User> {
  const email = normaliseEmail(input.email);
  const method = input.signInMethod ?? "password";
  if (method === "password" && requireSsoActive(readSsoSettings())) {
    throw new ConflictError("Single sign-on is required for everyone on this installation; invite the person to sign in with their institution.", {
      signInMethod: ["Password sign-in is switched off: choose their institution."],
    });
  }
  if (method === "sso" && !oidcSettings()) {
    throw new ConflictError("Sign-in with the institution is not configured on this installation; invite the person with a password.", {
      signInMethod: ["Not available: no single sign-on provider is configured."],
    });
  }
  await limit("invitationIp", context.clientIp ?? (await currentClientIp()));
  await limit("invitationAddress", email);
  const db = getDb();
  const user = db.transaction((tx) => {
    let user = findUserByEmail(email, tx);
    if (user?.passwordHash || user?.ssoSubject) {
      throw new ConflictError("That person already has an account.", { email: ["That person already has an account."] });
    }
    if (user) {
      user = tx
        .update(users)
        .set({ name: input.name, role: input.role, signInMethod: method, active: true, updatedAt: new Date() })
        .where(eq(users.id, user.id))
        .returning()
        .get();
    } else {
      user = tx.insert(users).values({ email, name: input.name, role: input.role, signInMethod: method, invitedById: actor.id }).returning().get();
    }
    if (method === "sso") {
      // No password link; any earlier one stops working.
      tx.update(userTokens).set({ usedAt: new Date() }).where(and(eq(userTokens.userId, user.id), isNull(userTokens.usedAt))).run();
      enqueueEmail(tx, {
        kind: "invitation",
        to: [email],
        recipientUserId: user.id,
        ...ssoInvitationEmail({ inviteeName: input.name, inviterName: actor.name, roleLabel: ROLE_LABELS[input.role], signInLink: `${appUrl()}/sign-in` }),
      });
    } else {
      const token = issueUserToken(tx, { userId: user.id, kind: "invitation", ttlMs: INVITATION_TTL_MS, createdById: actor.id });
      enqueueEmail(tx, {
        kind: "invitation",
        to: [email],
        recipientUserId: user.id,
        ...invitationEmail({
          inviteeName: input.name,
          inviterName: actor.name,
          roleLabel: ROLE_LABELS[input.role],
          link: `${appUrl()}/invitation/${token}`,
          expiresInDays: INVITATION_TTL_MS / 86_400_000,
        }),
      });
    }
    recordAudit(tx, actor, {
      action: "invite",
      entityType: "user",
      entityId: user.id,
      summary: `Invited ${email} as ${ROLE_LABELS[input.role]}${method === "sso" ? " to sign in with the institution" : ""}`,
      after: { email, name: input.name, role: input.role, signInMethod: method },
    });
    return user;
  });
  kickOutbox();
  return user;
}

/** The invitee for a usable invitation link, for the page that asks for a password. */
export function findInvitation(token: string): { email: string; name: string } | null {
  const db = getDb();
  const row = findUsableToken(db, token, "invitation");
  if (!row) return null;
  const user = findUserById(row.userId, db);
  if (!user || !user.active) return null;
  return { email: user.email, name: user.name };
}

export function findPasswordReset(token: string): { email: string } | null {
  const db = getDb();
  const row = findUsableToken(db, token, "password_reset");
  if (!row) return null;
  const user = findUserById(row.userId, db);
  if (!user || !user.active) return null;
  return { email: user.email };
}

/**
 * Sets the password through a single-use link (invitation or reset). The token is consumed in the
 * same transaction that writes the hash; earlier sessions of that user stop working.
 */
export async function setPasswordWithToken(
  kind: "invitation" | "password_reset",
  input: { token: string; password: string; name?: string },
): Promise<User> {
  const passwordHash = await hashPassword(input.password);
  const db = getDb();
  return db.transaction((tx) => {
    const row = findUsableToken(tx, input.token, kind);
    const user = row ? findUserById(row.userId, tx) : undefined;
    if (!row || !user || !user.active || !markTokenUsed(tx, row.id)) {
      throw new ValidationError("This link has expired or was already used. Ask for a new one.");
    }
    const sso = readSsoSettings(tx);
    if (user.signInMethod === "sso" || (requireSsoActive(sso) && user.id !== sso.breakGlassUserId)) {
      throw new ValidationError("This account signs in through your institution and has no Headroom password. Use “Sign in with your institution”.");
    }
    const updated = tx
      .update(users)
      .set({
        passwordHash,
        ...(kind === "invitation" && input.name ? { name: input.name } : {}),
        sessionVersion: sql`${users.sessionVersion} + 1`,
        updatedAt: new Date(),
      })
      .where(eq(users.id, user.id))
      .returning()
      .get();
    // The new password ends every session, including any an intruder holds.
    tx.delete(sessions).where(eq(sessions.userId, user.id)).run();
    recordAudit(tx, user, {
      action: kind === "invitation" ? "accept_invitation" : "reset_password",
      entityType: "user",
      entityId: user.id,
      summary: kind === "invitation" ? `${user.email} activated the account` : `${user.email} reset the password`,
    });
    return updated;
  });
}

/**
 * Queues a reset link when the address belongs to an active, activated account and neither the
 * address nor the asking client has used up its reset limit (RATE_LIMIT_RESET_ADDRESS,
 * RATE_LIMIT_RESET_IP; counted whether or not the account exists). The caller shows the same
 * answer either way, so the form reveals neither who has an account nor the limit. Resolves to
 * whether a link was queued; never rejects, so the form's answer does not depend on it.
 */
export async function requestPasswordReset(emailInput: string, context: { clientIp?: string } = {}): Promise<boolean> {
  try {
    const email = normaliseEmail(emailInput);
    const ip = context.clientIp ?? (await currentClientIp());
    const byIp = await consume("resetIp", ip);
    const byAddress = await consume("resetAddress", email);
    if (!byIp.allowed || !byAddress.allowed) {
      log.warn({ limit: byIp.allowed ? "resetAddress" : "resetIp" }, "password reset refused by rate limit");
      return false;
    }
    return queuePasswordReset(email);
  } catch (error) {
    log.error({ err: error }, "password reset request failed");
    return false;
  }
}

function queuePasswordReset(email: string): boolean {
  const db = getDb();
  const queued = db.transaction((tx) => {
    const user = findUserByEmail(email, tx);
    if (!user || !user.active) return false;
    const sso = readSsoSettings(tx);
    if (user.signInMethod === "sso" || (requireSsoActive(sso) && user.id !== sso.breakGlassUserId)) {
      // No password to reset: say so by e-mail, where only the address's owner reads it.
      enqueueEmail(tx, {
        kind: "password_reset",
        to: [user.email],
        recipientUserId: user.id,
        ...ssoPasswordResetEmail({ name: user.name, signInLink: `${appUrl()}/sign-in` }),
      });
      recordAudit(tx, { system: "password reset" }, {
        action: "request_password_reset",
        entityType: "user",
        entityId: user.id,
        summary: `Password reset asked for ${user.email}, who signs in with the institution: told so by e-mail`,
      });
      return true;
    }
    if (!user.passwordHash) return false;
    const token = issueUserToken(tx, { userId: user.id, kind: "password_reset", ttlMs: PASSWORD_RESET_TTL_MS });
    enqueueEmail(tx, {
      kind: "password_reset",
      to: [user.email],
      recipientUserId: user.id,
      ...passwordResetEmail({
        name: user.name,
        link: `${appUrl()}/reset-password/${token}`,
        expiresInMinutes: PASSWORD_RESET_TTL_MS / 60_000,
      }),
    });
    recordAudit(tx, { system: "password reset" }, {
      action: "request_password_reset",
      entityType: "user",
      entityId: user.id,
      summary: `Password reset link sent to ${user.email}`,
    });
    return true;
  });
  if (queued) kickOutbox();
  return queued;
}

function requireOtherUser(actor: SessionUser, userId: number, tx: Parameters<typeof findUserById>[1]): User {
  const user = findUserById(userId, tx);
  if (!user) throw new NotFoundError("That user");
  if (user.id === actor.id) {
    throw new ConflictError("You cannot change your own role or access; ask another administrator.");
  }
  const sso = readSsoSettings(tx);
  if (requireSsoActive(sso) && sso.breakGlassUserId === user.id) {
    throw new ConflictError("This is the break-glass administrator while single sign-on is required; choose another under Admin → Single sign-on first.");
  }
  return user;
}

export function changeUserRole(actor: SessionUser, userId: number, role: Role): User {
  return getDb().transaction((tx) => {
    const user = requireOtherUser(actor, userId, tx);
    if (user.role === role) return user;
    if (user.role === "admin" && user.active && countActiveAdmins(tx) <= 1) {
      throw new ConflictError("This is the last active administrator; make someone else an administrator first.");
    }
    return writeRole(tx, actor, user, role);
  });
}

/**
 * Gives `user` another role in the caller's transaction: their sessions are void (the session
 * version moves on) and the change is audited, `why` after the summary. The caller has checked
 * that the change is allowed.
 */
export function writeRole(tx: DbOrTx, actor: AuditActor, user: User, role: Role, why?: string): User {
  const updated = tx
    .update(users)
    .set({ role, sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: new Date() })
    .where(eq(users.id, user.id))
    .returning()
    .get();
  recordAudit(tx, actor, {
    action: "change_role",
    entityType: "user",
    entityId: user.id,
    summary: `Changed ${user.email} from ${ROLE_LABELS[user.role]} to ${ROLE_LABELS[role]}${why ? ` (${why})` : ""}`,
    before: { role: user.role },
    after: { role },
  });
  return updated;
}

export function setUserActive(actor: SessionUser, userId: number, active: boolean): User {
  return getDb().transaction((tx) => {
    const user = requireOtherUser(actor, userId, tx);
    if (user.active === active) return user;
    if (!active && user.role === "admin" && countActiveAdmins(tx) <= 1) {
      throw new ConflictError("This is the last active administrator and cannot be deactivated.");
    }
    const updated = tx
      .update(users)
      .set({ active, sessionVersion: sql`${users.sessionVersion} + 1`, updatedAt: new Date() })
      .where(eq(users.id, user.id))
      .returning()
      .get();
    recordAudit(tx, actor, {
      action: active ? "reactivate" : "deactivate",
      entityType: "user",
      entityId: user.id,
      summary: `${active ? "Reactivated" : "Deactivated"} ${user.email}`,
      before: { active: user.active },
      after: { active },
    });
    return updated;
  });
}

/** A person's own alert choices; audited like every other change. */
export function updateAlertPreferences(actor: SessionUser, input: AlertPreferencesInput): User {
  return getDb().transaction((tx) => {
    const before = tx.select().from(users).where(eq(users.id, actor.id)).get();
    if (!before) throw new NotFoundError("Your account no longer exists.");
    const after = tx.update(users).set({ ...input, updatedAt: new Date() }).where(eq(users.id, actor.id)).returning().get();
    recordAudit(tx, actor, {
      action: "update",
      entityType: "user",
      entityId: actor.id,
      summary: `Alert choices: excursions ${input.alertExcursions}, findings ${input.alertFindings}, daily digest ${input.dailyDigest ? "on" : "off"}`,
      before: { alertExcursions: before.alertExcursions, alertFindings: before.alertFindings, dailyDigest: before.dailyDigest },
      after: { alertExcursions: after.alertExcursions, alertFindings: after.alertFindings, dailyDigest: after.dailyDigest },
    });
    return after;
  });
}
