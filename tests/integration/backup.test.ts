/**
 * Backups and restores: an online backup while another connection keeps committing, uploaded files
 * byte for byte, the last N kept, the nightly schedule, and a restore that refuses a running app
 * or a damaged copy without replacing anything.
 *
 * What "every committed row" means here: SQLite's online backup finishes with a copy of the
 * database as of its last step. A transaction committed through another connection between two
 * steps makes the copy start again from the first page; one committed through the backup's own
 * connection is written into the copy as it happens. Either way the copy holds exactly the rows
 * committed before the last step — every one of them, and none committed after the backup ended.
 * better-sqlite3 resolves the backup's promise in the same turn as that last step, so "before the
 * last step" is "before the backup's promise resolved".
 */
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { beforeAll, describe, expect, it } from "vitest";
import { closeDb, databasePath, getDb } from "@/db/client";
import { rooms, sensors, sites } from "@/db/schema";
import { listBackups, MANIFEST_FILE, pruneBackups, takeBackup, type BackupManifest } from "@/lib/backup/backup";
import { lastSlotMs, nightlyBackupDue, runNightlyBackupIfDue } from "@/lib/backup/job";
import { restoreBackup, RestoreRefusedError } from "@/lib/backup/restore";

const root = path.dirname(databasePath());
const uploads = path.join(root, "uploads");
const backups = path.join(root, "backups");
process.env.UPLOAD_DIR = uploads;
process.env.BACKUP_DIR = backups;

const HOUR = 3_600_000;
const T0 = Date.parse("2026-11-01T00:00:00Z");
let sensorId: number;
const pdfBytes = randomBytes(300_000);
const photoBytes = randomBytes(4096);

const readingTimes = (file: string): number[] => {
  const db = new Database(file, { readonly: true });
  try {
    return (db.prepare("SELECT at FROM readings WHERE sensor_id = ? ORDER BY at").pluck().all(sensorId) as number[]).slice();
  } finally {
    db.close();
  }
};
const integrity = (file: string): string => {
  const db = new Database(file, { readonly: true });
  try {
    return db.pragma("integrity_check", { simple: true }) as string;
  } finally {
    db.close();
  }
};
const options = (nowMs: number, extra: Partial<Parameters<typeof takeBackup>[0]> = {}) => ({
  sqlite: getDb().$client,
  uploadDir: uploads,
  backupDir: backups,
  keep: 14,
  appVersion: "0.1.0",
  nowMs,
  pagesPerStep: 20,
  ...extra,
});

beforeAll(() => {
  const db = getDb();
  const site = db.insert(sites).values({ name: "Backup campus" }).returning().get();
  const room = db.insert(rooms).values({ siteId: site.id, code: "B-1", name: "Store" }).returning().get();
  sensorId = db.insert(sensors).values({ externalId: "LOG-B1", name: "Store logger", roomId: room.id }).returning().get().id;
  // Enough rows for a copy of several hundred pages, so that writes land between its steps.
  const insert = db.$client.prepare("INSERT INTO readings (sensor_id, at, temp_c) VALUES (?, ?, ?)");
  db.$client.transaction(() => {
    for (let i = 0; i < 40_000; i++) insert.run(sensorId, T0 + i * 60_000, 18 + (i % 50) / 10);
  })();
  fs.mkdirSync(path.join(uploads, "sds", "2026"), { recursive: true });
  fs.writeFileSync(path.join(uploads, "sds", "2026", "acetone.pdf"), pdfBytes);
  fs.writeFileSync(path.join(uploads, "label photo.png"), photoBytes);
  fs.mkdirSync(path.join(uploads, "csv-uploads"));
  fs.writeFileSync(path.join(uploads, "csv-uploads", "0123456789abcdef0123456789abcdef.csv"), "Time,Temp\n");
});

let concurrentFolder: string;
let committedBeforeEnd: number[];
let committedAfterEnd: number[];

describe("a backup while the database is written", () => {
  it("taken while another connection commits between its steps holds exactly the rows committed before its last step", async () => {
    const writer = new Database(databasePath());
    writer.pragma("busy_timeout = 5000");
    const insert = writer.prepare("INSERT INTO readings (sensor_id, at, temp_c) VALUES (?, ?, ?)");
    const writeBatch = writer.transaction((fromMs: number) => {
      for (let k = 0; k < 5; k++) insert.run(sensorId, fromMs + k * 1000, 21.5);
    });
    let next = T0 + 100 * 24 * HOUR;
    const committed: number[] = [];
    let steps = 0;
    const before = readingTimes(databasePath());
    const result = await takeBackup(
      options(Date.parse("2026-12-01T02:00:00Z"), {
        onStep: () => {
          steps++;
          writeBatch(next);
          for (let k = 0; k < 5; k++) committed.push(next + k * 1000);
          next += 10_000;
        },
      }),
    );
    // Written after the backup's promise resolved: not in it.
    writeBatch(next);
    committedAfterEnd = [0, 1, 2, 3, 4].map((k) => next + k * 1000);
    writer.close();

    concurrentFolder = result.folder;
    committedBeforeEnd = [...before, ...committed].sort((a, b) => a - b);
    expect(steps).toBeGreaterThan(3);
    // SQLite began the copy again after writes from another connection; after three restarts the
    // rest was copied in one step.
    expect(result.restarts).toBe(3);
    const copy = path.join(result.folder, "headroom.db");
    expect(integrity(copy)).toBe("ok");
    expect(readingTimes(copy)).toEqual(committedBeforeEnd);
    expect(readingTimes(databasePath())).toEqual([...committedBeforeEnd, ...committedAfterEnd]);
  });

  it("taken while its own connection commits between steps is written along, without starting again", async () => {
    const insert = getDb().$client.prepare("INSERT INTO readings (sensor_id, at, temp_c) VALUES (?, ?, ?)");
    let next = T0 + 200 * 24 * HOUR;
    const committed: number[] = [];
    const before = readingTimes(databasePath());
    const result = await takeBackup(
      options(Date.parse("2026-12-01T03:00:00Z"), {
        onStep: () => {
          getDb().$client.transaction(() => insert.run(sensorId, next, 22))();
          committed.push(next);
          next += 60_000;
        },
      }),
    );
    expect(committed.length).toBeGreaterThan(3);
    expect(result.restarts).toBe(0);
    const copy = path.join(result.folder, "headroom.db");
    expect(integrity(copy)).toBe("ok");
    expect(readingTimes(copy)).toEqual([...before, ...committed]);
  });

  it("writes a manifest with the app version, each file's size and SHA-256, and leaves out logger files waiting for import", () => {
    const manifest = JSON.parse(fs.readFileSync(path.join(concurrentFolder, MANIFEST_FILE), "utf8")) as BackupManifest;
    expect(path.basename(concurrentFolder)).toBe("2026-12-01T020000Z");
    expect(manifest).toMatchObject({ format: 1, createdAt: "2026-12-01T02:00:00.000Z", appVersion: "0.1.0" });
    expect(manifest.files.map((f) => f.path)).toEqual(["headroom.db", "uploads/label photo.png", "uploads/sds/2026/acetone.pdf"]);
    expect(manifest.files[2]).toEqual({ path: "uploads/sds/2026/acetone.pdf", sizeBytes: 300_000, sha256: createHash("sha256").update(pdfBytes).digest("hex") });
    expect(manifest.files[0].sizeBytes).toBe(fs.statSync(path.join(concurrentFolder, "headroom.db")).size);
    // One self-contained file: no -wal or -shm beside the copy.
    expect(fs.readdirSync(concurrentFolder).sort()).toEqual(["headroom.db", "manifest.json", "uploads"]);
  });
});

describe("keeping the last N", () => {
  it("deletes all but the newest backups after each one", async () => {
    const dir = path.join(root, "pruning");
    for (let day = 1; day <= 5; day++) {
      await takeBackup(options(Date.UTC(2026, 10, day, 2), { backupDir: dir, keep: 3, pagesPerStep: 100_000 }));
    }
    expect(listBackups(dir).map((b) => b.name)).toEqual(["2026-11-03T020000Z", "2026-11-04T020000Z", "2026-11-05T020000Z"]);
    expect(pruneBackups(dir, 1)).toEqual(["2026-11-03T020000Z", "2026-11-04T020000Z"]);
    expect(fs.readdirSync(dir)).toEqual(["2026-11-05T020000Z"]);
  });
});

describe("the nightly backup", () => {
  it("is due once per day after the configured hour, judged by the newest backup's time", () => {
    const hour = 2;
    expect(lastSlotMs(Date.parse("2026-12-05T01:59:00Z"), hour)).toBe(Date.parse("2026-12-04T02:00:00Z"));
    expect(lastSlotMs(Date.parse("2026-12-05T02:00:00Z"), hour)).toBe(Date.parse("2026-12-05T02:00:00Z"));
    expect(nightlyBackupDue(Date.parse("2026-12-05T02:10:00Z"), hour, Date.parse("2026-12-04T02:00:05Z"))).toBe(true);
    expect(nightlyBackupDue(Date.parse("2026-12-05T23:50:00Z"), hour, Date.parse("2026-12-05T02:00:05Z"))).toBe(false);
    expect(nightlyBackupDue(Date.parse("2026-12-06T01:50:00Z"), hour, Date.parse("2026-12-05T02:00:05Z"))).toBe(false);
    // Down at 02:00, back at 09:00: taken then.
    expect(nightlyBackupDue(Date.parse("2026-12-06T09:00:00Z"), hour, Date.parse("2026-12-05T02:00:05Z"))).toBe(true);
  });

  it("runs when due and not again the same day, even from a fresh process (it reads the folders)", async () => {
    process.env.BACKUP_DIR = path.join(root, "nightly");
    process.env.BACKUP_HOUR_UTC = "3";
    try {
      expect(await runNightlyBackupIfDue(Date.parse("2026-12-06T03:10:00Z"))).toBe(true);
      expect(await runNightlyBackupIfDue(Date.parse("2026-12-06T03:20:00Z"))).toBe(false);
      expect(await runNightlyBackupIfDue(Date.parse("2026-12-07T02:59:00Z"))).toBe(false);
      expect(listBackups(path.join(root, "nightly")).map((b) => b.name)).toEqual(["2026-12-06T031000Z"]);
    } finally {
      process.env.BACKUP_DIR = backups;
      delete process.env.BACKUP_HOUR_UTC;
    }
  });
});

describe("restoring", () => {
  const sha = (file: string) => createHash("sha256").update(fs.readFileSync(file)).digest("hex");
  const asideFiles = () => fs.readdirSync(root).filter((n) => n.includes("before-restore"));

  it("refuses while the app has the database open, and replaces nothing", async () => {
    getDb(); // the app's connection
    const liveBefore = sha(databasePath());
    await expect(restoreBackup({ folder: concurrentFolder, databasePath: databasePath(), uploadDir: uploads })).rejects.toThrow(
      `${databasePath()} is open in another process: Headroom appears to be running. Stop it, then restore.`,
    );
    expect(sha(databasePath())).toBe(liveBefore);
    expect(asideFiles()).toEqual([]);
  });

  it("refuses a copy with bytes flipped in the middle (its checksum fails), and replaces nothing", async () => {
    closeDb();
    const damaged = path.join(root, "damaged");
    fs.cpSync(concurrentFolder, damaged, { recursive: true });
    const file = path.join(damaged, "headroom.db");
    const bytes = fs.readFileSync(file);
    const middle = Math.floor(bytes.length / 2);
    for (let i = middle; i < middle + 64; i++) bytes[i] ^= 0xff;
    fs.writeFileSync(file, bytes);
    const liveBefore = sha(databasePath());
    await expect(restoreBackup({ folder: damaged, databasePath: databasePath(), uploadDir: uploads })).rejects.toThrow(
      "headroom.db does not match its SHA-256 in the manifest. The backup is damaged.",
    );
    expect(sha(databasePath())).toBe(liveBefore);
    expect(asideFiles()).toEqual([]);
  });

  it("refuses a damaged copy whose manifest was rewritten to match it: the integrity check fails", async () => {
    const damaged = path.join(root, "damaged");
    const file = path.join(damaged, "headroom.db");
    const bytes = fs.readFileSync(file);
    // A whole page in the middle overwritten: its b-tree page header is no longer one.
    const page = 4096;
    const middlePage = Math.floor(bytes.length / page / 2) * page;
    bytes.fill(0xff, middlePage, middlePage + page);
    fs.writeFileSync(file, bytes);
    const manifest = JSON.parse(fs.readFileSync(path.join(damaged, MANIFEST_FILE), "utf8")) as BackupManifest;
    manifest.files[0] = { ...manifest.files[0], sha256: sha(file), sizeBytes: bytes.length };
    fs.writeFileSync(path.join(damaged, MANIFEST_FILE), JSON.stringify(manifest));
    const error = await restoreBackup({ folder: damaged, databasePath: databasePath(), uploadDir: uploads }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(RestoreRefusedError);
    expect((error as Error).message).toMatch(/^The backup's database (fails its integrity check|cannot be read)/);
    expect(asideFiles()).toEqual([]);
  });

  it("restores the database and the uploaded files byte for byte, keeping the current ones aside", async () => {
    // Since the backup: a file changed, one added.
    fs.writeFileSync(path.join(uploads, "label photo.png"), "overwritten");
    fs.writeFileSync(path.join(uploads, "added later.pdf"), "later");
    const liveBefore = sha(databasePath());
    const result = await restoreBackup({ folder: concurrentFolder, databasePath: databasePath(), uploadDir: uploads, nowMs: Date.parse("2026-12-05T15:00:00Z") });
    expect(result.restoredFiles).toBe(3);
    expect(result.keptAside).toEqual([`${databasePath()}.before-restore-2026-12-05T150000Z`, `${uploads}.before-restore-2026-12-05T150000Z`]);

    expect(integrity(databasePath())).toBe("ok");
    expect(readingTimes(databasePath())).toEqual(committedBeforeEnd);
    expect(Buffer.compare(fs.readFileSync(path.join(uploads, "sds", "2026", "acetone.pdf")), pdfBytes)).toBe(0);
    expect(Buffer.compare(fs.readFileSync(path.join(uploads, "label photo.png")), photoBytes)).toBe(0);
    expect(fs.existsSync(path.join(uploads, "added later.pdf"))).toBe(false);

    // Kept aside, not deleted: the database as it was (with the rows written after the backup) and the uploads.
    expect(sha(`${databasePath()}.before-restore-2026-12-05T150000Z`)).toBe(liveBefore);
    expect(readingTimes(`${databasePath()}.before-restore-2026-12-05T150000Z`)).toEqual(expect.arrayContaining(committedAfterEnd));
    expect(fs.readFileSync(path.join(`${uploads}.before-restore-2026-12-05T150000Z`, "added later.pdf"), "utf8")).toBe("later");

    // The app opens the restored database (WAL again, migrations current).
    expect(getDb().$client.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(await getDb().$count(sensors)).toBe(1);
  });
});
