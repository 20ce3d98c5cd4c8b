import "server-only";
import type { DbOrTx } from "@/db/client";
import { findingEmail } from "@/emails/finding";
import { appUrl } from "@/lib/config";
import { enqueueEmail } from "@/lib/mail/outbox";
import type { FindingChange } from "@/lib/register/store";
import { describeAlertLocation, responsibleUsers } from "./recipients";

/** Only these severities are e-mailed as they happen; the rest are read in the register and the digest. */
export const ALERTED_SEVERITIES = new Set(["critical", "high"]);

function formatValue(value: number | null, limit: number | null, ratio: number | null, unit: string | null): string | null {
  if (value == null) return null;
  const v = Number(value.toPrecision(3));
  const l = limit == null ? null : Number(limit.toPrecision(3));
  const pct = ratio == null ? "" : ` (${Number((ratio * 100).toPrecision(3))} % of the limit)`;
  return `Computed ${v}${unit ? ` ${unit}` : ""}${l == null ? "" : ` against a limit of ${l}${unit ? ` ${unit}` : ""}`}${pct}.`;
}

/**
 * Queues e-mails for critical and high findings that were raised, re-opened or escalated, to the
 * people responsible for the location who chose finding alerts as they happen. Keys are stable per
 * finding, event and person, with the time of the change, so a re-run never sends twice.
 */
export function queueFindingAlerts(tx: DbOrTx, changes: FindingChange[]): number {
  let queued = 0;
  for (const { kind, finding } of changes) {
    if (!ALERTED_SEVERITIES.has(finding.severity)) continue;
    const location = describeAlertLocation(tx, { roomId: finding.roomId, storageUnitId: finding.storageUnitId });
    if (!location) continue;
    const message = findingEmail({
      event: kind,
      severity: finding.severity,
      title: finding.title,
      locationLabel: location.label,
      valueText: formatValue(finding.value, finding.limitValue, finding.ratio, finding.unit),
      worstCaseText: finding.worstCaseSource,
      link: `${appUrl()}/register/${finding.id}`,
    });
    for (const user of responsibleUsers(tx, location)) {
      if (user.alertFindings !== "immediate") continue;
      queued += enqueueEmail(tx, {
        ...message,
        kind: `finding_${kind}`,
        to: [user.email],
        recipientUserId: user.id,
        idempotencyKey: `finding:${kind}:${finding.id}:${finding.updatedAt.getTime()}:${user.id}`,
      })
        ? 1
        : 0;
    }
  }
  return queued;
}
