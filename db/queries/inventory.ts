import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { rooms, sensors, storageUnits } from "@/db/schema";

export function listSensors() {
  return getDb()
    .select({ id: sensors.id, externalId: sensors.externalId, name: sensors.name, active: sensors.active, roomCode: rooms.code, unitCode: storageUnits.code })
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .orderBy(sensors.externalId)
    .all();
}
