import "server-only";
import { webhookReceiverUrl } from "@/lib/config";
import type { ReceivedWebhook } from "./receiver-fake";

export type ReceiverRecordings = { available: true; url: string; received: ReceivedWebhook[] } | { available: false; reason: string | null };

/** What the local webhook receiver recorded, for admins; only when one is configured (WEBHOOK_FAKE_PORT). */
export async function receiverRecordings(): Promise<ReceiverRecordings> {
  const url = webhookReceiverUrl();
  if (!url) return { available: false, reason: null };
  try {
    const response = await fetch(`${url}/deliveries`, { cache: "no-store", signal: AbortSignal.timeout(2_000) });
    if (!response.ok) return { available: false, reason: `The local webhook receiver answered ${response.status}.` };
    const body = (await response.json()) as { data: ReceivedWebhook[] };
    return { available: true, url, received: body.data.slice(0, 50) };
  } catch {
    return { available: false, reason: `The local webhook receiver at ${url} is not answering. Deliveries to it wait and are retried.` };
  }
}
