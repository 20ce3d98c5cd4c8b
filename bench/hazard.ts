// Benchmark: evaluations per second of saturationPressure + saturatedConcentration, the pair run
// for every location × substance × temperature when the register is re-evaluated.
// Run with `npx tsx bench/hazard.ts`. Target: at least 5 million pairs per second on one core.
//
// Each scenario is warmed up first (so the JIT has optimised the hot path), then timed in several
// rounds. Rates are given per CPU-second of this process (process.cpuUsage: what one core does,
// less affected by other processes on a shared machine) and per wall-clock second; the median is
// the headline figure, the best shows what an idle core does.
import * as hazard from '@/lib/hazard';
import { substanceLibrary } from '@/db/seed/substance-library';

// Take the functions once: module namespaces are reached through getters, which would otherwise
// be timed along with the physics.
const { saturationPressure, saturatedConcentration } = hazard;

const TARGET_PER_SECOND = 5_000_000;
const WARM_UP_MS = 1500;
const ROUNDS = 7;
const ROUND_MS = 1000;
const BATCH = 20_000;

type Case = { props: hazard.VaporProperties; tempC: number };
type Round = { cpuRate: number; wallRate: number; checksum: number };

function buildCases(temperaturesC: number[], onlyCovered: boolean): Case[] {
  const cases: Case[] = [];
  for (const seed of substanceLibrary) {
    if (seed.correlations.length === 0) continue;
    const props: hazard.VaporProperties = {
      molarMassGPerMol: seed.molarMassGPerMol,
      correlations: seed.correlations,
      normalBoilingPointC: seed.normalBoilingPointC,
      enthalpyOfVaporizationKJPerMol: seed.enthalpyOfVaporizationKJPerMol,
      meltingPointC: seed.meltingPointC,
      flashPointC: seed.flashPointC,
      lflVolPercent: seed.lflVolPercent,
      uflVolPercent: seed.uflVolPercent,
    };
    for (const tempC of temperaturesC) {
      const result = saturationPressure(props, tempC);
      if (onlyCovered && (result.warnings.length > 0 || saturatedConcentration(props, tempC).boils)) continue;
      cases.push({ props, tempC });
    }
  }
  return cases;
}

/** CPU time of this process in ms (user + system). */
function cpuMs(): number {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1000;
}

// Two timing loops written out rather than one loop taking a callback: a shared callback call
// site would see several functions and cost more than the physics being measured.

/** saturationPressure then saturatedConcentration for each case, as the register does. */
function timePairs(cases: Case[], durationMs: number): Round {
  const count = cases.length;
  let checksum = 0;
  let evaluations = 0;
  let index = 0;
  const wallStart = performance.now();
  const cpuStart = cpuMs();
  let wallNow = wallStart;
  while (wallNow - wallStart < durationMs) {
    for (let batch = 0; batch < BATCH; batch++) {
      const item = cases[index];
      checksum += saturationPressure(item.props, item.tempC).pressureKPa;
      checksum += saturatedConcentration(item.props, item.tempC).ppm;
      index = index + 1 === count ? 0 : index + 1;
    }
    evaluations += BATCH;
    wallNow = performance.now();
  }
  const cpuElapsedMs = cpuMs() - cpuStart;
  return { cpuRate: (evaluations * 1000) / cpuElapsedMs, wallRate: (evaluations * 1000) / (wallNow - wallStart), checksum };
}

/** saturatedConcentration alone: consecutive cases differ, so nothing computed before is reused. */
function timeSingles(cases: Case[], durationMs: number): Round {
  const count = cases.length;
  let checksum = 0;
  let evaluations = 0;
  let index = 0;
  const wallStart = performance.now();
  const cpuStart = cpuMs();
  let wallNow = wallStart;
  while (wallNow - wallStart < durationMs) {
    for (let batch = 0; batch < BATCH; batch++) {
      const item = cases[index];
      checksum += saturatedConcentration(item.props, item.tempC).ppm;
      index = index + 1 === count ? 0 : index + 1;
    }
    evaluations += BATCH;
    wallNow = performance.now();
  }
  const cpuElapsedMs = cpuMs() - cpuStart;
  return { cpuRate: (evaluations * 1000) / cpuElapsedMs, wallRate: (evaluations * 1000) / (wallNow - wallStart), checksum };
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[middle] : 0.5 * (sorted[middle - 1] + sorted[middle]);
}

const millions = (rate: number) => (rate / 1e6).toFixed(2);

function run(label: string, unit: string, cases: Case[], time: (cases: Case[], durationMs: number) => Round): number {
  time(cases, WARM_UP_MS);
  const rounds: Round[] = [];
  for (let round = 0; round < ROUNDS; round++) rounds.push(time(cases, ROUND_MS));
  const cpu = rounds.map((round) => round.cpuRate);
  const wall = rounds.map((round) => round.wallRate);
  const checksum = rounds.reduce((sum, round) => sum + round.checksum, 0);
  const cpuMedian = median(cpu);
  console.log(
    `${label} (${cases.length} cases):\n` +
      `  per CPU-second:   median ${millions(cpuMedian)} M ${unit}/s, best ${millions(Math.max(...cpu))}, worst ${millions(Math.min(...cpu))}\n` +
      `  per wall second:  median ${millions(median(wall))} M ${unit}/s, best ${millions(Math.max(...wall))}, worst ${millions(Math.min(...wall))}` +
      `  (checksum ${checksum.toExponential(3)})`,
  );
  return cpuMedian;
}

const storageTemperaturesC = [-20, -18, 2, 4, 5, 8, 15, 20, 22, 25, 28, 30, 35, 40];
const covered = buildCases(storageTemperaturesC, true);
console.log(
  `Node ${process.version}; one thread; ${WARM_UP_MS} ms warm-up, then ${ROUNDS} rounds of ${ROUND_MS} ms per scenario. ` +
    'A pair = saturationPressure + saturatedConcentration for the same substance and temperature.',
);
const pairRate = run('In-range pairs (no warnings: the common case)', 'pairs', covered, timePairs);
run('In-range saturatedConcentration alone (no pressure to reuse)', 'evaluations', covered, timeSingles);
run('Every library liquid at −20…40 °C, incl. extrapolation and boiling warnings', 'pairs', buildCases(storageTemperaturesC, false), timePairs);
const met = pairRate >= TARGET_PER_SECOND;
console.log(
  `Target ${TARGET_PER_SECOND / 1e6} M pairs per CPU-second on the in-range case: ${met ? 'met' : 'NOT met'} ` +
    `(median ${millions(pairRate)} M pairs/s)`,
);
process.exitCode = 0;
