import "server-only";
import { eq } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { findUserById } from "@/db/queries/users";
import { settings } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { oidcSettings } from "@/lib/config";
import { ConflictError } from "@/lib/errors";
import { DEFAULT_SSO_SETTINGS, storedSsoSettingsSchema, type SsoSettings, type SsoSettingsInput } from "./schemas";

export const SSO_SETTINGS_KEY = "sso";

export function readSsoSettings(db: DbOrTx = getDb()): SsoSettings {
  const row = db.select({ value: settings.value }).from(settings).where(eq(settings.key, SSO_SETTINGS_KEY)).get();
  if (!row) return DEFAULT_SSO_SETTINGS;
  const parsed = storedSsoSettingsSchema.safeParse(row.value);
  return parsed.success ? parsed.data : DEFAULT_SSO_SETTINGS;
}

/** Whether password sign-in is refused for everyone but the break-glass admin (only while the provider is configured). */
export function requireSsoActive(value: SsoSettings): boolean {
  return value.requireSso && value.breakGlassUserId !== null && oidcSettings() !== null;
}

/**
 * Saves the group rules, the just-in-time domains and "require single sign-on", audited in the
 * same transaction. Requiring single sign-on needs a configured provider and an active
 * administrator who keeps a password (the break-glass account).
 */
export function saveSsoSettings(actor: SessionUser, input: SsoSettingsInput): SsoSettings {
  return getDb().transaction((tx) => {
    const before = readSsoSettings(tx);
    let breakGlassUserId: number | null = input.breakGlassUserId ?? null;
    if (input.requireSso) {
      if (!oidcSettings()) {
        throw new ConflictError("Single sign-on cannot be required: no provider is configured (OIDC_ISSUER, OIDC_CLIENT_ID, OIDC_CLIENT_SECRET).", {
          requireSso: ["No provider is configured on this installation."],
        });
      }
      const admin = breakGlassUserId === null ? undefined : findUserById(breakGlassUserId, tx);
      if (!admin || admin.role !== "admin" || !admin.active || admin.signInMethod !== "password" || !admin.passwordHash) {
        throw new ConflictError("The break-glass account must be an active administrator who signs in with a password.", {
          breakGlassUserId: ["Choose an active administrator who signs in with a password."],
        });
      }
    } else if (breakGlassUserId !== null) {
      const admin = findUserById(breakGlassUserId, tx);
      if (!admin || admin.role !== "admin") breakGlassUserId = null;
    }
    const value: SsoSettings = { mappings: input.mappings, jitDomains: input.jitDomains, requireSso: input.requireSso, breakGlassUserId };
    tx.insert(settings)
      .values({ key: SSO_SETTINGS_KEY, value, updatedById: actor.id })
      .onConflictDoUpdate({ target: settings.key, set: { value, updatedById: actor.id, updatedAt: new Date() } })
      .run();
    recordAudit(tx, actor, {
      action: "update",
      entityType: "setting",
      entityId: SSO_SETTINGS_KEY,
      summary: `Changed single sign-on: ${value.mappings.length} group rule${value.mappings.length === 1 ? "" : "s"}, ${value.jitDomains.length ? `accounts made at first sign-in for ${value.jitDomains.join(", ")}` : "invited people only"}, ${value.requireSso ? "required for everyone but the break-glass administrator" : "password sign-in allowed"}`,
      before,
      after: value,
    });
    return value;
  });
}
