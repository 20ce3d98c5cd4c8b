import "server-only";
import type { SessionOptions } from "iron-session";
import { cookieSecure, sessionSecret } from "@/lib/config";
import type { PendingSignIn } from "./client";
import type { SsoRefusalReason } from "./sign-in";

/**
 * The single sign-on's own short-lived cookie (not the session's): the pending sign-in's state,
 * nonce and PKCE verifier between the start and the callback, then a refusal for the page that
 * explains it. Sealed and encrypted by iron-session, 10 minutes, only under /sso.
 */
export const SSO_COOKIE = "headroom_sso";
export const SSO_COOKIE_TTL_SECONDS = 10 * 60;

/** What the refusal page explains: an account's refusal, a sign-in that failed its checks, or the provider's own refusal. */
export type SsoPageRefusal = { reason: SsoRefusalReason | "state" | "provider"; groups: string[]; email: string | null };

export type SsoCookieData = { pending?: PendingSignIn; refusal?: SsoPageRefusal };

export function ssoCookieOptions(): SessionOptions {
  return {
    cookieName: SSO_COOKIE,
    password: sessionSecret(),
    ttl: SSO_COOKIE_TTL_SECONDS,
    // Lax: the provider's redirect back is a top-level GET from another site.
    cookieOptions: { httpOnly: true, sameSite: "lax", secure: cookieSecure(), path: "/sso" },
  };
}
