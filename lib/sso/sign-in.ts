import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { countActiveAdmins, findUserByEmail, normaliseEmail } from "@/db/queries/users";
import { sessions, userTokens, users, type Role, type User } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import { writeRole } from "@/lib/users/service";
import { ROLE_LABELS } from "@/lib/auth/permissions";
import type { SsoClaims } from "./client";
import { groupsFromClaim, jitAllowed, roleForGroups } from "./rules";
import { readSsoSettings } from "./settings";

/** Why a single sign-on was refused; each has its own page text. */
export const SSO_REFUSAL_REASONS = [
  "no_group",
  "not_invited",
  "deactivated",
  "no_email",
  "email_unverified",
  "other_identity",
  "break_glass",
] as const;
export type SsoRefusalReason = (typeof SSO_REFUSAL_REASONS)[number];

export type SsoRefusal = { reason: SsoRefusalReason; groups: string[]; email: string | null };

export type SsoOutcome = { ok: true; user: User } | ({ ok: false } & SsoRefusal);

const SSO_ACTOR = { system: "single sign-on" };

/**
 * Decides a single sign-on from the provider's verified claims, in one transaction: finds the
 * account by its linked identity (iss + sub) or, at the first sign-in, by a verified e-mail
 * address of an invited or active person (or makes it for a just-in-time domain), links it (no
 * local password from then on), gives it the role of the first group rule that matches, and
 * audits the sign-in with its method. A refusal creates no session and is audited with its reason.
 */
export function completeSsoSignIn(claims: SsoClaims, context: { ip: string; now?: number }): SsoOutcome {
  const now = new Date(context.now ?? Date.now());
  const groups = groupsFromClaim(claims.groups);
  const email = claims.email ? normaliseEmail(claims.email) : null;
  return getDb().transaction((tx): SsoOutcome => {
    const settings = readSsoSettings(tx);
    const refuse = (reason: SsoRefusalReason, user?: User): SsoOutcome => {
      recordAudit(tx, user ?? SSO_ACTOR, {
        action: "sign_in_refused",
        entityType: "user",
        entityId: user?.id ?? null,
        summary: `Single sign-on refused for ${email ?? claims.sub}: ${REFUSAL_SUMMARIES[reason]} (groups received: ${groups.length ? groups.slice(0, 20).join(", ") : "none"})`,
        after: { method: "sso", reason, email, groups, ip: context.ip },
      });
      return { ok: false, reason, groups, email };
    };

    const linked = tx
      .select()
      .from(users)
      .where(and(eq(users.ssoIssuer, claims.iss), eq(users.ssoSubject, claims.sub)))
      .get();
    let user: User | undefined = linked;
    if (!user) {
      if (!email || email.length > 254 || !email.includes("@")) return refuse("no_email");
      if (claims.emailVerified === false) return refuse("email_unverified");
      user = findUserByEmail(email, tx);
      if (user?.ssoSubject) return refuse("other_identity", user);
      if (user && settings.breakGlassUserId === user.id) return refuse("break_glass", user);
    }
    if (user && !user.active) return refuse("deactivated", user);
    const rule = roleForGroups(settings.mappings, groups);
    if (!rule) return refuse("no_group", user);

    if (!user) {
      if (!jitAllowed(settings.jitDomains, email!)) return refuse("not_invited");
      user = tx
        .insert(users)
        .values({
          email: email!,
          name: (claims.name ?? "").trim().slice(0, 120) || email!,
          role: rule.role,
          signInMethod: "sso",
          ssoIssuer: claims.iss,
          ssoSubject: claims.sub,
        })
        .returning()
        .get();
      recordAudit(tx, SSO_ACTOR, {
        action: "create",
        entityType: "user",
        entityId: user.id,
        summary: `Made the account of ${user.email} at its first single sign-on (${ROLE_LABELS[rule.role]}, group ${rule.group})`,
        after: { email: user.email, name: user.name, role: user.role, method: "sso", group: rule.group },
      });
    } else if (!linked) {
      user = linkAccount(tx, user, claims);
    }

    if (user.role !== rule.role) user = applyMappedRole(tx, user, rule.role, rule.group);

    user = tx.update(users).set({ lastSignInAt: now }).where(eq(users.id, user.id)).returning().get();
    recordAudit(tx, user, {
      action: "sign_in",
      entityType: "user",
      entityId: user.id,
      summary: `${user.email} signed in with single sign-on`,
      after: { ip: context.ip, method: "sso", groups, role: user.role },
    });
    return { ok: true, user };
  });
}

/** Links an invited or active account to the provider's identity: no local password from now on. */
function linkAccount(tx: DbOrTx, user: User, claims: SsoClaims): User {
  const hadPassword = user.passwordHash !== null;
  const linked = tx
    .update(users)
    .set({
      ssoIssuer: claims.iss,
      ssoSubject: claims.sub,
      signInMethod: "sso",
      passwordHash: null,
      ...(hadPassword ? { sessionVersion: sql`${users.sessionVersion} + 1` } : {}),
      updatedAt: new Date(),
    })
    .where(eq(users.id, user.id))
    .returning()
    .get();
  // Links to set or reset a password stop working.
  tx.update(userTokens).set({ usedAt: new Date() }).where(and(eq(userTokens.userId, user.id), isNull(userTokens.usedAt))).run();
  if (hadPassword) tx.delete(sessions).where(eq(sessions.userId, user.id)).run();
  recordAudit(tx, user, {
    action: "link_sso",
    entityType: "user",
    entityId: user.id,
    summary: `${user.email} now signs in with single sign-on${hadPassword ? "; the password was removed" : ""}`,
    before: { signInMethod: user.signInMethod },
    after: { signInMethod: "sso" },
  });
  return linked;
}

/** The role the group rules give, audited; the last active administrator keeps the role. */
function applyMappedRole(tx: DbOrTx, user: User, role: Role, group: string): User {
  if (user.role === "admin" && user.active && countActiveAdmins(tx) <= 1) {
    recordAudit(tx, SSO_ACTOR, {
      action: "change_role",
      entityType: "user",
      entityId: user.id,
      summary: `Kept ${user.email} as Administrator although group ${group} gives ${ROLE_LABELS[role]}: the last active administrator`,
      before: { role: user.role },
      after: { role: user.role },
    });
    return user;
  }
  return writeRole(tx, SSO_ACTOR, user, role, `group ${group} at single sign-on`);
}

const REFUSAL_SUMMARIES: Record<SsoRefusalReason, string> = {
  no_group: "none of the groups received matches a group rule",
  not_invited: "not invited, and the address's domain is not open to new accounts",
  deactivated: "the account is deactivated",
  no_email: "the provider sent no e-mail address",
  email_unverified: "the provider says the e-mail address is not verified",
  other_identity: "the account is linked to another identity at the provider",
  break_glass: "the break-glass administrator signs in with a password",
};
