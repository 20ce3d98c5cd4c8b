import "server-only";
import { mailBaseUrl, mailUsesFake } from "@/lib/config";
import type { CapturedEmail } from "./fake-server";

export type CapturedMailbox = { available: true; messages: CapturedEmail[] } | { available: false; reason: string };

/** The messages the local e-mail fake has captured, for admins; only when the fake is in use. */
export async function capturedMessages(): Promise<CapturedMailbox> {
  if (!mailUsesFake()) return { available: false, reason: "E-mail goes to the hosted service, so there is no local mailbox to show." };
  try {
    const response = await fetch(`${mailBaseUrl()}/emails`, { cache: "no-store", signal: AbortSignal.timeout(2_000) });
    if (!response.ok) return { available: false, reason: `The e-mail fake answered ${response.status}.` };
    const body = (await response.json()) as { data: CapturedEmail[] };
    return { available: true, messages: body.data };
  } catch {
    return { available: false, reason: `The e-mail fake at ${mailBaseUrl()} is not answering. Messages stay queued until it is back.` };
  }
}
