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

function checkReading(reading: TemperatureReading): void {
  if (!Number.isFinite(reading.atMs) || !Number.isFinite(reading.tempC)) {
    throw new RangeError("Every reading needs a finite time and temperature.");
  }
}

function checkRule(rule: ExcursionRule): void {
  if (!Number.isFinite(rule.thresholdC)) throw new RangeError("The excursion threshold must be a finite temperature.");
  if (!Number.isFinite(rule.minDurationMs) || rule.minDurationMs < 0) throw new RangeError("The minimum duration must be zero or more.");
}

export type ExcursionDetector = {
  /**
   * The next reading, in time order (equal instants may follow each other; the higher temperature
   * counts). Returns the excursion this reading's predecessor completed, if any: a reading is
   * decided only once a later instant arrives.
   */
  push(reading: TemperatureReading): DetectedExcursion | null;
  /** No more readings: what is left (the last completed excursion and an open one), in time order. */
  finish(): DetectedExcursion[];
};

/**
 * The detector for readings that arrive sorted (a database cursor, a file in time order): constant
 * memory whatever the number of readings. `detectExcursions` is this detector over a sorted copy.
 */
export function createExcursionDetector(rule: ExcursionRule): ExcursionDetector {
  checkRule(rule);
  let pending: TemperatureReading | null = null;
  let finished = false;
  let current: (Omit<DetectedExcursion, "endMs" | "durationMs"> & { lastAtMs: number }) | null = null;

  const close = (endMs: number | null, lastAtMs: number): DetectedExcursion | null => {
    const open = current;
    current = null;
    if (!open) return null;
    const durationMs = (endMs ?? lastAtMs) - open.startMs;
    if (durationMs < rule.minDurationMs) return null;
    return { startMs: open.startMs, endMs, peakTempC: open.peakTempC, peakAtMs: open.peakAtMs, durationMs, readingsAbove: open.readingsAbove, longestGapMs: open.longestGapMs };
  };

  const take = (reading: TemperatureReading): DetectedExcursion | null => {
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
      return close(reading.atMs, current.lastAtMs);
    }
    return null;
  };

  return {
    push(reading) {
      if (finished) throw new Error("The detector has finished; create a new one.");
      checkReading(reading);
      if (!pending) {
        pending = { atMs: reading.atMs, tempC: reading.tempC };
        return null;
      }
      if (reading.atMs < pending.atMs) throw new RangeError("Readings must arrive in time order; sort them or use detectExcursions.");
      if (reading.atMs === pending.atMs) {
        if (reading.tempC > pending.tempC) pending.tempC = reading.tempC; // the conservative choice
        return null;
      }
      const completed = take(pending);
      pending = { atMs: reading.atMs, tempC: reading.tempC };
      return completed;
    },
    finish() {
      if (finished) return [];
      finished = true;
      const found: DetectedExcursion[] = [];
      if (pending) {
        const completed = take(pending);
        if (completed) found.push(completed);
      }
      if (current) {
        const open = close(null, (current as { lastAtMs: number }).lastAtMs);
        if (open) found.push(open);
      }
      return found;
    },
  };
}

export function detectExcursions(readings: readonly TemperatureReading[], rule: ExcursionRule): DetectedExcursion[] {
  checkRule(rule);
  readings.forEach(checkReading);
  const sorted = [...readings].sort((a, b) => a.atMs - b.atMs);
  const detector = createExcursionDetector(rule);
  const found: DetectedExcursion[] = [];
  for (const reading of sorted) {
    const completed = detector.push(reading);
    if (completed) found.push(completed);
  }
  found.push(...detector.finish());
  return found;
}
