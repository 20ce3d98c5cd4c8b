// Benchmark: a logger file of 1,000,000 readings through the CSV import path. Targets:
//   1. The import (parse, check every row, write, excursion refresh — one call of importCsvUpload)
//      takes under 15 s.
//   2. Memory stays bounded: the file is streamed, never loaded; peak RSS growth during the import
//      stays well under the file's size and within a fixed budget whatever the size.
// Then excursion detection over the stored readings, streamed from the database in time order
// through the incremental detector.
//
// Run with `npx tsx --conditions=react-server bench/readings.ts` (the condition makes
// `import "server-only"` a no-op). Options: `--rows N` (default 1,000,000); `--keep-files` keeps the
// database and the generated CSV (their paths are printed).
//
// The file is one refrigerator logger's export: an information block, then
// Date;Time;Temperature;Unit;Serial with dd.mm.yyyy dates, 24-hour local times in Europe/Berlin
// (both daylight-saving changes of 2025 inside, the repeated hour included), decimal commas, every
// 30 s from 1 January 2025 (a year in the past: readings ahead of the server's clock are refused). Invented data: 4–5 °C with noise, short door openings, and one warm
// spell above 8 °C for 40–100 min about every two weeks. The script reports; it does not fail.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-readings-"));
process.env.DATABASE_PATH = path.join(tempDir, "readings.db");
process.env.UPLOAD_DIR = path.join(tempDir, "uploads");
process.env.BCRYPT_COST = "4";
process.env.SESSION_SECRET = "bench-session-secret-at-least-32-characters-long";
process.env.LOG_LEVEL = "silent";

const rowsArg = process.argv.indexOf("--rows");
const ROW_COUNT = rowsArg > 0 ? Number(process.argv[rowsArg + 1]) : 1_000_000;
const keepFiles = process.argv.includes("--keep-files");
const IMPORT_TARGET_S = 15;
/**
 * Memory is bounded when the growth does not follow the file's size: SQLite's page caches (16 MB
 * for the database, 16 MB for the staging table) and a chunk of text at a time, not the rows.
 * Try `--rows 2000000` to see the growth stay where it is.
 */
const MEMORY_BUDGET_BYTES = 64 * 1024 * 1024;
const ZONE = "Europe/Berlin";
const DEVICE = "LOG-BENCH";
const THRESHOLD_C = 8;
const MIN_DURATION_MIN = 30;

async function main(): Promise<void> {
  const { closeDb, getDb } = await import("@/db/client");
  const { rooms, sites, storageUnits, sensors, users, excursions, readings } = await import("@/db/schema");
  const { startCsvUploadFromFile, previewCsvUpload, importCsvUpload } = await import("@/lib/temperatures/csv-upload");
  const { csvMappingSchema } = await import("@/lib/temperatures/csv");
  const { createExcursionDetector } = await import("@/lib/temperatures/excursions");
  const { writeLoggerCsv } = await import("./lib/logger-csv");
  const { eq } = await import("drizzle-orm");

  const MB = 1024 * 1024;
  const mb = (bytes: number) => `${(bytes / MB).toFixed(0)} MB`;
  const seconds = (ms: number) => `${(ms / 1000).toFixed(2)} s`;
  const thousands = (n: number) => n.toLocaleString("en-GB");
  const verdict = (met: boolean) => (met ? "target met" : "target NOT met");

  /** RSS sampled every 20 ms while `work` runs (a synchronous stretch is seen at its ends only). */
  async function measured<T>(work: () => Promise<T>): Promise<{ value: T; ms: number; cpuMs: number; startRss: number; peakRss: number }> {
    global.gc?.();
    const startRss = process.memoryUsage.rss();
    let peakRss = startRss;
    const timer = setInterval(() => {
      peakRss = Math.max(peakRss, process.memoryUsage.rss());
    }, 20);
    const startedAt = performance.now();
    const cpuAtStart = process.cpuUsage();
    try {
      const value = await work();
      const ms = performance.now() - startedAt;
      const cpu = process.cpuUsage(cpuAtStart);
      peakRss = Math.max(peakRss, process.memoryUsage.rss());
      return { value, ms, cpuMs: (cpu.user + cpu.system) / 1000, startRss, peakRss };
    } finally {
      clearInterval(timer);
    }
  }

  console.log(`Node ${process.version}, ${os.cpus().length} CPUs, load average ${os.loadavg().map((l) => l.toFixed(2)).join(" ")}.`);

  // ---------------------------------------------------------------------------------------------
  // 1. A sensor on a refrigerator with an 8 °C / 30 min excursion rule, and a facilities user
  // ---------------------------------------------------------------------------------------------
  const db = getDb();
  const user = db.insert(users).values({ email: "bench.facilities@example.test", name: "Bench Facilities", role: "facilities", passwordHash: "x" }).returning().get();
  const actor = { id: user.id, email: user.email, name: user.name, role: user.role };
  const site = db.insert(sites).values({ name: "Bench campus" }).returning().get();
  const room = db.insert(rooms).values({ siteId: site.id, code: "B-1", name: "Bench lab", designMaxTempC: 27 }).returning().get();
  const unit = db
    .insert(storageUnits)
    .values({ roomId: room.id, code: "FR-B", name: "Bench refrigerator", kind: "flammable_storage_refrigerator", setMinC: 2, setMaxC: 8, excursionThresholdC: THRESHOLD_C, excursionMinDurationMin: MIN_DURATION_MIN })
    .returning()
    .get();
  const sensor = db.insert(sensors).values({ externalId: DEVICE, name: "Bench refrigerator logger", storageUnitId: unit.id }).returning().get();

  // ---------------------------------------------------------------------------------------------
  // 2. The logger file, written as a stream
  // ---------------------------------------------------------------------------------------------
  const csvPath = path.join(tempDir, "logger-bench.csv");
  const generated = await measured(() => writeLoggerCsv(csvPath, { rows: ROW_COUNT, device: DEVICE, timeZone: ZONE }));
  const fileBytes = fs.statSync(csvPath).size;
  console.log(`\nGenerated ${thousands(ROW_COUNT)} readings (${mb(fileBytes)}) in ${seconds(generated.ms)}; peak RSS ${mb(generated.peakRss)}.`);

  // ---------------------------------------------------------------------------------------------
  // 3. Upload (copy + layout detection), preview (one read pass), import (read pass + write)
  // ---------------------------------------------------------------------------------------------
  const uploaded = await measured(() => startCsvUploadFromFile(actor, sensor.id, csvPath));
  const info = uploaded.value;
  console.log(`\nUpload: ${seconds(uploaded.ms)}. Detected: delimiter “${info.layout.delimiter}”, decimal “${info.layout.decimalSeparator}”, header on line ${info.layout.headerLine}, columns ${info.layout.headers.join(", ")}.`);
  const mapping = csvMappingSchema.parse({ ...info.mapping, timeZone: ZONE });
  console.log(`Mapping: ${JSON.stringify(mapping)}`);

  const preview = await measured(() => previewCsvUpload(actor, sensor.id, info.token, mapping));
  console.log(
    `\nPreview (read and check every row, nothing written): ${seconds(preview.ms)} (CPU ${seconds(preview.cpuMs)}); ${thousands(preview.value.rowCount)} rows, ${thousands(preview.value.issueCount)} problems; ` +
      `RSS ${mb(preview.startRss)} → peak ${mb(preview.peakRss)} (growth ${mb(preview.peakRss - preview.startRss)}).`,
  );
  if (preview.value.issueCount) console.log(preview.value.issues.slice(0, 5));

  const imported = await measured(() => importCsvUpload(actor, sensor.id, info.token, mapping));
  const result = imported.value;
  const rowsPerSecond = Math.round(result.rowCount / (imported.ms / 1000));
  console.log(
    `\nImport: ${seconds(imported.ms)} (CPU ${seconds(imported.cpuMs)}) for ${thousands(result.rowCount)} rows (${thousands(rowsPerSecond)} rows/s): ${thousands(result.accepted)} accepted, ${thousands(result.duplicates)} duplicates; ` +
      `excursions ${JSON.stringify(result.excursions)}.`,
  );
  console.log(`  read pass ≈ ${seconds(preview.ms)} (the preview), write transaction ≈ ${seconds(imported.ms - preview.ms)} (insert from the staging table, excursion refresh, audit).`);
  console.log("  Wall times include waiting for the CPU when the machine is busy (see the load average); CPU time is this process's own.");
  const importGrowth = imported.peakRss - imported.startRss;
  console.log(
    `  RSS ${mb(imported.startRss)} → peak ${mb(imported.peakRss)} sampled (growth ${mb(importGrowth)} for a ${mb(fileBytes)} file); process maximum RSS so far ${mb(process.resourceUsage().maxRSS * 1024)}.`,
  );
  const budget = Math.min(fileBytes, MEMORY_BUDGET_BYTES);
  console.log(
    `  Import under ${IMPORT_TARGET_S} s: ${verdict(imported.ms < IMPORT_TARGET_S * 1000)}. ` +
      `Peak RSS growth under the file size and under ${mb(MEMORY_BUDGET_BYTES)} whatever the size: ${verdict(importGrowth < budget)} (${((100 * importGrowth) / fileBytes).toFixed(0)} % of the file).`,
  );

  // ---------------------------------------------------------------------------------------------
  // 4. Excursion detection over the stored readings, streamed in time order
  // ---------------------------------------------------------------------------------------------
  const sqlite = db.$client;
  const detection = await measured(async () => {
    const detector = createExcursionDetector({ thresholdC: THRESHOLD_C, minDurationMs: MIN_DURATION_MIN * 60_000 });
    const found = [];
    let count = 0;
    const rows = sqlite.prepare("SELECT at, temp_c FROM readings WHERE sensor_id = ? ORDER BY at").raw(true).iterate(sensor.id) as IterableIterator<[number, number]>;
    for (const [atMs, tempC] of rows) {
      count++;
      const completed = detector.push({ atMs, tempC });
      if (completed) found.push(completed);
    }
    found.push(...detector.finish());
    return { count, found };
  });
  const stored = db.select().from(excursions).where(eq(excursions.sensorId, sensor.id)).orderBy(excursions.startAt).all();
  const same =
    stored.length === detection.value.found.length &&
    stored.every((e, i) => e.startAt.getTime() === detection.value.found[i].startMs && (e.endAt?.getTime() ?? null) === detection.value.found[i].endMs && e.peakTempC === detection.value.found[i].peakTempC);
  const longest = Math.max(...detection.value.found.map((e) => e.durationMs / 60_000));
  console.log(
    `\nExcursion detection, streamed from the database: ${thousands(detection.value.count)} readings in ${seconds(detection.ms)} (CPU ${seconds(detection.cpuMs)}); ${detection.value.found.length} excursions ` +
      `(longest ${longest.toFixed(0)} min); RSS growth ${mb(detection.peakRss - detection.startRss)}. Same as the ${stored.length} stored by the import: ${same ? "yes" : "NO"}.`,
  );
  const storedCount = await db.$count(readings, eq(readings.sensorId, sensor.id));
  console.log(`Readings stored: ${thousands(storedCount)}. Load average at the end ${os.loadavg().map((l) => l.toFixed(2)).join(" ")}.`);

  closeDb();
  if (keepFiles) console.log(`\nKept: ${process.env.DATABASE_PATH} and ${csvPath}`);
  else fs.rmSync(tempDir, { recursive: true, force: true });
}

main().catch((error) => {
  console.error(error);
  if (!keepFiles) fs.rmSync(tempDir, { recursive: true, force: true });
  process.exitCode = 1;
});
