import "server-only";
import { desc, eq, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers, mixtures, rooms, sensors, storageUnits, substances, users } from "@/db/schema";

export function recentContainers(limit = 100) {
  return getDb()
    .select({
      id: containers.id,
      label: containers.label,
      amount: containers.amount,
      amountUnit: containers.amountUnit,
      state: containers.state,
      substanceName: substances.name,
      mixtureName: mixtures.name,
      unitCode: storageUnits.code,
      roomCode: rooms.code,
      ownerName: users.name,
    })
    .from(containers)
    .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .leftJoin(substances, eq(substances.id, containers.substanceId))
    .leftJoin(mixtures, eq(mixtures.id, containers.mixtureId))
    .leftJoin(users, eq(users.id, containers.ownerId))
    .where(ne(containers.state, "disposed"))
    .orderBy(desc(containers.updatedAt))
    .limit(limit)
    .all();
}

export function listSensors() {
  return getDb()
    .select({ id: sensors.id, externalId: sensors.externalId, name: sensors.name, active: sensors.active, roomCode: rooms.code, unitCode: storageUnits.code })
    .from(sensors)
    .leftJoin(storageUnits, eq(storageUnits.id, sensors.storageUnitId))
    .leftJoin(rooms, eq(rooms.id, sensors.roomId))
    .orderBy(sensors.externalId)
    .all();
}

export function listSubstancesBrief() {
  return getDb()
    .select({
      id: substances.id,
      cas: substances.cas,
      name: substances.name,
      formula: substances.formula,
      normalBoilingPointC: substances.normalBoilingPointC,
      flashPointC: substances.flashPointC,
      lflVolPercent: substances.lflVolPercent,
    })
    .from(substances)
    .orderBy(substances.name)
    .all();
}
