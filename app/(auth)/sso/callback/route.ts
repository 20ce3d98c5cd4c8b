import { getIronSession } from "iron-session";
import { NextResponse } from "next/server";
import { writeSessionCookie } from "@/lib/auth/session";
import { appUrl, oidcRedirectUri } from "@/lib/config";
import { clientIp } from "@/lib/http/client-ip";
import { publicRoute } from "@/lib/http/route";
import { log } from "@/lib/log";
import { refund, signInKeys } from "@/lib/rate-limit";
import { redeemCode, ssoConfigured, type SsoClaims } from "@/lib/sso/client";
import { completeSsoSignIn } from "@/lib/sso/sign-in";
import { SSO_COOKIE_TTL_SECONDS, ssoCookieOptions, type SsoCookieData, type SsoPageRefusal } from "@/lib/sso/state-cookie";

/**
 * The provider sends the person back here with a code. The state must match the pending sign-in
 * in the `headroom_sso` cookie (set by /sso in this browser less than 10 minutes ago); the code is
 * redeemed with the PKCE verifier and the ID token checked (signature, issuer, audience, nonce).
 * Then the account decides: a session and the overview, or the refusal page. The pending sign-in
 * is used up either way.
 */
export const GET = publicRoute(async ({ request }) => {
  const ip = clientIp(request);
  const reading = await getIronSession<SsoCookieData>(request, new Response(), ssoCookieOptions());
  const pending = reading.pending;
  const query = new URL(request.url).searchParams;

  const refuse = async (refusal: SsoPageRefusal) => {
    const response = NextResponse.redirect(new URL("/sso/refused", appUrl()), 303);
    const cookie = await getIronSession<SsoCookieData>(request, response, ssoCookieOptions());
    delete cookie.pending;
    cookie.refusal = refusal;
    await cookie.save();
    return response;
  };

  if (!ssoConfigured()) return NextResponse.redirect(new URL("/sign-in?sso=off", appUrl()), 303);
  const fresh = pending && Date.now() - pending.startedAt < SSO_COOKIE_TTL_SECONDS * 1000;
  if (!pending || !fresh || query.get("state") !== pending.state) {
    log.warn({ hasPending: Boolean(pending), fresh: Boolean(fresh) }, "single sign-on: missing or mismatched state");
    return refuse({ reason: "state", groups: [], email: null });
  }
  if (query.has("error")) {
    log.info({ error: query.get("error")?.slice(0, 100) }, "single sign-on: the provider refused");
    return refuse({ reason: "provider", groups: [], email: null });
  }

  // The address the provider redirected to is ours (APP_URL), never the request's Host header.
  const callbackUrl = new URL(oidcRedirectUri());
  callbackUrl.search = new URL(request.url).search;
  let claims: SsoClaims;
  try {
    claims = await redeemCode(callbackUrl, pending);
  } catch (error) {
    log.warn({ err: error }, "single sign-on: the provider's answer failed its checks");
    return refuse({ reason: "provider", groups: [], email: null });
  }

  const outcome = completeSsoSignIn(claims, { ip });
  // The cookie stays small: at most 20 groups of 100 characters are shown.
  if (!outcome.ok) return refuse({ reason: outcome.reason, groups: outcome.groups.slice(0, 20).map((g) => g.slice(0, 100)), email: outcome.email });

  await refund("signInIp", signInKeys.ip(ip));
  const response = NextResponse.redirect(new URL("/", appUrl()), 303);
  await writeSessionCookie(request, response, outcome.user);
  const cookie = await getIronSession<SsoCookieData>(request, response, ssoCookieOptions());
  cookie.destroy();
  return response;
});
