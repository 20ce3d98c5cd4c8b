// Benchmark: the register workbook with 100,000 findings. Target: written in under 5 s with a peak
// resident memory under 300 MB.
//
// Run with `npx tsx --conditions=react-server bench/export.ts` (the condition makes
// `import "server-only"` a no-op). Options: `--keep-files` keeps the database and the workbook
// (their paths are printed); `--findings N` builds N findings instead of 100,000; `--runs N` exports N
// times (3 by default; the target is judged on the median, memory on the highest); `--short-traces`
// stores a five-row trace per finding instead of the engine's full one, to show the cost of the
// traces against the rest of the workbook; `--in-thread` writes the workbook in the export process's
// own thread rather than in a worker thread streaming to it (as the download route does).
//
// The script builds a register in a temporary database: the sourced substance library, 3 sites,
// 100 rooms with 20 storage units each, 20,000 containers, 100 sensors with 2,000 readings each,
// 1,000 excursions and 100,000 findings, each with a calculation trace from the hazard engine
// (the closed-enclosure bound over six containers: inputs with sources, every step, result and
// warnings), stored with its readable text as the register stores it (about 1.9 KB per finding, long
// sources cited from trace_sources). Then a fresh Node process (so its memory is the export's alone, on top of
// Node and the loaded modules) writes the workbook to a file (in a worker thread, streamed back, unless --in-thread),
// sampling process.memoryUsage().rss every 50 ms, three times by default. It reports; it does not fail: exit code 0 either way.
import { spawnSync } from "node:child_process";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { MessageChannel } from "node:worker_threads";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { RegisterWorkbookResult } from "@/lib/exports/register-workbook";

const findingsArg = process.argv.indexOf("--findings");
/** `--findings N` builds a smaller (or larger) register, e.g. to profile quickly. */
const FINDING_COUNT = findingsArg >= 0 ? Number(process.argv[findingsArg + 1]) : 100_000;
const SHORT_TRACES = process.argv.includes("--short-traces");
/** `--in-thread` writes the workbook in the exporting thread itself instead of in a worker thread (as the server does). */
const IN_THREAD = process.argv.includes("--in-thread");
const runsArg = process.argv.indexOf("--runs");
/** `--runs N` exports N times (3 by default) and judges the median. */
const RUNS = runsArg >= 0 ? Math.max(1, Number(process.argv[runsArg + 1])) : 3;
const SITE_COUNT = 3;
const ROOM_COUNT = 100;
const UNITS_PER_ROOM = 20;
const CONTAINER_COUNT = 20_000;
const SENSOR_COUNT = 100;
const READINGS_PER_SENSOR = 2_000;
const EXCURSION_COUNT = 1_000;
const TARGET_S = 5;
const TARGET_PEAK_MB = 300;
const SAMPLE_EVERY_MS = 50;
const DAY_MS = 86_400_000;

type ExportFigures = { seconds: number; cpuSeconds: number; peakRssMb: number; startRssMb: number; bytes: number; counts: RegisterWorkbookResult };

const fixed = (value: number, digits = 1) => value.toFixed(digits);
const thousands = (n: number) => n.toLocaleString("en-GB");

/** The child process: write the workbook and report time and memory as one JSON line. */
async function exportOnly(outFile: string): Promise<void> {
  const { writeRegisterWorkbook } = await import("@/lib/exports/register-workbook");
  const { closeDb, getDb } = await import("@/db/client");
  const { runTask } = await import("@/lib/workers/pool");
  const { readableFromPort } = await import("@/lib/workers/port-stream");
  getDb(); // open (and check migrations) before the clock starts, as a running server has
  // A worker thread with its modules loaded and its connection open, as a busy server has.
  if (!IN_THREAD) await runTask("readings.ingest", { readings: [] });
  const startRssMb = process.memoryUsage().rss / 2 ** 20;
  let peakRss = process.memoryUsage().rss;
  const sampler = setInterval(() => {
    peakRss = Math.max(peakRss, process.memoryUsage().rss);
  }, SAMPLE_EVERY_MS);
  const startMs = performance.now();
  const startCpu = process.cpuUsage();
  const output = fs.createWriteStream(outFile);
  let counts: RegisterWorkbookResult;
  try {
    const options = { generatedBy: "Bench <bench@example.test>", nowMs: Date.now() };
    if (IN_THREAD) counts = await writeRegisterWorkbook(output, options);
    else {
      // As the download route does: written in a worker, its bytes streamed to this thread.
      const { port1, port2 } = new MessageChannel();
      const task = runTask("exports.registerWorkbook", { port: port2, ...options }, { transferList: [port2] });
      const written = pipeline(Readable.fromWeb(readableFromPort(port1) as import("node:stream/web").ReadableStream<Uint8Array>), output);
      // A task that fails ends the stream too (as the download route does).
      [counts] = await Promise.all([task.catch((error: unknown) => (port1.close(), Promise.reject(error))), written]);
    }
  } finally {
    clearInterval(sampler);
  }
  const seconds = (performance.now() - startMs) / 1000;
  const cpu = process.cpuUsage(startCpu);
  peakRss = Math.max(peakRss, process.memoryUsage().rss);
  closeDb();
  const figures: ExportFigures = { seconds, cpuSeconds: (cpu.user + cpu.system) / 1e6, peakRssMb: peakRss / 2 ** 20, startRssMb, bytes: fs.statSync(outFile).size, counts };
  console.log(JSON.stringify(figures));
}

async function build(): Promise<void> {
  const { closeDb, getDb } = await import("@/db/client");
  const { seedSubstanceLibrary } = await import("@/db/seed/substances");
  const { substances, users } = await import("@/db/schema");
  const { enclosureBound } = await import("@/lib/hazard");
  const { toVaporProperties } = await import("@/lib/substances/vapor");
  const { seededRandom } = await import("./lib/stats");
  const { citingWith, traceText } = await import("@/lib/register/trace-text");

  const random = seededRandom(20_260_802);
  const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)];
  const between = (min: number, max: number) => min + random() * (max - min);
  const db = getDb();
  const sqlite = db.$client;
  const startMs = performance.now();

  db.transaction((tx) => seedSubstanceLibrary(tx));
  const people = ["safety_officer", "researcher", "researcher", "facilities", "auditor"].map((role, i) =>
    db.insert(users).values({ email: `bench.${i}@example.test`, name: `Bench person ${i}`, role: role as "researcher" }).returning().get(),
  );
  const library = db.select().from(substances).all().filter((s) => s.physicalState === "liquid" && s.correlations.length > 0);

  // A pool of real engine traces: each liquid of the library at several worst-case temperatures.
  // Each with its readable text, rendered as the register renders it (long sources cited from trace_sources).
  type Pooled = { substanceId: number; name: string; json: string; text: string; sourceIds: string; ppm: number; tempC: number };
  const pool: Pooled[] = [];
  const insertSource = sqlite.prepare("insert into trace_sources (text) values (?) on conflict (text) do update set text = excluded.text returning id");
  const sourceIds = new Map<string, number>();
  const sourceId = (text: string) => {
    if (!sourceIds.has(text)) sourceIds.set(text, (insertSource.get(text) as { id: number }).id);
    return sourceIds.get(text)!;
  };
  for (const substance of library) {
    for (const tempC of [8, 22, 28, 31, 35]) {
      const bound = enclosureBound({
        props: toVaporProperties(substance),
        substanceName: substance.name,
        propertySources: substance.sources,
        tempC,
        tempSource: `${tempC.toFixed(1)} °C, design maximum`,
        freeVolumeM3: 0.15,
        containers: [
          { label: "BX-000123", massG: 790, open: true },
          { label: "BX-000124", massG: 395, open: false },
          { label: "BX-000125", massG: 1580, open: true },
          { label: "BX-000126", massG: 120.5, open: true },
          { label: "BX-000127", massG: 790, open: false },
          { label: "BX-000128", massG: 2370, open: false },
        ],
        scenario: "largest-container",
      });
      const shortTrace = {
        method: "Closed-enclosure bound",
        steps: [
          { label: "Worst-case temperature", value: tempC, unit: "°C" },
          { label: "Saturated concentration", value: bound.saturatedPpm, unit: "ppm", formula: "C_sat = 10⁶ · Psat / Patm" },
          { label: "Inventory-limited concentration", value: bound.inventoryPpm, unit: "ppm", formula: "C_inv = (m/M)·Vm / V_free" },
          { label: "Worst-case concentration", value: bound.concentrationPpm, unit: "ppm", formula: "C_max = min(C_sat, C_inv)" },
        ],
        warnings: [],
      };
      const trace = SHORT_TRACES ? shortTrace : bound.trace;
      const citing = citingWith(sourceId);
      const text = traceText(trace, citing.cite);
      pool.push({ substanceId: substance.id, name: substance.name, json: JSON.stringify(trace), text, sourceIds: JSON.stringify(citing.ids()), ppm: bound.concentrationPpm, tempC });
    }
  }

  const insertSite = sqlite.prepare("insert into sites (name) values (?)");
  const insertRoom = sqlite.prepare(
    "insert into rooms (site_id, code, name, kind, floor_area_m2, height_m, air_changes_per_hour, design_max_temp_c) values (?, ?, ?, 'laboratory', 40, 3, 6, 28)",
  );
  const insertUnit = sqlite.prepare(
    "insert into storage_units (room_id, code, name, kind, internal_volume_l, set_min_c, set_max_c, excursion_threshold_c, owner_id) values (?, ?, ?, ?, ?, ?, ?, ?, ?)",
  );
  const insertContainer = sqlite.prepare(
    "insert into containers (label, substance_id, amount, amount_unit, state, storage_unit_id, owner_id, received_at) values (?, ?, ?, 'mL', ?, ?, ?, ?)",
  );
  const insertSensor = sqlite.prepare("insert into sensors (external_id, name, room_id, storage_unit_id) values (?, ?, ?, ?)");
  const insertReading = sqlite.prepare("insert into readings (sensor_id, at, temp_c) values (?, ?, ?)");
  const insertExcursion = sqlite.prepare(
    "insert into excursions (sensor_id, room_id, storage_unit_id, threshold_c, start_at, end_at, peak_temp_c, peak_at) values (?, ?, ?, ?, ?, ?, ?, ?)",
  );
  const insertFinding = sqlite.prepare(
    `insert into findings (fingerprint, rule, severity, status, scenario, title, site_id, room_id, storage_unit_id, substance_id,
       value, limit_value, ratio, unit, worst_case_temp_c, worst_case_source, assignee_id, mitigation_plan, risk_accepted_until,
       first_raised_at, last_evaluated_at, resolved_at)
     values (@fingerprint, @rule, @severity, @status, @scenario, @title, @siteId, @roomId, @unitId, @substanceId,
       @value, @limitValue, @ratio, @unit, @worstCaseTempC, @worstCaseSource, @assigneeId, @mitigationPlan, @riskAcceptedUntil,
       @firstRaisedAt, @lastEvaluatedAt, @resolvedAt)`,
  );
  // As TraceWriter stores them: traceText's text is XML-safe.
  const insertTrace = sqlite.prepare("insert into finding_traces (finding_id, trace, text, text_xml_safe, source_ids) values (?, ?, ?, 1, ?)");

  const nowMs = Date.now();
  const units: { id: number; roomId: number; siteId: number; code: string }[] = [];
  const roomsBuilt: { id: number; siteId: number }[] = [];
  sqlite.transaction(() => {
    const siteIds = Array.from({ length: SITE_COUNT }, (_, i) => Number(insertSite.run(`Bench site ${i + 1}`).lastInsertRowid));
    const UNIT_KINDS = ["flammable_cabinet", "open_shelving", "flammable_storage_refrigerator", "domestic_refrigerator"] as const;
    for (let r = 1; r <= ROOM_COUNT; r++) {
      const siteId = siteIds[r % SITE_COUNT];
      const code = `L-${String(r).padStart(3, "0")}`;
      const roomId = Number(insertRoom.run(siteId, code, `Laboratory ${code}`).lastInsertRowid);
      roomsBuilt.push({ id: roomId, siteId });
      for (let u = 1; u <= UNITS_PER_ROOM; u++) {
        const kind = UNIT_KINDS[u % UNIT_KINDS.length];
        const cold = kind.endsWith("refrigerator");
        const unitCode = `U-${String(u).padStart(2, "0")}`;
        const id = Number(insertUnit.run(roomId, unitCode, `Unit ${u} of ${code}`, kind, cold ? 150 : 400, cold ? 2 : null, cold ? 8 : null, cold ? 10 : null, pick(people).id).lastInsertRowid);
        units.push({ id, roomId, siteId, code: unitCode });
      }
    }
    for (let n = 1; n <= CONTAINER_COUNT; n++) {
      const state = random() < 0.1 ? "disposed" : pick(["sealed", "opened", "in_use"]);
      insertContainer.run(`BX-${String(n).padStart(6, "0")}`, pick(library).id, Math.round(between(50, 2500)), state, pick(units).id, pick(people).id, Math.round(nowMs - between(30, 900) * DAY_MS));
    }
    for (let s = 1; s <= SENSOR_COUNT; s++) {
      const onUnit = s % 2 === 0;
      const unit = pick(units);
      const sensorId = Number(insertSensor.run(`LOG-${String(s).padStart(3, "0")}`, `Logger ${s}`, onUnit ? null : unit.roomId, onUnit ? unit.id : null).lastInsertRowid);
      for (let i = 0; i < READINGS_PER_SENSOR; i++) insertReading.run(sensorId, nowMs - (READINGS_PER_SENSOR - i) * 15 * 60_000, (onUnit ? 5 : 21) + between(-2, 3));
      for (let e = 0; e < EXCURSION_COUNT / SENSOR_COUNT; e++) {
        const startAt = nowMs - between(2, 300) * DAY_MS;
        insertExcursion.run(sensorId, onUnit ? null : unit.roomId, onUnit ? unit.id : null, onUnit ? 10 : 30, Math.round(startAt), Math.round(startAt + between(30, 600) * 60_000), onUnit ? 14 : 32, Math.round(startAt + 20 * 60_000));
      }
    }
    const SEVERITIES = ["critical", "high", "moderate", "low"] as const;
    const STATUSES = ["open", "open", "acknowledged", "mitigating", "resolved", "risk_accepted"] as const;
    const SCENARIOS = ["in_control", "control_lost", "room_worst_case", "spill"] as const;
    for (let n = 1; n <= FINDING_COUNT; n++) {
      const unit = pick(units);
      const traced = pick(pool);
      const scenario = pick(SCENARIOS);
      const status = pick(STATUSES);
      const raisedAt = Math.round(nowMs - between(1, 400) * DAY_MS);
      const limitPpm = pick([25, 50, 100, 250, 500, 1000]);
      const findingId = insertFinding.run({
        fingerprint: `enclosure-oel|unit:${unit.id}|substance:${traced.substanceId}|${scenario}|${n}`,
        rule: "enclosure-oel",
        severity: pick(SEVERITIES),
        status,
        scenario,
        title: `${traced.name} in ${unit.code} could reach ${Math.round(traced.ppm)} ppm at ${traced.tempC} °C`,
        siteId: unit.siteId,
        roomId: unit.roomId,
        unitId: unit.id,
        substanceId: traced.substanceId,
        value: traced.ppm,
        limitValue: limitPpm,
        ratio: traced.ppm / limitPpm,
        unit: "ppm",
        worstCaseTempC: traced.tempC,
        worstCaseSource: `${traced.tempC.toFixed(1)} °C, design maximum`,
        assigneeId: status === "mitigating" ? people[0].id : null,
        mitigationPlan: status === "mitigating" ? "Move the open bottles to the flammable-storage refrigerator and re-check." : null,
        riskAcceptedUntil: status === "risk_accepted" ? Math.round(nowMs + 90 * DAY_MS) : null,
        firstRaisedAt: raisedAt,
        lastEvaluatedAt: Math.round(raisedAt + random() * (nowMs - raisedAt)),
        resolvedAt: status === "resolved" ? nowMs - DAY_MS : null,
      }).lastInsertRowid;
      insertTrace.run(findingId, traced.json, traced.text, traced.sourceIds);
    }
  })();
  sqlite.exec("ANALYZE");
  const traceBytes = (sqlite.prepare("select sum(length(trace)) as json, sum(length(text)) as text from finding_traces").get() as { json: number; text: number });
  console.log(
    `Register built in ${fixed((performance.now() - startMs) / 1000, 2)} s: ${thousands(FINDING_COUNT)} findings ` +
      `(${SHORT_TRACES ? "short traces" : "full engine traces"}: ${fixed(traceBytes.json / 2 ** 20)} MB of JSON, ${fixed(traceBytes.text / 2 ** 20)} MB as text, ${pool.length} distinct), ${thousands(CONTAINER_COUNT)} containers, ` +
      `${thousands(units.length)} storage units in ${roomsBuilt.length} rooms, ${SENSOR_COUNT} sensors with ${thousands(SENSOR_COUNT * READINGS_PER_SENSOR)} readings, ` +
      `${thousands(EXCURSION_COUNT)} excursions.`,
  );
  closeDb();
}

async function main(): Promise<void> {
  const exportIndex = process.argv.indexOf("--export-only");
  if (exportIndex >= 0) {
    await exportOnly(process.argv[exportIndex + 1]);
    // The worker pool's idle thread would keep this process a minute longer.
    process.exit(0);
  }
  const keepFiles = process.argv.includes("--keep-files");
  const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-export-"));
  process.env.DATABASE_PATH = path.join(tempDir, "register.db");
  process.env.LOG_LEVEL = "silent";
  const outFile = path.join(tempDir, "register.xlsx");
  try {
    await build();
    // Several runs, each in a fresh process: on a shared machine one run can take half as long
    // again as the next, so the target is judged on the median run.
    const runs: (ExportFigures & { loadAtStart: number })[] = [];
    for (let run = 0; run < RUNS; run++) {
      const loadAtStart = os.loadavg()[0];
      const child = spawnSync(process.execPath, [...process.execArgv, process.argv[1], "--export-only", outFile, ...(IN_THREAD ? ["--in-thread"] : [])], {
        env: { ...process.env },
        encoding: "utf8",
        maxBuffer: 16 * 2 ** 20,
      });
      if (child.status !== 0) throw new Error(`the export process failed:\n${child.stderr}`);
      runs.push({ ...(JSON.parse(child.stdout.trim().split("\n").at(-1)!) as ExportFigures), loadAtStart });
    }
    const sorted = [...runs].sort((a, b) => a.seconds - b.seconds);
    const figures = sorted[Math.floor((sorted.length - 1) / 2)];
    const peakRssMb = Math.max(...runs.map((r) => r.peakRssMb));
    const c = figures.counts;
    console.log(
      `\nWorkbook written: ${fixed(figures.bytes / 2 ** 20)} MB; ${thousands(c.findings)} findings, ${thousands(c.traces)} traces citing ${thousands(c.traceSources)} sources, ` +
        `${thousands(c.containers)} containers, ${thousands(c.locations)} location rows, ${thousands(c.excursions)} excursions, ${c.substances} substances; ` +
        `zip CRC-32 ${c.nativeZipCrc ? "from zlib" : "in JavaScript"}.`,
    );
    console.log(`Runs: ${runs.map((r) => `${fixed(r.seconds, 2)} s (load ${fixed(r.loadAtStart, 2)})`).join(", ")}.`);
    console.log(`By sheet, median run: ${Object.entries(c.timingsMs).map(([sheet, ms]) => `${sheet} ${fixed(ms / 1000, 2)} s`).join(", ")}.`);
    console.log(
      `Time, median of ${runs.length}: ${fixed(figures.seconds, 2)} s (target < ${TARGET_S} s): ${figures.seconds < TARGET_S ? "target met" : "target NOT met"}; ` +
        `CPU time of the export process ${fixed(figures.cpuSeconds, 2)} s (main thread and compression threads together).`,
    );
    console.log(
      `Peak RSS, highest of the runs: ${fixed(peakRssMb, 0)} MB (target < ${TARGET_PEAK_MB} MB): ${peakRssMb < TARGET_PEAK_MB ? "target met" : "target NOT met"}; ` +
        `${fixed(figures.startRssMb, 0)} MB before the export began (Node and the loaded modules).`,
    );
    console.log(`Written ${IN_THREAD ? "in the exporting thread (--in-thread)" : "in a worker thread and streamed to the exporting thread, as the server does"}.`);
    console.log(`Machine: ${os.cpus().length} cores; Node ${process.version}.`);
    if (keepFiles) console.log(`Kept: ${process.env.DATABASE_PATH} and ${outFile}`);
  } finally {
    if (!keepFiles) fs.rmSync(tempDir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
