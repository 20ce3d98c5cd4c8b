/**
 * Real webhook bodies against the documented payload schemas (lib/api-docs/webhooks.ts): each
 * body parses with its event's schema and has exactly the documented keys, all the way down.
 */
import { expect } from "vitest";
import { z } from "zod";
import { WEBHOOK_PAYLOAD_SCHEMAS } from "@/lib/api-docs/webhooks";
import { isWebhookEventType } from "@/lib/webhooks/events";

/** Where a value and a schema part ways by their keys: missing or undocumented ones. */
export function keyProblems(schema: z.ZodType, value: unknown, at = "$"): string[] {
  if (schema instanceof z.ZodOptional || schema instanceof z.ZodNullable || schema instanceof z.ZodDefault) {
    return value === null || value === undefined ? [] : keyProblems(schema.unwrap() as z.ZodType, value, at);
  }
  if (schema instanceof z.ZodArray) return (value as unknown[]).flatMap((item, i) => keyProblems(schema.element as z.ZodType, item, `${at}[${i}]`));
  if (schema instanceof z.ZodObject) {
    const shape = schema.shape as Record<string, z.ZodType>;
    const problems: string[] = [];
    const expected = Object.keys(shape).filter((k) => !(shape[k] instanceof z.ZodOptional)).sort();
    const actual = Object.keys(value as object);
    const missing = expected.filter((k) => !actual.includes(k));
    const extra = actual.filter((k) => !(k in shape));
    if (missing.length || extra.length) problems.push(`${at}: missing ${missing.join(", ") || "none"}; undocumented ${extra.join(", ") || "none"}`);
    for (const [key, child] of Object.entries(shape)) if (key in (value as object)) problems.push(...keyProblems(child, (value as Record<string, unknown>)[key], `${at}.${key}`));
    return problems;
  }
  return [];
}

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
