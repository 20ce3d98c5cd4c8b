/**
 * Takes a backup of the live database (SQLite's online backup: the app may keep running) and the
 * uploaded files into a dated folder under BACKUP_DIR, then keeps the last BACKUP_KEEP.
 */
import { closeDb, databasePath, getDb } from "../db/client";
import { appVersion, takeBackup } from "../lib/backup/backup";
import { backupDir, backupKeep, uploadDir } from "../lib/config";

async function main() {
  const result = await takeBackup({ sqlite: getDb().$client, uploadDir: uploadDir(), backupDir: backupDir(), keep: backupKeep(), appVersion: appVersion() });
  closeDb();
  const bytes = result.manifest.files.reduce((n, f) => n + f.sizeBytes, 0);
  console.log(
    `[headroom] backup of ${databasePath()} and ${uploadDir()} written to ${result.folder}: ${result.manifest.files.length} files, ` +
      `${(bytes / 1024 / 1024).toFixed(1)} MB in ${(result.durationMs / 1000).toFixed(1)} s` +
      (result.pruned.length ? `; deleted older backups ${result.pruned.join(", ")}` : ""),
  );
}

main().catch((error) => {
  console.error(`[headroom] backup failed: ${error instanceof Error ? error.message : error}`);
  process.exit(1);
});
