// Benchmark: evaluations per second of saturationPressure + saturatedConcentration, the pair run
// for every location × substance × temperature when the register is re-evaluated.
// Run with `npx tsx bench/hazard.ts`. Target: at least 5 million pairs per second on one core.
import * as hazard from '@/lib/hazard';
import { substanceLibrary } from '@/db/seed/substance-library';

// Take the functions once: module namespaces are reached through getters, which would otherwise
// be timed along with the physics.
const { saturationPressure, saturatedConcentration } = hazard;

const TARGET_PER_SECOND = 5_000_000;
const ROUNDS = 5;
const ROUND_MS = 1000;

type Case = { props: hazard.VaporProperties; tempC: number };

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

/** CPU time of this process in ms: the rate per core, unaffected by other processes on a shared machine. */
function cpuMs(): number {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1000;
}

function measure(cases: Case[]): { perSecond: number; perWallSecond: number; checksum: number } {
  const count = cases.length;
  let checksum = 0;
  let evaluations = 0;
  let index = 0;
  const wallStart = performance.now();
  const cpuStart = cpuMs();
  let wallNow = wallStart;
  while (wallNow - wallStart < ROUND_MS) {
    for (let batch = 0; batch < 20_000; batch++) {
      const item = cases[index];
      checksum += saturationPressure(item.props, item.tempC).pressureKPa;
      checksum += saturatedConcentration(item.props, item.tempC).ppm;
      index = index + 1 === count ? 0 : index + 1;
    }
    evaluations += 20_000;
    wallNow = performance.now();
  }
  const cpuElapsedMs = cpuMs() - cpuStart;
  return { perSecond: (evaluations * 1000) / cpuElapsedMs, perWallSecond: (evaluations * 1000) / (wallNow - wallStart), checksum };
}

function run(label: string, cases: Case[]): number {
  measure(cases); // warm-up: let the JIT optimise the hot path
  const rates: number[] = [];
  const wallRates: number[] = [];
  let checksum = 0;
  for (let round = 0; round < ROUNDS; round++) {
    const result = measure(cases);
    rates.push(result.perSecond);
    wallRates.push(result.perWallSecond);
    checksum += result.checksum;
  }
  rates.sort((a, b) => a - b);
  wallRates.sort((a, b) => a - b);
  const median = rates[Math.floor(ROUNDS / 2)];
  console.log(
    `${label}: ${cases.length} cases, median ${(median / 1e6).toFixed(2)} M pairs per CPU-second ` +
      `(best ${(rates[ROUNDS - 1] / 1e6).toFixed(2)}, worst ${(rates[0] / 1e6).toFixed(2)}; ` +
      `wall clock ${(wallRates[Math.floor(ROUNDS / 2)] / 1e6).toFixed(2)} M/s; checksum ${checksum.toExponential(3)})`,
  );
  return median;
}

const storageTemperaturesC = [-20, -18, 2, 4, 5, 8, 15, 20, 22, 25, 28, 30, 35, 40];
console.log(
  `Node ${process.version}; single thread, rates per CPU-second of this process (wall clock shown too: on a shared machine it is lower); ` +
    'each evaluation = saturationPressure + saturatedConcentration',
);
const covered = run('In-range (no warnings: the common case)', buildCases(storageTemperaturesC, true));
run('Every library liquid at −20…40 °C, incl. extrapolation and boiling warnings', buildCases(storageTemperaturesC, false));
const met = covered >= TARGET_PER_SECOND;
console.log(
  `Target ${TARGET_PER_SECOND / 1e6} M pairs/s on the in-range case: ${met ? 'met' : 'NOT met'} (${(covered / 1e6).toFixed(2)} M pairs/s)`,
);
process.exitCode = 0;
