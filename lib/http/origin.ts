/**
 * Which origins may send writes with a signed-in person's cookie. Pure (no server-only imports),
 * so that both the route handlers and the proxy in front of the pages use the same rule.
 */

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export function isStateChanging(method: string): boolean {
  return !SAFE_METHODS.has(method.toUpperCase());
}

/**
 * The app's own origin (from `APP_URL`). Outside production, and whenever the app is served on
 * localhost, the same port on localhost and 127.0.0.1 is accepted too, so either address works.
 */
export function allowedOrigins(appUrl: string, production: boolean): Set<string> {
  const own = new URL(appUrl);
  const origins = new Set([own.origin]);
  if (!production || own.hostname === "localhost" || own.hostname === "127.0.0.1") {
    const port = own.port ? `:${own.port}` : "";
    origins.add(`${own.protocol}//localhost${port}`);
    origins.add(`${own.protocol}//127.0.0.1${port}`);
  }
  return origins;
}

/**
 * Whether a cookie-authenticated write may be believed: its `Origin` must be the app's own; a
 * browser that sends no Origin tells with `Sec-Fetch-Site`. A request with neither comes from a
 * program (curl, a script), not from a page a signed-in person was lured to, and is let through.
 */
export function isSameOriginRequest(headers: Headers, appUrl: string, production: boolean): boolean {
  const origin = headers.get("origin");
  if (origin !== null) return allowedOrigins(appUrl, production).has(origin.toLowerCase());
  const site = headers.get("sec-fetch-site");
  if (site !== null) return site === "same-origin" || site === "none";
  return true;
}
