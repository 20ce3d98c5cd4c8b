/**
 * Demo inventory for the invented Corvane Institute: a few hundred containers placed the way a
 * real storeroom drifts — mostly sensible, with the mistakes a safety officer goes looking for
 * (diethyl ether in a domestic-type refrigerator, a drum of acetone in an unsprinklered store).
 * Deterministic, so every fresh demo looks the same.
 */
import { and, eq } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { containerMoves, containers, rooms, storageUnits, substances, type AmountUnit } from "@/db/schema";

type Placement = { unit: string; room: string; items: [cas: string, amount: number, unit: AmountUnit, count: number][] };

/** What each unit holds: [CAS number, amount, unit, how many containers]. */
const PLACEMENTS: Placement[] = [
  { room: "B-014", unit: "FC-1", items: [["67-64-1", 2.5, "L", 12], ["67-56-1", 2.5, "L", 8], ["64-17-5", 2.5, "L", 10], ["67-63-0", 2.5, "L", 8], ["110-54-3", 1, "L", 6]] },
  { room: "B-014", unit: "FC-2", items: [["141-78-6", 2.5, "L", 8], ["108-88-3", 2.5, "L", 8], ["109-99-9", 1, "L", 6], ["75-05-8", 2.5, "L", 6], ["78-93-3", 1, "L", 4]] },
  { room: "B-014", unit: "SH-1", items: [["67-64-1", 20, "L", 2], ["64-17-5", 20, "L", 2], ["7732-18-5", 20, "L", 4]] },
  { room: "B-014", unit: "CC-1", items: [["64-19-7", 2.5, "L", 6], ["64-18-6", 1, "L", 3]] },
  { room: "2.107", unit: "FR-1", items: [["60-29-7", 0.5, "L", 2], ["67-64-1", 0.25, "L", 3], ["7732-18-5", 1, "L", 4]] },
  { room: "2.107", unit: "FC-3", items: [["67-64-1", 1, "L", 6], ["64-17-5", 1, "L", 8], ["67-56-1", 1, "L", 4], ["141-78-6", 1, "L", 4]] },
  { room: "2.107", unit: "SH-2", items: [["7732-18-5", 1, "L", 10], ["64-17-5", 0.5, "L", 4], ["67-68-5", 0.5, "L", 3]] },
  { room: "2.115", unit: "FSR-1", items: [["60-29-7", 1, "L", 3], ["75-09-2", 1, "L", 4], ["67-66-3", 0.5, "L", 4], ["110-54-3", 0.5, "L", 4], ["109-66-0", 0.5, "L", 2]] },
  { room: "2.115", unit: "FZ-1", items: [["67-56-1", 0.1, "L", 10], ["64-17-5", 0.1, "L", 10]] },
  { room: "2.115", unit: "FZ-2", items: [["64-17-5", 0.05, "L", 12]] },
  { room: "2.115", unit: "FC-4", items: [["109-99-9", 1, "L", 4], ["108-88-3", 1, "L", 6], ["108-38-3", 1, "L", 4], ["68-12-2", 1, "L", 4], ["110-82-7", 1, "L", 3]] },
  { room: "B-020", unit: "SH-3", items: [["64-17-5", 1, "L", 6], ["67-63-0", 1, "L", 4], ["7732-18-5", 5, "L", 4]] },
  { room: "R-1.02", unit: "XR-1", items: [["75-05-8", 1, "L", 8], ["67-56-1", 1, "L", 8], ["109-99-9", 0.5, "L", 4], ["60-29-7", 0.5, "L", 2]] },
  { room: "R-1.02", unit: "FC-5", items: [["75-05-8", 4, "L", 6], ["67-56-1", 4, "L", 6], ["67-63-0", 2.5, "L", 4], ["142-82-5", 1, "L", 4]] },
  { room: "R-0.05", unit: "FC-6", items: [["67-64-1", 2.5, "L", 8], ["108-88-3", 2.5, "L", 6], ["110-54-3", 2.5, "L", 4], ["71-43-2", 1, "L", 2]] },
  { room: "R-0.05", unit: "SH-4", items: [["67-64-1", 200, "L", 1], ["64-17-5", 20, "L", 2]] },
  { room: "R-0.08", unit: "CA-1", items: [["7727-37-9", 50, "L", 2], ["124-38-9", 10, "kg", 1]] },
];

const STATES = ["sealed", "sealed", "opened", "in_use", "opened", "sealed"] as const;
const DAY_MS = 86_400_000;

/** A small deterministic generator (Park–Miller), so the demo is the same on every machine. */
function generator(seed: number) {
  let state = seed;
  return () => (state = (state * 48_271) % 2_147_483_647) / 2_147_483_647;
}

export function seedDemoInventory(tx: DbOrTx, owners: { researcherId: number; safetyId: number; facilitiesId: number }, now = Date.now()): number {
  const random = generator(20_261_201);
  const casToId = new Map(tx.select({ id: substances.id, cas: substances.cas }).from(substances).all().map((s) => [s.cas, s.id]));
  let serial = 0;
  for (const placement of PLACEMENTS) {
    const unit = tx
      .select({ id: storageUnits.id, ownerId: storageUnits.ownerId })
      .from(storageUnits)
      .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
      .where(and(eq(storageUnits.code, placement.unit), eq(rooms.code, placement.room)))
      .get();
    if (!unit) continue;
    for (const [cas, amount, amountUnit, count] of placement.items) {
      const substanceId = casToId.get(cas);
      if (!substanceId) continue;
      for (let i = 0; i < count; i += 1) {
        serial += 1;
        const state = amountUnit === "kg" || amount >= 20 ? "sealed" : STATES[Math.floor(random() * STATES.length)];
        const fill = state === "sealed" ? 1 : 0.2 + 0.75 * random();
        const receivedAt = now - Math.floor((30 + 700 * random()) * DAY_MS);
        const ownerId = unit.ownerId ?? (random() < 0.5 ? owners.researcherId : owners.safetyId);
        const row = tx
          .insert(containers)
          .values({
            label: `CV-${String(serial).padStart(5, "0")}`,
            substanceId,
            amount: Math.round(amount * fill * 1000) / 1000,
            amountUnit,
            capacity: amount,
            capacityUnit: amountUnit,
            containerKind: amount >= 200 ? "drum" : amount >= 10 ? (cas === "7727-37-9" ? "dewar" : "carboy") : amountUnit === "kg" ? "other" : "glass_bottle",
            state,
            storageUnitId: unit.id,
            ownerId,
            receivedAt: new Date(receivedAt),
            openedAt: state === "sealed" ? null : new Date(receivedAt + Math.floor(20 * random() * DAY_MS)),
            expiresAt: new Date(receivedAt + 3 * 365 * DAY_MS),
            createdAt: new Date(receivedAt),
            updatedAt: new Date(receivedAt),
          })
          .returning({ id: containers.id })
          .get();
        tx.insert(containerMoves).values({ containerId: row.id, toStorageUnitId: unit.id, movedById: ownerId, movedAt: new Date(receivedAt) }).run();
      }
    }
  }
  return serial;
}
