// Benchmark: the pure assessment rules over an invented register of 100,000 containers in 2,000
// storage units (50 each, half of them refrigerators assessed in control and with control lost) and
// 100 rooms. Target: under 1 ms of CPU per unit on average, traces not read (a re-assessment reads a
// trace only for a finding that is new or changed). It also reports what reading and serialising every
// trace costs, the upper bound of a first assessment.
//
// Run with `npx tsx bench/assessment.ts`. It reports; it does not fail: the exit code is 0 either way.
// Times are CPU time of this process (process.cpuUsage), less affected by other processes on a shared
// machine than wall-clock time; the median of several rounds is the headline figure.
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
