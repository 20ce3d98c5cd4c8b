/**
 * Invented temperature traces for the demo sensors of the Corvane Institute: one reading every
 * 15 minutes for a year. Nothing here was measured; the shapes follow simple physics so that the
 * charts look like what real loggers record:
 *
 * - Rooms follow a seasonal and a daily cycle (northern hemisphere: warmest in late July), with
 *   weekday occupancy in the laboratories, passed through a first-order lag for the building's
 *   thermal mass: T ← D + (T − D)·e^(−Δt/τ) for a driving temperature D (Newton's law of cooling).
 * - A summer heat wave of 9 days in mid-July raises the driving temperature of every room by its
 *   own coupling: a great deal in the basement solvent store with its sunny south wall and in the
 *   unconditioned Riverside store, little in the air-conditioned laboratories.
 * - Refrigerators, freezers and the cold room hold their set point with a compressor-cycle wobble
 *   (a triangle wave) and door openings during working hours: a jump at one reading that is gone
 *   by the next (the air in a closed unit recovers within minutes), never two readings in a row,
 *   so that a door opening can cross a threshold but never lasts as long as a minimum duration.
 * - One refrigerator's compressor fails for a weekend: the interior warms towards the room with a
 *   first-order approach (time constant a few hours) and is pulled back down after the repair.
 *
 * The site's loggers keep UTC, so the daily cycle and the working hours are in UTC. Pure and
 * deterministic: every random draw is a hash of the sensor's seed and the reading's instant, so
 * seeding twice with the same end gives the same readings, and seeding on another day gives the
 * same readings at the same instants (once the first day's start-up has decayed), apart from the
 * failure weekend, which is chosen relative to the end.
 */

export const READING_INTERVAL_MS = 15 * 60_000;
export const DEMO_READING_DAYS = 365;
const HOUR_MS = 3_600_000;
const DAY_MS = 86_400_000;

export type HeatWave = { startMs: number; endMs: number; dayIntensities: readonly number[] };
export type Failure = { startMs: number; repairMs: number; warmTauH: number; pullDownTauH: number };

export type RoomTrace = {
  kind: "room";
  seed: number;
  meanC: number;
  /** Half the difference between the warmest and the coldest time of year. */
  seasonalAmpC: number;
  /** Half the daily swing of the driving temperature, in winter and at the height of summer. */
  dailyAmpWinterC: number;
  dailyAmpSummerC: number;
  /** Hour (UTC) of the warmest driving temperature; the lag moves the room's peak later. */
  dailyPeakHour: number;
  /** Extra driving temperature on weekdays 08:00–18:00 (people, equipment). */
  occupiedRiseC: number;
  /** How much of the heat wave's driving excess (up to ~10 °C in the afternoon) reaches the room. */
  heatWaveCoupling: number;
  thermalTauH: number;
  noiseC: number;
};

export type ColdTrace = {
  kind: "cold";
  seed: number;
  setPointC: number;
  cycleAmpC: number;
  cyclePeriodMin: number;
  /** The room whose trace is this unit's surroundings. */
  ambientRoom: string;
  /** °C of interior change per °C of room above 21 °C (door seals, condenser load). */
  ambientCoupling: number;
  /** Chance that a reading in working hours catches a door opening, and the jump it shows. */
  doorChance: number;
  doorRiseMinC: number;
  doorRiseMaxC: number;
  openFromHour: number;
  openToHour: number;
  failure?: Failure;
};

export type TraceModel = RoomTrace | ColdTrace;

/** The reading instants: every 15 minutes for DEMO_READING_DAYS up to and including `endMs` (rounded down to the quarter hour). */
export function readingInstants(endMs: number): { firstMs: number; lastMs: number; count: number } {
  const lastMs = Math.floor(endMs / READING_INTERVAL_MS) * READING_INTERVAL_MS;
  const count = (DEMO_READING_DAYS * DAY_MS) / READING_INTERVAL_MS;
  return { firstMs: lastMs - (count - 1) * READING_INTERVAL_MS, lastMs, count };
}

/**
 * The heat wave: 10–19 July (9 days, UTC) of the latest year in which it is over before the last
 * day of readings. When the year of readings starts after 10 July of that year (seeding between
 * 10 and 20 July), it starts on the second day of readings instead.
 */
export function heatWaveFor(endMs: number): HeatWave {
  const { firstMs, lastMs } = readingInstants(endMs);
  const lengthMs = 9 * DAY_MS;
  let year = new Date(lastMs).getUTCFullYear();
  let startMs = Date.UTC(year, 6, 10);
  if (startMs + lengthMs > lastMs - DAY_MS) {
    year -= 1;
    startMs = Date.UTC(year, 6, 10);
  }
  const earliestMs = Math.ceil((firstMs + DAY_MS) / DAY_MS) * DAY_MS;
  if (startMs < earliestMs) startMs = earliestMs;
  // Daily peaks: a build-up, four days of the worst, a thunderstorm-ended tail.
  return { startMs, endMs: startMs + lengthMs, dayIntensities: [0.45, 0.7, 0.88, 1, 0.97, 0.95, 0.9, 0.62, 0.3] };
}

/**
 * The failed refrigerator: the last full weekend (Friday to Sunday) of the month three months
 * before the last reading; the compressor stops on Friday at 19:00 UTC and runs again after the
 * repair on Monday at 08:30 UTC.
 */
export function failureWeekendFor(endMs: number): { startMs: number; repairMs: number } {
  const last = new Date(readingInstants(endMs).lastMs);
  const monthStart = new Date(Date.UTC(last.getUTCFullYear(), last.getUTCMonth() - 3, 1));
  const lastDay = new Date(Date.UTC(monthStart.getUTCFullYear(), monthStart.getUTCMonth() + 1, 0));
  const lastSundayMs = lastDay.getTime() - lastDay.getUTCDay() * DAY_MS;
  const fridayMs = lastSundayMs - 2 * DAY_MS;
  return { startMs: fridayMs + 19 * HOUR_MS, repairMs: fridayMs + 3 * DAY_MS + 8.5 * HOUR_MS };
}

/** A 32-bit integer hash (the finaliser of MurmurHash3) of a seed, a reading's index and a channel → [0, 1). */
function uniform(seed: number, index: number, channel: number): number {
  let h = (seed * 0x9e3779b1) ^ Math.imul(index, 0x85ebca6b) ^ Math.imul(channel + 1, 0xc2b2ae35);
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return (h >>> 0) / 4_294_967_296;
}

/** A standard normal draw by the Box–Muller transform. */
function gaussian(seed: number, index: number, channel: number): number {
  const u1 = Math.max(uniform(seed, index, channel), 1e-12);
  const u2 = uniform(seed, index, channel + 101);
  return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
}

/** +1 on 24 July, −1 on 22 January: the northern-hemisphere season. */
function season(atMs: number): number {
  const date = new Date(atMs);
  const dayOfYear = (atMs - Date.UTC(date.getUTCFullYear(), 0, 1)) / DAY_MS;
  return Math.cos((2 * Math.PI * (dayOfYear - 204)) / 365.25);
}

function hourOfDay(atMs: number): number {
  return (((atMs % DAY_MS) + DAY_MS) % DAY_MS) / HOUR_MS;
}

function isWeekday(atMs: number): boolean {
  const day = new Date(atMs).getUTCDay();
  return day >= 1 && day <= 5;
}

/** The heat wave's strength at an instant (0…1), each day's peak eased into the next with a cosine. */
export function heatWaveIntensity(wave: HeatWave, atMs: number): number {
  if (atMs <= wave.startMs || atMs >= wave.endMs) return 0;
  const days = wave.dayIntensities;
  const position = (atMs - wave.startMs) / DAY_MS - 0.5; // day k's peak at its midday
  const k = Math.floor(position);
  const at = (i: number) => (i < 0 || i >= days.length ? 0 : days[i]);
  const f = (1 - Math.cos(Math.PI * (position - k))) / 2;
  return at(k) * (1 - f) + at(k + 1) * f;
}

const round1 = (tempC: number) => Math.round(tempC * 10) / 10;

/** A room's trace, unrounded (the surroundings of the units in it); `toReadings` rounds it as a logger would. */
export function roomTrace(model: RoomTrace, firstMs: number, count: number, wave: HeatWave): Float64Array {
  const out = new Float64Array(count);
  const decay = Math.exp(-READING_INTERVAL_MS / (model.thermalTauH * HOUR_MS));
  const noiseDecay = 0.96; // AR(1) per reading: drafts, the air handler, people
  const noiseKick = model.noiseC * Math.sqrt(1 - noiseDecay ** 2);
  let tempC = Number.NaN;
  let noiseC = 0;
  for (let i = 0; i < count; i += 1) {
    const atMs = firstMs + i * READING_INTERVAL_MS;
    const index = atMs / READING_INTERVAL_MS;
    const s = season(atMs);
    const hour = hourOfDay(atMs);
    const dailyAmpC = model.dailyAmpWinterC + (model.dailyAmpSummerC - model.dailyAmpWinterC) * (s + 1) / 2;
    const dayShape = Math.cos((2 * Math.PI * (hour - model.dailyPeakHour)) / 24);
    const occupied = isWeekday(atMs) && hour >= 8 && hour < 18 ? model.occupiedRiseC : 0;
    // The heat wave's driving excess: warm nights, hot afternoons (outdoor air and sun on the walls).
    const wave01 = heatWaveIntensity(wave, atMs);
    const waveC = wave01 * model.heatWaveCoupling * (5 + 5 * Math.cos((2 * Math.PI * (hour - 13)) / 24));
    const drivingC = model.meanC + model.seasonalAmpC * s + dailyAmpC * dayShape + occupied + waveC;
    tempC = Number.isNaN(tempC) ? drivingC : drivingC + (tempC - drivingC) * decay;
    noiseC = noiseC * noiseDecay + noiseKick * gaussian(model.seed, index, 0);
    out[i] = tempC + noiseC;
  }
  return out;
}

function triangle(x: number): number {
  return 4 * Math.abs(x - Math.floor(x + 0.5)) - 1;
}

/** A refrigerator's, freezer's or cold room's trace, given its surroundings' trace. */
export function coldTrace(model: ColdTrace, firstMs: number, ambientC: Float64Array): Float64Array {
  const count = ambientC.length;
  const out = new Float64Array(count);
  const doorDecay = Math.exp(-READING_INTERVAL_MS / (7 * 60_000)); // the door jump is mostly gone 15 min later
  const phase = uniform(model.seed, 0, 9);
  let doorC = 0;
  let lastDoor = -10;
  let failedC: number | null = null; // the interior temperature while the compressor is off
  let excessC = 0; // above the normal trace, pulled down after the repair
  const failure = model.failure;
  for (let i = 0; i < count; i += 1) {
    const atMs = firstMs + i * READING_INTERVAL_MS;
    const index = atMs / READING_INTERVAL_MS;
    const hour = hourOfDay(atMs);
    const cycleC = model.cycleAmpC * triangle(atMs / (model.cyclePeriodMin * 60_000) + phase);
    const normalC = model.setPointC + cycleC + model.ambientCoupling * (ambientC[i] - 21) + 0.04 * gaussian(model.seed, index, 1);
    doorC *= doorDecay;
    const working = isWeekday(atMs) && hour >= model.openFromHour && hour < model.openToHour;
    const failed = failure != null && atMs >= failure.startMs && atMs < failure.repairMs;
    // Nobody opens a unit that is being pulled back down after a failure (it is labelled "do not open").
    if (working && !failed && excessC < 0.3 && i - lastDoor >= 2 && uniform(model.seed, index, 2) < model.doorChance) {
      doorC += model.doorRiseMinC + (model.doorRiseMaxC - model.doorRiseMinC) * uniform(model.seed, index, 3);
      lastDoor = i;
    }
    if (failed && failure) {
      // Newton's law of cooling towards the room: T ← T_room + (T − T_room)·e^(−Δt/τ).
      const previousC: number = failedC ?? (i > 0 ? out[i - 1] : normalC);
      failedC = ambientC[i] + (previousC - ambientC[i]) * Math.exp(-READING_INTERVAL_MS / (failure.warmTauH * HOUR_MS));
      excessC = failedC - normalC;
      out[i] = failedC;
      continue;
    }
    if (excessC !== 0 && failure) {
      excessC *= Math.exp(-READING_INTERVAL_MS / (failure.pullDownTauH * HOUR_MS));
      if (Math.abs(excessC) < 0.01) excessC = 0;
    }
    out[i] = normalC + doorC + excessC;
  }
  return out;
}

/** Readings as loggers send them: 0.1 °C resolution. */
export function toReadings(tempsC: Float64Array): Float64Array {
  return tempsC.map(round1);
}

export { DAY_MS, HOUR_MS };

export type DemoSensor = { externalId: string; name: string; room: string; unit?: string; trace: TraceModel };

const labRoom = (seed: number, meanC: number, seasonalAmpC: number, heatWaveCoupling: number): RoomTrace => ({
  kind: "room",
  seed,
  meanC,
  seasonalAmpC,
  dailyAmpWinterC: 0.3,
  dailyAmpSummerC: 0.8,
  dailyPeakHour: 14,
  occupiedRiseC: 1.1,
  heatWaveCoupling,
  thermalTauH: 3,
  noiseC: 0.12,
});

/**
 * The demo loggers, one per room with a design maximum where a room logger makes sense and one in
 * every refrigerator, freezer and the walk-in cold room. The cryogen fill room has an
 * oxygen monitor, not a temperature logger. Device ids are the invented gateway's numbering.
 */
export function demoSensors(endMs: number): DemoSensor[] {
  const failure = failureWeekendFor(endMs);
  return [
    {
      externalId: "S-201",
      name: "B-014 ambient",
      room: "B-014",
      trace: { kind: "room", seed: 201, meanC: 21, seasonalAmpC: 2, dailyAmpWinterC: 0.5, dailyAmpSummerC: 1.3, dailyPeakHour: 13, occupiedRiseC: 0, heatWaveCoupling: 1, thermalTauH: 5, noiseC: 0.15 },
    },
    { externalId: "S-202", name: "2.107 ambient", room: "2.107", trace: labRoom(202, 21.2, 1.3, 0.18) },
    {
      externalId: "S-203",
      name: "2.107 FR-1 interior",
      room: "2.107",
      unit: "FR-1",
      trace: { kind: "cold", seed: 203, setPointC: 4.3, cycleAmpC: 0.9, cyclePeriodMin: 34, ambientRoom: "2.107", ambientCoupling: 0.06, doorChance: 0.07, doorRiseMinC: 0.6, doorRiseMaxC: 4.4, openFromHour: 9, openToHour: 17 },
    },
    { externalId: "S-204", name: "2.115 ambient", room: "2.115", trace: labRoom(204, 20.8, 1.1, 0.15) },
    {
      externalId: "S-205",
      name: "2.115 FSR-1 interior",
      room: "2.115",
      unit: "FSR-1",
      trace: {
        kind: "cold",
        seed: 205,
        setPointC: 4.6,
        cycleAmpC: 0.7,
        cyclePeriodMin: 41,
        ambientRoom: "2.115",
        ambientCoupling: 0.04,
        doorChance: 0.04,
        doorRiseMinC: 0.5,
        doorRiseMaxC: 3.2,
        openFromHour: 8,
        openToHour: 18,
        failure: { ...failure, warmTauH: 4, pullDownTauH: 1.1 },
      },
    },
    {
      externalId: "S-206",
      name: "2.115 FZ-1 interior",
      room: "2.115",
      unit: "FZ-1",
      trace: { kind: "cold", seed: 206, setPointC: -20.5, cycleAmpC: 1.3, cyclePeriodMin: 52, ambientRoom: "2.115", ambientCoupling: 0.08, doorChance: 0.03, doorRiseMinC: 1, doorRiseMaxC: 5, openFromHour: 8, openToHour: 18 },
    },
    {
      externalId: "S-207",
      name: "2.115 FZ-2 interior",
      room: "2.115",
      unit: "FZ-2",
      trace: { kind: "cold", seed: 207, setPointC: -79.5, cycleAmpC: 0.8, cyclePeriodMin: 70, ambientRoom: "2.115", ambientCoupling: 0.1, doorChance: 0.025, doorRiseMinC: 3, doorRiseMaxC: 11, openFromHour: 8, openToHour: 18 },
    },
    {
      externalId: "S-208",
      name: "B-020 cold room",
      room: "B-020",
      trace: { kind: "cold", seed: 208, setPointC: 4.2, cycleAmpC: 0.8, cyclePeriodMin: 26, ambientRoom: "B-014", ambientCoupling: 0.05, doorChance: 0.05, doorRiseMinC: 0.4, doorRiseMaxC: 2.4, openFromHour: 7, openToHour: 16 },
    },
    { externalId: "S-209", name: "R-1.02 ambient", room: "R-1.02", trace: labRoom(209, 21, 1.4, 0.2) },
    {
      externalId: "S-210",
      name: "R-1.02 XR-1 interior",
      room: "R-1.02",
      unit: "XR-1",
      trace: { kind: "cold", seed: 210, setPointC: 4.4, cycleAmpC: 0.6, cyclePeriodMin: 47, ambientRoom: "R-1.02", ambientCoupling: 0.04, doorChance: 0.03, doorRiseMinC: 0.5, doorRiseMaxC: 2.8, openFromHour: 8, openToHour: 17 },
    },
    {
      externalId: "S-211",
      name: "R-0.05 ambient",
      room: "R-0.05",
      trace: { kind: "room", seed: 211, meanC: 16.5, seasonalAmpC: 7.5, dailyAmpWinterC: 0.8, dailyAmpSummerC: 2, dailyPeakHour: 14, occupiedRiseC: 0, heatWaveCoupling: 0.75, thermalTauH: 6, noiseC: 0.25 },
    },
  ];
}

/** Every demo sensor's readings (0.1 °C), rooms first so that each unit sees its room's trace. */
export function demoTraces(endMs: number): { sensors: DemoSensor[]; firstMs: number; count: number; heatWave: HeatWave; failure: { startMs: number; repairMs: number }; tempsC: Map<string, Float64Array> } {
  const { firstMs, count } = readingInstants(endMs);
  const heatWave = heatWaveFor(endMs);
  const sensors = demoSensors(endMs);
  const roomTemps = new Map<string, Float64Array>();
  const tempsC = new Map<string, Float64Array>();
  for (const sensor of sensors) {
    if (sensor.trace.kind !== "room") continue;
    const temps = roomTrace(sensor.trace, firstMs, count, heatWave);
    roomTemps.set(sensor.room, temps);
    tempsC.set(sensor.externalId, toReadings(temps));
  }
  for (const sensor of sensors) {
    if (sensor.trace.kind !== "cold") continue;
    const ambient = roomTemps.get(sensor.trace.ambientRoom);
    if (!ambient) throw new Error(`No room trace for ${sensor.trace.ambientRoom}, the surroundings of ${sensor.externalId}.`);
    tempsC.set(sensor.externalId, toReadings(coldTrace(sensor.trace, firstMs, ambient)));
  }
  return { sensors, firstMs, count, heatWave, failure: failureWeekendFor(endMs), tempsC };
}
