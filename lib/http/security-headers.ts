/**
 * The security headers of every response. Pure, so that the proxy in front of the pages, the
 * route handlers' wrapper (lib/http/route.ts) and the tests read the same values.
 */

/** For pages: scripts only from the app itself and the inline scripts Next.js marks with this response's nonce. */
export function pageContentSecurityPolicy(nonce: string, options: { development: boolean; https: boolean }): string {
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${options.development ? " 'unsafe-eval'" : ""}`,
    // Style attributes rendered on the server (charts, progress bars) cannot carry a nonce.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ];
  if (options.https) directives.push("upgrade-insecure-requests");
  return directives.join("; ");
}

/** For JSON, files and workbooks: nothing in them may load or run anything, nor be framed. */
export const API_CONTENT_SECURITY_POLICY = "default-src 'none'; frame-ancestors 'none'; sandbox";

/** Headers every response carries (the CSP is set per kind of response). */
export function commonSecurityHeaders(options: { production: boolean }): { key: string; value: string }[] {
  const headers = [
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "Referrer-Policy", value: "same-origin" },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=(), usb=()" },
  ];
  // Browsers honour HSTS only on responses that came over HTTPS, so sending it is harmless on plain HTTP.
  if (options.production) headers.push({ key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" });
  return headers;
}
