/**
 * What a webhook URL may be. Checked when an endpoint is saved (here: the host resolved, every
 * address classified) and again on every delivery's socket (lib/webhooks/deliver.ts, through
 * request-filtering-agent), so a host name that later resolves elsewhere does not get through.
 *
 * - https only; plain http only to the loopback (localhost, 127.0.0.0/8, ::1) and only while
 *   WEBHOOK_ALLOW_HTTP_LOOPBACK is on (the default outside production): the local receiver.
 * - No user name or password in the address, no fragment, at most 2,000 characters.
 * - Public (unicast) addresses only, unless the admin allowed private addresses for the endpoint:
 *   then private (RFC 1918), unique-local, loopback, link-local and shared (CGNAT) addresses too.
 * - Never: the cloud metadata addresses, unspecified, multicast, broadcast and reserved ranges.
 */
import dns from "node:dns";
import net from "node:net";
import ipaddr from "ipaddr.js";
import { ValidationError } from "@/lib/errors";

import { WEBHOOK_URL_MAX_LENGTH } from "./url-rules-limits";

export { WEBHOOK_URL_MAX_LENGTH };

/** Ranges an admin may open for one endpoint with "allow private addresses". */
const PRIVATE_RANGES = new Set(["private", "uniqueLocal", "loopback", "linkLocal", "carrierGradeNat"]);

/** Never reachable, whatever the endpoint allows: instance metadata services. */
export const METADATA_ADDRESSES = ["169.254.169.254", "fd00:ec2::254", "100.100.100.200"];

/**
 * For the delivery socket (request-filtering-agent's denyIPAddressList, matched as exact addresses:
 * its CIDR matching warns across address families). Multicast and reserved ranges cannot be
 * connected to over TCP anyway, and were refused when the address was saved.
 */
export const SOCKET_DENIED_ADDRESSES = [...METADATA_ADDRESSES, ...METADATA_ADDRESSES.filter((a) => !a.includes(":")).map((a) => `::ffff:${a}`)];

const RANGE_WORDS: Record<string, string> = {
  private: "a private address",
  uniqueLocal: "a private (unique-local) address",
  loopback: "a loopback address",
  linkLocal: "a link-local address",
  carrierGradeNat: "a shared (carrier-grade NAT) address",
  unspecified: "an unspecified address",
  multicast: "a multicast address",
  broadcast: "the broadcast address",
};

export type AddressVerdict = { ok: true } | { ok: false; always: boolean; words: string };

/** Whether one resolved address may be reached. */
export function classifyAddress(address: string, allowPrivate: boolean): AddressVerdict {
  let parsed: ipaddr.IPv4 | ipaddr.IPv6;
  try {
    parsed = ipaddr.process(address); // an IPv4-mapped IPv6 address counts as its IPv4 address
  } catch {
    return { ok: false, always: true, words: "an address that cannot be read" };
  }
  const normal = parsed.toString();
  if (METADATA_ADDRESSES.some((m) => ipaddr.process(m).toString() === normal)) return { ok: false, always: true, words: "a cloud metadata address" };
  const range = parsed.range();
  if (range === "unicast") return { ok: true };
  if (PRIVATE_RANGES.has(range)) return allowPrivate ? { ok: true } : { ok: false, always: false, words: RANGE_WORDS[range] };
  return { ok: false, always: true, words: RANGE_WORDS[range] ?? `a reserved address (${range})` };
}

function refuse(message: string): never {
  throw new ValidationError(message, { url: [message] });
}

function isLoopbackHost(hostname: string): boolean {
  if (hostname === "localhost") return true;
  const bare = hostname.replace(/^\[|\]$/g, "");
  return net.isIP(bare) !== 0 && ipaddr.process(bare).range() === "loopback";
}

/** The rules that need no network: scheme, credentials, length. Returns the parsed URL. */
export function parseWebhookUrl(raw: string, opts: { allowHttpLoopback: boolean }): URL {
  const text = raw.trim();
  if (text.length === 0) refuse("Enter the receiver's address, starting with https://.");
  if (text.length > WEBHOOK_URL_MAX_LENGTH) refuse(`Use an address of at most ${WEBHOOK_URL_MAX_LENGTH.toLocaleString("en")} characters.`);
  let url: URL;
  try {
    url = new URL(text);
  } catch {
    refuse("Enter a full address starting with https://, e.g. https://hooks.example.org/headroom.");
  }
  if (url.username || url.password) refuse("Remove the user name and password from the address: receivers check the signature instead.");
  if (url.hash) refuse("Remove the #fragment from the address: it is never sent to the receiver.");
  if (url.protocol === "http:") {
    if (!isLoopbackHost(url.hostname)) refuse("Use an https:// address. Plain http:// is accepted only for a receiver on this machine (localhost, 127.0.0.1).");
    if (!opts.allowHttpLoopback) refuse("Use an https:// address. Plain http:// to this machine is switched off here (WEBHOOK_ALLOW_HTTP_LOOPBACK).");
  } else if (url.protocol !== "https:") {
    refuse("Use an https:// address.");
  }
  if (!url.hostname) refuse("Enter a full address with a host name, e.g. https://hooks.example.org/headroom.");
  return url;
}

export type Lookup = (host: string) => Promise<string[]>;

/** How long a save waits for the host to resolve. */
const LOOKUP_TIMEOUT_MS = 5_000;

const systemLookup: Lookup = async (host) => {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(Object.assign(new Error("lookup timed out"), { code: "timed out" })), LOOKUP_TIMEOUT_MS);
  });
  try {
    return (await Promise.race([dns.promises.lookup(host, { all: true, verbatim: true }), timeout])).map((a) => a.address);
  } finally {
    clearTimeout(timer);
  }
};

/**
 * The whole check when an endpoint is saved: the rules above, then the host resolved and every
 * address it resolves to classified. Returns the address to store (normalised by the URL parser).
 */
export async function checkWebhookUrl(raw: string, opts: { allowPrivate: boolean; allowHttpLoopback: boolean; lookup?: Lookup }): Promise<string> {
  const url = parseWebhookUrl(raw, opts);
  const host = url.hostname.replace(/^\[|\]$/g, "");
  let addresses: string[];
  if (net.isIP(host) !== 0) addresses = [host];
  else {
    try {
      addresses = await (opts.lookup ?? systemLookup)(host);
    } catch (error) {
      const code = (error as { code?: string }).code;
      refuse(`${host} could not be resolved${code ? ` (${code})` : ""}. Check the address; the receiver must be reachable from this server.`);
    }
    if (addresses.length === 0) refuse(`${host} does not resolve to any address.`);
  }
  for (const address of addresses) {
    const verdict = classifyAddress(address, opts.allowPrivate);
    if (verdict.ok) continue;
    const subject = net.isIP(host) !== 0 ? `${address} is` : `${host} resolves to`;
    const what = net.isIP(host) !== 0 ? verdict.words : `${verdict.words} (${address})`;
    if (verdict.always) refuse(`${subject} ${what}, which webhooks may never reach.`);
    refuse(`${subject} ${what}; allow private addresses for this endpoint if it is inside your network.`);
  }
  if (url.protocol === "http:" && !addresses.every((a) => ipaddr.process(a).range() === "loopback")) {
    refuse(`Use an https:// address: ${host} does not resolve to this machine only.`);
  }
  return url.href;
}
