// Benchmark: hostile import workbooks refused through the import service. Target for each file:
// refused within 2 s, with RSS growing by less than 100 MB while it is read.
//   - a 300 KB workbook whose one cell unpacks to 300 MB (honest sizes: refused from the zip's
//     central directory),
//   - the same declaring 1 KB for its worksheet (stopped while inflating, at the cell limit),
//   - shared strings declaring 1 KB that unpack to 90 MB (stopped while inflating, at the ratio),
//   - a 1.1 MB workbook of 3,000,000 rows (stopped at row 100,001).
// Each goes through previewLocationImport and commitLocationImport from a file on disk, as the
// route handlers call them after streaming the upload.
//
// Run with `npx tsx --expose-gc --conditions=react-server bench/uploads.ts` (the condition makes
// `import "server-only"` a no-op). The files are written once; each is then read in a fresh
// process of its own, so that one file's heap does not hide the next one's growth. The script
// reports; it does not fail: the exit code is 0 either way.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const caseArg = process.argv.indexOf("--case");
const caseIndex = caseArg > 0 ? Number(process.argv[caseArg + 1]) : null;
const dirArg = process.argv.indexOf("--dir");
const tempDir = dirArg > 0 ? process.argv[dirArg + 1] : fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-uploads-"));
process.env.DATABASE_PATH = path.join(tempDir, "uploads.db");
process.env.UPLOAD_DIR = path.join(tempDir, "uploads");
process.env.BCRYPT_COST = "4";
process.env.SESSION_SECRET = "bench-session-secret-at-least-32-characters-long";
process.env.LOG_LEVEL = "silent";

const TIME_TARGET_MS = 2000;
const MEMORY_TARGET_BYTES = 100 * 1024 * 1024;
const MiB = 1024 * 1024;

async function main(): Promise<void> {
  const { closeDb, getDb } = await import("@/db/client");
  const { users } = await import("@/db/schema");
  const { commitLocationImport, previewLocationImport } = await import("@/lib/imports/service");
  const { ImportFileError } = await import("@/lib/imports/errors");
  const { writeXlsxManyRows, writeXlsxZipBomb } = await import("../tests/fixtures/hostile-files");

  const mb = (bytes: number) => `${(bytes / MiB).toFixed(1)} MB`;

  /** RSS sampled every 10 ms while `work` runs (a synchronous stretch is seen at its ends only). */
  async function measured(work: () => Promise<unknown>): Promise<{ outcome: string; ms: number; growth: number }> {
    (globalThis as { gc?: () => void }).gc?.();
    const startRss = process.memoryUsage.rss();
    let peakRss = startRss;
    const timer = setInterval(() => {
      peakRss = Math.max(peakRss, process.memoryUsage.rss());
    }, 10);
    const startedAt = performance.now();
    let outcome: string;
    try {
      await work();
      outcome = "ACCEPTED (not refused)";
    } catch (error) {
      outcome = error instanceof ImportFileError ? `${error.status} ${error.code}` : `unexpected ${String(error)}`;
    } finally {
      clearInterval(timer);
    }
    const ms = performance.now() - startedAt;
    peakRss = Math.max(peakRss, process.memoryUsage.rss());
    return { outcome, ms, growth: peakRss - startRss };
  }


  const cases: { label: string; file: string; write: (file: string) => Promise<unknown> }[] = [
    { label: "zip bomb, one 300 MB cell", file: "bomb.xlsx", write: (file) => writeXlsxZipBomb(file, { cellBytes: 300 * MiB }) },
    {
      label: "zip bomb, size understated",
      file: "bomb-understated.xlsx",
      write: (file) => writeXlsxZipBomb(file, { cellBytes: 300 * MiB, place: "inline", declaredUncompressedBytes: 1000 }),
    },
    {
      label: "90 MB of shared strings, understated",
      file: "strings-understated.xlsx",
      write: (file) => writeXlsxZipBomb(file, { cellBytes: 30_000, cells: 3000, declaredUncompressedBytes: 1000 }),
    },
    { label: "3,000,000 rows", file: "rows.xlsx", write: (file) => writeXlsxManyRows(file, { rows: 3_000_000 }) },
  ];

  if (caseIndex === null) {
    console.log(`Node ${process.version}, ${os.cpus().length} CPUs, load average ${os.loadavg().map((l) => l.toFixed(2)).join(" ")}.`);
    console.log("\nRefusals (time; peak RSS growth while reading), each file in a fresh process:");
    for (const [index, { label, file, write }] of cases.entries()) {
      const filePath = path.join(tempDir, file);
      const startedAt = performance.now();
      await write(filePath);
      const writtenMs = performance.now() - startedAt;
      console.log(`  ${label}: ${mb(fs.statSync(filePath).size)} on disk (written in ${(writtenMs / 1000).toFixed(1)} s)`);
      const child = spawnSync(process.execPath, [...process.execArgv, process.argv[1], "--case", String(index), "--dir", tempDir], { encoding: "utf8", env: process.env });
      process.stdout.write(child.stdout);
      if (child.status !== 0) process.stdout.write(child.stderr);
    }
    return;
  }

  const db = getDb();
  const user = db.insert(users).values({ email: `bench.${caseIndex}@example.test`, name: "Bench Facilities", role: "facilities", passwordHash: "x" }).returning().get();
  const actor = { id: user.id, email: user.email, name: user.name, role: user.role };
  const { file } = cases[caseIndex];
  const filePath = path.join(tempDir, file);
  for (const [step, work] of [
    ["preview", () => previewLocationImport({ path: filePath, fileName: file })],
    ["import ", () => commitLocationImport(actor, { path: filePath, fileName: file })],
  ] as const) {
    const { outcome, ms, growth } = await measured(work);
    const met = ms < TIME_TARGET_MS && growth < MEMORY_TARGET_BYTES;
    console.log(
      `    ${step} ${outcome.padEnd(22)} ${ms.toFixed(0).padStart(5)} ms, RSS +${mb(Math.max(0, growth)).padStart(8)}: ` +
        `${met ? "target met" : "target NOT met"} (< ${TIME_TARGET_MS / 1000} s, < ${mb(MEMORY_TARGET_BYTES)})`,
    );
  }
  closeDb();
}

main()
  .catch((error) => {
    console.error(error);
    process.exitCode = 1;
  })
  .finally(() => {
    if (caseIndex === null) fs.rmSync(tempDir, { recursive: true, force: true });
  });
