/**
 * Per-run memo of the engine's results, so that Psat is computed once per (substance,
 * temperature, pressure) however many containers, rules and scenarios ask for it. Pass one cache
 * to every assessLocation call of a run to share it between locations; the keys are the snapshot
 * objects, so the cache lives as long as the snapshots do.
 */
import {
  HazardInputError,
  lowerFlammableTemperatureC,
  saturatedConcentration,
  temperatureAtSaturationPressureC,
  type SaturatedConcentrationResult,
} from "@/lib/hazard";
import type { SubstanceSnapshot } from "./types";

export type SaturationEntry = { readonly ok: true; readonly result: SaturatedConcentrationResult } | { readonly ok: false; readonly error: HazardInputError };
export type TemperatureEntry = { readonly ok: true; readonly tempC: number | null } | { readonly ok: false; readonly error: HazardInputError };

type PerSubstance = {
  /** tempC → entry, for one ambient pressure (the common case); other pressures go to `others`. */
  pressureKPa: number;
  saturation: Map<number, SaturationEntry>;
  others: Map<number, Map<number, SaturationEntry>> | null;
  boilingTempC: Map<number, TemperatureEntry> | null;
  lowerFlammableTempC: Map<number, TemperatureEntry> | null;
};

export type AssessmentCache = { readonly substances: WeakMap<SubstanceSnapshot, PerSubstance> };

export function createAssessmentCache(): AssessmentCache {
  return { substances: new WeakMap() };
}

function entryFor(cache: AssessmentCache, substance: SubstanceSnapshot, pressureKPa: number): PerSubstance {
  let entry = cache.substances.get(substance);
  if (entry === undefined) {
    entry = { pressureKPa, saturation: new Map(), others: null, boilingTempC: null, lowerFlammableTempC: null };
    cache.substances.set(substance, entry);
  }
  return entry;
}

function guarded<T>(compute: () => T): { ok: true; value: T } | { ok: false; error: HazardInputError } {
  try {
    return { ok: true, value: compute() };
  } catch (error) {
    if (error instanceof HazardInputError) return { ok: false, error };
    throw error;
  }
}

/** The saturated concentration of the pure substance at tempC and the given pressure (memoised; engine errors are kept, not thrown). */
export function cachedSaturation(cache: AssessmentCache, substance: SubstanceSnapshot, tempC: number, pressureKPa: number): SaturationEntry {
  const entry = entryFor(cache, substance, pressureKPa);
  let byTemp = entry.saturation;
  if (pressureKPa !== entry.pressureKPa) {
    entry.others ??= new Map();
    byTemp = entry.others.get(pressureKPa) ?? new Map();
    entry.others.set(pressureKPa, byTemp);
  }
  let found = byTemp.get(tempC);
  if (found === undefined) {
    const outcome = guarded(() => saturatedConcentration(substance.props, tempC, pressureKPa));
    found = outcome.ok ? { ok: true, result: outcome.value } : { ok: false, error: outcome.error };
    byTemp.set(tempC, found);
  }
  return found;
}

/** Temperature at which Psat reaches the ambient pressure: the boiling point at the site. */
export function cachedBoilingTempC(cache: AssessmentCache, substance: SubstanceSnapshot, pressureKPa: number): TemperatureEntry {
  const entry = entryFor(cache, substance, pressureKPa);
  entry.boilingTempC ??= new Map();
  let found = entry.boilingTempC.get(pressureKPa);
  if (found === undefined) {
    const outcome = guarded(() => temperatureAtSaturationPressureC(substance.props, pressureKPa));
    found = outcome.ok ? { ok: true, tempC: outcome.value } : { ok: false, error: outcome.error };
    entry.boilingTempC.set(pressureKPa, found);
  }
  return found;
}

/** Lower flammable temperature (Psat/Patm = LFL); null without an LFL. */
export function cachedLowerFlammableTempC(cache: AssessmentCache, substance: SubstanceSnapshot, pressureKPa: number): TemperatureEntry {
  const entry = entryFor(cache, substance, pressureKPa);
  entry.lowerFlammableTempC ??= new Map();
  let found = entry.lowerFlammableTempC.get(pressureKPa);
  if (found === undefined) {
    const outcome = guarded(() => lowerFlammableTemperatureC(substance.props, pressureKPa));
    found = outcome.ok ? { ok: true, tempC: outcome.value } : { ok: false, error: outcome.error };
    entry.lowerFlammableTempC.set(pressureKPa, found);
  }
  return found;
}
