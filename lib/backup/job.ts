/**
 * The nightly backup, started with the other background jobs. Once a day at BACKUP_HOUR_UTC: the
 * job checks every ten minutes whether today's slot has passed without a backup since, judged by
 * the newest backup folder's time — so a restart neither skips the day nor takes a second one, and
 * a server that was down at the hour takes it when it is back. An installation without any backup
 * takes its first at the next slot after the server started, not at every start.
 */
import "server-only";
import { getDb } from "@/db/client";
import { backupDir, backupKeep, backupSchedule, uploadDir } from "@/lib/config";
import { log } from "@/lib/log";
import { appVersion, listBackups, takeBackup } from "./backup";

const CHECK_INTERVAL_MS = 10 * 60 * 1000;
/** After a failed attempt, the next waits this long (a full disk should not be hammered). */
const RETRY_AFTER_MS = 60 * 60 * 1000;

/** The latest scheduled instant at or before `nowMs`: today's hour, or yesterday's before it. */
export function lastSlotMs(nowMs: number, hourUtc: number): number {
  const day = new Date(nowMs);
  const today = Date.UTC(day.getUTCFullYear(), day.getUTCMonth(), day.getUTCDate(), hourUtc);
  return today <= nowMs ? today : today - 24 * 3600 * 1000;
}

/** True when no backup was taken since the latest slot. */
export function nightlyBackupDue(nowMs: number, hourUtc: number, latestBackupMs: number | null): boolean {
  return latestBackupMs === null || latestBackupMs < lastSlotMs(nowMs, hourUtc);
}

const globalBackup = globalThis as unknown as { headroomBackupTimer?: NodeJS.Timeout; headroomBackupRunning?: boolean; headroomBackupFailedAt?: number; headroomBackupJobStartedAt?: number };

export async function runNightlyBackupIfDue(nowMs = Date.now()): Promise<boolean> {
  const { hourUtc } = backupSchedule();
  const dir = backupDir();
  const latest = listBackups(dir).at(-1)?.atMs ?? globalBackup.headroomBackupJobStartedAt ?? null;
  if (!nightlyBackupDue(nowMs, hourUtc, latest)) return false;
  if (globalBackup.headroomBackupRunning) return false;
  if (globalBackup.headroomBackupFailedAt !== undefined && nowMs - globalBackup.headroomBackupFailedAt < RETRY_AFTER_MS) return false;
  globalBackup.headroomBackupRunning = true;
  try {
    const result = await takeBackup({ sqlite: getDb().$client, uploadDir: uploadDir(), backupDir: dir, keep: backupKeep(), appVersion: appVersion(), nowMs });
    globalBackup.headroomBackupFailedAt = undefined;
    log.info(
      { job: "backup", folder: result.folder, files: result.manifest.files.length, bytes: result.manifest.files.reduce((n, f) => n + f.sizeBytes, 0), restarts: result.restarts, pruned: result.pruned, ms: Math.round(result.durationMs) },
      "nightly backup taken",
    );
    return true;
  } catch (error) {
    globalBackup.headroomBackupFailedAt = nowMs;
    log.error({ err: error, job: "backup" }, "nightly backup failed; it is tried again in an hour");
    return false;
  } finally {
    globalBackup.headroomBackupRunning = false;
  }
}

/** Starts the check (unless BACKUP_NIGHTLY=false). */
export function startBackupJob(): boolean {
  if (!backupSchedule().nightly || globalBackup.headroomBackupTimer) return false;
  globalBackup.headroomBackupJobStartedAt = Date.now();
  const check = () => void runNightlyBackupIfDue();
  globalBackup.headroomBackupTimer = setInterval(check, CHECK_INTERVAL_MS);
  globalBackup.headroomBackupTimer.unref?.();
  check();
  return true;
}
