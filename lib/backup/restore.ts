/**
 * Restoring a backup into a stopped installation: the copy is checked first (every file against
 * the manifest's size and SHA-256, then PRAGMA integrity_check on the database), the running app is
 * detected and refused, and the current database and upload folder are kept aside under a dated
 * name (renamed, never deleted) before the backup's take their place.
 *
 * How a running app is detected: the restore opens the live database and asks for an exclusive
 * lock (`PRAGMA locking_mode = EXCLUSIVE`, then `BEGIN EXCLUSIVE`) without waiting. A process that
 * has the database open in WAL mode — the app does from its start to its end, even when idle —
 * holds the lock on the shared-memory index that this needs, so SQLite answers "database is
 * locked". The app writes no pid file, and a pid file would outlive a crash; the lock goes with the
 * process. (A WAL file left beside the database is no sign of a running app: it is what a crash
 * leaves, and it is kept aside with the database it belongs to.)
 */
import "server-only";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { DATABASE_FILE, MANIFEST_FILE, sha256Of, UPLOADS_FOLDER, type BackupManifest } from "./backup";

export class RestoreRefusedError extends Error {}

export type RestoreOptions = { folder: string; databasePath: string; uploadDir: string; nowMs?: number };
export type RestoreResult = { restoredFiles: number; keptAside: string[] };

function readManifest(folder: string): BackupManifest {
  let manifest: BackupManifest;
  try {
    manifest = JSON.parse(fs.readFileSync(path.join(folder, MANIFEST_FILE), "utf8")) as BackupManifest;
  } catch {
    throw new RestoreRefusedError(`${folder} has no readable ${MANIFEST_FILE}: it is not a finished Headroom backup.`);
  }
  if (manifest.format !== 1 || !Array.isArray(manifest.files) || manifest.files[0]?.path !== DATABASE_FILE) {
    throw new RestoreRefusedError(`${folder}/${MANIFEST_FILE} is not a Headroom backup manifest this version can read.`);
  }
  for (const file of manifest.files) {
    const parts = file.path.split("/");
    if (file.path !== DATABASE_FILE && (parts[0] !== UPLOADS_FOLDER || parts.length < 2 || parts.some((p) => p === "" || p === "." || p === ".."))) {
      throw new RestoreRefusedError(`The manifest names a file outside the backup: ${file.path}`);
    }
  }
  return manifest;
}

/** Every file of the manifest, with its size and checksum, then the database's integrity check. */
export async function verifyBackup(folder: string): Promise<BackupManifest> {
  const manifest = readManifest(folder);
  for (const file of manifest.files) {
    const full = path.join(folder, ...file.path.split("/"));
    let size: number;
    try {
      size = fs.statSync(full).size;
    } catch {
      throw new RestoreRefusedError(`${file.path} is missing from the backup.`);
    }
    if (size !== file.sizeBytes) throw new RestoreRefusedError(`${file.path} has ${size} bytes; the manifest says ${file.sizeBytes}. The backup is damaged.`);
    if ((await sha256Of(full)) !== file.sha256) throw new RestoreRefusedError(`${file.path} does not match its SHA-256 in the manifest. The backup is damaged.`);
  }
  let check: string[];
  try {
    const copy = new Database(path.join(folder, DATABASE_FILE), { readonly: true, fileMustExist: true });
    try {
      check = (copy.pragma("integrity_check") as { integrity_check: string }[]).map((r) => r.integrity_check);
    } finally {
      copy.close();
    }
  } catch (error) {
    throw new RestoreRefusedError(`The backup's database cannot be read: ${(error as Error).message}`);
  }
  if (check.length !== 1 || check[0] !== "ok") throw new RestoreRefusedError(`The backup's database fails its integrity check: ${check.slice(0, 5).join("; ")}`);
  return manifest;
}

/** Refuses when another process has the live database open. */
export function assertStopped(databasePath: string): void {
  if (!fs.existsSync(databasePath)) return;
  const probe = new Database(databasePath, { fileMustExist: true, timeout: 0 });
  try {
    probe.pragma("locking_mode = EXCLUSIVE");
    probe.exec("BEGIN EXCLUSIVE");
    probe.exec("COMMIT");
  } catch (error) {
    if ((error as { code?: string }).code === "SQLITE_BUSY") {
      throw new RestoreRefusedError(`${databasePath} is open in another process: Headroom appears to be running. Stop it, then restore.`);
    }
    throw error;
  } finally {
    probe.close();
  }
}

function stamp(ms: number): string {
  return new Date(ms).toISOString().slice(0, 19).replace(/:/g, "") + "Z";
}

/**
 * Checks the backup, refuses while the app runs, stages the copy beside the live files, then keeps
 * the live database (with its -wal and -shm) and upload folder aside as `….before-restore-<time>`
 * and renames the staged copy into place. Nothing is replaced unless every check passed.
 */
export async function restoreBackup(options: RestoreOptions): Promise<RestoreResult> {
  const manifest = await verifyBackup(options.folder);
  assertStopped(options.databasePath);

  const suffix = `.before-restore-${stamp(options.nowMs ?? Date.now())}`;
  const stagedDb = `${options.databasePath}.restoring`;
  const stagedUploads = `${options.uploadDir}.restoring`;
  fs.rmSync(stagedDb, { force: true });
  fs.rmSync(stagedUploads, { recursive: true, force: true });
  fs.mkdirSync(path.dirname(path.resolve(options.databasePath)), { recursive: true });
  try {
    fs.copyFileSync(path.join(options.folder, DATABASE_FILE), stagedDb);
    fs.mkdirSync(stagedUploads, { recursive: true, mode: 0o700 });
    for (const file of manifest.files.slice(1)) {
      const target = path.join(stagedUploads, ...file.path.split("/").slice(1));
      fs.mkdirSync(path.dirname(target), { recursive: true, mode: 0o700 });
      fs.copyFileSync(path.join(options.folder, ...file.path.split("/")), target);
    }
    // The staged copies are what will be used: checked again against the manifest.
    for (const [file, staged] of manifest.files.map((f, i) => [f, i === 0 ? stagedDb : path.join(stagedUploads, ...f.path.split("/").slice(1))] as const)) {
      if ((await sha256Of(staged)) !== file.sha256) throw new RestoreRefusedError(`The copy of ${file.path} does not match the manifest; nothing was replaced.`);
    }
  } catch (error) {
    fs.rmSync(stagedDb, { force: true });
    fs.rmSync(stagedUploads, { recursive: true, force: true });
    throw error;
  }

  // Checked once more just before the swap: the app may have been started while files were copied.
  assertStopped(options.databasePath);
  const keptAside: string[] = [];
  for (const ending of ["", "-wal", "-shm", "-journal"]) {
    const live = options.databasePath + ending;
    if (fs.existsSync(live)) {
      fs.renameSync(live, options.databasePath + suffix + ending);
      keptAside.push(options.databasePath + suffix + ending);
    }
  }
  if (fs.existsSync(options.uploadDir)) {
    fs.renameSync(options.uploadDir, options.uploadDir + suffix);
    keptAside.push(options.uploadDir + suffix);
  }
  fs.renameSync(stagedDb, options.databasePath);
  fs.renameSync(stagedUploads, options.uploadDir);
  return { restoredFiles: manifest.files.length, keptAside };
}
