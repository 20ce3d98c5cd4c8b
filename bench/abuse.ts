// Benchmark: a production server under abuse. Targets:
//   1. While a 1,000,000-row logger import, an export of the register's 100,000 findings and 16
//      parallel failed sign-ins (kept at 16 the whole time) run, the p95 of `GET /api/health` and of
//      a container list request (`GET /api/v1/containers?pageSize=50`) stays under 100 ms.
//   2. A zip-bomb workbook (one cell unpacking to 300 MB) and a 1 MB workbook of 3,000,000 rows sent
//      to the location-import preview are refused within 2 s each, with the server's RSS growing by
//      less than 100 MB.
//
// Run with `npx tsx --conditions=react-server bench/abuse.ts` (the condition makes
// `import "server-only"` a no-op). It builds the app (`npm run build`) unless `--no-build` says the
// current build is up to date, builds a register of 100,000 findings in a temporary database
// (bench/lib/register-db.ts), writes the logger file and the hostile workbooks, starts
// `next start` on a free port against that database (production settings, TRUST_PROXY=1: this
// process stands in for the reverse proxy, so each failed sign-in can come from its own address),
// signs in a safety officer and a facilities user, measures the idle latencies, then the latencies
// under load, then the hostile files. Latencies are wall time seen by this process (on the same
// machine, so they include waiting for a CPU); the server's RSS is read from /proc every 10 ms (the
// server process and any children). Options: `--keep-files` keeps the temporary folder (database,
// server log); `--rows N` for the logger file; `--findings N` for the register. The script
// reports; it does not fail: the exit code is 0 either way, unless the server does not start.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { freePort, startServer, treeRss } from "./lib/process";

const argValue = (name: string) => {
  const index = process.argv.indexOf(name);
  return index >= 0 ? process.argv[index + 1] : undefined;
};
const LOGGER_ROWS = Number(argValue("--rows") ?? 1_000_000);
const FINDINGS = Number(argValue("--findings") ?? 100_000);
const KEEP_FILES = process.argv.includes("--keep-files");
const NO_BUILD = process.argv.includes("--no-build");
const PARALLEL_SIGN_INS = 16;
const LATENCY_TARGET_MS = 100;
const REFUSAL_TARGET_MS = 2000;
const RSS_GROWTH_TARGET_MB = 100;
const PASSWORD = "bench password, long enough";
const SESSION_SECRET = "bench-session-secret-at-least-32-characters-long";
const DEVICE = "LOG-002";

const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-abuse-"));
process.env.DATABASE_PATH = path.join(tempDir, "register.db");
process.env.UPLOAD_DIR = path.join(tempDir, "uploads");
process.env.LOG_LEVEL = "silent";

const MiB = 1024 * 1024;
const ms = (value: number) => `${value.toFixed(0)} ms`;
const thousands = (n: number) => n.toLocaleString("en-GB");
const verdict = (met: boolean) => (met ? "target met" : "target NOT met");

type Summary = { count: number; median: number; p95: number; max: number };

async function main(): Promise<void> {
  const { quantile } = await import("./lib/stats");
  const summary = (samples: number[]): Summary => ({ count: samples.length, median: quantile(samples, 0.5), p95: quantile(samples, 0.95), max: Math.max(...samples) });
  const line = (label: string, s: Summary) => `${label}: median ${ms(s.median)}, p95 ${ms(s.p95)}, max ${ms(s.max)} (${thousands(s.count)} requests)`;

  console.log(`Node ${process.version}, ${os.cpus().length} CPUs, ${(os.totalmem() / 2 ** 30).toFixed(0)} GB, load average ${os.loadavg().map((l) => l.toFixed(2)).join(" ")}.`);

  // -----------------------------------------------------------------------------------------------
  // 1. The build, the register, the files
  // -----------------------------------------------------------------------------------------------
  if (!NO_BUILD) {
    console.log("\nBuilding the app (npm run build; --no-build skips it when the build is current) …");
    const built = spawnSync("npm", ["run", "build"], { stdio: ["ignore", "ignore", "inherit"], env: { ...process.env, NODE_ENV: "production" } });
    if (built.status !== 0) throw new Error("npm run build failed");
  } else if (!fs.existsSync(path.join(".next", "BUILD_ID")) || !fs.existsSync(path.join(".next", "workers", "worker.mjs"))) {
    throw new Error("--no-build was given but there is no complete build in .next/: run npm run build first.");
  }

  const { buildRegisterDb } = await import("./lib/register-db");
  await buildRegisterDb({ findings: FINDINGS });
  const bcrypt = (await import("bcryptjs")).default;
  const { closeDb, getDb } = await import("@/db/client");
  const { bcryptCost } = await import("@/lib/config");
  const sqlite = getDb().$client;
  // Known passwords at the production cost, for the safety officer (bench.0) and facilities (bench.3).
  const hash = bcrypt.hashSync(PASSWORD, bcryptCost());
  sqlite.prepare("UPDATE users SET password_hash = ? WHERE email IN ('bench.0@example.test', 'bench.3@example.test')").run(hash);
  const sensor = sqlite.prepare("SELECT id FROM sensors WHERE external_id = ?").get(DEVICE) as { id: number };
  const containerCount = (sqlite.prepare("SELECT count(*) AS n FROM containers").get() as { n: number }).n;
  closeDb();

  const { writeLoggerCsv } = await import("./lib/logger-csv");
  const { writeXlsxManyRows, writeXlsxZipBomb } = await import("../tests/fixtures/hostile-files");
  const csvPath = path.join(tempDir, "logger.csv");
  const { bytes: csvBytes } = await writeLoggerCsv(csvPath, { rows: LOGGER_ROWS, device: DEVICE });
  const bombPath = path.join(tempDir, "bomb.xlsx");
  await writeXlsxZipBomb(bombPath, { cellBytes: 300 * MiB });
  const rowsPath = path.join(tempDir, "rows.xlsx");
  await writeXlsxManyRows(rowsPath, { rows: 3_000_000 });
  console.log(
    `Logger file: ${thousands(LOGGER_ROWS)} rows, ${(csvBytes / MiB).toFixed(1)} MB. Zip bomb ${(fs.statSync(bombPath).size / 1024).toFixed(0)} KB; ` +
      `3,000,000 rows in ${(fs.statSync(rowsPath).size / MiB).toFixed(1)} MB.`,
  );

  // -----------------------------------------------------------------------------------------------
  // 2. The server
  // -----------------------------------------------------------------------------------------------
  const port = await freePort();
  const server = await startServer({ port, logDir: tempDir, env: { SESSION_SECRET, TRUST_PROXY: "1" } });
  const base = server.base;
  console.log(`\nServer: next start on ${base}, pid ${server.pid}, answering after ${ms(server.readyMs)}.`);

  const origin = { origin: base };
  async function signIn(email: string): Promise<string> {
    const response = await fetch(`${base}/api/v1/session`, {
      method: "POST",
      headers: { ...origin, "content-type": "application/json", "x-forwarded-for": "192.0.2.10" },
      body: JSON.stringify({ email, password: PASSWORD }),
    });
    if (response.status !== 200) throw new Error(`sign-in of ${email} answered ${response.status}: ${await response.text()}`);
    return response.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  }
  const officer = await signIn("bench.0@example.test");
  const facilities = await signIn("bench.3@example.test");

  async function timed(url: string, cookie?: string): Promise<number> {
    const t = performance.now();
    const response = await fetch(url, { headers: cookie ? { cookie } : {} });
    await response.arrayBuffer();
    if (!response.ok) throw new Error(`${url} answered ${response.status}`);
    return performance.now() - t;
  }
  const containersUrl = `${base}/api/v1/containers?pageSize=50&sort=label&dir=asc`;
  /** Health and container list, one after the other, every 20 ms, until `until` settles. */
  async function probe(until: Promise<unknown>): Promise<{ health: number[]; containers: number[] }> {
    let done = false;
    void until.finally(() => (done = true));
    const health: number[] = [];
    const containers: number[] = [];
    while (!done) {
      health.push(await timed(`${base}/api/health`));
      containers.push(await timed(containersUrl, facilities));
      await new Promise((resolve) => setTimeout(resolve, 20));
    }
    return { health, containers };
  }

  // Warm: the pages compiled on first use, the worker threads started.
  for (let i = 0; i < 5; i++) await timed(containersUrl, facilities);
  const idle = await probe(new Promise((resolve) => setTimeout(resolve, 3000)));
  console.log(`\nIdle, ${thousands(containerCount)} containers in the database:`);
  console.log(`  ${line("GET /api/health", summary(idle.health))}`);
  console.log(`  ${line("GET /api/v1/containers?pageSize=50", summary(idle.containers))}`);

  // -----------------------------------------------------------------------------------------------
  // 3. Under load
  // -----------------------------------------------------------------------------------------------
  const rssBeforeLoad = treeRss(server.pid);
  let peakRssLoad = rssBeforeLoad;
  const rssTimer = setInterval(() => (peakRssLoad = Math.max(peakRssLoad, treeRss(server.pid))), 100);

  const importRun = (async () => {
    const t = performance.now();
    const form = new FormData();
    form.set("file", await fs.openAsBlob(csvPath), "logger.csv");
    const uploaded = await fetch(`${base}/api/v1/sensors/${sensor.id}/csv-uploads`, { method: "POST", headers: { ...origin, cookie: facilities }, body: form });
    const upload = (await uploaded.json()) as { data?: { token: string; mapping: Record<string, unknown> }; error?: unknown };
    if (uploaded.status !== 201 || !upload.data) throw new Error(`upload answered ${uploaded.status}: ${JSON.stringify(upload.error)}`);
    const uploadMs = performance.now() - t;
    const imported = await fetch(`${base}/api/v1/sensors/${sensor.id}/csv-uploads/${upload.data.token}/import`, {
      method: "POST",
      headers: { ...origin, cookie: facilities, "content-type": "application/json" },
      body: JSON.stringify({ ...upload.data.mapping, timeZone: "Europe/Berlin" }),
    });
    const body = (await imported.json()) as { data?: { accepted: number; duplicates: number }; error?: { message: string } };
    if (imported.status !== 200 || !body.data) throw new Error(`import answered ${imported.status}: ${JSON.stringify(body.error)}`);
    return { uploadMs, totalMs: performance.now() - t, accepted: body.data.accepted };
  })();

  const exportRun = (async () => {
    const t = performance.now();
    const response = await fetch(`${base}/api/v1/exports/register.xlsx`, { headers: { cookie: officer } });
    if (response.status !== 200) throw new Error(`export answered ${response.status}: ${await response.text()}`);
    let bytes = 0;
    for await (const chunk of response.body as unknown as AsyncIterable<Uint8Array>) bytes += chunk.byteLength;
    return { totalMs: performance.now() - t, bytes };
  })();

  const heavy = Promise.allSettled([importRun, exportRun]);
  let stopSignIns = false;
  void heavy.finally(() => (stopSignIns = true));
  const signInStatuses = new Map<number, number>();
  const signInTimes: number[] = [];
  let attempt = 0;
  const signInLoops = Array.from({ length: PARALLEL_SIGN_INS }, async () => {
    while (!stopSignIns) {
      attempt++;
      // Each attempt from its own address (behind the trusted proxy), at an account that exists.
      const address = `10.${(attempt >> 16) & 255}.${(attempt >> 8) & 255}.${attempt & 255}`;
      const t = performance.now();
      const response = await fetch(`${base}/api/v1/session`, {
        method: "POST",
        headers: { ...origin, "content-type": "application/json", "x-forwarded-for": address },
        body: JSON.stringify({ email: "bench.1@example.test", password: `wrong guess ${attempt}` }),
      });
      await response.arrayBuffer();
      signInTimes.push(performance.now() - t);
      signInStatuses.set(response.status, (signInStatuses.get(response.status) ?? 0) + 1);
    }
  });
  const loadStartedAt = performance.now();
  const loaded = await probe(heavy);
  await Promise.all(signInLoops);
  clearInterval(rssTimer);
  const loadMs = performance.now() - loadStartedAt;
  const [importOutcome, exportOutcome] = await heavy;

  console.log(`\nUnder load for ${(loadMs / 1000).toFixed(1)} s:`);
  if (importOutcome.status === "fulfilled") {
    const { uploadMs, totalMs, accepted } = importOutcome.value;
    console.log(`  logger import: upload ${(uploadMs / 1000).toFixed(1)} s, with the import ${(totalMs / 1000).toFixed(1)} s; ${thousands(accepted)} readings accepted.`);
  } else console.log(`  logger import FAILED: ${String(importOutcome.reason)}`);
  if (exportOutcome.status === "fulfilled") {
    console.log(`  register export: ${(exportOutcome.value.totalMs / 1000).toFixed(1)} s, ${(exportOutcome.value.bytes / MiB).toFixed(1)} MB.`);
  } else console.log(`  register export FAILED: ${String(exportOutcome.reason)}`);
  const statuses = [...signInStatuses].map(([status, count]) => `${thousands(count)} × ${status}`).join(", ");
  console.log(`  failed sign-ins, ${PARALLEL_SIGN_INS} at a time throughout: ${statuses}; ${line("each", summary(signInTimes))}.`);
  const healthLoad = summary(loaded.health);
  const containersLoad = summary(loaded.containers);
  console.log(`  ${line("GET /api/health", healthLoad)}: p95 under ${LATENCY_TARGET_MS} ms ${verdict(healthLoad.p95 < LATENCY_TARGET_MS)}`);
  console.log(`  ${line("GET /api/v1/containers?pageSize=50", containersLoad)}: p95 under ${LATENCY_TARGET_MS} ms ${verdict(containersLoad.p95 < LATENCY_TARGET_MS)}`);
  console.log(`  server RSS ${(rssBeforeLoad / MiB).toFixed(0)} MB before, peak ${(peakRssLoad / MiB).toFixed(0)} MB (sampled every 100 ms).`);

  // -----------------------------------------------------------------------------------------------
  // 4. Hostile workbooks
  // -----------------------------------------------------------------------------------------------
  console.log(`\nHostile workbooks to POST /api/v1/imports/locations/preview (time to the answer; server RSS growth, sampled every 10 ms):`);
  for (const [label, file] of [
    ["zip bomb, one 300 MB cell", bombPath],
    ["3,000,000 rows", rowsPath],
  ] as const) {
    await new Promise((resolve) => setTimeout(resolve, 1000));
    const before = treeRss(server.pid);
    let peak = before;
    const timer = setInterval(() => (peak = Math.max(peak, treeRss(server.pid))), 10);
    const t = performance.now();
    const form = new FormData();
    form.set("file", await fs.openAsBlob(file), path.basename(file));
    const response = await fetch(`${base}/api/v1/imports/locations/preview`, { method: "POST", headers: { ...origin, cookie: facilities }, body: form });
    const body = (await response.json()) as { error?: { code: string; message: string } };
    const elapsed = performance.now() - t;
    clearInterval(timer);
    peak = Math.max(peak, treeRss(server.pid));
    const growthMb = (peak - before) / MiB;
    const refused = response.status >= 400 && response.status < 500;
    console.log(
      `  ${label}: ${response.status} ${body.error?.code ?? ""} in ${ms(elapsed)}, RSS ${(before / MiB).toFixed(0)} MB + ${growthMb.toFixed(1)} MB: ` +
        `${verdict(refused && elapsed < REFUSAL_TARGET_MS && growthMb < RSS_GROWTH_TARGET_MB)} (refused, < ${REFUSAL_TARGET_MS / 1000} s, < ${RSS_GROWTH_TARGET_MB} MB)`,
    );
    if (body.error) console.log(`    “${body.error.message}”`);
  }
  console.log(`\nLoad average at the end ${os.loadavg().map((l) => l.toFixed(2)).join(" ")}.`);

  await server.stop();
}

let failed = false;
main()
  .catch((error) => {
    failed = true;
    console.error(error);
    console.error(`Kept for a look: ${tempDir} (the server's log is server.log).`);
  })
  .finally(() => {
    if (KEEP_FILES && !failed) console.log(`Kept: ${tempDir}`);
    else if (failed) return;
    else fs.rmSync(tempDir, { recursive: true, force: true });
  });
