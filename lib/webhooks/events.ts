/** The webhook event types and their labels. Pure: safe for client components. */
export const WEBHOOK_EVENT_TYPES = [
  "finding.raised",
  "finding.escalated",
  "finding.resolved",
  "excursion.started",
  "excursion.ended",
  "excursion.crossing_warning",
] as const;

export type WebhookEventType = (typeof WEBHOOK_EVENT_TYPES)[number];

export const WEBHOOK_EVENT_LABELS: Record<WebhookEventType, { label: string; description: string }> = {
  "finding.raised": { label: "Finding raised", description: "A new finding in the register, or one that holds again after it had resolved." },
  "finding.escalated": { label: "Finding escalated", description: "A finding being worked on went up in severity." },
  "finding.resolved": { label: "Finding resolved", description: "Resolved by re-assessment or by a person." },
  "excursion.started": { label: "Excursion started", description: "A sensor has read above its threshold for the minimum duration." },
  "excursion.ended": { label: "Excursion ended", description: "Readings are back at or below the threshold." },
  "excursion.crossing_warning": { label: "Crossing warning", description: "A warming unit is projected to cross a hazard threshold within the hour." },
};

export function isWebhookEventType(value: string): value is WebhookEventType {
  return (WEBHOOK_EVENT_TYPES as readonly string[]).includes(value);
}
