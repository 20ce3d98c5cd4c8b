import "server-only";
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { getDb, type DbOrTx, type Tx } from "@/db/client";
import { files, type StoredFile } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { uploadDir } from "@/lib/config";
import { log } from "@/lib/log";
import { checkSdsBytes, PDF_CONTENT_TYPE, sanitiseFileName } from "./validate";

export { MAX_SDS_BYTES } from "./validate";

export type Upload = {
  bytes: Uint8Array;
  originalName: string;
  /** What the browser claimed; recorded nowhere and never trusted (the bytes decide). */
  declaredType?: string | null;
};

/** Generated names only: 32 hex characters and ".pdf". Anything else never reaches the disk. */
const STORED_NAME = /^[0-9a-f]{32}\.pdf$/;

export function storedFilePath(storedName: string): string {
  if (!STORED_NAME.test(storedName)) throw new Error(`Refusing an unexpected stored file name: ${storedName}`);
  return path.join(uploadDir(), storedName);
}

/** Writes the bytes under a new random name: a temporary file with mode 0600, then a rename. */
function writeStoredFile(bytes: Uint8Array): string {
  const dir = uploadDir();
  fs.mkdirSync(dir, { recursive: true, mode: 0o700 });
  const storedName = `${randomBytes(16).toString("hex")}.pdf`;
  const finalPath = path.join(dir, storedName);
  const tempPath = path.join(dir, `.${storedName}.${process.pid}.tmp`);
  try {
    const fd = fs.openSync(tempPath, "wx", 0o600);
    try {
      fs.writeSync(fd, bytes);
      fs.fsyncSync(fd);
    } finally {
      fs.closeSync(fd);
    }
    fs.renameSync(tempPath, finalPath);
  } catch (error) {
    fs.rmSync(tempPath, { force: true });
    throw error;
  }
  return storedName;
}

/** Removes a stored file; a file that is already gone is not an error. */
export function removeStoredFile(storedName: string): void {
  try {
    fs.rmSync(storedFilePath(storedName), { force: true });
  } catch (error) {
    log.error({ err: error, storedName }, "could not remove a stored file");
  }
}

/**
 * Checks an upload (not empty, at most MAX_SDS_BYTES, a PDF by its first bytes), writes it under
 * a generated name and records it in `files`. When the row cannot be inserted the written file
 * is removed again, so an error never leaves data behind.
 */
export function storeUpload(actor: SessionUser, upload: Upload, tx: DbOrTx = getDb()): StoredFile {
  checkSdsBytes(upload.bytes);
  const originalName = sanitiseFileName(upload.originalName);
  const sha256 = createHash("sha256").update(upload.bytes).digest("hex");
  const storedName = writeStoredFile(upload.bytes);
  try {
    return tx
      .insert(files)
      .values({ storedName, originalName, contentType: PDF_CONTENT_TYPE, sizeBytes: upload.bytes.length, sha256, uploadedById: actor.id })
      .returning()
      .get();
  } catch (error) {
    removeStoredFile(storedName);
    throw error;
  }
}

/**
 * Runs `work` in one transaction; `store` saves an upload inside it. If anything in the
 * transaction fails (a later write, the audit event, the commit) the files written for it are
 * removed, and once it commits every row's file is on disk.
 */
export function inTransactionWithUploads<T>(actor: SessionUser, work: (tx: Tx, store: (upload: Upload) => StoredFile) => T): T {
  const written: string[] = [];
  try {
    return getDb().transaction((tx) =>
      work(tx, (upload) => {
        const file = storeUpload(actor, upload, tx);
        written.push(file.storedName);
        return file;
      }),
    );
  } catch (error) {
    for (const storedName of written) removeStoredFile(storedName);
    throw error;
  }
}
