/**
 * Demo temperatures for the invented Corvane Institute: the demo loggers, a year of readings
 * every 15 minutes up to the seed time (traces in ./demo-traces.ts), the excursions Headroom finds
 * in them, an acknowledgement of the failed refrigerator, the warm-up fitted to that failure, and
 * the demo ingest key. Invented data.
 */
import type Database from "better-sqlite3";
import { and, asc, count, eq } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { auditEvents, excursions, jobs, rooms, sensors, storageUnits } from "@/db/schema";
import { storeApiKey } from "@/lib/api-keys/service";
import { refreshExcursions } from "@/lib/temperatures/excursion-store";
import { WARM_UP_FIT_JOB } from "@/lib/temperatures/warm-up-jobs";
import { refitUnitWarmUp, unitsWithEndedExcursions } from "@/lib/temperatures/warm-up-store";
import { DAY_MS, demoTraces, READING_INTERVAL_MS } from "./demo-traces";

/**
 * The demo ingest key, published in the README so that its `curl` example works as written.
 * DEMO ONLY: anyone who has read the README knows it. Revoke it (`DELETE /api/v1/api-keys/{id}`) on any
 * installation that is not a throwaway demo. Same shape as a generated key: `hrk_` + 32 characters.
 */
export const DEMO_INGEST_KEY = "hrk_demo_corvane-logger-gateway-0001";
export const DEMO_INGEST_KEY_NAME = "Demo logger gateway";

export type DemoTemperatureSummary = {
  sensors: number;
  readings: number;
  excursions: number;
  heatWave: { startMs: number; endMs: number };
  failure: { startMs: number; repairMs: number };
  /** The units whose warm-up was fitted to their recorded failures. */
  warmUpFits: { unitId: number; tauMin: number; rmsErrorC: number; excursions: number; readings: number }[];
};

const FAILURE_ACKNOWLEDGEMENT =
  "Compressor start relay failed on Friday evening; the contractor replaced it on Monday at 08:30 and the unit was back below 8 °C by mid-morning. " +
  "Checked the contents with the lab: every container sealed, none bulging or leaking, nothing discarded. " +
  "The unit's alarm now also goes to the weekend on-call phone.";

/**
 * Registers the demo sensors and stores their readings (one prepared statement, in the caller's
 * transaction), then lets excursion detection find the heat wave in B-014 and the refrigerator
 * failure in FSR-1, which the facilities contact acknowledged after the repair.
 */
export function seedDemoTemperatures(
  tx: DbOrTx,
  sqlite: Database.Database,
  people: { adminId: number; facilities: { id: number; email: string } },
  nowMs = Date.now(),
): DemoTemperatureSummary {
  const traces = demoTraces(nowMs);
  // One statement per day of readings (96 rows): a year is 365 of them, and a quarter fewer calls
  // than row by row.
  const perDay = DAY_MS / READING_INTERVAL_MS;
  if (traces.count % perDay !== 0) throw new Error("The demo year must be whole days of readings.");
  const insertDay = sqlite.prepare(`insert into readings (sensor_id, at, temp_c) values ${Array(perDay).fill("(?, ?, ?)").join(", ")}`);
  const dayArgs: number[] = new Array(perDay * 3);
  const sensorIds: number[] = [];
  let readingCount = 0;
  let failed: { id: number; externalId: string } | null = null;
  for (const spec of traces.sensors) {
    const room = tx.select({ id: rooms.id }).from(rooms).where(eq(rooms.code, spec.room)).get();
    if (!room) throw new Error(`The demo has no room ${spec.room}.`);
    const unit = spec.unit
      ? tx.select({ id: storageUnits.id }).from(storageUnits).where(and(eq(storageUnits.roomId, room.id), eq(storageUnits.code, spec.unit))).get()
      : undefined;
    if (spec.unit && !unit) throw new Error(`The demo has no unit ${spec.unit} in ${spec.room}.`);
    const sensor = tx
      .insert(sensors)
      .values({ externalId: spec.externalId, name: spec.name, roomId: unit ? null : room.id, storageUnitId: unit?.id ?? null, timeZone: "UTC" })
      .returning({ id: sensors.id })
      .get();
    sensorIds.push(sensor.id);
    if (spec.trace.kind === "cold" && spec.trace.failure) failed = { id: sensor.id, externalId: spec.externalId };
    const tempsC = traces.tempsC.get(spec.externalId)!;
    for (let day = 0; day < traces.count; day += perDay) {
      for (let j = 0; j < perDay; j += 1) {
        dayArgs[3 * j] = sensor.id;
        dayArgs[3 * j + 1] = traces.firstMs + (day + j) * READING_INTERVAL_MS;
        dayArgs[3 * j + 2] = tempsC[day + j];
      }
      insertDay.run(dayArgs);
    }
    readingCount += tempsC.length;
  }

  // The demo's excursions are in the past: no alert e-mails for them.
  refreshExcursions(tx, sensorIds, { notify: false });

  if (failed) {
    const failure = tx
      .select()
      .from(excursions)
      .where(eq(excursions.sensorId, failed.id))
      .orderBy(asc(excursions.startAt))
      .all()
      .find((e) => e.startAt.getTime() >= traces.failure.startMs && e.startAt.getTime() < traces.failure.repairMs);
    if (failure?.endAt) {
      // Acknowledged the morning of the repair, like the rest of the demo's history dated in the past.
      const acknowledgedAt = new Date(Math.ceil((failure.endAt.getTime() + 60 * 60_000) / READING_INTERVAL_MS) * READING_INTERVAL_MS);
      tx.update(excursions)
        .set({ acknowledgedAt, acknowledgedById: people.facilities.id, acknowledgeComment: FAILURE_ACKNOWLEDGEMENT, updatedAt: acknowledgedAt })
        .where(eq(excursions.id, failure.id))
        .run();
      const stamp = failure.startAt.toISOString().slice(0, 16).replace("T", " ");
      tx.insert(auditEvents)
        .values({
          at: acknowledgedAt,
          actorId: people.facilities.id,
          actorLabel: people.facilities.email,
          action: "acknowledge",
          entityType: "excursion",
          entityId: String(failure.id),
          summary: `Acknowledged the excursion on sensor ${failed.externalId} from ${stamp} UTC: ${FAILURE_ACKNOWLEDGEMENT}`,
        })
        .run();
    }
  }

  // Each unit with a recorded failure gets its warm-up fitted now, as the background job would after
  // the excursion ended; the first assessment below reads it (so nothing is queued here).
  const warmUpFits: DemoTemperatureSummary["warmUpFits"] = [];
  for (const unitId of unitsWithEndedExcursions(tx)) {
    const { fit } = refitUnitWarmUp(tx, unitId, { nowMs, queue: false });
    if (fit) warmUpFits.push({ unitId, tauMin: fit.tauMin, rmsErrorC: fit.rmsErrorC, excursions: fit.excursionCount, readings: fit.readingCount });
  }
  tx.delete(jobs).where(and(eq(jobs.kind, WARM_UP_FIT_JOB), eq(jobs.status, "queued"))).run();

  storeApiKey(tx, { system: "demo seed" }, { name: DEMO_INGEST_KEY_NAME, scopes: ["readings:write"], key: DEMO_INGEST_KEY, createdById: people.adminId });

  return {
    sensors: sensorIds.length,
    readings: readingCount,
    excursions: tx.select({ n: count() }).from(excursions).get()?.n ?? 0,
    heatWave: { startMs: traces.heatWave.startMs, endMs: traces.heatWave.endMs },
    failure: traces.failure,
    warmUpFits,
  };
}
