/**
 * Backups of a running installation: the database through SQLite's online backup and the uploaded
 * files, into a dated folder with a manifest (sizes and SHA-256 of every file), keeping the last N.
 *
 * What a backup holds. SQLite's online backup copies the database page by page, a few pages per
 * step with the event loop free between steps. When the database is written between two steps
 * through the connection that runs the backup, SQLite writes the change into the copy as well;
 * when it is written through another connection (the app, while `npm run backup` runs in its own
 * process) the copy starts again from the first page at the next step. Either way the finished
 * copy is the database as it was at the backup's last step: it holds every transaction committed
 * before that step, and none committed after it. To finish while another process keeps writing,
 * after a few restarts the rest is copied in one step (a read transaction of its own: the app's
 * writers go on, WAL lets them).
 */
import "server-only";
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";

export const MANIFEST_FILE = "manifest.json";
export const DATABASE_FILE = "headroom.db";
export const UPLOADS_FOLDER = "uploads";
/** Logger files waiting an hour for their import (lib/temperatures/csv-upload.ts): not worth keeping. */
const TRANSIENT_UPLOAD_FOLDERS = new Set(["csv-uploads"]);
/** A backup folder's name: its UTC time, sortable. */
const FOLDER_NAME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2})(\d{2})(\d{2})Z$/;
const PARTIAL_PREFIX = ".partial-";
/** Restarts of the page-by-page copy (another process writing) before the rest is copied in one step. */
const MAX_RESTARTS = 3;

export type ManifestFile = { path: string; sizeBytes: number; sha256: string };

export type BackupManifest = {
  format: 1;
  createdAt: string;
  appVersion: string;
  /** The database copy first, then the uploaded files (paths relative to the backup folder, with /). */
  files: ManifestFile[];
};

export type BackupResult = { folder: string; manifest: BackupManifest; restarts: number; pruned: string[]; durationMs: number };

export type BackupOptions = {
  /** The open connection to the live database: the copy is taken through it. */
  sqlite: Database.Database;
  uploadDir: string;
  backupDir: string;
  keep: number;
  appVersion: string;
  nowMs?: number;
  /** Pages copied per step (SQLite pages are 4 KB here). */
  pagesPerStep?: number;
  /** Called after each step; tests write between steps from here. */
  onStep?: (progress: { totalPages: number; remainingPages: number }) => void;
};

export function folderNameFor(ms: number): string {
  return new Date(ms).toISOString().slice(0, 19).replace(/:/g, "") + "Z";
}

/** The instant a backup folder's name stands for, or null when the name is not one. */
export function folderTimeMs(name: string): number | null {
  const m = FOLDER_NAME.exec(name);
  if (!m) return null;
  return Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]), Number(m[4]), Number(m[5]), Number(m[6]));
}

/** Completed backups (a folder with a manifest), oldest first. */
export function listBackups(backupDir: string): { name: string; path: string; atMs: number }[] {
  let names: string[];
  try {
    names = fs.readdirSync(backupDir);
  } catch {
    return [];
  }
  return names
    .map((name) => ({ name, path: path.join(backupDir, name), atMs: folderTimeMs(name) }))
    .filter((b): b is { name: string; path: string; atMs: number } => b.atMs !== null && fs.existsSync(path.join(b.path, MANIFEST_FILE)))
    .sort((a, b) => a.atMs - b.atMs);
}

export function appVersion(): string {
  try {
    return (JSON.parse(fs.readFileSync(path.join(process.cwd(), "package.json"), "utf8")) as { version?: string }).version ?? "unknown";
  } catch {
    return "unknown";
  }
}

export async function sha256Of(filePath: string): Promise<string> {
  const hash = createHash("sha256");
  for await (const chunk of fs.createReadStream(filePath)) hash.update(chunk as Buffer);
  return hash.digest("hex");
}

/** Every file under `dir` as paths relative to it, skipping `skip` (absolute) and the transient folders. */
function filesUnder(dir: string, skip: string[]): string[] {
  const out: string[] = [];
  const walk = (relative: string) => {
    let entries: fs.Dirent[];
    try {
      entries = fs.readdirSync(path.join(dir, relative), { withFileTypes: true });
    } catch {
      return;
    }
    for (const entry of entries) {
      const rel = path.join(relative, entry.name);
      const full = path.join(dir, rel);
      if (skip.some((s) => full === s || full.startsWith(s + path.sep))) continue;
      if (entry.isDirectory()) {
        if (relative === "" && TRANSIENT_UPLOAD_FOLDERS.has(entry.name)) continue;
        walk(rel);
      } else if (entry.isFile()) out.push(rel);
    }
  };
  walk("");
  return out.sort();
}

/** Copies the database through the online backup; the number of times the copy started again. */
async function copyDatabase(sqlite: Database.Database, destination: string, pagesPerStep: number, onStep?: BackupOptions["onStep"]): Promise<number> {
  let restarts = 0;
  let lastRemaining = Number.POSITIVE_INFINITY;
  await sqlite.backup(destination, {
    progress: (progress) => {
      // More pages left than after the previous step: another connection wrote, the copy began again.
      if (progress.remainingPages > lastRemaining) restarts++;
      lastRemaining = progress.remainingPages;
      onStep?.(progress);
      return restarts >= MAX_RESTARTS ? 0x7fffffff : pagesPerStep;
    },
  });
  return restarts;
}

/**
 * Takes one backup into `<backupDir>/<UTC time>/`: `headroom.db` (self-contained, rollback
 * journal, checked with PRAGMA integrity_check), `uploads/…`, and `manifest.json`. The folder is
 * written under a hidden name and renamed when complete, so a folder with a manifest is always a
 * whole backup. Then only the last `keep` backups are kept.
 */
export async function takeBackup(options: BackupOptions): Promise<BackupResult> {
  const startedAt = performance.now();
  const nowMs = options.nowMs ?? Date.now();
  fs.mkdirSync(options.backupDir, { recursive: true, mode: 0o700 });
  const name = folderNameFor(nowMs);
  const folder = path.join(options.backupDir, name);
  if (fs.existsSync(folder)) throw new Error(`A backup named ${name} already exists in ${options.backupDir}.`);
  const partial = path.join(options.backupDir, `${PARTIAL_PREFIX}${name}-${process.pid}`);
  fs.mkdirSync(partial, { mode: 0o700 });
  try {
    const databaseCopy = path.join(partial, DATABASE_FILE);
    const restarts = await copyDatabase(options.sqlite, databaseCopy, options.pagesPerStep ?? 1000, options.onStep);
    // The copy carries the live database's WAL mode; a rollback journal makes it one file that
    // opens read-only without creating -wal and -shm files beside it.
    const copy = new Database(databaseCopy);
    try {
      copy.pragma("journal_mode = DELETE");
      const check = copy.pragma("integrity_check") as { integrity_check: string }[];
      if (check.length !== 1 || check[0].integrity_check !== "ok") {
        throw new Error(`The database copy fails its integrity check: ${check.map((c) => c.integrity_check).join("; ")}`);
      }
    } finally {
      copy.close();
    }

    const files: ManifestFile[] = [{ path: DATABASE_FILE, sizeBytes: fs.statSync(databaseCopy).size, sha256: await sha256Of(databaseCopy) }];
    const uploadsCopy = path.join(partial, UPLOADS_FOLDER);
    fs.mkdirSync(uploadsCopy, { mode: 0o700 });
    for (const relative of filesUnder(options.uploadDir, [path.resolve(options.backupDir)])) {
      const target = path.join(uploadsCopy, relative);
      fs.mkdirSync(path.dirname(target), { recursive: true, mode: 0o700 });
      try {
        // Files are written under a temporary name and renamed (lib/files): a copy is never half a file.
        fs.copyFileSync(path.join(options.uploadDir, relative), target);
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code === "ENOENT") continue; // deleted meanwhile
        throw error;
      }
      files.push({ path: [UPLOADS_FOLDER, ...relative.split(path.sep)].join("/"), sizeBytes: fs.statSync(target).size, sha256: await sha256Of(target) });
    }

    const manifest: BackupManifest = { format: 1, createdAt: new Date(nowMs).toISOString(), appVersion: options.appVersion, files };
    fs.writeFileSync(path.join(partial, MANIFEST_FILE), JSON.stringify(manifest, null, 2) + "\n", { mode: 0o600 });
    fs.renameSync(partial, folder);
    const pruned = pruneBackups(options.backupDir, options.keep);
    return { folder, manifest, restarts, pruned, durationMs: performance.now() - startedAt };
  } catch (error) {
    fs.rmSync(partial, { recursive: true, force: true });
    throw error;
  }
}

/** Deletes all but the last `keep` backups, and unfinished ones older than a day. The names deleted. */
export function pruneBackups(backupDir: string, keep: number, nowMs = Date.now()): string[] {
  const backups = listBackups(backupDir);
  const removed: string[] = [];
  for (const backup of backups.slice(0, Math.max(0, backups.length - keep))) {
    fs.rmSync(backup.path, { recursive: true, force: true });
    removed.push(backup.name);
  }
  for (const name of fs.readdirSync(backupDir)) {
    if (!name.startsWith(PARTIAL_PREFIX)) continue;
    const full = path.join(backupDir, name);
    if (nowMs - fs.statSync(full).mtimeMs > 24 * 3600 * 1000) {
      fs.rmSync(full, { recursive: true, force: true });
      removed.push(name);
    }
  }
  return removed;
}
