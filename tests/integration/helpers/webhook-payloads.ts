/**
 * Real webhook bodies against the documented payload schemas (lib/api-docs/webhooks.ts): each
 * body parses with its event's schema and has exactly the documented keys, all the way down.
 */
import { expect } from "vitest";
import { WEBHOOK_PAYLOAD_SCHEMAS } from "@/lib/api-docs/webhooks";
import { isWebhookEventType } from "@/lib/webhooks/events";
import { keyProblems } from "./documented-keys";

/** Parses one delivered body with its event's documented schema; returns the event name. */
export function expectDocumentedPayload(body: string): string {
  const payload = JSON.parse(body) as { type: string };
  expect(isWebhookEventType(payload.type), payload.type).toBe(true);
  const schema = WEBHOOK_PAYLOAD_SCHEMAS[payload.type as keyof typeof WEBHOOK_PAYLOAD_SCHEMAS];
  const parsed = schema.safeParse(payload);
  expect(parsed.success, `${payload.type}: ${parsed.error?.message}`).toBe(true);
  expect(keyProblems(schema, payload), payload.type).toEqual([]);
  return payload.type;
}
