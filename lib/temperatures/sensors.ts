import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { rooms, sensors, storageUnits, type Sensor } from "@/db/schema";
import { auditSnapshot } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import type { SessionUser } from "@/lib/auth/session";
import { rethrowConstraint } from "@/lib/db-errors";
import { ValidationError } from "@/lib/errors";
import type { SensorInput } from "./schemas";

const DEVICE_UNIQUE = { "sensors.external_id": { field: "externalId", message: "Another sensor already has this device id." } };

export function createSensor(actor: SessionUser, input: SensorInput): Sensor {
  try {
    return getDb().transaction((tx) => {
      if (input.roomId != null) {
        const room = tx.select({ retiredAt: rooms.retiredAt }).from(rooms).where(eq(rooms.id, input.roomId)).get();
        if (!room || room.retiredAt) throw new ValidationError("Choose an existing room.", { roomId: ["Choose an existing room."] });
      }
      if (input.storageUnitId != null) {
        const unit = tx.select({ retiredAt: storageUnits.retiredAt }).from(storageUnits).where(eq(storageUnits.id, input.storageUnitId)).get();
        if (!unit || unit.retiredAt) throw new ValidationError("Choose an existing storage unit.", { storageUnitId: ["Choose an existing storage unit."] });
      }
      const sensor = tx
        .insert(sensors)
        .values({ externalId: input.externalId, name: input.name, roomId: input.roomId ?? null, storageUnitId: input.storageUnitId ?? null })
        .returning()
        .get();
      recordAudit(tx, actor, { action: "create", entityType: "sensor", entityId: sensor.id, summary: `Registered sensor ${sensor.externalId} (${sensor.name})`, after: auditSnapshot(sensor) });
      return sensor;
    });
  } catch (error) {
    rethrowConstraint(error, DEVICE_UNIQUE);
  }
}

export function listSensorRows() {
  return getDb()
    .select({
      id: sensors.id,
      externalId: sensors.externalId,
      name: sensors.name,
      active: sensors.active,
      roomId: sensors.roomId,
      storageUnitId: sensors.storageUnitId,
      roomCode: rooms.code,
      unitCode: storageUnits.code,
    })
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .orderBy(asc(sensors.externalId))
    .all();
}
