import "server-only";
import { inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb, preparedOn } from "@/db/client";
import { sensors } from "@/db/schema";
import { DomainError } from "@/lib/errors";
import { reassessRooms, roomsOfSensors } from "@/lib/assessment/service";
import { readingLimits } from "@/lib/config";
import { log } from "@/lib/log";
import { refreshExcursions, type RefreshResult } from "./excursion-store";
import { formatInstantUtc, instantProblem, parseOffsetInstant, temperatureProblem, type ReadingLimits } from "./plausible";
import { holdingWriteGate } from "@/lib/workers/write-gate";

export const MAX_READINGS_PER_BATCH = 10_000;

/** One reading: its shape, a real instant inside the window, a temperature inside the range. */
function readingSchemaFor(limits: ReadingLimits, nowMs: number) {
  return z.object({
    sensor: z.string({ error: "sensor is required: the logger's device id." }).trim().min(1, "sensor is required: the logger's device id.").max(100),
    at: z
      .string({ error: "at is required, as ISO-8601 with an offset, e.g. 2026-07-14T15:40:00+02:00." })
      .trim()
      .transform((text, ctx) => {
        const instant = parseOffsetInstant(text);
        const problem = instant.ok ? instantProblem(instant.atMs, limits, nowMs) : instant.message;
        if (problem || !instant.ok) {
          ctx.addIssue({ code: "custom", message: `at ${problem}` });
          return z.NEVER;
        }
        return { text, atMs: instant.atMs };
      }),
    tempC: z.number({ error: "tempC must be a number, in °C." }).superRefine((tempC, ctx) => {
      const problem = temperatureProblem(tempC, limits);
      if (problem) ctx.addIssue({ code: "custom", message: `tempC ${problem}` });
    }),
  });
}

export const ingestBodySchema = z.object({
  readings: z.array(z.unknown(), { error: "readings must be a list." }).min(1, "Send at least one reading.").max(MAX_READINGS_PER_BATCH, `Send at most ${MAX_READINGS_PER_BATCH} readings per batch.`),
});

export type RowError = { index: number; field: string; message: string };

export class BatchRejectedError extends DomainError {
  constructor(readonly rows: RowError[]) {
    super("batch_rejected", `Nothing was stored: ${rows.length} problem${rows.length === 1 ? "" : "s"} in the batch. Fix them and send the whole batch again.`, 400);
  }
}

/** A reading whose sensor and instant already hold a different stored temperature: the stored one is kept. */
export type ConflictRow = { index: number; sensor: string; at: string; tempC: number; storedTempC: number };

export type IngestResult = { accepted: number; duplicates: number; conflicts: number; conflictRows: ConflictRow[]; sensorIds: number[]; excursions: RefreshResult };

type ParsedReading = { index: number; sensor: string; at: string; atMs: number; tempC: number };

/** Each row that shares its sensor and instant with a row of another temperature, naming the others. */
function contradictions(parsed: ParsedReading[]): RowError[] {
  const groups = new Map<string, ParsedReading[]>();
  for (const row of parsed) {
    const key = `${row.atMs} ${row.sensor}`;
    const group = groups.get(key);
    if (group) group.push(row);
    else groups.set(key, [row]);
  }
  const errors: RowError[] = [];
  for (const group of groups.values()) {
    if (group.length < 2) continue;
    for (const row of group) {
      const others = group.filter((o) => o.tempC !== row.tempC);
      if (others.length === 0) continue;
      const when = `at the same instant (${formatInstantUtc(row.atMs)}); this one says ${row.tempC} °C. Keep one of them.`;
      errors.push({
        index: row.index,
        field: "tempC",
        message:
          others.length === 1
            ? `The reading at index ${others[0].index} gives sensor “${row.sensor}” ${others[0].tempC} °C ${when}`
            : `The readings at indexes ${others.map((o) => o.index).join(", ")} give sensor “${row.sensor}” ${others.map((o) => `${o.tempC} °C`).join(", ")} ${when}`,
      });
    }
  }
  return errors;
}

/**
 * Stores a batch of readings all or nothing: every row is checked first (shape, a real instant
 * inside the window, a temperature inside the range, a known sensor, no two temperatures for one
 * sensor and instant) and any problem rejects the whole batch with every row's error. A reading
 * already stored (same sensor and instant) with the same temperature counts as a duplicate; with a
 * different one it is a conflict: the stored reading is kept and the row is reported back.
 */
export function ingestReadings(rawRows: unknown[], options: { limits?: ReadingLimits; nowMs?: number } = {}): IngestResult {
  const limits = options.limits ?? readingLimits();
  const nowMs = options.nowMs ?? Date.now();
  const errors: RowError[] = [];
  const parsed: ParsedReading[] = [];
  const readingSchema = readingSchemaFor(limits, nowMs);
  rawRows.forEach((raw, index) => {
    const result = readingSchema.safeParse(raw);
    if (!result.success) {
      for (const issue of result.error.issues) errors.push({ index, field: issue.path.join(".") || "reading", message: issue.message });
    } else {
      parsed.push({ index, sensor: result.data.sensor, at: result.data.at.text, atMs: result.data.at.atMs, tempC: result.data.tempC });
    }
  });
  errors.push(...contradictions(parsed));
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

  // The write gate: in a worker thread (big batches), the request thread waits for this without blocking.
  return holdingWriteGate(() => db.transaction((tx) => {
    const insert = preparedOn(tx, "INSERT INTO readings (sensor_id, at, temp_c) VALUES (?, ?, ?) ON CONFLICT (sensor_id, at) DO NOTHING");
    const stored = preparedOn(tx, "SELECT temp_c AS tempC FROM readings WHERE sensor_id = ? AND at = ?");
    let accepted = 0;
    const conflictRows: ConflictRow[] = [];
    for (const row of parsed) {
      const sensorId = known.get(row.sensor)!.id;
      if (insert.run(sensorId, row.atMs, row.tempC).changes === 1) {
        accepted++;
        continue;
      }
      const { tempC: storedTempC } = stored.get(sensorId, row.atMs) as { tempC: number };
      if (storedTempC !== row.tempC) conflictRows.push({ index: row.index, sensor: row.sensor, at: row.at, tempC: row.tempC, storedTempC });
    }
    const sensorIds = [...new Set(parsed.map((p) => known.get(p.sensor)!.id))];
    // Detection, stored excursions and their alert e-mails land with the readings or not at all.
    const sinceMs = parsed.reduce((min, p) => Math.min(min, p.atMs), Number.POSITIVE_INFINITY);
    const excursionChanges = accepted > 0 ? refreshExcursions(tx, sensorIds, { sinceMs, notify: true }) : { opened: 0, closed: 0, updated: 0 };
    // New readings can raise a location's worst case: its register follows in the same transaction.
    if (accepted > 0) reassessRooms(tx, roomsOfSensors(tx, sensorIds), { reason: "new temperature readings" });
    if (conflictRows.length) log.warn({ conflicts: conflictRows.length, sensors: [...new Set(conflictRows.map((c) => c.sensor))] }, "readings differing from stored ones were not stored");
    return {
      accepted,
      duplicates: parsed.length - accepted - conflictRows.length,
      conflicts: conflictRows.length,
      conflictRows,
      sensorIds,
      excursions: excursionChanges,
    };
  }));
}
