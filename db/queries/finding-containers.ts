import "server-only";
import { and, asc, eq, inArray, isNull, notInArray, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { containers, mixtures, storageUnits, substances, users } from "@/db/schema";

function select() {
  return getDb()
    .select({
      id: containers.id,
      label: containers.label,
      amount: containers.amount,
      amountUnit: containers.amountUnit,
      state: containers.state,
      storageUnitId: containers.storageUnitId,
      unitCode: storageUnits.code,
      roomId: storageUnits.roomId,
      ownerName: users.name,
      substanceName: substances.name,
      mixtureName: mixtures.name,
    })
    .from(containers)
    .innerJoin(storageUnits, eq(storageUnits.id, containers.storageUnitId))
    .leftJoin(substances, eq(substances.id, containers.substanceId))
    .leftJoin(mixtures, eq(mixtures.id, containers.mixtureId))
    .leftJoin(users, eq(users.id, containers.ownerId));
}

export type FindingContainerRow = Awaited<ReturnType<ReturnType<typeof select>["all"]>>[number];

/** The containers with these ids as they are stored now (owner, state, where they are). */
export function containersByIds(ids: number[]): FindingContainerRow[] {
  if (ids.length === 0) return [];
  return select().where(inArray(containers.id, ids)).all();
}

/**
 * The containers now at a finding's location (its unit, or every unit of its room) holding its
 * substance or mixture, leaving out empty and disposed ones: the contributing containers of a
 * finding whose stored trace does not list them.
 */
export function containersNowAt(where: { roomId: number | null; storageUnitId: number | null; substanceId: number | null; mixtureId: number | null }, limit = 200): FindingContainerRow[] {
  const content: SQL | undefined =
    where.substanceId != null ? eq(containers.substanceId, where.substanceId) : where.mixtureId != null ? eq(containers.mixtureId, where.mixtureId) : undefined;
  if (!content) return [];
  const place = where.storageUnitId != null ? eq(containers.storageUnitId, where.storageUnitId) : where.roomId != null ? eq(storageUnits.roomId, where.roomId) : undefined;
  if (!place) return [];
  return select()
    .where(and(place, content, notInArray(containers.state, ["empty", "disposed"]), isNull(storageUnits.retiredAt)))
    .orderBy(asc(containers.label))
    .limit(limit)
    .all();
}
