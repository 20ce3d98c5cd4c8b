// Benchmark: logger readings through `POST /api/v1/readings` on a production server. Target it
// reports against: readings/s accepted with the p95 under 1 s per batch, for batches of 100 and of
// 1,000 readings, from 20 loggers at once (each its own sensor, sending its next batch as soon as
// the previous one is answered). It also reports batches/s, p50/p95/max per batch, errors by
// status, the server's RSS (from /proc, the server and its children, every 100 ms), the number of
// sensors at one reading a minute that the rate means (readings/s × 60) and, during the 1,000
// case, the p95 of `GET /api/health` asked every 20 ms (does ingest starve other requests?).
//
// Run with `npx tsx --conditions=react-server bench/ingest.ts`. It builds the app (`npm run build`)
// unless `--no-build` says the current build is up to date, builds a small register in a
// temporary database (bench/lib/register-db.ts: 100 sensors on storage units and rooms), stores an
// ingest API key with the readings:write scope, starts `next start` on a free port against it
// (production settings; RATE_LIMIT_READINGS_KEY raised so that the key's limit of 120 batches a
// minute does not cap the measure: the bench measures the server, not the limit) and runs each
// case for a fixed time. Each logger sends consecutive minutes going forward from a start years in
// the past (2020 for the 100 case, 2023 for the 1,000 case), so no reading is a duplicate and none
// is in the future. Latencies are wall time seen by this process, on the same machine (they
// include waiting for a CPU). An untimed 8 s round of batches of 100 (dated 2018) warms the server
// first. Options: `--seconds N` per case (default 25), `--loggers N`
// (default 20), `--findings N` for the register (default 1,000), `--port N` (default: a free
// port), `--keep-files`. The script
// reports; it does not fail.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { freePort, startServer, treeRss } from "./lib/process";

const argValue = (name: string) => {
  const index = process.argv.indexOf(name);
  return index >= 0 ? process.argv[index + 1] : undefined;
};
const SECONDS = Number(argValue("--seconds") ?? 25);
const LOGGERS = Number(argValue("--loggers") ?? 20);
const FINDINGS = Number(argValue("--findings") ?? 1_000);
const KEEP_FILES = process.argv.includes("--keep-files");
const NO_BUILD = process.argv.includes("--no-build");
const BATCH_TARGET_MS = 1000;
const SESSION_SECRET = "bench-session-secret-at-least-32-characters-long";
const INGEST_KEY = "hrk_bench_ingest-gateway-00000000001";

const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-ingest-"));
process.env.DATABASE_PATH = path.join(tempDir, "ingest.db");
process.env.UPLOAD_DIR = path.join(tempDir, "uploads");
process.env.LOG_LEVEL = "silent";

const MiB = 1024 * 1024;
const ms = (value: number) => `${value.toFixed(0)} ms`;
const thousands = (n: number) => Math.round(n).toLocaleString("en-GB");
const load = () => os.loadavg().map((l) => l.toFixed(2)).join(" ");

async function main(): Promise<void> {
  const { quantile } = await import("./lib/stats");
  console.log(`Node ${process.version}, ${os.cpus().length} CPUs, ${(os.totalmem() / 2 ** 30).toFixed(0)} GB, load average ${load()}.`);

  if (!NO_BUILD) {
    console.log("\nBuilding the app (npm run build; --no-build skips it when the build is current) …");
    const built = spawnSync("npm", ["run", "build"], { stdio: ["ignore", "ignore", "inherit"], env: { ...process.env, NODE_ENV: "production" } });
    if (built.status !== 0) throw new Error("npm run build failed");
  } else if (!fs.existsSync(path.join(".next", "BUILD_ID"))) {
    throw new Error("--no-build was given but there is no build in .next/: run npm run build first.");
  }

  const { buildRegisterDb } = await import("./lib/register-db");
  await buildRegisterDb({ findings: FINDINGS, shortTraces: true });
  const { closeDb, getDb } = await import("@/db/client");
  const { storeApiKey } = await import("@/lib/api-keys/service");
  const db = getDb();
  db.transaction((tx) => storeApiKey(tx, { system: "ingest bench" }, { name: "Bench gateway", scopes: ["readings:write"], key: INGEST_KEY, createdById: null }));
  const sensorIds = (db.$client.prepare("SELECT external_id AS id FROM sensors ORDER BY id LIMIT ?").all(LOGGERS) as { id: string }[]).map((r) => r.id);
  closeDb();
  if (sensorIds.length < LOGGERS) throw new Error(`only ${sensorIds.length} sensors in the bench register`);

  const port = argValue("--port") ? Number(argValue("--port")) : await freePort();
  const server = await startServer({ port, logDir: tempDir, env: { SESSION_SECRET, RATE_LIMIT_READINGS_KEY: "1000000" } });
  const base = server.base;
  console.log(`\nServer: next start on ${base}, pid ${server.pid}; ${LOGGERS} loggers, ${SECONDS} s per case.`);

  async function runCase(batchSize: number, startMs: number, probeHealth: boolean, seconds = SECONDS, report = true): Promise<void> {
    const statuses = new Map<string, number>();
    const latencies: number[] = [];
    const health: number[] = [];
    let accepted = 0;
    let duplicates = 0;
    const rssBefore = treeRss(server.pid);
    let rssPeak = rssBefore;
    const rssTimer = setInterval(() => (rssPeak = Math.max(rssPeak, treeRss(server.pid))), 100);
    const caseStart = performance.now();
    const endAt = caseStart + seconds * 1000;
    const loggers = sensorIds.map(async (sensor, index) => {
      let minute = 0;
      while (performance.now() < endAt) {
        const readings = Array.from({ length: batchSize }, (_, i) => ({
          sensor,
          at: new Date(startMs + (minute + i) * 60_000).toISOString(),
          tempC: 4 + ((index + minute + i) % 7) / 10,
        }));
        minute += batchSize;
        const t = performance.now();
        try {
          const response = await fetch(`${base}/api/v1/readings`, {
            method: "POST",
            headers: { authorization: `Bearer ${INGEST_KEY}`, "content-type": "application/json" },
            body: JSON.stringify({ readings }),
          });
          const body = (await response.json()) as { accepted?: number; duplicates?: number };
          latencies.push(performance.now() - t);
          statuses.set(String(response.status), (statuses.get(String(response.status)) ?? 0) + 1);
          if (response.status === 202) {
            accepted += body.accepted ?? 0;
            duplicates += body.duplicates ?? 0;
          }
        } catch (error) {
          statuses.set(`network: ${(error as Error).message}`, (statuses.get(`network: ${(error as Error).message}`) ?? 0) + 1);
        }
      }
    });
    const probe = (async () => {
      while (probeHealth && performance.now() < endAt) {
        const t = performance.now();
        const response = await fetch(`${base}/api/health`);
        await response.arrayBuffer();
        health.push(performance.now() - t);
        await new Promise((resolve) => setTimeout(resolve, 20));
      }
    })();
    await Promise.all([...loggers, probe]);
    const elapsedS = (performance.now() - caseStart) / 1000;
    clearInterval(rssTimer);
    if (!report) return;
    const p95 = quantile(latencies, 0.95);
    const rate = accepted / elapsedS;
    console.log(`\nBatches of ${thousands(batchSize)}, ${LOGGERS} loggers, ${elapsedS.toFixed(1)} s (load average at the end ${load()}):`);
    console.log(`  ${thousands(rate)} readings/s accepted (${thousands(accepted)} in all, ${thousands(duplicates)} duplicates), ${(latencies.length / elapsedS).toFixed(1)} batches/s`);
    console.log(`  per batch: p50 ${ms(quantile(latencies, 0.5))}, p95 ${ms(p95)}, max ${ms(Math.max(...latencies))}: p95 under ${BATCH_TARGET_MS} ms ${p95 < BATCH_TARGET_MS ? "target met" : "target NOT met"}`);
    console.log(`  answers: ${[...statuses].map(([status, count]) => `${thousands(count)} × ${status}`).join(", ")}`);
    console.log(`  = ${thousands(rate * 60)} sensors at one reading a minute`);
    console.log(`  server RSS ${(rssBefore / MiB).toFixed(0)} MB before, peak ${(rssPeak / MiB).toFixed(0)} MB`);
    if (probeHealth) console.log(`  GET /api/health meanwhile: p50 ${ms(quantile(health, 0.5))}, p95 ${ms(quantile(health, 0.95))}, max ${ms(Math.max(...health))} (${health.length} requests)`);
  }

  // Warm, untimed: the route loaded, the worker threads started and their statements prepared
  // (without it the first batches take 8–14 s and land in the first case's p95).
  await runCase(100, Date.UTC(2018, 0, 1), false, 8, false);
  await runCase(100, Date.UTC(2020, 0, 1), false);
  await runCase(1000, Date.UTC(2023, 0, 1), true);

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
