import { NextResponse, type NextRequest } from "next/server";
import { isSameOriginRequest, isStateChanging } from "@/lib/http/origin";
import { API_CONTENT_SECURITY_POLICY, commonSecurityHeaders, pageContentSecurityPolicy } from "@/lib/http/security-headers";

/**
 * In front of every page request: refuses writes from another origin to the pages (server actions;
 * a foreign form would otherwise reach Next.js's own check and end as a 500), gives every page a
 * fresh script nonce in its Content-Security-Policy, and sets the security headers. It is not a
 * permission check: route handlers and server actions run the guard themselves.
 *
 * It does not run for /api/ (see `config`): Next.js copies the body of every request a proxy sees
 * into memory so that both may read it, and silently cuts it at 10 MB, which would truncate logger
 * uploads and hold every upload in memory. The route handlers check the origin and set the same
 * headers themselves (lib/http/route.ts).
 */
export function proxy(request: NextRequest) {
  const production = process.env.NODE_ENV === "production";
  const appUrl = (process.env.APP_URL || `http://localhost:${process.env.PORT || 3000}`).replace(/\/+$/, "");
  const headers = commonSecurityHeaders({ production });
  if (isStateChanging(request.method) && !isSameOriginRequest(request.headers, appUrl, production)) {
    const refused = new NextResponse("This form was sent from a page outside Headroom, so it was refused. Open Headroom at its own address and try again.\n", {
      status: 403,
      headers: { "content-type": "text/plain; charset=utf-8", "Content-Security-Policy": API_CONTENT_SECURITY_POLICY },
    });
    for (const { key, value } of headers) refused.headers.set(key, value);
    return refused;
  }

  let response: NextResponse;
  if (request.nextUrl.pathname.startsWith("/_next/")) {
    response = NextResponse.next();
  } else {
    const nonce = btoa(crypto.randomUUID());
    const policy = pageContentSecurityPolicy(nonce, { development: !production, https: appUrl.startsWith("https:") });
    // Next.js reads the nonce from the request's policy and puts it on the scripts it renders.
    const requestHeaders = new Headers(request.headers);
    requestHeaders.set("Content-Security-Policy", policy);
    response = NextResponse.next({ request: { headers: requestHeaders } });
    response.headers.set("Content-Security-Policy", policy);
  }
  for (const { key, value } of headers) response.headers.set(key, value);
  return response;
}

export const config = {
  // Everything but the API (whose route handlers stream their bodies and secure their answers).
  matcher: ["/((?!api/).*)"],
};
