import "server-only";
import path from "node:path";
import { databasePath } from "@/db/client";

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
