/**
 * The pure rules of single sign-on: which role a person's groups give, whether an address may
 * enter without an invitation, and which provider addresses are acceptable. No database, no
 * Next.js, so they are unit-tested on their own and usable from client components.
 */
import type { Role } from "@/lib/auth/roles";

export type GroupRoleMapping = { group: string; role: Role };

/** The first mapping, in the admins' order, whose group the person has; null when none matches. */
export function roleForGroups(mappings: readonly GroupRoleMapping[], groups: readonly string[]): GroupRoleMapping | null {
  const held = new Set(groups);
  return mappings.find((mapping) => held.has(mapping.group)) ?? null;
}

/** The domain of an e-mail address, lower case ("a@Lab.Example.org" → "lab.example.org"). */
export function emailDomain(email: string): string {
  const at = email.lastIndexOf("@");
  return at < 0 ? "" : email.slice(at + 1).trim().toLowerCase();
}

/**
 * Whether an address may have its account made at its first sign-in (just-in-time): only when its
 * domain is exactly one of the listed domains (a subdomain does not count).
 */
export function jitAllowed(domains: readonly string[], email: string): boolean {
  const domain = emailDomain(email);
  return domain !== "" && domains.some((d) => d.toLowerCase() === domain);
}

const LOOPBACK_HOSTS = new Set(["localhost", "127.0.0.1", "[::1]"]);

export function isLoopbackHost(hostname: string): boolean {
  return LOOPBACK_HOSTS.has(hostname.toLowerCase()) || /^127(\.\d{1,3}){3}$/.test(hostname);
}

/**
 * Checks a provider's issuer address: https, or plain http on a loopback host (the local provider
 * for development and tests). Returns the problem in words, or null when it is acceptable.
 */
export function issuerProblem(issuer: string): string | null {
  let url: URL;
  try {
    url = new URL(issuer);
  } catch {
    return `OIDC_ISSUER must be an address such as https://login.example.org, not “${issuer}”.`;
  }
  if (url.username || url.password) return "OIDC_ISSUER must not carry a user name or password.";
  if (url.search || url.hash) return "OIDC_ISSUER must not carry a query or fragment.";
  if (url.protocol === "https:") return null;
  if (url.protocol === "http:" && isLoopbackHost(url.hostname)) return null;
  if (url.protocol === "http:") return `OIDC_ISSUER must use https (plain http is allowed only for a provider on this machine, such as http://localhost:3026), not “${issuer}”.`;
  return `OIDC_ISSUER must use https, not “${url.protocol}”.`;
}

/** The `groups` claim as a list of strings: a list, a single string, or nothing. */
export function groupsFromClaim(value: unknown): string[] {
  if (typeof value === "string") return value ? [value] : [];
  if (!Array.isArray(value)) return [];
  return value.filter((g): g is string => typeof g === "string" && g.length > 0 && g.length <= 256).slice(0, 500);
}
