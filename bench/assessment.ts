// Benchmark: assessment at scale, in two sections.
//
// 1. The pure rules over an invented register of 100,000 containers in 2,000 storage units (50 each,
//    half of them refrigerators assessed in control and with control lost) and 100 rooms. Target:
//    under 1 ms of CPU per unit on average, traces not read (a re-assessment reads a trace only for a
//    finding that is new or changed). It also reports what reading and serialising every trace costs,
//    the upper bound of a first assessment. Times are CPU time of this process (process.cpuUsage),
//    less affected by other processes on a shared machine than wall-clock time.
// 2. Through the database: a temporary register of 100,000 containers in 2,000 units (100 rooms × 20)
//    re-assessed with `reassessRooms` in batches of rooms, as the re-assessment job does. Targets: the
//    full re-assessment with nothing changed under 2 s (also printed as a ratio to a bare scan of the
//    same container rows) — every location's inputs are read and digested, and a room's own rules or
//    a unit whose digest is that of its last assessment are not run again (lib/assessment/service.ts
//    reassessRooms) —,
//    the same forced through every rule for comparison (no target), and one container moved
//    (`moveContainer`, which re-assesses its two rooms in its transaction) well under 100 ms.
//    Wall-clock times; the load average is printed beside them.
//
// Run with `npx tsx --conditions=react-server bench/assessment.ts` (the condition makes
// `import "server-only"` a no-op). `--rules-only` / `--database-only` run one section;
// `--no-time-to-danger` leaves the refrigerators' warm-up out (the time to danger's cost is the difference). It reports;
// it does not fail: the exit code is 0 either way.
import fs from "node:fs";
/** `--no-time-to-danger`: refrigerators without a warm-up, to show what the time to danger costs. */
const NO_TIME_TO_DANGER = process.argv.includes("--no-time-to-danger");
import os from "node:os";
import path from "node:path";
import { substanceLibrary } from "@/db/seed/substance-library";
import {
  assessLocation,
  buildSubstanceSnapshot,
  createAssessmentCache,
  type LocationSnapshot,
  type RoomInfo,
  type StoredLiquid,
  type SubstanceSnapshot,
} from "@/lib/assessment/rules";
import { selectWorstCase, type WorstCase } from "@/lib/temperatures/worst-case";

const UNIT_COUNT = 2_000;
const CONTAINERS_PER_UNIT = 50;
const ROOM_COUNT = 100;
const ROUNDS = 7;
const TARGET_MS_PER_UNIT = 1;

const substances: SubstanceSnapshot[] = substanceLibrary
  .filter((seed) => seed.physicalState === "liquid")
  .map((seed, i) =>
    buildSubstanceSnapshot({
      id: i + 1,
      name: seed.name,
      cas: seed.cas,
      physicalState: seed.physicalState,
      molarMassGPerMol: seed.molarMassGPerMol,
      correlations: seed.correlations,
      normalBoilingPointC: seed.normalBoilingPointC,
      enthalpyOfVaporizationKJPerMol: seed.enthalpyOfVaporizationKJPerMol ?? null,
      meltingPointC: seed.meltingPointC ?? null,
      flashPointC: seed.flashPointC ?? null,
      lflVolPercent: seed.lflVolPercent ?? null,
      uflVolPercent: seed.uflVolPercent ?? null,
      liquidDensityKgPerM3: seed.liquidDensityGPerMl != null ? seed.liquidDensityGPerMl * 1000 : null,
      exposureLimits: seed.exposureLimits,
      sources: seed.sources,
    }),
  );

const design = (tempC: number): WorstCase => selectWorstCase([{ kind: "design", tempC }]) as WorstCase;
const STATES = ["sealed", "sealed", "opened", "in_use"] as const;

function room(id: number): RoomInfo {
  return {
    id,
    siteId: 1,
    code: `R-${id}`,
    name: `Room ${id}`,
    kind: "laboratory",
    volumeM3: 120,
    floorAreaM2: 40,
    airChangesPerHour: 6,
    mixingFactor: 0.5,
    sprinklered: id % 2 === 0,
    atmosphericPressureKPa: 101.325,
    worstCase: design(24 + (id % 30) / 10),
  };
}

let containerId = 0;
function contents(seed: number, count: number): StoredLiquid[] {
  return Array.from({ length: count }, (_, i) => {
    containerId += 1;
    return {
      containerId,
      label: `B-${containerId}`,
      content: { kind: "substance", substance: substances[(seed * 7 + i * 3) % substances.length] },
      amount: [0.1, 0.5, 1, 2.5, 4][i % 5],
      amountUnit: "L",
      state: STATES[(seed + i) % STATES.length],
    } satisfies StoredLiquid;
  });
}

const rooms = Array.from({ length: ROOM_COUNT }, (_, i) => room(i + 1));
const units: LocationSnapshot[] = Array.from({ length: UNIT_COUNT }, (_, u) => {
  const fridge = u % 2 === 0;
  return {
    kind: "unit",
    room: rooms[u % ROOM_COUNT],
    contents: contents(u, CONTAINERS_PER_UNIT),
    unit: {
      id: u + 1,
      code: `U-${u + 1}`,
      name: `Unit ${u + 1}`,
      kind: fridge ? (u % 4 === 0 ? "domestic_refrigerator" : "flammable_storage_refrigerator") : "flammable_cabinet",
      internalVolumeL: fridge ? 280 : 450,
      ventilated: false,
      ignitionSourceFree: u % 4 !== 0,
      setRange: fridge ? { minC: 2, maxC: 8 } : null,
      // Refrigerators carry a warm-up, so the time to danger of their control-lost findings is part of the cost.
      warmUp: fridge && !NO_TIME_TO_DANGER ? { tauMin: 240, source: "default", reason: "τ = 4 h, default" } : null,
      worstCase: { inControl: design(fridge ? 4 + (u % 50) / 10 : 22 + (u % 70) / 10), controlLost: null },
    },
  };
});
const roomSnapshots: LocationSnapshot[] = rooms.map((r, i) => ({ kind: "room", room: r, contents: contents(1000 + i, 20 * CONTAINERS_PER_UNIT) }));

function cpuMs(): number {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1000;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

function round(locations: LocationSnapshot[], readTraces: boolean): { ms: number; findings: number; traceBytes: number } {
  const cache = createAssessmentCache();
  const start = cpuMs();
  let findings = 0;
  let traceBytes = 0;
  for (const location of locations) {
    for (const finding of assessLocation(location, undefined, { cache })) {
      findings += 1;
      if (readTraces) traceBytes += JSON.stringify(finding.trace).length;
    }
  }
  return { ms: cpuMs() - start, findings, traceBytes };
}

function rulesSection(): void {
  console.log("— The pure rules, on in-memory snapshots —");
  round(units, false); // warm-up
  const unitRounds = Array.from({ length: ROUNDS }, () => round(units, false));
  const perUnit = unitRounds.map((r) => r.ms / UNIT_COUNT);
  console.log(`${UNIT_COUNT} units × ${CONTAINERS_PER_UNIT} containers, traces not read (${unitRounds[0].findings} findings):`);
  console.log(`  CPU per unit: median ${median(perUnit).toFixed(3)} ms, best ${Math.min(...perUnit).toFixed(3)}, worst ${Math.max(...perUnit).toFixed(3)}`);
  console.log(`  all units: median ${median(unitRounds.map((r) => r.ms)).toFixed(0)} ms`);

  const roomRounds = Array.from({ length: 3 }, () => round(roomSnapshots, false));
  console.log(`${ROOM_COUNT} rooms × ${20 * CONTAINERS_PER_UNIT} containers (spills, room quantities): median ${median(roomRounds.map((r) => r.ms / ROOM_COUNT)).toFixed(3)} ms per room`);

  const withTraces = round(units.slice(0, 200), true);
  console.log(
    `Reading and serialising every trace (first assessment): ${(withTraces.ms / 200).toFixed(2)} ms per unit, ${(withTraces.traceBytes / withTraces.findings / 1024).toFixed(1)} KB of JSON per finding`,
  );
  console.log(`Target under ${TARGET_MS_PER_UNIT} ms of CPU per unit: ${median(perUnit) < TARGET_MS_PER_UNIT ? "met" : "NOT met"}`);
}

// ---------------------------------------------------------------------------------------------------
// 2. Through the database
// ---------------------------------------------------------------------------------------------------

const DB_ROOM_COUNT = 100;
const DB_UNITS_PER_ROOM = 20;
const DB_CONTAINER_COUNT = 100_000;
const ROOMS_PER_BATCH = 25; // as the re-assessment job (lib/assessment/jobs.ts)
const MOVES = 21;
const FULL_TARGET_S = 2;
const MOVE_TARGET_MS = 100;
const DAY_MS = 86_400_000;

/** With `--profile`: a CPU profile of a phase, written to the working directory (open it in a browser's dev tools). */
async function profiled<T>(name: string, run: () => T): Promise<T> {
  if (!process.argv.includes("--profile")) return run();
  const inspector = await import("node:inspector/promises");
  const session = new inspector.Session();
  session.connect();
  await session.post("Profiler.enable");
  await session.post("Profiler.start");
  const result = run();
  const { profile } = await session.post("Profiler.stop");
  const file = `assessment-${name}.cpuprofile`;
  fs.writeFileSync(file, JSON.stringify(profile));
  session.disconnect();
  console.log(`    CPU profile written to ${file}`);
  return result;
}

async function databaseSection(): Promise<void> {
  const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-"));
  process.env.DATABASE_PATH = path.join(tempDir, "assessment.db");
  process.env.LOG_LEVEL = "silent";
  try {
    await runDatabaseSection();
  } finally {
    const { closeDb } = await import("@/db/client");
    closeDb();
    fs.rmSync(tempDir, { recursive: true, force: true });
  }
}

async function runDatabaseSection(): Promise<void> {
  // Modules that open the database are imported only now, after DATABASE_PATH is set.
  const { getDb } = await import("@/db/client");
  const { seedSubstanceLibrary } = await import("@/db/seed/substances");
  const { loadAssessmentSettings, reassessRooms, SnapshotLibrary } = await import("@/lib/assessment/service");
  const { allRoomIds } = await import("@/lib/assessment/jobs");
  const { moveContainer } = await import("@/lib/inventory/service");
  const { seededRandom, median: medianOf } = await import("./lib/stats");

  console.log("— Through the database (reassessRooms) —");
  const random = seededRandom(20_261_202);
  const pick = <T>(items: readonly T[]): T => items[Math.floor(random() * items.length)];
  const between = (min: number, max: number) => min + random() * (max - min);
  const secondsSince = (startMs: number) => (performance.now() - startMs) / 1000;
  const load = () => os.loadavg().map((l) => l.toFixed(2)).join(" ");

  const db = getDb();
  const sqlite = db.$client;
  const startMs = performance.now();
  db.transaction((tx) => {
    seedSubstanceLibrary(tx);
  });
  const liquids = sqlite.prepare("select id from substances where physical_state = 'liquid' and retired_at is null order by id").all() as { id: number }[];
  const substanceIds = liquids.map((s) => s.id);

  const nowMs = Date.now();
  const UNIT_PLAN = [
    // kind, internal volume, set range, ventilated, ignition-source free
    { kind: "flammable_cabinet", volumeL: 450, set: null, ventilated: false, safe: true },
    { kind: "flammable_cabinet", volumeL: 220, set: null, ventilated: true, safe: true },
    { kind: "open_shelving", volumeL: null, set: null, ventilated: false, safe: false },
    { kind: "corrosives_cabinet", volumeL: 300, set: null, ventilated: false, safe: false },
    { kind: "flammable_storage_refrigerator", volumeL: 280, set: [2, 8], ventilated: false, safe: true },
    { kind: "domestic_refrigerator", volumeL: 150, set: [2, 8], ventilated: false, safe: false },
    { kind: "explosion_proof_refrigerator", volumeL: 400, set: [4, 10], ventilated: false, safe: true },
    { kind: "freezer_minus_20", volumeL: 250, set: [-25, -15], ventilated: false, safe: true },
    { kind: "freezer_minus_80", volumeL: 500, set: [-86, -70], ventilated: false, safe: true },
    { kind: "fume_hood", volumeL: null, set: null, ventilated: true, safe: false },
  ] as const;
  const STATES = ["sealed", "sealed", "sealed", "opened", "in_use", "in_use", "empty", "disposed"] as const;
  const SIZES: [number, "mL" | "L"][] = [[100, "mL"], [250, "mL"], [500, "mL"], [1, "L"], [2.5, "L"], [4, "L"]];

  const units: { id: number; roomId: number }[] = [];
  let sensorCount = 0;
  let readingCount = 0;
  sqlite.transaction(() => {
    const userId = Number(
      sqlite.prepare("insert into users (email, name, role, password_hash) values ('officer@bench.invalid', 'Bench Officer', 'safety_officer', null)").run().lastInsertRowid,
    );
    const siteId = Number(sqlite.prepare("insert into sites (name, atmospheric_pressure_kpa) values ('Bench Campus', 101.325)").run().lastInsertRowid);
    const insertRoom = sqlite.prepare(
      "insert into rooms (site_id, code, name, kind, floor_area_m2, height_m, air_changes_per_hour, design_max_temp_c, sprinklered) values (?, ?, ?, ?, ?, ?, ?, ?, ?)",
    );
    const insertUnit = sqlite.prepare(
      "insert into storage_units (room_id, code, name, kind, internal_volume_l, set_min_c, set_max_c, ventilated, ignition_source_free, owner_id) values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
    );
    const insertSensor = sqlite.prepare("insert into sensors (external_id, name, room_id, storage_unit_id) values (?, ?, ?, ?)");
    const insertReading = sqlite.prepare("insert or ignore into readings (sensor_id, at, temp_c) values (?, ?, ?)");
    const readingsFor = (sensorId: number, baseTempC: number) => {
      for (let r = 0; r < 24; r++) {
        insertReading.run(sensorId, Math.round(nowMs - between(0, 200) * DAY_MS), Math.round((baseTempC + between(-1.5, 3)) * 10) / 10);
        readingCount += 1;
      }
    };
    for (let r = 1; r <= DB_ROOM_COUNT; r++) {
      const code = `B-${String(r).padStart(3, "0")}`;
      const roomId = Number(
        insertRoom.run(siteId, code, `Laboratory ${code}`, r % 10 === 0 ? "storeroom" : "laboratory", between(15, 80), 3, pick([2, 4, 6, 8, 10]), r % 3 === 0 ? 25 : null, r % 2).lastInsertRowid,
      );
      if (r % 4 === 0) {
        sensorCount += 1;
        readingsFor(Number(insertSensor.run(`BR-${r}`, `Room logger ${code}`, roomId, null).lastInsertRowid), 22);
      }
      for (let u = 1; u <= DB_UNITS_PER_ROOM; u++) {
        const plan = UNIT_PLAN[(u + r) % UNIT_PLAN.length];
        const unitId = Number(
          insertUnit.run(roomId, `U-${String(u).padStart(2, "0")}`, `Unit ${u} of ${code}`, plan.kind, plan.volumeL, plan.set?.[0] ?? null, plan.set?.[1] ?? null, plan.ventilated ? 1 : 0, plan.safe ? 1 : 0, userId)
            .lastInsertRowid,
        );
        units.push({ id: unitId, roomId });
        if (plan.set && u % 3 === 0) {
          sensorCount += 1;
          readingsFor(Number(insertSensor.run(`BU-${unitId}`, `Logger of unit ${unitId}`, null, unitId).lastInsertRowid), plan.set[1] - 1);
        }
      }
    }
    // Each unit holds a handful of substances (5–15 distinct), in several containers each.
    const palette = new Map<number, number[]>();
    for (const unit of units) {
      const count = 5 + Math.floor(random() * 11);
      const start = Math.floor(random() * substanceIds.length);
      palette.set(unit.id, Array.from({ length: count }, (_, i) => substanceIds[(start + i * 7) % substanceIds.length]));
    }
    const insertContainer = sqlite.prepare(
      `insert into containers (label, substance_id, amount, amount_unit, capacity, capacity_unit, state, storage_unit_id, owner_id, received_at, created_at, updated_at)
       values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    );
    for (let n = 1; n <= DB_CONTAINER_COUNT; n++) {
      const unit = units[(n * 7919) % units.length];
      const [capacity, unitOfAmount] = pick(SIZES);
      const state = pick(STATES);
      const amount = state === "empty" || state === "disposed" ? 0 : Math.round(capacity * between(0.1, 1) * 100) / 100;
      const createdAt = Math.round(nowMs - between(30, 1500) * DAY_MS);
      insertContainer.run(`BC-${String(n).padStart(6, "0")}`, pick(palette.get(unit.id)!), amount, unitOfAmount, capacity, unitOfAmount, state, unit.id, userId, createdAt, createdAt, createdAt);
    }
  })();
  sqlite.exec("ANALYZE");
  console.log(
    `Register built in ${secondsSince(startMs).toFixed(2)} s: ${DB_CONTAINER_COUNT.toLocaleString("en-GB")} containers (about a quarter empty or disposed) in ` +
      `${units.length.toLocaleString("en-GB")} units of ${DB_ROOM_COUNT} rooms, ${substanceIds.length} liquids in the library, ${sensorCount} sensors with ${readingCount} readings.`,
  );

  // (a) A bare scan of the same container rows, without any assessment.
  const scan = sqlite.prepare("select id, label, substance_id, mixture_id, amount, amount_unit, state, storage_unit_id from containers");
  const bareScanS = (): number => {
    const begun = performance.now();
    let total = 0;
    for (const row of scan.iterate() as IterableIterator<{ amount: number }>) total += row.amount;
    if (!Number.isFinite(total)) throw new Error("unreachable");
    return secondsSince(begun);
  };
  bareScanS(); // warm the page cache
  const scanS = medianOf([bareScanS(), bareScanS(), bareScanS()]);
  console.log(`(a) Bare better-sqlite3 scan of the ${DB_CONTAINER_COUNT.toLocaleString("en-GB")} container rows: ${(scanS * 1000).toFixed(1)} ms (T0)`);

  const roomIds = allRoomIds(db);
  const fullAssessment = (reason: string, force = false) => {
    const begun = performance.now();
    const settings = loadAssessmentSettings(db);
    const library = new SnapshotLibrary(db);
    const totals = { raised: 0, updated: 0, resolved: 0, reopened: 0, unchanged: 0, units: 0, roomsUnchanged: 0 };
    for (let i = 0; i < roomIds.length; i += ROOMS_PER_BATCH) {
      const batch = roomIds.slice(i, i + ROOMS_PER_BATCH);
      const result = db.transaction((tx) => reassessRooms(tx, batch, { reason, settings, library, notify: false, nowMs: Date.now(), force }));
      for (const key of ["raised", "updated", "resolved", "reopened", "unchanged", "units", "roomsUnchanged"] as const) totals[key] += result[key];
    }
    return { seconds: secondsSince(begun), ...totals };
  };

  // (b) The first assessment: every finding is new, inserted with its trace.
  const first = await profiled("first-assessment", () => fullAssessment("first assessment"));
  const findingCount = (sqlite.prepare("select count(*) as n from findings").get() as { n: number }).n;
  console.log(`(b) First full assessment (${roomIds.length} rooms, ${first.units} units, ${first.raised} findings raised with traces): ${first.seconds.toFixed(2)} s [load ${load()}]`);

  // (c) The full re-assessment with nothing changed: the target.
  const again = await profiled("re-assessment", () => [fullAssessment("re-assessment"), fullAssessment("re-assessment"), fullAssessment("re-assessment")]);
  const reS = medianOf(again.map((r) => r.seconds));
  const last = again[again.length - 1];
  console.log(
    `(c) Full re-assessment, nothing changed (${findingCount} findings; in the rooms assessed: ${last.unchanged} unchanged, ${last.raised} raised, ${last.updated} updated, ${last.resolved} resolved): ` +
      `median ${reS.toFixed(2)} s of ${again.map((r) => r.seconds.toFixed(2)).join(", ")}, ${(reS / scanS).toFixed(0)} × T0 [load ${load()}]`,
  );
  console.log(`    ${last.roomsUnchanged} of ${roomIds.length} rooms had the inputs of their last assessment (same settings, rooms, units, containers, substances and worst cases) and were not assessed again.`);
  console.log(`    Target under ${FULL_TARGET_S} s: ${reS < FULL_TARGET_S ? "met" : "NOT met"}`);

  // (c′) The same, forced: every rule run and every finding compared although nothing changed
  // (the cost when the inputs of every room do change, e.g. after a settings change).
  const forced = [fullAssessment("forced re-assessment", true), fullAssessment("forced re-assessment", true)];
  const forcedS = medianOf(forced.map((r) => r.seconds));
  console.log(
    `(c′) Forced full re-assessment, every rule run (${forced[1].unchanged} findings unchanged): median ${forcedS.toFixed(2)} s of ${forced.map((r) => r.seconds.toFixed(2)).join(", ")}, ` +
      `${(forcedS / scanS).toFixed(0)} × T0 [load ${load()}] (no target; reported for comparison)`,
  );

  // (d) One container moved to another room's unit: moveContainer re-assesses both rooms in its transaction.
  const officer = sqlite.prepare("select id, email, name, role from users where role = 'safety_officer'").get() as { id: number; email: string; name: string; role: "safety_officer" };
  const live = sqlite.prepare("select id, storage_unit_id as unitId from containers where state not in ('empty', 'disposed') order by id limit ?").all(MOVES) as { id: number; unitId: number }[];
  const moveMs: number[] = [];
  await profiled("moves", () => {
  for (const [i, container] of live.entries()) {
    const home = units.find((u) => u.id === container.unitId)!;
    const target = units.filter((u) => u.roomId !== home.roomId)[(i * 37) % (units.length - DB_UNITS_PER_ROOM)];
    const begun = performance.now();
    moveContainer(officer, "all", container.id, target.id);
    moveMs.push(performance.now() - begun);
  }
  });
  const moveMedianMs = medianOf(moveMs);
  console.log(
    `(d) One container moved (moveContainer, two rooms of ${DB_UNITS_PER_ROOM} units re-assessed): median ${moveMedianMs.toFixed(1)} ms of ${MOVES}, ` +
      `best ${Math.min(...moveMs).toFixed(1)}, worst ${Math.max(...moveMs).toFixed(1)} [load ${load()}]`,
  );
  console.log(`    Target well under ${MOVE_TARGET_MS} ms: ${moveMedianMs < MOVE_TARGET_MS ? "met" : "NOT met"}`);
  console.log(`Peak RSS: ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MB`);
}

async function main(): Promise<void> {
  console.log(`Load average at start: ${os.loadavg().map((l) => l.toFixed(2)).join(" ")} (${os.cpus().length} CPUs)`);
  if (!process.argv.includes("--database-only")) rulesSection();
  if (!process.argv.includes("--rules-only")) await databaseSection();
}

void main();
