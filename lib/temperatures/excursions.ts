/**
 * Excursion detection: a period during which a location's temperature stays above its threshold
 * for at least the minimum duration. Pure; the caller loads readings and stores what it finds.
 *
 * Rules (cold-chain practice, written down so every excursion can be explained):
 * - "Above" is strictly greater than the threshold: a reading exactly at the threshold is within limits.
 * - Readings are taken in time order whatever order they arrive in; two readings at the same instant
 *   count once, with the higher temperature (the conservative choice).
 * - An excursion starts at the first reading above the threshold and ends at the first reading back
 *   at or below it. If the last reading is still above, the excursion is open (end null).
 * - A gap in the data inside an excursion does not end it (the unit was above before and after); the
 *   longest gap is reported so a person can judge it.
 * - It counts only when it lasted at least the minimum duration: end − start, or for an open one,
 *   last reading − start.
 */
export type TemperatureReading = { atMs: number; tempC: number };

export type ExcursionRule = { thresholdC: number; minDurationMs: number };

export type DetectedExcursion = {
  startMs: number;
  /** Null while the excursion lasts (the latest reading is still above the threshold). */
  endMs: number | null;
  peakTempC: number;
  peakAtMs: number;
  durationMs: number;
  readingsAbove: number;
  longestGapMs: number;
};

function orderedReadings(readings: readonly TemperatureReading[]): TemperatureReading[] {
  for (const reading of readings) {
    if (!Number.isFinite(reading.atMs) || !Number.isFinite(reading.tempC)) {
      throw new RangeError("Every reading needs a finite time and temperature.");
    }
  }
  const sorted = [...readings].sort((a, b) => a.atMs - b.atMs || b.tempC - a.tempC);
  const unique: TemperatureReading[] = [];
  for (const reading of sorted) {
    if (unique.length && unique[unique.length - 1].atMs === reading.atMs) continue; // the higher one came first
    unique.push(reading);
  }
  return unique;
}

export function detectExcursions(readings: readonly TemperatureReading[], rule: ExcursionRule): DetectedExcursion[] {
  if (!Number.isFinite(rule.thresholdC)) throw new RangeError("The excursion threshold must be a finite temperature.");
  if (!Number.isFinite(rule.minDurationMs) || rule.minDurationMs < 0) throw new RangeError("The minimum duration must be zero or more.");
  const series = orderedReadings(readings);
  const found: DetectedExcursion[] = [];
  let current: (Omit<DetectedExcursion, "endMs" | "durationMs"> & { lastAtMs: number }) | null = null;

  const close = (endMs: number | null, lastAtMs: number) => {
    if (!current) return;
    const durationMs = (endMs ?? lastAtMs) - current.startMs;
    if (durationMs >= rule.minDurationMs) {
      const { lastAtMs: _last, ...rest } = current;
      found.push({ ...rest, endMs, durationMs });
    }
    current = null;
  };

  for (const reading of series) {
    const above = reading.tempC > rule.thresholdC;
    if (above && !current) {
      current = { startMs: reading.atMs, peakTempC: reading.tempC, peakAtMs: reading.atMs, readingsAbove: 1, longestGapMs: 0, lastAtMs: reading.atMs };
    } else if (above && current) {
      current.longestGapMs = Math.max(current.longestGapMs, reading.atMs - current.lastAtMs);
      current.lastAtMs = reading.atMs;
      current.readingsAbove += 1;
      if (reading.tempC > current.peakTempC) {
        current.peakTempC = reading.tempC;
        current.peakAtMs = reading.atMs;
      }
    } else if (!above && current) {
      current.longestGapMs = Math.max(current.longestGapMs, reading.atMs - current.lastAtMs);
      close(reading.atMs, current.lastAtMs);
    }
  }
  if (current) close(null, (current as { lastAtMs: number }).lastAtMs);
  return found;
}
