/**
 * An open excursion on the demo's −20 °C freezer FZ-1 (sensor S-206), its τ set to one hour so a
 * projection can be worked by hand: readings of −8, −4 and 0 °C 30 and 15 minutes before `nowMs`
 * and at it, over a −10 °C threshold. Invented demo data; the demo must be seeded first.
 */
import { eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { excursions, readings, sensors, storageUnits } from "@/db/schema";

export function openWarmingExcursionOnFz1(db: Db, nowMs: number): { unitId: number; ownerId: number | null; excursionId: number } {
  const fz1 = db.select().from(storageUnits).where(eq(storageUnits.code, "FZ-1")).get()!;
  db.update(storageUnits).set({ warmUpTauMin: 60, warmUpTauNote: "test" }).where(eq(storageUnits.id, fz1.id)).run();
  const sensor = db.select().from(sensors).where(eq(sensors.externalId, "S-206")).get()!;
  db.insert(readings)
    .values([
      { sensorId: sensor.id, at: new Date(nowMs - 30 * 60_000), tempC: -8 },
      { sensorId: sensor.id, at: new Date(nowMs - 15 * 60_000), tempC: -4 },
      { sensorId: sensor.id, at: new Date(nowMs), tempC: 0 },
    ])
    .run();
  const excursionId = db
    .insert(excursions)
    .values({ sensorId: sensor.id, storageUnitId: fz1.id, thresholdC: -10, startAt: new Date(nowMs - 30 * 60_000), peakTempC: 0, peakAt: new Date(nowMs) })
    .returning({ id: excursions.id })
    .get().id;
  return { unitId: fz1.id, ownerId: fz1.ownerId, excursionId };
}
