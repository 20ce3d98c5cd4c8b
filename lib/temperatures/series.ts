import "server-only";
import { and, asc, desc, eq, gte, isNull, lte, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { excursions, readings, rooms, sensors, storageUnits } from "@/db/schema";
import { NotFoundError } from "@/lib/errors";

/** The chart draws at most this many points; more readings are summarised per time bucket. */
export const MAX_SERIES_POINTS = 1500;

const MINUTE_MS = 60_000;
const HOUR_MS = 60 * MINUTE_MS;
const DAY_MS = 24 * HOUR_MS;
export const DEFAULT_WINDOW_MS = 365 * DAY_MS;

/** Bucket widths that fall on whole clock units, so a bucket reads as "06:00–12:00". */
const BUCKET_STEPS_MS = [1, 2, 5, 10, 15, 30].map((m) => m * MINUTE_MS).concat([1, 2, 3, 4, 6, 8, 12].map((h) => h * HOUR_MS), [1, 2, 3, 7, 14, 30].map((d) => d * DAY_MS));

/**
 * One point of the trace. Raw readings have minC = maxC = tempC and count 1; a bucket starts at
 * atMs, lasts bucketMs, and carries the mean (tempC), lowest and highest of its readings.
 */
export type SeriesPoint = { atMs: number; tempC: number; minC: number; maxC: number; count: number };

export type SeriesExcursion = {
  id: number;
  thresholdC: number;
  startAtMs: number;
  /** Null while it lasts. */
  endAtMs: number | null;
  peakTempC: number;
  peakAtMs: number;
  acknowledged: boolean;
};

export type ReadingSeries = {
  sensor: { id: number; externalId: string; name: string; active: boolean };
  location: {
    kind: "room" | "unit";
    id: number;
    code: string;
    name: string;
    setMinC: number | null;
    setMaxC: number | null;
    thresholdC: number | null;
    minDurationMin: number | null;
  };
  fromMs: number;
  toMs: number;
  /** "raw": every reading in the window; "bucket": one point per bucketMs. */
  resolution: "raw" | "bucket";
  bucketMs: number | null;
  points: SeriesPoint[];
  /** Over the whole window, from the readings themselves (not the bucket means). */
  summary: {
    count: number;
    minC: number | null;
    minAtMs: number | null;
    maxC: number | null;
    maxAtMs: number | null;
    last: { atMs: number; tempC: number } | null;
  };
  /** The sensor's first and latest reading overall, for the chart's range buttons. */
  extent: { firstAtMs: number; lastAtMs: number } | null;
  /** Excursions that overlap the window, oldest first. */
  excursions: SeriesExcursion[];
};

/** The smallest clock-aligned bucket that keeps the window within MAX_SERIES_POINTS buckets. */
export function bucketWidthMs(spanMs: number, maxPoints = MAX_SERIES_POINTS): number {
  // floor(at / width) over [from, to] gives at most floor(span / width) + 1 distinct buckets.
  const needed = spanMs / (maxPoints - 1);
  return BUCKET_STEPS_MS.find((step) => step >= needed) ?? Math.ceil(needed / DAY_MS) * DAY_MS;
}

function sensorWithLocation(sensorId: number) {
  const row = getDb()
    .select({
      sensor: sensors,
      roomCode: rooms.code,
      roomName: rooms.name,
      roomSetMinC: rooms.setMinC,
      roomSetMaxC: rooms.setMaxC,
      roomThresholdC: rooms.excursionThresholdC,
      roomMinDurationMin: rooms.excursionMinDurationMin,
      unitCode: storageUnits.code,
      unitName: storageUnits.name,
      unitSetMinC: storageUnits.setMinC,
      unitSetMaxC: storageUnits.setMaxC,
      unitThresholdC: storageUnits.excursionThresholdC,
      unitMinDurationMin: storageUnits.excursionMinDurationMin,
    })
    .from(sensors)
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .where(eq(sensors.id, sensorId))
    .get();
  if (!row) throw new NotFoundError("That sensor");
  const { sensor } = row;
  const location: ReadingSeries["location"] =
    sensor.storageUnitId != null
      ? {
          kind: "unit",
          id: sensor.storageUnitId,
          code: row.unitCode ?? "",
          name: row.unitName ?? "",
          setMinC: row.unitSetMinC,
          setMaxC: row.unitSetMaxC,
          thresholdC: row.unitThresholdC,
          minDurationMin: row.unitMinDurationMin,
        }
      : {
          kind: "room",
          id: sensor.roomId!,
          code: row.roomCode ?? "",
          name: row.roomName ?? "",
          setMinC: row.roomSetMinC,
          setMaxC: row.roomSetMaxC,
          thresholdC: row.roomThresholdC,
          minDurationMin: row.roomMinDurationMin,
        };
  return { sensor: { id: sensor.id, externalId: sensor.externalId, name: sensor.name, active: sensor.active }, location };
}

/** The sensor's first and latest reading instants (both ends of the primary key index). */
export function readingExtent(sensorId: number): { firstAtMs: number; lastAtMs: number } | null {
  const db = getDb();
  const first = db.select({ at: readings.at }).from(readings).where(eq(readings.sensorId, sensorId)).orderBy(asc(readings.at)).limit(1).get();
  if (!first) return null;
  const last = db.select({ at: readings.at }).from(readings).where(eq(readings.sensorId, sensorId)).orderBy(desc(readings.at)).limit(1).get()!;
  return { firstAtMs: first.at.getTime(), lastAtMs: last.at.getTime() };
}

/**
 * A sensor's trace for a chart window [fromMs, toMs]: every reading when there are at most
 * MAX_SERIES_POINTS, otherwise one point per clock-aligned bucket (GROUP BY at / bucketMs on the
 * (sensor_id, at) primary key) with the bucket's mean, lowest and highest reading. Without a
 * window: up to the latest reading (now when there is none), back to the first reading but at
 * most DEFAULT_WINDOW_MS and at least a day.
 */
export function readingSeries(sensorId: number, window: { fromMs?: number; toMs?: number } = {}, nowMs = Date.now()): ReadingSeries {
  const { sensor, location } = sensorWithLocation(sensorId);
  const extent = readingExtent(sensorId);
  const toMs = window.toMs ?? (window.fromMs != null ? window.fromMs + DEFAULT_WINDOW_MS : (extent?.lastAtMs ?? nowMs));
  // Without a start, the chart opens on the data: back to the first reading, at most a year, at least a day.
  const fromMs =
    window.fromMs ??
    (extent && window.toMs == null ? Math.min(Math.max(extent.firstAtMs, toMs - DEFAULT_WINDOW_MS), toMs - DAY_MS) : toMs - DEFAULT_WINDOW_MS);
  const client = getDb().$client;

  // SQLite fills bare columns from the row that holds the single min() (documented behaviour of
  // aggregate queries), so the query also says when the lowest was read.
  const low = client
    .prepare(`select count(*) as n, min(temp_c) as tempC, at from readings where sensor_id = ? and at between ? and ?`)
    .get(sensorId, fromMs, toMs) as { n: number; tempC: number | null; at: number | null };
  const highC = (client.prepare(`select max(temp_c) as tempC from readings where sensor_id = ? and at between ? and ?`).get(sensorId, fromMs, toMs) as { tempC: number | null }).tempC;
  // On a tie the latest instant, as the worst-case temperature reports it.
  const high = {
    tempC: highC,
    at:
      highC == null
        ? null
        : (client.prepare(`select max(at) as at from readings where sensor_id = ? and at between ? and ? and temp_c = ?`).get(sensorId, fromMs, toMs, highC) as { at: number }).at,
  };
  const lastRow = client
    .prepare(`select at, temp_c as tempC from readings where sensor_id = ? and at between ? and ? order by at desc limit 1`)
    .get(sensorId, fromMs, toMs) as { at: number; tempC: number } | undefined;
  const stats = { n: low.n, minC: low.tempC, minAtMs: low.at, maxC: high.tempC, maxAtMs: high.at };

  let points: SeriesPoint[];
  let bucketMs: number | null = null;
  if (stats.n <= MAX_SERIES_POINTS) {
    points = (
      client.prepare(`select at, temp_c as tempC from readings where sensor_id = ? and at between ? and ? order by at`).all(sensorId, fromMs, toMs) as {
        at: number;
        tempC: number;
      }[]
    ).map((r) => ({ atMs: r.at, tempC: r.tempC, minC: r.tempC, maxC: r.tempC, count: 1 }));
  } else {
    bucketMs = bucketWidthMs(toMs - fromMs);
    points = (
      client
        .prepare(
          `select (at / cast(? as integer)) as bucket, avg(temp_c) as meanC, min(temp_c) as minC, max(temp_c) as maxC, count(*) as n
             from readings where sensor_id = ? and at between ? and ?
            group by bucket order by bucket`,
        )
        .all(bucketMs, sensorId, fromMs, toMs) as { bucket: number; meanC: number; minC: number; maxC: number; n: number }[]
    ).map((b) => ({ atMs: b.bucket * bucketMs!, tempC: b.meanC, minC: b.minC, maxC: b.maxC, count: b.n }));
  }

  const overlapping = getDb()
    .select()
    .from(excursions)
    .where(and(eq(excursions.sensorId, sensorId), lte(excursions.startAt, new Date(toMs)), or(isNull(excursions.endAt), gte(excursions.endAt, new Date(fromMs)))))
    .orderBy(asc(excursions.startAt))
    .all();

  // One peak instant everywhere: where the window's highest reading is an excursion's stored peak,
  // the summary names that excursion's peak_at (its first reading at that temperature), not a later tie.
  const peakExcursion = overlapping
    .filter((e) => stats.maxC != null && e.peakTempC === stats.maxC && e.peakAt.getTime() >= fromMs && e.peakAt.getTime() <= toMs)
    .at(-1);
  if (peakExcursion) stats.maxAtMs = peakExcursion.peakAt.getTime();

  return {
    sensor,
    location,
    fromMs,
    toMs,
    resolution: bucketMs == null ? "raw" : "bucket",
    bucketMs,
    points,
    summary: {
      count: stats.n,
      minC: stats.minC,
      minAtMs: stats.minAtMs,
      maxC: stats.maxC,
      maxAtMs: stats.maxAtMs,
      last: lastRow ? { atMs: lastRow.at, tempC: lastRow.tempC } : null,
    },
    extent,
    excursions: overlapping.map((e) => ({
      id: e.id,
      thresholdC: e.thresholdC,
      startAtMs: e.startAt.getTime(),
      endAtMs: e.endAt?.getTime() ?? null,
      peakTempC: e.peakTempC,
      peakAtMs: e.peakAt.getTime(),
      acknowledged: e.acknowledgedAt != null,
    })),
  };
}

