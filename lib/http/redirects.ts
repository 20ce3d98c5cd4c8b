/**
 * Redirect targets taken from a request (`?next=` after sign-in) may only lead inside the app: a
 * path that starts with one `/`, never `//` or `/\` (which browsers read as another host), with no
 * backslashes or control characters (browsers drop tabs and newlines, turning `/\t/x` into `//x`).
 * Anything else gives the fallback.
 */
export function safeRedirectPath(target: unknown, fallback = "/"): string {
  if (typeof target !== "string" || target.length === 0 || target.length > 2048) return fallback;
  if (!target.startsWith("/") || target.startsWith("//")) return fallback;
  if (/[\\\u0000-\u001f\u007f]/.test(target)) return fallback;
  let decoded: string;
  try {
    decoded = decodeURIComponent(target);
  } catch {
    return fallback;
  }
  if (decoded.startsWith("//") || /[\\\u0000-\u001f\u007f]/.test(decoded)) return fallback;
  const base = "http://headroom.invalid";
  let url: URL;
  try {
    url = new URL(target, base);
  } catch {
    return fallback;
  }
  if (url.origin !== base) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}
