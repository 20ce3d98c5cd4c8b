import "server-only";
import { alias } from "drizzle-orm/sqlite-core";
import { and, asc, desc, eq, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containerMoves, containers, mixtures, rooms, sites, storageUnits, substances, users } from "@/db/schema";

const fromUnits = alias(storageUnits, "from_units");
const fromRooms = alias(rooms, "from_rooms");
const toUnits = alias(storageUnits, "to_units");
const toRooms = alias(rooms, "to_rooms");
const movers = alias(users, "movers");

function containerSelect() {
  return getDb()
    .select({
      container: containers,
      substanceName: substances.name,
      substanceCas: substances.cas,
      mixtureName: mixtures.name,
      unitCode: storageUnits.code,
      unitName: storageUnits.name,
      roomId: rooms.id,
      roomCode: rooms.code,
      siteId: sites.id,
      siteName: sites.name,
      ownerName: users.name,
      ownerEmail: users.email,
    })
    .from(containers)
    .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .innerJoin(sites, eq(sites.id, rooms.siteId))
    .leftJoin(substances, eq(substances.id, containers.substanceId))
    .leftJoin(mixtures, eq(mixtures.id, containers.mixtureId))
    .leftJoin(users, eq(users.id, containers.ownerId));
}

type Joined = NonNullable<ReturnType<ReturnType<typeof containerSelect>["get"]>>;

function flatten(row: Joined) {
  const { container, ...rest } = row;
  return { ...container, ...rest };
}

export function getContainer(id: number) {
  const row = containerSelect().where(eq(containers.id, id)).get();
  if (!row) return null;
  const moves = getDb()
    .select({
      id: containerMoves.id,
      movedAt: containerMoves.movedAt,
      fromUnitCode: fromUnits.code,
      fromRoomCode: fromRooms.code,
      toUnitCode: toUnits.code,
      toRoomCode: toRooms.code,
      movedBy: movers.name,
    })
    .from(containerMoves)
    .leftJoin(fromUnits, eq(fromUnits.id, containerMoves.fromStorageUnitId))
    .leftJoin(fromRooms, eq(fromRooms.id, fromUnits.roomId))
    .innerJoin(toUnits, eq(toUnits.id, containerMoves.toStorageUnitId))
    .innerJoin(toRooms, eq(toRooms.id, toUnits.roomId))
    .leftJoin(movers, eq(movers.id, containerMoves.movedById))
    .where(eq(containerMoves.containerId, id))
    .orderBy(desc(containerMoves.movedAt), desc(containerMoves.id))
    .all();
  return { ...flatten(row), moves };
}

/** Exact label or barcode match, for scanners. */
export function findContainerIdByLabel(label: string): number | null {
  const row = getDb().select({ id: containers.id }).from(containers).where(eq(containers.label, label.trim())).get();
  return row?.id ?? null;
}

/** Containers stored in a room or one of its units (not disposed), for the room and unit pages. */
export function containersAt(where: { roomId?: number; storageUnitId?: number }, limit = 500) {
  const condition = where.storageUnitId ? eq(containers.storageUnitId, where.storageUnitId) : eq(rooms.id, where.roomId ?? -1);
  return containerSelect()
    .where(and(condition, ne(containers.state, "disposed")))
    .orderBy(asc(storageUnits.code), asc(containers.label))
    .limit(limit)
    .all()
    .map(flatten);
}
