import "server-only";
import { inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { readings, sensors } from "@/db/schema";
import { DomainError } from "@/lib/errors";
import { refreshExcursions, type RefreshResult } from "./excursion-store";

/** ISO-8601 with an explicit offset (Z or ±hh:mm): a logger's local time without one is ambiguous. */
const ISO_WITH_OFFSET = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:\d{2})$/;

export const MAX_READINGS_PER_BATCH = 10_000;

const readingSchema = z.object({
  sensor: z.string({ error: "sensor is required: the logger's device id." }).trim().min(1, "sensor is required: the logger's device id.").max(100),
  at: z
    .string({ error: "at is required, as ISO-8601 with an offset, e.g. 2026-07-14T15:40:00+02:00." })
    .regex(ISO_WITH_OFFSET, "at must be ISO-8601 with an offset (Z or ±hh:mm), e.g. 2026-07-14T15:40:00+02:00.")
    .refine((v) => !Number.isNaN(Date.parse(v)), "at is not a real date and time."),
  tempC: z
    .number({ error: "tempC must be a number, in °C." })
    .refine(Number.isFinite, "tempC must be a finite number.")
    .refine((t) => t >= -200 && t <= 200, "tempC must be between −200 and 200 °C."),
});

export const ingestBodySchema = z.object({
  readings: z.array(z.unknown(), { error: "readings must be a list." }).min(1, "Send at least one reading.").max(MAX_READINGS_PER_BATCH, `Send at most ${MAX_READINGS_PER_BATCH} readings per batch.`),
});

export type RowError = { index: number; field: string; message: string };

export class BatchRejectedError extends DomainError {
  constructor(readonly rows: RowError[]) {
    super("batch_rejected", `Nothing was stored: ${rows.length} problem${rows.length === 1 ? "" : "s"} in the batch. Fix them and send the whole batch again.`, 400);
  }
}

/**
 * Stores a batch of readings all or nothing: every row is checked first (shape, time, temperature,
 * known sensor) and any problem rejects the whole batch with every row's error. A reading already
 * stored (same sensor and instant) counts as a duplicate and is stored once.
 */
export function ingestReadings(rawRows: unknown[]): { accepted: number; duplicates: number; sensorIds: number[]; excursions: RefreshResult } {
  const errors: RowError[] = [];
  const parsed: { index: number; sensor: string; atMs: number; tempC: number }[] = [];
  rawRows.forEach((raw, index) => {
    const result = readingSchema.safeParse(raw);
    if (!result.success) {
      for (const issue of result.error.issues) errors.push({ index, field: issue.path.join(".") || "reading", message: issue.message });
    } else {
      parsed.push({ index, sensor: result.data.sensor, atMs: Date.parse(result.data.at), tempC: result.data.tempC });
    }
  });
  const db = getDb();
  const externalIds = [...new Set(parsed.map((p) => p.sensor))];
  const known = new Map<string, { id: number; active: boolean }>();
  for (let i = 0; i < externalIds.length; i += 500) {
    for (const row of db.select({ id: sensors.id, externalId: sensors.externalId, active: sensors.active }).from(sensors).where(inArray(sensors.externalId, externalIds.slice(i, i + 500))).all()) {
      known.set(row.externalId, row);
    }
  }
  for (const row of parsed) {
    const sensor = known.get(row.sensor);
    if (!sensor) errors.push({ index: row.index, field: "sensor", message: `No sensor has the device id “${row.sensor}”. Register it first.` });
    else if (!sensor.active) errors.push({ index: row.index, field: "sensor", message: `Sensor “${row.sensor}” is switched off in Headroom.` });
  }
  if (errors.length) throw new BatchRejectedError(errors.sort((a, b) => a.index - b.index));

  return db.transaction((tx) => {
    let accepted = 0;
    for (const row of parsed) {
      const result = tx
        .insert(readings)
        .values({ sensorId: known.get(row.sensor)!.id, at: new Date(row.atMs), tempC: row.tempC })
        .onConflictDoNothing()
        .run();
      accepted += result.changes;
    }
    const sensorIds = [...new Set(parsed.map((p) => known.get(p.sensor)!.id))];
    // Detection, stored excursions and their alert e-mails land with the readings or not at all.
    const sinceMs = parsed.reduce((min, p) => Math.min(min, p.atMs), Number.POSITIVE_INFINITY);
    const excursionChanges = accepted > 0 ? refreshExcursions(tx, sensorIds, { sinceMs, notify: true }) : { opened: 0, closed: 0, updated: 0 };
    return { accepted, duplicates: parsed.length - accepted, sensorIds, excursions: excursionChanges };
  });
}
