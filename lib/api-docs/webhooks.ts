/**
 * The outgoing webhook events in the API document (OpenAPI 3.1 `webhooks`): the envelope
 * `{ type, timestamp, data }` of each event in lib/webhooks/events.ts, the signature headers and
 * what the receiver should answer. The payload builders in lib/webhooks/domain-events.ts are typed
 * by these schemas, and tests/integration/webhook-payloads.test.ts parses real deliveries with them
 * (strict objects: a field sent but not documented fails both).
 */
import { z } from "zod";
import type { ZodOpenApiPathItemObject, ZodOpenApiPathsObject } from "zod-openapi";
import { FINDING_STATUSES, SCENARIOS, SEVERITIES } from "@/db/enums";
import { DELIVERY_TIMEOUT_MS, RETRY_DELAYS_MS } from "@/lib/webhooks/deliver";
import { WEBHOOK_EVENT_LABELS, WEBHOOK_EVENT_TYPES, type WebhookEventType } from "@/lib/webhooks/events";
import { severitySchema } from "./schemas";

export const WEBHOOKS_TAG = "Webhooks";

const APP = "https://headroom.example.org";
/** An instant as Date#toISOString writes it (UTC, milliseconds). */
const dateTime = z
  .string()
  .refine((v) => !Number.isNaN(Date.parse(v)) && new Date(v).toISOString() === v, "An ISO-8601 UTC time, e.g. 2026-12-04T22:00:00.000Z.")
  .meta({ format: "date-time" });

// ---------------------------------------------------------------------------------------------
// The pieces of `data`
// ---------------------------------------------------------------------------------------------

export const webhookLocationSchema = z
  .strictObject({
    roomId: z.number().int().nullable().meta({ description: "The room; null only when the location no longer exists." }),
    storageUnitId: z.number().int().nullable().meta({ description: "The storage unit, or null for a room-wide finding." }),
    label: z.string().nullable().meta({ description: "Unit, room and site in words; null when the location no longer exists." }),
    link: z.string().nullable().meta({ description: "The location's page in Headroom; null when the location no longer exists." }),
  })
  .meta({
    id: "WebhookLocation",
    description: "Where the event happened.",
    example: {
      roomId: 3,
      storageUnitId: 7,
      label: "FSR-1 Flammable-storage refrigerator, room 2.115 Synthesis laboratory, North Campus",
      link: `${APP}/locations/units/7`,
    },
  });

const findingFields = {
  id: z.number().int().meta({ description: "The finding's id in the register." }),
  rule: z.string().meta({ description: "The assessment rule that flagged it, e.g. `enclosure-lfl`, `spill-exposure`, `quantity-limit`." }),
  title: z.string().meta({ description: "One sentence for people." }),
  severity: severitySchema,
  status: z.enum(FINDING_STATUSES).meta({ description: "The finding's status in the register after the change." }),
  scenario: z.enum(SCENARIOS).meta({ description: "The scenario the worst case was computed for." }),
  value: z.number().nullable().meta({ description: "The computed worst case, in `unit`; null for findings without a number (missing data)." }),
  limit: z.number().nullable().meta({ description: "The limit it was compared with, in `unit`." }),
  ratio: z.number().nullable().meta({ description: "`value` / `limit`." }),
  unit: z.string().nullable().meta({ description: "The unit of `value` and `limit`." }),
  worstCaseTempC: z.number().nullable().meta({ description: "The temperature the worst case assumes, °C." }),
  url: z.string().meta({ description: "The finding's page in the register." }),
};

/** The finding fields every finding event carries; each event adds its own. */
export const webhookFindingCoreSchema = z.strictObject(findingFields);

const findingExample = {
  id: 118,
  rule: "enclosure-lfl",
  title: "Acetone vapor could reach 31 % of its LFL in FSR-1 if cooling fails",
  severity: "high",
  status: "open",
  scenario: "control_lost",
  value: 0.31,
  limit: 0.25,
  ratio: 1.24,
  unit: "fraction of LFL",
  worstCaseTempC: 21.6,
  url: `${APP}/register/118`,
} as const;

export const findingRaisedFindingSchema = z
  .strictObject({ ...findingFields, reopened: z.boolean().meta({ description: "True when the finding had resolved and holds again." }) })
  .meta({ id: "WebhookFindingRaised", description: "The finding raised or re-opened." });

export const findingEscalatedFindingSchema = z
  .strictObject({ ...findingFields, previousSeverity: z.enum(SEVERITIES).nullable().meta({ description: "The severity before the escalation." }) })
  .meta({ id: "WebhookFindingEscalated", description: "The finding, at its new severity." });

export const findingResolvedFindingSchema = z
  .strictObject({
    ...findingFields,
    resolvedBy: z.enum(["re-assessment", "person"]).meta({ description: "`re-assessment`: the condition no longer holds; `person`: someone marked it resolved and the check agreed." }),
  })
  .meta({ id: "WebhookFindingResolved", description: "The finding that resolved." });

export const webhookExcursionSchema = z
  .strictObject({
    id: z.number().int().meta({ description: "The excursion's id." }),
    sensor: z.string().meta({ description: "The sensor's external id, as the logger sends it." }),
    thresholdC: z.number().meta({ description: "The excursion threshold of the unit or room, °C." }),
    startAt: dateTime.meta({ description: "When the readings went above the threshold." }),
    endAt: dateTime.nullable().meta({ description: "When they were back at or below it; null while the excursion is open (excursion.started of an excursion that is still going on)." }),
    peakTempC: z.number().meta({ description: "The highest reading so far, °C." }),
    peakAt: dateTime.meta({ description: "When the highest reading was taken." }),
    url: z.string().meta({ description: "The excursion's page in Headroom." }),
  })
  .meta({ id: "WebhookExcursion", description: "A temperature excursion of one sensor." });

export const webhookCrossingExcursionSchema = z
  .strictObject({
    id: z.number().int().meta({ description: "The open excursion's id." }),
    url: z.string().meta({ description: "The excursion's page in Headroom." }),
    latestTempC: z.number().meta({ description: "The latest reading, °C, the projection starts from." }),
    latestAt: dateTime.meta({ description: "When it was taken." }),
  })
  .meta({ id: "WebhookCrossingExcursion", description: "The open excursion the warning is about." });

export const webhookCrossingSchema = z
  .strictObject({
    key: z.string().meta({ description: "The control-lost finding's fingerprint and the threshold: warned once per excursion and key." }),
    name: z.string().meta({ description: "The substance or mixture." }),
    rule: z.string().meta({ description: "The assessment rule of the threshold." }),
    severity: severitySchema,
    threshold: z.string().meta({ description: "The threshold's label, e.g. `LFL`." }),
    tempC: z.number().meta({ description: "The temperature at which the contents cross it, °C." }),
    at: dateTime.nullable().meta({ description: "When the projected warm-up reaches it; null when already reached." }),
    reached: z.boolean().meta({ description: "Already at or above it at the latest reading." }),
    description: z.string().meta({ description: "The crossing in words, with the clock time in UTC." }),
  })
  .meta({ id: "WebhookCrossing", description: "One hazard threshold the warming unit is projected to cross." });

// ---------------------------------------------------------------------------------------------
// The envelopes
// ---------------------------------------------------------------------------------------------

const findingLocationExample = webhookLocationSchema.meta()!.example;
const unitLocationExample = {
  roomId: 3,
  storageUnitId: 9,
  label: "FZ-1 Freezer −20 °C, room 2.115 Synthesis laboratory, North Campus",
  link: `${APP}/locations/units/9`,
};
const excursionExample = {
  id: 41,
  sensor: "S-206",
  thresholdC: -10,
  startAt: "2026-12-04T21:30:00.000Z",
  endAt: null,
  peakTempC: -4.5,
  peakAt: "2026-12-04T21:45:00.000Z",
  url: `${APP}/temperatures/excursions/41`,
};

function envelope<T extends WebhookEventType, D extends z.ZodType>(type: T, id: string, data: D, example: { timestamp: string; data: unknown }) {
  return z
    .strictObject({
      type: z.literal(type).meta({ description: "The event name." }),
      timestamp: dateTime.meta({ description: "When the event happened (an excursion's start or end, the moment of the change)." }),
      data,
    })
    .meta({ id, description: `${WEBHOOK_EVENT_LABELS[type].label}: ${WEBHOOK_EVENT_LABELS[type].description}`, example: { type, ...example } });
}

export const findingRaisedEventSchema = envelope(
  "finding.raised",
  "FindingRaisedEvent",
  z.strictObject({ finding: findingRaisedFindingSchema, location: webhookLocationSchema }),
  { timestamp: "2026-12-05T07:31:10.000Z", data: { finding: { ...findingExample, reopened: false }, location: findingLocationExample } },
);

export const findingEscalatedEventSchema = envelope(
  "finding.escalated",
  "FindingEscalatedEvent",
  z.strictObject({ finding: findingEscalatedFindingSchema, location: webhookLocationSchema }),
  {
    timestamp: "2026-12-05T14:02:37.000Z",
    data: {
      finding: { ...findingExample, severity: "critical", status: "acknowledged", title: "Acetone vapor could reach 52 % of its LFL in FSR-1 if cooling fails", value: 0.52, ratio: 2.08, previousSeverity: "high" },
      location: findingLocationExample,
    },
  },
);

export const findingResolvedEventSchema = envelope(
  "finding.resolved",
  "FindingResolvedEvent",
  z.strictObject({ finding: findingResolvedFindingSchema, location: webhookLocationSchema }),
  { timestamp: "2026-12-06T09:15:00.000Z", data: { finding: { ...findingExample, status: "resolved", resolvedBy: "person" }, location: findingLocationExample } },
);

export const excursionStartedEventSchema = envelope(
  "excursion.started",
  "ExcursionStartedEvent",
  z.strictObject({ excursion: webhookExcursionSchema, location: webhookLocationSchema }),
  { timestamp: excursionExample.startAt, data: { excursion: excursionExample, location: unitLocationExample } },
);

export const excursionEndedEventSchema = envelope(
  "excursion.ended",
  "ExcursionEndedEvent",
  z.strictObject({ excursion: webhookExcursionSchema, location: webhookLocationSchema }),
  {
    timestamp: "2026-12-04T23:05:00.000Z",
    data: { excursion: { ...excursionExample, endAt: "2026-12-04T23:05:00.000Z", peakTempC: 1.5, peakAt: "2026-12-04T22:20:00.000Z" }, location: unitLocationExample },
  },
);

export const excursionCrossingWarningEventSchema = envelope(
  "excursion.crossing_warning",
  "ExcursionCrossingWarningEvent",
  z.strictObject({ excursion: webhookCrossingExcursionSchema, crossings: z.array(webhookCrossingSchema), location: webhookLocationSchema }),
  {
    timestamp: "2026-12-04T22:00:00.000Z",
    data: {
      excursion: { id: 41, url: `${APP}/temperatures/excursions/41`, latestTempC: 0, latestAt: "2026-12-04T22:00:00.000Z" },
      crossings: [
        {
          key: "enclosure-lfl|unit:9|substance:5|control_lost|LFL",
          name: "methanol",
          rule: "enclosure-lfl",
          severity: "high",
          threshold: "LFL",
          tempC: 11.2,
          at: "2026-12-04T22:15:00.000Z",
          reached: false,
          description: "methanol: LFL at about 22:15 UTC",
        },
      ],
      location: unitLocationExample,
    },
  },
);

/** Each event's envelope schema, by event name. */
export const WEBHOOK_PAYLOAD_SCHEMAS = {
  "finding.raised": findingRaisedEventSchema,
  "finding.escalated": findingEscalatedEventSchema,
  "finding.resolved": findingResolvedEventSchema,
  "excursion.started": excursionStartedEventSchema,
  "excursion.ended": excursionEndedEventSchema,
  "excursion.crossing_warning": excursionCrossingWarningEventSchema,
} as const satisfies Record<WebhookEventType, z.ZodType>;

/** What an event's `data` must be: the builders in lib/webhooks/domain-events.ts are typed by it. */
export type WebhookEventData<T extends WebhookEventType> = z.input<(typeof WEBHOOK_PAYLOAD_SCHEMAS)[T]>["data"];
export type WebhookFindingCore = z.input<typeof webhookFindingCoreSchema>;
export type WebhookLocation = z.input<typeof webhookLocationSchema>;
export type WebhookCrossing = z.input<typeof webhookCrossingSchema>;

// ---------------------------------------------------------------------------------------------
// The OpenAPI `webhooks` object
// ---------------------------------------------------------------------------------------------

function duration(ms: number): string {
  if (ms < 60_000) return `${ms / 1000} s`;
  if (ms < 3_600_000) return `${ms / 60_000} min`;
  return `${ms / 3_600_000} h`;
}

export const RETRY_SCHEDULE_TEXT = RETRY_DELAYS_MS.map(duration).join(", ");

export const webhookHeadersSchema = z.object({
  "webhook-id": z.string().meta({
    description: "The message id (`msg_…`), the same on every attempt of one delivery: deduplicate on it, a retry may arrive after you already handled the message.",
    example: "msg_2KWPBgLlAfxdpx2AI54pPJ",
  }),
  "webhook-timestamp": z.string().meta({
    description: "When this attempt was signed, in seconds since 1970-01-01 UTC. Reject messages whose timestamp is more than 5 minutes away from your clock.",
    example: "1796983870",
  }),
  "webhook-signature": z.string().meta({
    description:
      "`v1,<base64>`: HMAC-SHA256 over `${webhook-id}.${webhook-timestamp}.${body}` (the raw body, as received), keyed with the base64-decoded part of the endpoint's secret after `whsec_`. Headroom sends one; the convention allows several separated by spaces, and the message is genuine if one matches. Any Standard Webhooks library verifies all of this.",
    example: "v1,K5oZfzN95Z9UVu1EsfQmfVNQhnkZ2pj9o9NDN/H/pI4=",
  }),
});

const DELIVERY_TEXT = `Headroom sends a POST with the JSON body below, signed by the Standard Webhooks convention (see the three headers). Verify the signature with the endpoint's secret before you trust the body, reject stale timestamps, and deduplicate on \`webhook-id\`: the same id is sent again on every retry.

**Answer** with any 2xx within ${DELIVERY_TIMEOUT_MS / 1000} s: the delivery is done and never sent again. Anything else — another status, a redirect (not followed), no answer within ${DELIVERY_TIMEOUT_MS / 1000} s, a refused connection — is retried after about ${RETRY_SCHEDULE_TEXT} (each ±20 %), then the delivery is marked failed; an administrator can send it again from Admin → Webhooks. Order is not guaranteed: use \`timestamp\` and the ids.`;

function webhookItem(type: WebhookEventType): ZodOpenApiPathItemObject {
  const { label, description } = WEBHOOK_EVENT_LABELS[type];
  return {
    post: {
      operationId: `webhook_${type.replace(".", "_")}`,
      tags: [WEBHOOKS_TAG],
      summary: `${type} — ${label}`,
      description: `${description}\n\n${DELIVERY_TEXT}`,
      requestParams: { header: webhookHeadersSchema },
      requestBody: { required: true, description: `The \`${type}\` event.`, content: { "application/json": { schema: WEBHOOK_PAYLOAD_SCHEMAS[type] } } },
      responses: {
        "2XX": { description: `Received: any 2xx within ${DELIVERY_TIMEOUT_MS / 1000} s marks the delivery delivered. The answer's body is kept (its first 4 KB) for the delivery log and otherwise ignored.` },
        default: { description: `Anything else, a redirect or a timeout: retried after about ${RETRY_SCHEDULE_TEXT}, then failed.` },
      },
    },
  };
}

/** The document's `webhooks`: one entry per event name. */
export function webhookDocuments(): ZodOpenApiPathsObject {
  return Object.fromEntries(WEBHOOK_EVENT_TYPES.map((type) => [type, webhookItem(type)]));
}

export const WEBHOOKS_DESCRIPTION = `**Webhooks.** Headroom can POST events — findings raised, escalated and resolved, temperature excursions started and ended, and crossing warnings — to endpoints an administrator registers under Admin → Webhooks, each with the events it receives and its own signing secret (\`whsec_…\`, shown once). Deliveries are signed by the Standard Webhooks convention and retried until the receiver answers 2xx; the "${WEBHOOKS_TAG}" part of this reference describes every event's payload, the headers and the expected answer.`;
