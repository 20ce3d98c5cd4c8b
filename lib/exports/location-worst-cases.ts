import "server-only";
import type { Db } from "@/db/client";
import { worstCasesForRooms, type LocationWorstCase } from "@/lib/temperatures/queries";
import { selectWorstCase, type WorstCase } from "@/lib/temperatures/worst-case";

/**
 * The worst-case temperature of every room and storage unit at once, for the workbook's
 * Locations sheet: the same candidates and selection as worstCaseForRoom / worstCaseForUnit,
 * read through worstCasesForRooms (a few queries for all locations instead of several per unit).
 * tests/integration/register-export.test.ts checks that both give the same answer.
 */
export type WorstCaseBook = {
  room(roomId: number): WorstCase | null;
  unit(unitId: number): LocationWorstCase;
};

export function locationWorstCases(db: Db, nowMs: number): WorstCaseBook {
  const sqlite = db.$client;
  const roomIds = (sqlite.prepare("select id from rooms").all() as { id: number }[]).map((r) => r.id);
  const units = new Map(
    (sqlite.prepare("select id, room_id as roomId, set_max_c as setMaxC from storage_units").all() as { id: number; roomId: number; setMaxC: number | null }[]).map((u) => [u.id, u]),
  );
  const known = new Set(roomIds);
  const batch = worstCasesForRooms(db, roomIds, nowMs);
  const roomCache = new Map<number, WorstCase | null>();
  return {
    room(roomId) {
      if (!known.has(roomId)) return null;
      if (!roomCache.has(roomId)) roomCache.set(roomId, selectWorstCase(batch.room(roomId)));
      return roomCache.get(roomId)!;
    },
    unit(unitId) {
      const unit = units.get(unitId);
      return unit ? batch.unit(unit) : { inControl: null, controlLost: null, controlled: false };
    },
  };
}
