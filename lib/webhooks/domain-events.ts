import "server-only";
import { inArray } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { findings, type Excursion, type Finding, type Severity } from "@/db/schema";
import { describeAlertLocation } from "@/lib/alerts/recipients";
import { appUrl } from "@/lib/config";
import { crossingText, type ProjectedCrossing } from "@/lib/temperatures/projection";
import type { WebhookCrossing, WebhookEventData, WebhookFindingCore, WebhookLocation } from "@/lib/api-docs/webhooks";
import type { WebhookEventType } from "./events";
import { activeSubscribers, enqueueWebhookEvent } from "./outbox";

/**
 * The register's and the loggers' events as webhook payloads, queued in the transaction of the
 * change. Payloads carry ids, codes, severity, the location and a link — no people. Each payload is
 * typed by its documented schema (lib/api-docs/webhooks.ts): a field not documented there fails tsc.
 */

type Location = WebhookLocation;

/** Queues one event with the `data` its documented schema names. */
function queue<T extends WebhookEventType>(tx: DbOrTx, type: T, data: WebhookEventData<T>, opts: Parameters<typeof enqueueWebhookEvent>[3]): number {
  return enqueueWebhookEvent(tx, type, data, opts);
}

function location(tx: DbOrTx, where: { roomId: number | null; storageUnitId: number | null }, cache: Map<string, Location>): Location {
  const key = `${where.roomId}:${where.storageUnitId}`;
  const known = cache.get(key);
  if (known) return known;
  const found = describeAlertLocation(tx, where);
  const value: Location = found
    ? { roomId: found.roomId, storageUnitId: found.storageUnitId, label: found.label, link: found.link }
    : { roomId: where.roomId, storageUnitId: where.storageUnitId, label: null, link: null };
  cache.set(key, value);
  return value;
}

type FindingEvent = "finding.raised" | "finding.escalated" | "finding.resolved";

function findingCore(finding: Finding): WebhookFindingCore {
  return {
    id: finding.id,
    rule: finding.rule,
    title: finding.title,
    severity: finding.severity,
    status: finding.status,
    scenario: finding.scenario,
    value: finding.value,
    limit: finding.limitValue,
    ratio: finding.ratio,
    unit: finding.unit,
    worstCaseTempC: finding.worstCaseTempC,
    url: `${appUrl()}/register/${finding.id}`,
  };
}

/** The finding and its location, with the fields only this event carries. */
function findingData<T extends FindingEvent>(
  tx: DbOrTx,
  _type: T,
  finding: Finding,
  cache: Map<string, Location>,
  extra: Omit<WebhookEventData<T>["finding"], keyof WebhookFindingCore>,
): WebhookEventData<T> {
  return {
    finding: { ...findingCore(finding), ...extra },
    location: location(tx, { roomId: finding.roomId, storageUnitId: finding.storageUnitId }, cache),
  } as WebhookEventData<T>;
}

export type FindingWebhookChange = { kind: "raised" | "reopened" | "escalated"; finding: Finding; fromSeverity?: Severity };

/**
 * After a reconcile: raised and re-opened findings (`finding.raised`, with `reopened`), escalated
 * ones (`finding.escalated`, with the severity before) and those re-assessment resolved. Costs one
 * indexed query when no endpoint is active.
 */
export function queueFindingWebhooks(tx: DbOrTx, changes: FindingWebhookChange[], resolvedIds: number[], at = new Date()): number {
  if (changes.length === 0 && resolvedIds.length === 0) return 0;
  const subscribers = activeSubscribers(tx);
  if (subscribers.length === 0) return 0;
  const cache = new Map<string, Location>();
  let queued = 0;
  for (const change of changes) {
    if (change.kind === "escalated") {
      queued += queue(tx, "finding.escalated", findingData(tx, "finding.escalated", change.finding, cache, { previousSeverity: change.fromSeverity ?? null }), { at, subscribers });
    } else {
      queued += queue(tx, "finding.raised", findingData(tx, "finding.raised", change.finding, cache, { reopened: change.kind === "reopened" }), { at, subscribers });
    }
  }
  if (resolvedIds.length && subscribers.some((s) => s.events.includes("finding.resolved"))) {
    for (let i = 0; i < resolvedIds.length; i += 500) {
      for (const finding of tx.select().from(findings).where(inArray(findings.id, resolvedIds.slice(i, i + 500))).all()) {
        queued += queue(tx, "finding.resolved", findingData(tx, "finding.resolved", finding, cache, { resolvedBy: "re-assessment" }), { at, subscribers });
      }
    }
  }
  return queued;
}

/** A person marked a finding resolved (and re-assessment agreed). */
export function queueFindingResolvedByPerson(tx: DbOrTx, finding: Finding, at = new Date()): number {
  return queue(tx, "finding.resolved", findingData(tx, "finding.resolved", finding, new Map(), { resolvedBy: "person" }), { at });
}

function excursionData(tx: DbOrTx, excursion: Excursion, sensor: string, cache: Map<string, Location>): WebhookEventData<"excursion.started" | "excursion.ended"> {
  return {
    excursion: {
      id: excursion.id,
      sensor,
      thresholdC: excursion.thresholdC,
      startAt: excursion.startAt.toISOString(),
      endAt: excursion.endAt?.toISOString() ?? null,
      peakTempC: excursion.peakTempC,
      peakAt: excursion.peakAt.toISOString(),
      url: `${appUrl()}/temperatures/excursions/${excursion.id}`,
    },
    location: location(tx, { roomId: excursion.roomId, storageUnitId: excursion.storageUnitId }, cache),
  };
}

/** A sensor's excursion events from one detection run; one that started and ended within the batch sends both. */
export function queueExcursionWebhooks(tx: DbOrTx, sensor: string, events: { kind: "started" | "ended" | "recorded"; excursion: Excursion }[]): number {
  if (events.length === 0) return 0;
  const subscribers = activeSubscribers(tx);
  if (subscribers.length === 0) return 0;
  const cache = new Map<string, Location>();
  let queued = 0;
  for (const { kind, excursion } of events) {
    const data = excursionData(tx, excursion, sensor, cache);
    if (kind === "started" || kind === "recorded") queued += queue(tx, "excursion.started", data, { at: excursion.startAt, subscribers });
    if (kind === "ended" || kind === "recorded") queued += queue(tx, "excursion.ended", data, { at: excursion.endAt ?? new Date(), subscribers });
  }
  return queued;
}

/** The time-to-danger warning of an open excursion (lib/alerts/crossing-alerts.ts), once per excursion and threshold. */
export function queueCrossingWarningWebhook(
  tx: DbOrTx,
  input: { excursionId: number; storageUnitId: number; latest: { at: Date; tempC: number }; crossings: ProjectedCrossing[] },
  at: Date,
): number {
  return queue(
    tx,
    "excursion.crossing_warning",
    {
      excursion: { id: input.excursionId, url: `${appUrl()}/temperatures/excursions/${input.excursionId}`, latestTempC: input.latest.tempC, latestAt: input.latest.at.toISOString() },
      crossings: input.crossings.map((c): WebhookCrossing => ({
        key: c.key,
        name: c.name,
        rule: c.rule,
        severity: c.severity,
        threshold: c.threshold,
        tempC: c.tempC,
        at: c.at?.toISOString() ?? null,
        reached: c.reached,
        description: crossingText(c, input.latest.at),
      })),
      location: location(tx, { roomId: null, storageUnitId: input.storageUnitId }, new Map()),
    },
    { at },
  );
}
