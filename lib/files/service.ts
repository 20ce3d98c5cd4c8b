import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb, type DbOrTx } from "@/db/client";
import { containers, files, substances, users, type StoredFile } from "@/db/schema";
import { recordAudit } from "@/lib/audit/record";
import { can, scopeFor, type Scope } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { ConflictError, ForbiddenError, NotFoundError } from "@/lib/errors";
import { inTransactionWithUploads, storedFilePath, type Upload } from "./storage";
import { checkSdsBytes } from "./validate";

/** What the API answers after an upload. */
export type AttachedSds = { fileId: number; originalName: string; sizeBytes: number; sha256: string };

/** What a page shows about the current sheet (serialisable, for the client component). */
export type SdsFileInfo = { id: number; originalName: string; sizeBytes: number; uploadedAtMs: number; uploadedBy: string | null };

function attached(file: StoredFile): AttachedSds {
  return { fileId: file.id, originalName: file.originalName, sizeBytes: file.sizeBytes, sha256: file.sha256 };
}

function fileName(tx: DbOrTx, id: number | null): string | null {
  if (id == null) return null;
  return tx.select({ name: files.originalName }).from(files).where(eq(files.id, id)).get()?.name ?? null;
}

function replacing(previous: string | null): string {
  return previous ? ` (replacing ${previous})` : "";
}

/**
 * Attaches a safety data sheet to a container. With the "own" scope (researchers) only to their
 * own containers: someone else's gives 403 before anything is written. A replaced sheet keeps its
 * `files` row as history; the container points to the new one.
 */
export function attachSdsToContainer(actor: SessionUser, scope: Scope, containerId: number, upload: Upload): AttachedSds {
  checkSdsBytes(upload.bytes);
  return inTransactionWithUploads(actor, (tx, store) => {
    const container = tx.select().from(containers).where(eq(containers.id, containerId)).get();
    if (!container) throw new NotFoundError("That container");
    if (scope === "own" && container.ownerId !== actor.id) throw new ForbiddenError("You can attach safety data sheets only to your own containers.");
    if (container.state === "disposed") throw new ConflictError("This container was disposed of; its record is kept and cannot be changed.");
    const previous = fileName(tx, container.sdsFileId);
    const file = store(upload);
    const where = scope === "own" ? and(eq(containers.id, containerId), eq(containers.ownerId, actor.id)) : eq(containers.id, containerId);
    const updated = tx.update(containers).set({ sdsFileId: file.id, updatedAt: new Date() }).where(where).returning({ id: containers.id }).get();
    if (!updated) throw new ForbiddenError("You can attach safety data sheets only to your own containers.");
    recordAudit(tx, actor, {
      action: "attach_sds",
      entityType: "container",
      entityId: containerId,
      summary: `Attached safety data sheet ${file.originalName} to container ${container.label}${replacing(previous)}`,
      before: { sdsFileId: container.sdsFileId, sdsFileName: previous },
      after: { sdsFileId: file.id, sdsFileName: file.originalName, sha256: file.sha256, sizeBytes: file.sizeBytes },
    });
    return attached(file);
  });
}

/** Attaches a safety data sheet to a library substance (roles with substances.write). */
export function attachSdsToSubstance(actor: SessionUser, substanceId: number, upload: Upload): AttachedSds {
  checkSdsBytes(upload.bytes);
  return inTransactionWithUploads(actor, (tx, store) => {
    const substance = tx.select().from(substances).where(eq(substances.id, substanceId)).get();
    if (!substance) throw new NotFoundError("That substance");
    const previous = fileName(tx, substance.sdsFileId);
    const file = store(upload);
    tx.update(substances).set({ sdsFileId: file.id, updatedAt: new Date(), updatedById: actor.id }).where(eq(substances.id, substanceId)).run();
    recordAudit(tx, actor, {
      action: "attach_sds",
      entityType: "substance",
      entityId: substanceId,
      summary: `Attached safety data sheet ${file.originalName} to substance ${substance.name}${replacing(previous)}`,
      before: { sdsFileId: substance.sdsFileId, sdsFileName: previous },
      after: { sdsFileId: file.id, sdsFileName: file.originalName, sha256: file.sha256, sizeBytes: file.sizeBytes },
    });
    return attached(file);
  });
}

export type ReadableFile = { path: string; originalName: string; contentType: string; sizeBytes: number };

/**
 * A stored file for someone who may see it: anyone who may read a container or substance that
 * points to it. A file nothing points to (a replaced sheet, kept as history) is for admins and
 * safety officers only.
 */
export function readFileForUser(user: SessionUser, fileId: number): ReadableFile {
  const db = getDb();
  const file = db.select().from(files).where(eq(files.id, fileId)).get();
  if (!file) throw new NotFoundError("That file");
  const onContainer = db.select({ id: containers.id }).from(containers).where(eq(containers.sdsFileId, fileId)).limit(1).get();
  const onSubstance = db.select({ id: substances.id }).from(substances).where(eq(substances.sdsFileId, fileId)).limit(1).get();
  const allowed =
    (onContainer != null && can(user.role, "inventory.read")) ||
    (onSubstance != null && can(user.role, "substances.read")) ||
    (onContainer == null && onSubstance == null && (user.role === "admin" || user.role === "safety_officer"));
  if (!allowed) throw new ForbiddenError("You may not open this file.");
  return { path: storedFilePath(file.storedName), originalName: file.originalName, contentType: file.contentType, sizeBytes: file.sizeBytes };
}

function fileInfo(fileId: number | null): SdsFileInfo | null {
  if (fileId == null) return null;
  const row = getDb()
    .select({ id: files.id, originalName: files.originalName, sizeBytes: files.sizeBytes, createdAt: files.createdAt, uploadedBy: users.name })
    .from(files)
    .leftJoin(users, eq(users.id, files.uploadedById))
    .where(eq(files.id, fileId))
    .get();
  return row ? { id: row.id, originalName: row.originalName, sizeBytes: row.sizeBytes, uploadedAtMs: row.createdAt.getTime(), uploadedBy: row.uploadedBy } : null;
}

/** The container page's sheet card: the current sheet and whether this user may upload one. */
export function containerSds(user: SessionUser, containerId: number): { fileInfo: SdsFileInfo | null; canUpload: boolean } {
  const row = getDb().select({ sdsFileId: containers.sdsFileId, ownerId: containers.ownerId, state: containers.state }).from(containers).where(eq(containers.id, containerId)).get();
  if (!row) return { fileInfo: null, canUpload: false };
  const scope = scopeFor(user.role, "files.upload");
  const canUpload = row.state !== "disposed" && (scope === "all" || (scope === "own" && row.ownerId === user.id));
  return { fileInfo: fileInfo(row.sdsFileId), canUpload };
}

/** The substance page's sheet card. */
export function substanceSds(user: SessionUser, substanceId: number): { fileInfo: SdsFileInfo | null; canUpload: boolean } {
  const row = getDb().select({ sdsFileId: substances.sdsFileId }).from(substances).where(eq(substances.id, substanceId)).get();
  if (!row) return { fileInfo: null, canUpload: false };
  return { fileInfo: fileInfo(row.sdsFileId), canUpload: can(user.role, "substances.write") };
}
