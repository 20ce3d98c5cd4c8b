import "server-only";
import path from "node:path";
import { databasePath } from "@/db/client";
import { issuerProblem } from "@/lib/sso/rules";

/** Settings read from the environment, with the defaults that make a fresh clone work. */
export const DEV_SESSION_SECRET = "headroom-development-secret-not-for-production-use";

export function isProduction(): boolean {
  return process.env.NODE_ENV === "production";
}

export function appUrl(): string {
  const url = process.env.APP_URL || `http://localhost:${process.env.PORT || 3000}`;
  return url.replace(/\/+$/, "");
}

export function sessionSecret(): string {
  const secret = process.env.SESSION_SECRET;
  if (secret && secret.length >= 32) return secret;
  if (secret) throw new Error("SESSION_SECRET must be at least 32 characters long.");
  if (isProduction()) {
    throw new Error(
      "SESSION_SECRET is not set. In production set it to a random string of at least 32 characters (npm run demo creates one in data/).",
    );
  }
  return DEV_SESSION_SECRET;
}

export function cookieSecure(): boolean {
  if (process.env.COOKIE_SECURE) return process.env.COOKIE_SECURE === "true";
  return isProduction();
}

export function emailFakePort(): number {
  return Number(process.env.EMAIL_FAKE_PORT || 3025);
}

/** Where the resend SDK sends; the local fake unless RESEND_BASE_URL names the hosted service. */
export function mailBaseUrl(): string {
  return (process.env.RESEND_BASE_URL || `http://127.0.0.1:${emailFakePort()}`).replace(/\/+$/, "");
}

export function mailUsesFake(): boolean {
  try {
    const host = new URL(mailBaseUrl()).hostname;
    return host === "127.0.0.1" || host === "localhost" || host === "[::1]";
  } catch {
    return false;
  }
}

export function mailApiKey(): string {
  return process.env.RESEND_API_KEY || "re_local_fake_key";
}

export function mailFrom(): string {
  return process.env.MAIL_FROM || "Headroom <headroom@example.org>";
}

export function bcryptCost(): number {
  const cost = Number(process.env.BCRYPT_COST || 12);
  return Number.isInteger(cost) && cost >= 4 && cost <= 15 ? cost : 12;
}

/** Where uploaded files (safety data sheets) are kept: outside public/, next to the database by default. */
export function uploadDir(): string {
  return process.env.UPLOAD_DIR || path.join(path.dirname(databasePath()), "uploads");
}

function envNumber(name: string, fallback: number): number {
  const text = process.env[name];
  if (text === undefined || text.trim() === "") return fallback;
  const value = Number(text);
  if (!Number.isFinite(value)) throw new Error(`${name} must be a number, not “${text}”.`);
  return value;
}

/**
 * What makes a temperature reading plausible (the logger API and logger-file uploads):
 * `READINGS_EARLIEST` (an ISO date, default 2000-01-01), `READINGS_MAX_FUTURE_MINUTES` (default 5:
 * loggers' clocks drift), `READINGS_MIN_TEMP_C` / `READINGS_MAX_TEMP_C` (default −200 / 200 °C).
 */
export function readingLimits(): { earliestMs: number; maxFutureMs: number; minTempC: number; maxTempC: number } {
  const earliestText = process.env.READINGS_EARLIEST?.trim() || "2000-01-01";
  const earliestMs = Date.parse(/^\d{4}-\d{2}-\d{2}$/.test(earliestText) ? `${earliestText}T00:00:00Z` : earliestText);
  if (Number.isNaN(earliestMs)) throw new Error(`READINGS_EARLIEST must be a date such as 2000-01-01, not “${earliestText}”.`);
  const maxFutureMinutes = envNumber("READINGS_MAX_FUTURE_MINUTES", 5);
  if (maxFutureMinutes < 0) throw new Error("READINGS_MAX_FUTURE_MINUTES must be 0 or more.");
  const minTempC = envNumber("READINGS_MIN_TEMP_C", -200);
  const maxTempC = envNumber("READINGS_MAX_TEMP_C", 200);
  if (!(minTempC < maxTempC)) throw new Error("READINGS_MIN_TEMP_C must be below READINGS_MAX_TEMP_C.");
  return { earliestMs, maxFutureMs: maxFutureMinutes * 60_000, minTempC, maxTempC };
}

/** Where `npm run backup` and the nightly backup write their dated folders (BACKUP_DIR). */
export function backupDir(): string {
  return process.env.BACKUP_DIR || path.join(path.dirname(databasePath()), "backups");
}

/** How many backups are kept (BACKUP_KEEP, default 14); older ones are deleted after each backup. */
export function backupKeep(): number {
  const keep = envNumber("BACKUP_KEEP", 14);
  if (!Number.isInteger(keep) || keep < 1) throw new Error("BACKUP_KEEP must be a whole number of at least 1.");
  return keep;
}

/** The nightly backup: on unless BACKUP_NIGHTLY=false, at BACKUP_HOUR_UTC (0–23, default 2). */
export function backupSchedule(): { nightly: boolean; hourUtc: number } {
  const hourUtc = envNumber("BACKUP_HOUR_UTC", 2);
  if (!Number.isInteger(hourUtc) || hourUtc < 0 || hourUtc > 23) throw new Error("BACKUP_HOUR_UTC must be a whole hour from 0 to 23.");
  return { nightly: process.env.BACKUP_NIGHTLY !== "false", hourUtc };
}

function positiveNumber(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw.trim() === "") return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value <= 0) throw new Error(`${name} must be a positive number (got "${raw}").`);
  return value;
}

/** A session not used for this long ends (a working day plus a margin). */
export function sessionIdleMs(): number {
  return positiveNumber("SESSION_IDLE_MINUTES", 8 * 60) * 60_000;
}

/** A session ends this long after sign-in however much it is used (a working week). */
export function sessionMaxMs(): number {
  return positiveNumber("SESSION_MAX_HOURS", 7 * 24) * 3_600_000;
}

/**
 * Which proxies in front of the app may say who the client is (X-Forwarded-For):
 * "off" (none: the socket's address counts), a number of hops, or a comma-separated list of
 * proxy addresses.
 */
export type TrustProxy = { kind: "off" } | { kind: "hops"; hops: number } | { kind: "addresses"; addresses: string[] };

export function trustProxy(): TrustProxy {
  const raw = (process.env.TRUST_PROXY ?? "").trim();
  if (!raw || /^(off|false|no|0)$/i.test(raw)) return { kind: "off" };
  if (/^\d+$/.test(raw)) return { kind: "hops", hops: Number(raw) };
  const addresses = raw.split(",").map((a) => a.trim()).filter(Boolean);
  return { kind: "addresses", addresses };
}

/** A rate limit: at most `points` within `durationSeconds`. */
export type RateLimitSetting = { points: number; durationSeconds: number };

function rateLimit(name: string, points: number, durationSeconds: number): RateLimitSetting {
  return { points: Math.floor(positiveNumber(name, points)), durationSeconds };
}

/** The rate limits; each count is configurable, the windows are fixed. */
export function rateLimitSettings() {
  return {
    signInAccountIp: rateLimit("RATE_LIMIT_SIGN_IN_ACCOUNT_IP", 10, 15 * 60),
    signInIp: rateLimit("RATE_LIMIT_SIGN_IN_IP", 50, 15 * 60),
    resetAddress: rateLimit("RATE_LIMIT_RESET_ADDRESS", 3, 60 * 60),
    resetIp: rateLimit("RATE_LIMIT_RESET_IP", 20, 60 * 60),
    invitationAddress: rateLimit("RATE_LIMIT_INVITATION_ADDRESS", 3, 60 * 60),
    invitationIp: rateLimit("RATE_LIMIT_INVITATION_IP", 50, 60 * 60),
    readingsKey: rateLimit("RATE_LIMIT_READINGS_KEY", 120, 60),
    whatIfUser: rateLimit("RATE_LIMIT_WHAT_IF_USER", 30, 60),
    exportUser: rateLimit("RATE_LIMIT_EXPORT_USER", 10, 60),
    importUser: rateLimit("RATE_LIMIT_IMPORT_USER", 20, 60),
    // Webhooks: saving an endpoint resolves its host (up to 5 s each).
    webhookSaveUser: rateLimit("RATE_LIMIT_WEBHOOK_SAVE_USER", 20, 10 * 60),
  } satisfies Record<string, RateLimitSetting>;
}

export type RateLimitName = keyof ReturnType<typeof rateLimitSettings>;

// --- Single sign-on (OpenID Connect) -------------------------------------------------------------

/** The institution's OpenID Connect provider: OIDC_ISSUER, OIDC_CLIENT_ID, OIDC_CLIENT_SECRET. */
export type OidcSettings = { issuer: string; clientId: string; clientSecret: string };

/**
 * The provider, or null when OIDC_ISSUER is not set (single sign-on off). A set issuer with a
 * missing client id or secret, or an issuer that is neither https nor http on this machine, is a
 * configuration error. The issuer is used exactly as written: it must match the provider's own
 * `issuer` (a trailing slash counts).
 */
export function oidcSettings(): OidcSettings | null {
  const issuer = (process.env.OIDC_ISSUER ?? "").trim();
  if (!issuer) return null;
  const problem = issuerProblem(issuer);
  if (problem) throw new Error(problem);
  const clientId = (process.env.OIDC_CLIENT_ID ?? "").trim();
  const clientSecret = process.env.OIDC_CLIENT_SECRET ?? "";
  if (!clientId) throw new Error("OIDC_CLIENT_ID is not set; it is required when OIDC_ISSUER is set.");
  if (clientId.length > 255) throw new Error("OIDC_CLIENT_ID is too long (at most 255 characters).");
  if (!clientSecret) throw new Error("OIDC_CLIENT_SECRET is not set; it is required when OIDC_ISSUER is set.");
  return { issuer, clientId, clientSecret };
}

/** The address the provider sends people back to; register it with the provider. */
export function oidcRedirectUri(): string {
  return `${appUrl()}/sso/callback`;
}

export function oidcFakePort(): number {
  return Number(process.env.OIDC_FAKE_PORT || 3026);
}

// --- Webhooks -------------------------------------------------------------------------------

/**
 * Plain http:// webhook URLs, to the loopback only (the local receiver of the demo and tests):
 * WEBHOOK_ALLOW_HTTP_LOOPBACK=true|false, on by default outside production. Everything else is https.
 */
export function webhookAllowHttpLoopback(): boolean {
  const value = process.env.WEBHOOK_ALLOW_HTTP_LOOPBACK;
  if (value === "true") return true;
  if (value === "false") return false;
  return !isProduction();
}

/** The local webhook receiver's port (WEBHOOK_FAKE_PORT, default 3027). */
export function webhookFakePort(): number {
  return Number(process.env.WEBHOOK_FAKE_PORT || 3027);
}

/** Where the admin page reads the local receiver's recordings: only when WEBHOOK_FAKE_PORT is set (npm run demo sets it). */
export function webhookReceiverUrl(): string | null {
  return process.env.WEBHOOK_FAKE_PORT ? `http://127.0.0.1:${webhookFakePort()}` : null;
}
