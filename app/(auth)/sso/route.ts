import { getIronSession } from "iron-session";
import { NextResponse } from "next/server";
import { appUrl } from "@/lib/config";
import { RateLimitedError } from "@/lib/errors";
import { clientIp } from "@/lib/http/client-ip";
import { publicRoute } from "@/lib/http/route";
import { log } from "@/lib/log";
import { limit, signInKeys } from "@/lib/rate-limit";
import { beginAuthorization, ssoConfigured } from "@/lib/sso/client";
import { ssoCookieOptions, type SsoCookieData } from "@/lib/sso/state-cookie";

/**
 * Starts a single sign-on: counts against the sign-in limit for the address, keeps the state,
 * nonce and PKCE verifier in the short-lived `headroom_sso` cookie, and sends the person to the
 * provider.
 */
export const GET = publicRoute(async ({ request }) => {
  const back = (problem: string) => NextResponse.redirect(new URL(`/sign-in?sso=${problem}`, appUrl()), 303);
  if (!ssoConfigured()) return back("off");
  try {
    await limit("signInIp", signInKeys.ip(clientIp(request)));
  } catch (error) {
    if (error instanceof RateLimitedError) return back("limited");
    throw error;
  }
  let started: Awaited<ReturnType<typeof beginAuthorization>>;
  try {
    started = await beginAuthorization();
  } catch (error) {
    log.error({ err: error }, "single sign-on: the provider could not be reached");
    return back("unavailable");
  }
  const response = NextResponse.redirect(started.url, 303);
  const cookie = await getIronSession<SsoCookieData>(request, response, ssoCookieOptions());
  cookie.pending = started.pending;
  delete cookie.refusal;
  await cookie.save();
  return response;
});
