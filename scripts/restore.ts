/**
 * Restores a backup folder (written by `npm run backup` or the nightly backup) into a stopped
 * installation: `npm run restore -- data/backups/2026-12-05T020000Z`. The current database and
 * upload folder are kept aside as `….before-restore-<time>`.
 */
import path from "node:path";
import { databasePath } from "../db/client";
import { restoreBackup } from "../lib/backup/restore";
import { uploadDir } from "../lib/config";

async function main() {
  const folder = process.argv[2];
  if (!folder) {
    console.error("[headroom] usage: npm run restore -- <backup folder>, e.g. npm run restore -- data/backups/2026-12-05T020000Z");
    process.exit(2);
  }
  const result = await restoreBackup({ folder: path.resolve(folder), databasePath: databasePath(), uploadDir: uploadDir() });
  console.log(`[headroom] restored ${result.restoredFiles} files from ${folder} into ${databasePath()} and ${uploadDir()}.`);
  if (result.keptAside.length) console.log(`[headroom] kept aside (delete them when the restore is confirmed): ${result.keptAside.join(", ")}`);
}

main().catch((error) => {
  console.error(`[headroom] nothing was restored: ${error instanceof Error ? error.message : error}`);
  process.exit(1);
});
