// Benchmark: the storage planner (GET /api/v1/storage-plan's work) over the bench register of
// 2,000 storage units in 100 rooms with 20,000 containers and 100,000 findings. Target: under 2 s
// for 2,000 units (and under 300 ms on the demo organisation, which `--demo` measures instead).
//
// Run with `npx tsx --conditions=react-server bench/planner.ts` (the condition makes
// `import "server-only"` a no-op). Options: `--runs N` plans N times per case (7 by default);
// `--demo` plans on the invented demo organisation (17 units) instead of the bench register;
// `--keep-files` keeps the database (its path is printed). Each case plans one content for every
// live unit: a new litre of a volatile flammable liquid, a new bottle of water, a move of a stored
// container. It reports the median and p95 per case, wall time and this process's CPU time; it does not
// fail: exit code 0 either way.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";

const runsArg = process.argv.indexOf("--runs");
const RUNS = runsArg >= 0 ? Math.max(1, Number(process.argv[runsArg + 1])) : 7;
const DEMO = process.argv.includes("--demo");
const TARGET_MS = DEMO ? 300 : 2000;

const fixed = (value: number, digits = 0) => value.toFixed(digits);

async function main(): Promise<void> {
  const keepFiles = process.argv.includes("--keep-files");
  const tempDir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-planner-"));
  process.env.DATABASE_PATH = path.join(tempDir, "register.db");
  process.env.LOG_LEVEL = "silent";
  try {
    if (DEMO) {
      const { getDb, closeDb } = await import("@/db/client");
      const { seedDemo } = await import("@/db/seed/demo");
      await seedDemo(getDb(), { bcryptCost: 4 });
      closeDb();
    } else {
      const { buildRegisterDb } = await import("./lib/register-db");
      await buildRegisterDb({ findings: 100_000, shortTraces: true });
      // The bench register's findings are made up; the planner reads the register's standing
      // findings as they are, and assesses every unit itself.
    }
    const { getDb, closeDb } = await import("@/db/client");
    const { planPlaces } = await import("@/lib/assessment/storage-plan");
    const { median, p95 } = await import("./lib/stats");
    const db = getDb();
    const sqlite = db.$client;
    const idOf = (cas: string) => (sqlite.prepare("select id from substances where cas = ?").get(cas) as { id: number }).id;
    const units = (sqlite.prepare("select count(*) as n from storage_units where retired_at is null").get() as { n: number }).n;
    const stored = sqlite
      .prepare("select c.id, c.label, c.substance_id as substanceId, c.amount, c.amount_unit as amountUnit, c.state, c.storage_unit_id as unitId, u.room_id as roomId from containers c join storage_units u on u.id = c.storage_unit_id where c.substance_id is not null and c.state not in ('empty', 'disposed') order by c.id limit 1")
      .get() as { id: number; label: string; substanceId: number; amount: number; amountUnit: "mL"; state: "sealed"; unitId: number; roomId: number };
    const cases = [
      { name: "1 L of diethyl ether, new", content: { substanceId: idOf("60-29-7"), mixtureId: null, amount: 1, amountUnit: "L" as const, label: "(new container)" }, options: {} },
      { name: "0.5 L of water, new", content: { substanceId: idOf("7732-18-5"), mixtureId: null, amount: 0.5, amountUnit: "L" as const, label: "(new container)" }, options: {} },
      {
        name: `move of ${stored.label}`,
        content: { substanceId: stored.substanceId, mixtureId: null, amount: stored.amount, amountUnit: stored.amountUnit, state: stored.state, label: stored.label, replacesContainerId: stored.id },
        options: { nearRoomId: stored.roomId, excludeUnitIds: [stored.unitId] },
      },
    ];
    console.log(`\nPlanning over ${units.toLocaleString("en-GB")} live storage units (${DEMO ? "the demo organisation" : "the bench register"}), ${RUNS} runs per case after one warm-up run:`);
    for (const c of cases) {
      planPlaces(db, c.content, { ...c.options, limit: 20 });
      const samples: number[] = [];
      const cpuSamples: number[] = [];
      let last: ReturnType<typeof planPlaces> | null = null;
      for (let run = 0; run < RUNS; run++) {
        const startMs = performance.now();
        const startCpu = process.cpuUsage();
        last = planPlaces(db, c.content, { ...c.options, limit: 20 });
        samples.push(performance.now() - startMs);
        const cpu = process.cpuUsage(startCpu);
        cpuSamples.push((cpu.user + cpu.system) / 1000);
      }
      const best = last!.items[0];
      const m = median(samples);
      console.log(
        `- ${c.name}: median ${fixed(m)} ms, p95 ${fixed(p95(samples))} ms (target < ${TARGET_MS} ms: ${m < TARGET_MS ? "met" : "NOT met"}), ` +
          `CPU time median ${fixed(median(cpuSamples))} ms (the wall time on a machine shared with other work runs longer); ` +
          `${last!.considered} units considered, ${last!.tooSmall} too small; first: ${best ? `${best.roomCode}/${best.code} ${best.verdict}` : "none"}.`,
      );
    }
    console.log(`Machine: ${os.cpus().length} cores, load ${fixed(os.loadavg()[0], 2)}; Node ${process.version}.`);
    closeDb();
    if (keepFiles) console.log(`Kept: ${process.env.DATABASE_PATH}`);
  } finally {
    if (!keepFiles) fs.rmSync(tempDir, { recursive: true, force: true });
  }
}

main().catch((error) => {
  console.error(error);
  process.exitCode = 1;
});
