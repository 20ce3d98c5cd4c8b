import "server-only";
import type { Db } from "@/db/client";
import { lookBackDays, type LocationWorstCase } from "@/lib/temperatures/queries";
import { controlLostWorstCase, selectWorstCase, type WorstCase, type WorstCaseCandidate } from "@/lib/temperatures/worst-case";

/**
 * The worst-case temperature of every room and storage unit at once, for the workbook's
 * Locations sheet. The same candidates as worstCaseForRoom / worstCaseForUnit
 * (lib/temperatures/queries.ts) — design maximum or upper end of the set range, the highest
 * reading of the location's own sensors in the look-back window (the later one on a tie), the
 * peak of each open excursion on them — and the same pure selection (lib/temperatures/worst-case.ts),
 * but read with four queries in all instead of several per location: a register with thousands
 * of units would otherwise spend seconds here. tests/integration/register-export.test.ts checks
 * that both give the same answer.
 */
export type WorstCaseBook = {
  room(roomId: number): WorstCase | null;
  unit(unitId: number): LocationWorstCase;
};

type SensorRow = { id: number; externalId: string; roomId: number | null; storageUnitId: number | null };

export function locationWorstCases(db: Db, nowMs: number): WorstCaseBook {
  const sqlite = db.$client;
  const sinceMs = nowMs - lookBackDays(db) * 86_400_000;
  const roomRows = sqlite.prepare("select id, design_max_temp_c as designMaxTempC from rooms").all() as { id: number; designMaxTempC: number | null }[];
  const unitRows = sqlite.prepare("select id, room_id as roomId, set_max_c as setMaxC from storage_units").all() as { id: number; roomId: number; setMaxC: number | null }[];
  const sensorRows = sqlite.prepare("select id, external_id as externalId, room_id as roomId, storage_unit_id as storageUnitId from sensors order by id").all() as SensorRow[];
  // Each sensor's highest reading in the window, and the latest instant it was reached.
  const highest = sqlite
    .prepare(
      `with peak as (select sensor_id, max(temp_c) as temp_c from readings where at >= @since group by sensor_id)
       select r.sensor_id as sensorId, r.temp_c as tempC, max(r.at) as atMs
         from readings r join peak p on p.sensor_id = r.sensor_id and r.temp_c = p.temp_c
        where r.at >= @since group by r.sensor_id`,
    )
    .all({ since: sinceMs }) as { sensorId: number; tempC: number; atMs: number }[];
  const openPeaks = sqlite
    .prepare("select sensor_id as sensorId, peak_temp_c as tempC, peak_at as atMs from excursions where end_at is null order by id")
    .all() as { sensorId: number; tempC: number; atMs: number }[];

  const sensorById = new Map(sensorRows.map((s) => [s.id, s]));
  const highestBySensor = new Map(highest.map((h) => [h.sensorId, h]));
  const sensorsByRoom = new Map<number, SensorRow[]>();
  const sensorsByUnit = new Map<number, SensorRow[]>();
  for (const sensor of sensorRows) {
    if (sensor.roomId != null) sensorsByRoom.set(sensor.roomId, [...(sensorsByRoom.get(sensor.roomId) ?? []), sensor]);
    if (sensor.storageUnitId != null) sensorsByUnit.set(sensor.storageUnitId, [...(sensorsByUnit.get(sensor.storageUnitId) ?? []), sensor]);
  }
  const rooms = new Map(roomRows.map((r) => [r.id, r]));
  const units = new Map(unitRows.map((u) => [u.id, u]));

  /** The highest reading of these sensors (the later on a tie), then each open excursion's peak. */
  function sensorCandidates(refs: SensorRow[]): WorstCaseCandidate[] {
    const out: WorstCaseCandidate[] = [];
    let best: { sensorId: number; tempC: number; atMs: number } | null = null;
    for (const ref of refs) {
      const h = highestBySensor.get(ref.id);
      if (h && (!best || h.tempC > best.tempC || (h.tempC === best.tempC && h.atMs > best.atMs))) best = h;
    }
    if (best) out.push({ kind: "reading", tempC: best.tempC, atMs: best.atMs, sensor: sensorById.get(best.sensorId)?.externalId ?? String(best.sensorId) });
    const ids = new Set(refs.map((r) => r.id));
    for (const peak of openPeaks) {
      if (ids.has(peak.sensorId)) out.push({ kind: "excursion", tempC: peak.tempC, atMs: peak.atMs, sensor: sensorById.get(peak.sensorId)?.externalId ?? String(peak.sensorId) });
    }
    return out;
  }

  function roomCandidates(roomId: number): WorstCaseCandidate[] | null {
    const room = rooms.get(roomId);
    if (!room) return null;
    const candidates: WorstCaseCandidate[] = [];
    if (room.designMaxTempC != null) candidates.push({ kind: "design", tempC: room.designMaxTempC });
    candidates.push(...sensorCandidates(sensorsByRoom.get(roomId) ?? []));
    return candidates;
  }

  const roomCache = new Map<number, WorstCase | null>();
  return {
    room(roomId) {
      if (!roomCache.has(roomId)) {
        const candidates = roomCandidates(roomId);
        roomCache.set(roomId, candidates ? selectWorstCase(candidates) : null);
      }
      return roomCache.get(roomId)!;
    },
    unit(unitId) {
      const unit = units.get(unitId);
      if (!unit) return { inControl: null, controlLost: null, controlled: false };
      const controlled = unit.setMaxC != null;
      const own: WorstCaseCandidate[] = [];
      if (controlled) own.push({ kind: "design", tempC: unit.setMaxC!, label: "upper end of the set range" });
      own.push(...sensorCandidates(sensorsByUnit.get(unitId) ?? []));
      const room = roomCandidates(unit.roomId) ?? [];
      if (!controlled) return { inControl: selectWorstCase([...own, ...room]), controlLost: null, controlled };
      const inControl = selectWorstCase(own);
      return { inControl, controlLost: controlLostWorstCase(inControl, selectWorstCase(room)), controlled };
    },
  };
}
