import { HazardInputError } from './errors';
import { traceStep, traceValue, type Trace, type TraceStep } from './trace';
import { STANDARD_ATMOSPHERE_KPA, formatSig, molarVolumeLPerMol } from './units';
import { assertNonNegative, assertPositive, assertTempC } from './validate';

export type WellMixedRoomResult = {
  /** Ventilation rate Q = ACH·V/3600. */
  ventilationM3PerS: number;
  /** C_ss = G/(k·Q), capped at saturation; null when there is no ventilation and no cap (it grows without bound). */
  steadyStateMgPerM3: number | null;
  steadyStatePpm: number | null;
  /** C(t) at elapsedS, capped at saturation; null when no elapsed time was asked for. */
  atElapsedMgPerM3: number | null;
  atElapsedPpm: number | null;
  /** Time to reach 95 % of the uncapped steady state: ln 20 · V/(k·Q). Null without ventilation. */
  timeTo95PercentS: number | null;
  cappedAtSaturation: boolean;
  trace: Trace;
};

/**
 * Well-mixed room (box) model with a constant source G:
 * V·dC/dt = G − k·Q·C, so C_ss = G/(k·Q) and C(t) = C_ss·(1 − e^(−k·Q·t/V)) from clean air
 * (AIHA, Mathematical Models for Estimating Occupational Exposure to Chemicals, 2nd ed.;
 * Univ. of Toledo dilution-ventilation notes). Without ventilation C(t) = G·t/V.
 * Mixing factor convention: k multiplies Q, 0 < k ≤ 1 (1 = perfect mixing). The ACGIH-style
 * K ≥ 1 divides Q instead: pass k = 1/K. Capped at the saturated concentration when given.
 */
export function wellMixedRoom(input: {
  generationRateGPerS: number;
  roomVolumeM3: number;
  airChangesPerHour: number;
  mixingFactor: number;
  elapsedS?: number;
  molarMassGPerMol: number;
  tempC: number;
  ambientPressureKPa?: number;
  saturatedPpm?: number;
}): WellMixedRoomResult {
  assertNonNegative(input.generationRateGPerS, 'generationRateGPerS');
  assertPositive(input.roomVolumeM3, 'roomVolumeM3');
  assertNonNegative(input.airChangesPerHour, 'airChangesPerHour');
  assertPositive(input.mixingFactor, 'mixingFactor');
  if (input.mixingFactor > 1) {
    throw new HazardInputError(
      'out-of-range',
      'mixingFactor',
      `mixingFactor multiplies the ventilation rate and must lie in (0, 1] (got ${input.mixingFactor}); for an ACGIH-style K ≥ 1 pass 1/K`,
    );
  }
  if (input.elapsedS !== undefined) assertNonNegative(input.elapsedS, 'elapsedS');
  assertPositive(input.molarMassGPerMol, 'molarMassGPerMol');
  assertTempC(input.tempC);
  const ambientPressureKPa = input.ambientPressureKPa ?? STANDARD_ATMOSPHERE_KPA;
  assertPositive(ambientPressureKPa, 'ambientPressureKPa');
  if (input.saturatedPpm !== undefined) assertNonNegative(input.saturatedPpm, 'saturatedPpm');

  const molarVolume = molarVolumeLPerMol(input.tempC, ambientPressureKPa);
  const toPpm = (mgPerM3: number) => (mgPerM3 * molarVolume) / input.molarMassGPerMol;
  const capMgPerM3 = input.saturatedPpm === undefined ? null : (input.saturatedPpm * input.molarMassGPerMol) / molarVolume;
  const generationMgPerS = input.generationRateGPerS * 1000;
  const ventilationM3PerS = (input.airChangesPerHour * input.roomVolumeM3) / 3600;
  const effectiveM3PerS = input.mixingFactor * ventilationM3PerS;
  const steps: TraceStep[] = [
    traceStep(
      'Ventilation rate from air changes',
      'Q = ACH·V/3600',
      `Q = ${input.airChangesPerHour} × ${formatSig(input.roomVolumeM3, 5)} / 3600 = ${formatSig(ventilationM3PerS, 5)} m³/s`,
      traceValue('Ventilation rate', 'Q', ventilationM3PerS, 'm³/s'),
    ),
  ];
  let cappedAtSaturation = false;
  const cap = (mgPerM3: number): number => {
    if (capMgPerM3 !== null && mgPerM3 > capMgPerM3) {
      cappedAtSaturation = true;
      return capMgPerM3;
    }
    return mgPerM3;
  };

  let steadyStateMgPerM3: number | null = null;
  let timeTo95PercentS: number | null = null;
  if (effectiveM3PerS > 0) {
    const uncapped = generationMgPerS / effectiveM3PerS;
    steadyStateMgPerM3 = cap(uncapped);
    timeTo95PercentS = (Math.log(20) * input.roomVolumeM3) / effectiveM3PerS;
    steps.push(
      traceStep(
        'Steady state',
        'C_ss = G/(k·Q)',
        `C_ss = ${formatSig(generationMgPerS, 5)} mg/s / (${input.mixingFactor} × ${formatSig(ventilationM3PerS, 5)} m³/s) = ${formatSig(uncapped, 5)} mg/m³`,
        traceValue('Steady-state concentration', 'C_ss', uncapped, 'mg/m³'),
      ),
    );
  } else if (capMgPerM3 !== null) {
    steadyStateMgPerM3 = capMgPerM3;
    cappedAtSaturation = generationMgPerS > 0;
  }

  let atElapsedMgPerM3: number | null = null;
  if (input.elapsedS !== undefined) {
    const uncapped =
      effectiveM3PerS > 0
        ? (generationMgPerS / effectiveM3PerS) * (1 - Math.exp((-effectiveM3PerS * input.elapsedS) / input.roomVolumeM3))
        : (generationMgPerS * input.elapsedS) / input.roomVolumeM3;
    atElapsedMgPerM3 = cap(uncapped);
    steps.push(
      traceStep(
        `Concentration after ${formatSig(input.elapsedS, 5)} s`,
        effectiveM3PerS > 0 ? 'C(t) = C_ss·(1 − e^(−k·Q·t/V))' : 'C(t) = G·t/V (no ventilation)',
        `C(t) = ${formatSig(uncapped, 5)} mg/m³`,
        traceValue('Concentration at t', 'C(t)', uncapped, 'mg/m³'),
      ),
    );
  }
  if (capMgPerM3 !== null) {
    steps.push(
      traceStep(
        'Capped at the saturated concentration',
        'C ≤ C_sat',
        `C_sat = ${formatSig(input.saturatedPpm as number, 5)} ppm = ${formatSig(capMgPerM3, 5)} mg/m³${cappedAtSaturation ? ' (cap applies)' : ' (cap does not apply)'}`,
        traceValue('Saturated concentration', 'C_sat', capMgPerM3, 'mg/m³'),
      ),
    );
  }
  const headline = atElapsedMgPerM3 ?? steadyStateMgPerM3;
  const warnings = ['Room-average estimate: near the spill or source the concentration is higher (well-mixed model limit)'];
  if (effectiveM3PerS === 0 && capMgPerM3 === null) {
    warnings.push('No ventilation and no saturation cap: the steady state is unbounded; give the saturated concentration');
  }
  const result = traceValue(
    atElapsedMgPerM3 !== null ? 'Concentration at the elapsed time' : 'Steady-state concentration',
    atElapsedMgPerM3 !== null ? 'C(t)' : 'C_ss',
    headline === null ? 'unbounded' : toPpm(headline),
    headline === null ? '' : 'ppm',
  );
  return {
    ventilationM3PerS,
    steadyStateMgPerM3,
    steadyStatePpm: steadyStateMgPerM3 === null ? null : toPpm(steadyStateMgPerM3),
    atElapsedMgPerM3,
    atElapsedPpm: atElapsedMgPerM3 === null ? null : toPpm(atElapsedMgPerM3),
    timeTo95PercentS,
    cappedAtSaturation,
    trace: {
      method: 'Well-mixed room model',
      source:
        'AIHA, Mathematical Models for Estimating Occupational Exposure to Chemicals (2nd ed.); mass balance V·dC = G·dt − k·Q·C·dt (Univ. of Toledo dilution-ventilation formulae)',
      inputs: [
        traceValue('Generation (evaporation) rate', 'G', input.generationRateGPerS, 'g/s'),
        traceValue('Room volume', 'V', input.roomVolumeM3, 'm³'),
        traceValue('Air changes per hour', 'ACH', input.airChangesPerHour, '1/h'),
        traceValue('Mixing factor (multiplies Q)', 'k', input.mixingFactor, ''),
        ...(input.elapsedS !== undefined ? [traceValue('Elapsed time', 't', input.elapsedS, 's')] : []),
        traceValue('Molar mass', 'M', input.molarMassGPerMol, 'g/mol'),
        traceValue('Room temperature', 'T', input.tempC, '°C'),
      ],
      steps,
      result,
      warnings,
    },
  };
}
