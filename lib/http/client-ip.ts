import "server-only";
import { headers as requestHeaders } from "next/headers";
import { trustProxy, type TrustProxy } from "@/lib/config";
import { PEER_ADDRESS_HEADER, peerAddressHeaderInstalled } from "./peer-address";

/**
 * Who the client is, for rate limits and the session list.
 *
 * `next start` gives route handlers and server actions no socket: it copies the socket's address
 * into X-Forwarded-For only when the request has none (`??=` in next/dist/server/base-server.js),
 * so a client that sends its own X-Forwarded-For chooses the address the app sees. The server
 * process therefore stamps every request with the socket's address in a header of its own
 * (`installPeerAddressHeader` in ./peer-address.ts, from instrumentation.ts), overwriting anything a client sent under
 * that name, and X-Forwarded-For counts only as far as TRUST_PROXY says.
 */
function normalise(address: string | null | undefined): string | null {
  let value = address?.trim();
  if (!value) return null;
  if (value.startsWith("[") && value.includes("]")) value = value.slice(1, value.indexOf("]"));
  if (/^\d+\.\d+\.\d+\.\d+:\d+$/.test(value)) value = value.slice(0, value.lastIndexOf(":"));
  if (value.toLowerCase().startsWith("::ffff:") && value.includes(".")) value = value.slice(7);
  return value.toLowerCase();
}

type HeaderSource = { get(name: string): string | null };

/**
 * The client's address from a request's headers. Without a trusted proxy it is the socket's
 * address; behind N trusted hops, the address N entries from the right of the chain
 * X-Forwarded-For + socket; behind listed proxies, the rightmost address of that chain that is
 * not one of them.
 */
export function clientIpFrom(source: HeaderSource, trust: TrustProxy = trustProxy()): string {
  const forwarded = (source.get("x-forwarded-for") ?? "")
    .split(",")
    .map(normalise)
    .filter((a): a is string => a !== null);
  const stamped = peerAddressHeaderInstalled() ? normalise(source.get(PEER_ADDRESS_HEADER)) : null;
  // Outside `next start` (tests, scripts) or for a request accepted before the stamp was
  // installed, Next's own X-Forwarded-For entry, the rightmost, stands in for the socket.
  const peer = stamped ?? forwarded.pop() ?? null;
  if (!peer) return "unknown";
  const chain = [...forwarded, peer];
  if (trust.kind === "off") return peer;
  if (trust.kind === "hops") return chain[Math.max(0, chain.length - 1 - trust.hops)];
  const trusted = new Set(trust.addresses.map(normalise));
  for (let i = chain.length - 1; i >= 0; i -= 1) {
    if (!trusted.has(chain[i])) return chain[i];
  }
  return chain[0];
}

/** For route handlers. */
export function clientIp(request: Request): string {
  return clientIpFrom(request.headers);
}

/** For server actions and server components: the current request's address, or "unknown" outside one. */
export async function currentClientIp(): Promise<string> {
  try {
    return clientIpFrom(await requestHeaders());
  } catch {
    return "unknown";
  }
}

/** The current request's User-Agent, or null outside one. */
export async function currentUserAgent(): Promise<string | null> {
  try {
    return (await requestHeaders()).get("user-agent");
  } catch {
    return null;
  }
}
