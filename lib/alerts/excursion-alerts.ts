import "server-only";
import { createHash } from "node:crypto";
import type { DbOrTx } from "@/db/client";
import type { Excursion } from "@/db/schema";
import { excursionEmail, formatDurationMin, formatEmailInstant, formatEmailTempC } from "@/emails/excursion";
import { appUrl } from "@/lib/config";
import { crossingText, projectOpenExcursion } from "@/lib/temperatures/projection";
import { renderEmail } from "@/emails/layout";
import { enqueueEmail } from "@/lib/mail/outbox";
import { describeAlertLocation, responsibleUsers } from "./recipients";

export type ExcursionAlertEvent = { kind: "started" | "ended" | "recorded"; excursion: Excursion };

/** More events than this from one batch of readings go out as one summary message per person. */
export const MAX_SEPARATE_EXCURSION_MESSAGES = 3;

/**
 * Queues the excursion e-mails for one sensor's events, in the caller's transaction, to the people
 * responsible for the location who chose to hear about excursions as they happen. Those who chose
 * the daily digest read about them there; those who chose "off" do not. Each message has a stable
 * idempotency key, so running the same detection twice never queues a message twice.
 */
export function queueExcursionAlerts(
  tx: DbOrTx,
  context: { sensorExternalId: string; minDurationMin: number; roomId: number | null; storageUnitId: number | null },
  events: ExcursionAlertEvent[],
): number {
  const location = describeAlertLocation(tx, { roomId: context.roomId, storageUnitId: context.storageUnitId });
  if (!location || events.length === 0) return 0;
  const recipients = responsibleUsers(tx, location).filter((user) => user.alertExcursions === "immediate");
  if (recipients.length === 0) return 0;
  // A started excursion on a unit: where its warm-up is heading, earliest crossing first.
  const projections = new Map<number, { lines: string[]; basis: string; link: string; firstAtMs: number }>();
  for (const event of events) {
    if (event.kind !== "started") continue;
    const projection = projectOpenExcursion(tx, event.excursion);
    if (!projection) continue;
    const lines = projection.crossings.filter((c) => !c.inControl && (c.reached || c.at)).slice(0, 8).map((c) => crossingText(c, projection.latest.at));
    if (lines.length === 0) continue;
    const first = projection.crossings.find((c) => !c.inControl && (c.reached || c.at));
    projections.set(event.excursion.id, {
      lines,
      basis: `${projection.tauReason}; warming towards ${formatEmailTempC(projection.roomTempC)}`,
      link: `${appUrl()}/temperatures/excursions/${event.excursion.id}`,
      firstAtMs: first?.reached ? 0 : (first?.at?.getTime() ?? Number.MAX_SAFE_INTEGER),
    });
  }
  // Ranked by the earliest crossing: the message about the most urgent excursion goes out first.
  events = [...events].sort((a, b) => (projections.get(a.excursion.id)?.firstAtMs ?? Number.MAX_SAFE_INTEGER) - (projections.get(b.excursion.id)?.firstAtMs ?? Number.MAX_SAFE_INTEGER));
  let queued = 0;
  for (const user of recipients) {
    if (events.length <= MAX_SEPARATE_EXCURSION_MESSAGES) {
      for (const event of events) {
        const e = event.excursion;
        const message = excursionEmail({
          event: event.kind,
          locationLabel: location.label,
          sensorLabel: context.sensorExternalId,
          thresholdC: e.thresholdC,
          minDurationMin: context.minDurationMin,
          startAt: e.startAt,
          endAt: e.endAt,
          peakTempC: e.peakTempC,
          peakAt: e.peakAt,
          link: location.link,
          projection: projections.get(e.id)?.lines,
          projectionBasis: projections.get(e.id)?.basis,
          projectionLink: projections.get(e.id)?.link,
        });
        queued += enqueueEmail(tx, { ...message, kind: `excursion_${event.kind}`, to: [user.email], recipientUserId: user.id, idempotencyKey: `excursion:${event.kind}:${e.id}:${user.id}` }) ? 1 : 0;
      }
      continue;
    }
    const sorted = [...events].sort((a, b) => a.excursion.startAt.getTime() - b.excursion.startAt.getTime());
    const peak = sorted.reduce((best, event) => (event.excursion.peakTempC > best.excursion.peakTempC ? event : best));
    const lines = sorted.map(({ kind, excursion: e }) => {
      const span = e.endAt ? `${formatEmailInstant(e.startAt)} – ${formatEmailInstant(e.endAt)} (${formatDurationMin((e.endAt.getTime() - e.startAt.getTime()) / 60_000)})` : `since ${formatEmailInstant(e.startAt)}, still open`;
      return `${kind === "ended" ? "Ended: " : ""}${span}, peak ${formatEmailTempC(e.peakTempC)}`;
    });
    const message = renderEmail(
      `${events.length} excursions at ${location.label}, peak ${formatEmailTempC(peak.excursion.peakTempC)}`,
      `${events.length} temperature excursions at ${location.label}`,
      [
        { kind: "p", text: `New readings from sensor ${context.sensorExternalId} show ${events.length} periods above the excursion threshold of ${formatEmailTempC(peak.excursion.thresholdC)} (minimum duration ${formatDurationMin(context.minDurationMin)}). The highest was ${formatEmailTempC(peak.excursion.peakTempC)} at ${formatEmailInstant(peak.excursion.peakAt)}.` },
        ...lines.map((text) => ({ kind: "small" as const, text: `• ${text}` })),
        { kind: "button", label: "Open the location", href: location.link },
        { kind: "small", text: "Screening figures from logger data, not air monitoring; qualified people decide, and local codes and the authority having jurisdiction prevail." },
      ],
    );
    const key = createHash("sha256").update(sorted.map((event) => `${event.kind}:${event.excursion.id}`).join(",")).digest("hex").slice(0, 32);
    queued += enqueueEmail(tx, { ...message, kind: "excursion_summary", to: [user.email], recipientUserId: user.id, idempotencyKey: `excursions:${key}:${user.id}` }) ? 1 : 0;
  }
  return queued;
}
