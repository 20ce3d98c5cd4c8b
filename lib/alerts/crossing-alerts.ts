import "server-only";
import { createHash } from "node:crypto";
import { and, inArray, isNotNull, isNull } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { excursionCrossingAlerts, excursions } from "@/db/schema";
import { crossingSoonEmail, formatEmailInstant, formatEmailTempC } from "@/emails/excursion";
import { appUrl } from "@/lib/config";
import { enqueueEmail } from "@/lib/mail/outbox";
import { queueCrossingWarningWebhook } from "@/lib/webhooks/domain-events";
import { crossingText, projectOpenExcursion, type ProjectedCrossing } from "@/lib/temperatures/projection";
import { describeAlertLocation, responsibleUsers } from "./recipients";

/** A projected crossing closer than this is warned about (once per excursion and threshold). */
export const CROSSING_WARNING_MS = 60 * 60_000;

/**
 * For every open excursion on a unit: project the warm-up from the latest reading and warn the
 * people responsible who hear about excursions as they happen when a threshold is less than an
 * hour away (or was passed since the last look), once per excursion and threshold — recorded in
 * excursion_crossing_alerts in the same transaction as the e-mail. Thresholds reached already in
 * control are findings of their own, not news. Returns the messages queued.
 */
export function checkCrossingAlerts(db: DbOrTx = getDb(), nowMs = Date.now()): number {
  const open = db.select().from(excursions).where(and(isNull(excursions.endAt), isNotNull(excursions.storageUnitId))).all();
  let queued = 0;
  for (const excursion of open) {
    const projection = projectOpenExcursion(db, excursion, nowMs);
    if (!projection) continue;
    const due = projection.crossings.filter((c) => !c.inControl && (c.reached || (c.at !== null && c.at.getTime() - nowMs <= CROSSING_WARNING_MS)));
    if (due.length === 0) continue;
    const sent = new Set(
      db
        .select({ key: excursionCrossingAlerts.thresholdKey })
        .from(excursionCrossingAlerts)
        .where(and(inArray(excursionCrossingAlerts.excursionId, [excursion.id]), inArray(excursionCrossingAlerts.thresholdKey, due.map((c) => c.key))))
        .all()
        .map((r) => r.key),
    );
    const fresh = due.filter((c) => !sent.has(c.key));
    if (fresh.length === 0) continue;
    queued += db.transaction((tx) => warn(tx, excursion.id, projection.latest, fresh, projection, nowMs));
  }
  return queued;
}

function warn(
  tx: DbOrTx,
  excursionId: number,
  latest: { at: Date; tempC: number },
  fresh: ProjectedCrossing[],
  projection: NonNullable<ReturnType<typeof projectOpenExcursion>>,
  nowMs: number,
): number {
  for (const c of fresh) {
    tx.insert(excursionCrossingAlerts)
      .values({ excursionId, thresholdKey: c.key, crossingAt: c.at ?? latest.at, sentAt: new Date(nowMs) })
      .onConflictDoNothing()
      .run();
  }
  queueCrossingWarningWebhook(tx, { excursionId, storageUnitId: projection.storageUnitId, latest, crossings: fresh }, new Date(nowMs));
  const location = describeAlertLocation(tx, { storageUnitId: projection.storageUnitId });
  if (!location) return 0;
  const lines = fresh.map((c) => crossingText(c, latest.at));
  const message = crossingSoonEmail({
    locationLabel: location.label,
    lines,
    first: lines[0],
    basis: `${projection.tauReason}; warming towards ${formatEmailTempC(projection.roomTempC)}`,
    latest: `${formatEmailTempC(latest.tempC)} at ${formatEmailInstant(latest.at)}`,
    link: `${appUrl()}/temperatures/excursions/${excursionId}`,
  });
  const key = createHash("sha256").update(fresh.map((c) => c.key).join(",")).digest("hex").slice(0, 32);
  let queued = 0;
  for (const user of responsibleUsers(tx, location).filter((u) => u.alertExcursions === "immediate")) {
    queued += enqueueEmail(tx, { ...message, kind: "excursion_crossing", to: [user.email], recipientUserId: user.id, idempotencyKey: `crossing:${excursionId}:${key}:${user.id}` }) ? 1 : 0;
  }
  return queued;
}
