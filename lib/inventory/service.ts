import "server-only";
import { reassessRooms, roomsOfUnits } from "@/lib/assessment/service";
import { and, eq } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import {
  containerMoves,
  containers,
  mixtures,
  rooms,
  storageUnits,
  substances,
  users,
  type Container,
  type ContainerState,
} from "@/db/schema";
import { auditSnapshot, changedFields } from "@/lib/audit/diff";
import { recordAudit } from "@/lib/audit/record";
import type { Scope } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { rethrowConstraint } from "@/lib/db-errors";
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from "@/lib/errors";
import { sameDimension, toBaseAmount, type ContainerCreateInput, type ContainerUpdateInput } from "./schemas";
import { withoutUndefined } from "@/lib/objects";

const LABEL_UNIQUE = { "containers.label": { field: "label", message: "A container with this label already exists." } };

function unitLabel(tx: DbOrTx, unitId: number): string {
  const row = tx
    .select({ unit: storageUnits.code, room: rooms.code })
    .from(storageUnits)
    .innerJoin(rooms, eq(rooms.id, storageUnits.roomId))
    .where(eq(storageUnits.id, unitId))
    .get();
  return row ? `${row.room} / ${row.unit}` : `unit ${unitId}`;
}

function requireLiveUnit(tx: DbOrTx, unitId: number, field = "storageUnitId"): void {
  const unit = tx.select({ id: storageUnits.id, retiredAt: storageUnits.retiredAt }).from(storageUnits).where(eq(storageUnits.id, unitId)).get();
  if (!unit || unit.retiredAt) throw new ValidationError("Choose an existing storage unit.", { [field]: ["Choose an existing storage unit."] });
}

function requireContent(tx: DbOrTx, substanceId: number | null | undefined, mixtureId: number | null | undefined): void {
  if (substanceId != null) {
    const row = tx.select({ retiredAt: substances.retiredAt }).from(substances).where(eq(substances.id, substanceId)).get();
    if (!row) throw new ValidationError("Choose a substance from the library.", { substanceId: ["Choose a substance from the library."] });
    if (row.retiredAt) throw new ValidationError("That substance is retired from the library.", { substanceId: ["That substance is retired from the library."] });
  }
  if (mixtureId != null) {
    const row = tx.select({ retiredAt: mixtures.retiredAt }).from(mixtures).where(eq(mixtures.id, mixtureId)).get();
    if (!row || row.retiredAt) throw new ValidationError("Choose an existing mixture.", { mixtureId: ["Choose an existing mixture."] });
  }
}

function requireOwner(tx: DbOrTx, ownerId: number | null | undefined): void {
  if (ownerId == null) return;
  const row = tx.select({ active: users.active }).from(users).where(eq(users.id, ownerId)).get();
  if (!row || !row.active) throw new ValidationError("Choose an active person as owner.", { ownerId: ["Choose an active person as owner."] });
}

/**
 * Loads a container for a change, enforcing ownership: with the "own" scope (researchers) only
 * containers they own; someone else's gives 403 and nothing changes.
 */
function loadForChange(tx: DbOrTx, actor: SessionUser, scope: Scope, id: number): Container {
  const row = tx.select().from(containers).where(eq(containers.id, id)).get();
  if (!row) throw new NotFoundError("That container");
  if (scope === "own" && row.ownerId !== actor.id) throw new ForbiddenError("You can change only your own containers.");
  if (row.state === "disposed") throw new ConflictError("This container was disposed of; its record is kept and cannot be changed.");
  return row;
}

/** The update's where: the id, and for the "own" scope the owner too, so ownership holds in the query itself. */
function ownedBy(actor: SessionUser, scope: Scope, id: number) {
  return scope === "own" ? and(eq(containers.id, id), eq(containers.ownerId, actor.id)) : eq(containers.id, id);
}

export function createContainer(actor: SessionUser, scope: Scope, input: ContainerCreateInput): Container {
  if (scope === "own" && input.ownerId != null && input.ownerId !== actor.id) {
    throw new ForbiddenError("You can log containers only as their owner.");
  }
  const ownerId = scope === "own" ? actor.id : (input.ownerId ?? actor.id);
  try {
    return getDb().transaction((tx) => {
      requireLiveUnit(tx, input.storageUnitId);
      requireContent(tx, input.substanceId, input.mixtureId);
      requireOwner(tx, ownerId);
      const state = input.state ?? "sealed";
      const container = tx
        .insert(containers)
        .values({
          ...input,
          substanceId: input.substanceId ?? null,
          mixtureId: input.mixtureId ?? null,
          containerKind: input.containerKind ?? "glass_bottle",
          state,
          ownerId,
          receivedAt: input.receivedAt == null ? null : new Date(input.receivedAt),
          openedAt: input.openedAt == null ? (state === "opened" || state === "in_use" ? new Date() : null) : new Date(input.openedAt),
          expiresAt: input.expiresAt == null ? null : new Date(input.expiresAt),
        })
        .returning()
        .get();
      tx.insert(containerMoves).values({ containerId: container.id, fromStorageUnitId: null, toStorageUnitId: container.storageUnitId, movedById: actor.id }).run();
      recordAudit(tx, actor, {
        action: "create",
        entityType: "container",
        entityId: container.id,
        summary: `Logged container ${container.label} (${container.amount} ${container.amountUnit}) in ${unitLabel(tx, container.storageUnitId)}`,
        after: auditSnapshot(container),
      });
      reassessRooms(tx, roomsOfUnits(tx, [container.storageUnitId]), { reason: `container ${container.label} logged` });
      return container;
    });
  } catch (error) {
    rethrowConstraint(error, LABEL_UNIQUE);
  }
}

export function updateContainer(actor: SessionUser, scope: Scope, id: number, input: ContainerUpdateInput): Container {
  try {
    return getDb().transaction((tx) => {
      const before = loadForChange(tx, actor, scope, id);
      if (scope === "own" && input.ownerId !== undefined && input.ownerId !== actor.id) {
        throw new ForbiddenError("Only a safety officer can hand a container to someone else.");
      }
      const patch = withoutUndefined(input);
      const merged = { ...before, ...patch };
      const substanceId = merged.substanceId ?? null;
      const mixtureId = merged.mixtureId ?? null;
      if ((substanceId == null) === (mixtureId == null)) {
        throw new ValidationError("Choose a substance or a mixture, not both.", { substanceId: ["Choose a substance or a mixture, not both."] });
      }
      if (input.substanceId !== undefined || input.mixtureId !== undefined) requireContent(tx, substanceId, mixtureId);
      requireOwner(tx, input.ownerId);
      if (merged.capacity != null && merged.capacityUnit) {
        if (!sameDimension(merged.amountUnit, merged.capacityUnit)) {
          throw new ValidationError("Give amount and capacity both as volumes or both as masses.", { capacityUnit: ["Give amount and capacity both as volumes (mL, L) or both as masses (g, kg)."] });
        }
        if (toBaseAmount(merged.amount, merged.amountUnit) > toBaseAmount(merged.capacity, merged.capacityUnit) * (1 + 1e-9)) {
          throw new ValidationError("The amount is more than the container's capacity.", { amount: ["The amount is more than the container's capacity."] });
        }
      }
      const toDate = (v: number | null | undefined) => (v === undefined ? undefined : v === null ? null : new Date(v));
      const values = withoutUndefined({
        ...patch,
        receivedAt: toDate(input.receivedAt),
        openedAt: toDate(input.openedAt) ?? (input.state && ["opened", "in_use"].includes(input.state) && !before.openedAt ? new Date() : undefined),
        expiresAt: toDate(input.expiresAt),
      });
      const after = tx.update(containers).set({ ...values, updatedAt: new Date() }).where(ownedBy(actor, scope, id)).returning().get();
      if (!after) throw new ForbiddenError("You can change only your own containers.");
      const diff = changedFields(auditSnapshot(before), auditSnapshot(after));
      if (diff.keys.length) {
        recordAudit(tx, actor, { action: "update", entityType: "container", entityId: id, summary: `Updated container ${after.label} (${diff.keys.join(", ")})`, before: diff.before, after: diff.after });
      }
      reassessRooms(tx, roomsOfUnits(tx, [before.storageUnitId, after.storageUnitId]), { reason: `container ${after.label} changed` });
      return after;
    });
  } catch (error) {
    rethrowConstraint(error, LABEL_UNIQUE);
  }
}

/** Moves a container to another unit; the move is kept as history and audited. */
export function moveContainer(actor: SessionUser, scope: Scope, id: number, toStorageUnitId: number): Container {
  return getDb().transaction((tx) => {
    const before = loadForChange(tx, actor, scope, id);
    if (before.storageUnitId === toStorageUnitId) {
      throw new ValidationError("The container is already in that storage unit.", { storageUnitId: ["The container is already in that storage unit."] });
    }
    requireLiveUnit(tx, toStorageUnitId);
    const after = tx.update(containers).set({ storageUnitId: toStorageUnitId, updatedAt: new Date() }).where(ownedBy(actor, scope, id)).returning().get();
    if (!after) throw new ForbiddenError("You can change only your own containers.");
    tx.insert(containerMoves).values({ containerId: id, fromStorageUnitId: before.storageUnitId, toStorageUnitId, movedById: actor.id }).run();
    const from = unitLabel(tx, before.storageUnitId);
    const to = unitLabel(tx, toStorageUnitId);
    recordAudit(tx, actor, {
      action: "move",
      entityType: "container",
      entityId: id,
      summary: `Moved container ${before.label} from ${from} to ${to}`,
      before: { storageUnitId: before.storageUnitId, location: from },
      after: { storageUnitId: toStorageUnitId, location: to },
    });
    reassessRooms(tx, roomsOfUnits(tx, [before.storageUnitId, toStorageUnitId]), { reason: `container ${after.label} moved from ${from} to ${to}` });
    return after;
  });
}

const STATE_WORDS: Record<ContainerState, string> = {
  sealed: "sealed",
  opened: "opened",
  in_use: "in use",
  empty: "empty",
  disposed: "disposed of",
};

export function setContainerState(actor: SessionUser, scope: Scope, id: number, state: ContainerState): Container {
  return getDb().transaction((tx) => {
    const before = loadForChange(tx, actor, scope, id);
    if (before.state === state) return before;
    const openedAt = (state === "opened" || state === "in_use") && !before.openedAt ? new Date() : before.openedAt;
    const amount = state === "empty" || state === "disposed" ? 0 : before.amount;
    const after = tx.update(containers).set({ state, openedAt, amount, updatedAt: new Date() }).where(ownedBy(actor, scope, id)).returning().get();
    if (!after) throw new ForbiddenError("You can change only your own containers.");
    recordAudit(tx, actor, {
      action: "update",
      entityType: "container",
      entityId: id,
      summary: `Marked container ${before.label} ${STATE_WORDS[state]}`,
      before: { state: before.state, amount: before.amount },
      after: { state, amount },
    });
    reassessRooms(tx, roomsOfUnits(tx, [after.storageUnitId]), { reason: `container ${after.label} marked ${state.replace("_", " ")}` });
    return after;
  });
}
