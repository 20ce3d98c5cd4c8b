import { HazardInputError } from './errors';
import { epaRmpEvaporationRate } from './evaporation';
import { traceStep, traceValue, type Trace } from './trace';
import { GAS_CONSTANT_J_PER_MOL_K, KELVIN_OFFSET, formatSig } from './units';
import { assertPositive, assertTempC } from './validate';

/**
 * A broken bottle inside a closed space (a refrigerator, a cabinet): the pool evaporates into the
 * still air of the free volume at the EPA RMP Eq. D-1 rate, slowed as the air nears saturation —
 * the rate is proportional to the vapor-pressure deficit (Psat − p), the mass-transfer basis of
 * Eq. D-1 (Mackay & Matsugu 1973) — until the liquid is gone:
 *
 *   dp/dt = (R·T/V)·(QR₀/M)·(1 − p/Psat)  ⇒  p(t) = Psat·(1 − e^(−t/θ)),  θ = Psat·V·M/(R·T·QR₀)
 *
 * so a partial pressure p_target < Psat is reached after t = −θ·ln(1 − p_target/Psat), unless the whole bottle
 * has evaporated first (p ≤ n·R·T/V). No air leaves the space (the worst case for a closed door).
 */
export type EnclosedSpillInput = {
  /** The spilled volume, L. */
  liquidVolumeL: number;
  liquidDensityKgPerM3: number;
  molarMassGPerMol: number;
  /** Saturation vapor pressure at the temperature of the space. */
  vaporPressureKPa: number;
  tempC: number;
  /** The air in the space, m³. */
  freeVolumeM3: number;
  poolAreaM2: number;
  windSpeedMPerS: number;
  ambientPressureKPa: number;
  lflVolPercent: number;
  /** Fractions of the LFL to time, e.g. [0.25, 1]. */
  lflFractions: readonly number[];
};

export type EnclosedSpillTime = {
  lflFraction: number;
  /** Minutes after the spill; null when never reached (saturation or the bottle's contents fall short). */
  minutes: number | null;
  /** Why it is never reached, when it is not. */
  limitedBy: 'saturation' | 'inventory' | null;
};

export type EnclosedSpillResult = {
  rateGPerS: number;
  timeConstantMin: number;
  /** The highest fraction of the LFL the air could reach: at saturation, or when all of it has evaporated. */
  maxLflFraction: number;
  times: EnclosedSpillTime[];
  trace: Trace;
};

export function enclosedSpillTimes(input: EnclosedSpillInput): EnclosedSpillResult {
  assertPositive(input.liquidVolumeL, 'liquidVolumeL');
  assertPositive(input.liquidDensityKgPerM3, 'liquidDensityKgPerM3');
  assertPositive(input.molarMassGPerMol, 'molarMassGPerMol');
  assertPositive(input.vaporPressureKPa, 'vaporPressureKPa');
  assertTempC(input.tempC);
  assertPositive(input.freeVolumeM3, 'freeVolumeM3');
  assertPositive(input.ambientPressureKPa, 'ambientPressureKPa');
  assertPositive(input.lflVolPercent, 'lflVolPercent');
  for (const fraction of input.lflFractions) {
    if (!(fraction > 0) || !Number.isFinite(fraction)) throw new HazardInputError('not-positive', 'lflFractions', `each LFL fraction must be a positive number (got ${String(fraction)})`);
  }
  const tempK = input.tempC + KELVIN_OFFSET;
  // Psat cannot exceed the ambient pressure in an open-to-room space: a boiling liquid fills it with vapor.
  const psatKPa = Math.min(input.vaporPressureKPa, input.ambientPressureKPa);
  const evaporation = epaRmpEvaporationRate({
    molarMassGPerMol: input.molarMassGPerMol,
    vaporPressureKPa: psatKPa,
    tempC: input.tempC,
    poolAreaM2: input.poolAreaM2,
    windSpeedMPerS: input.windSpeedMPerS,
  });
  const rateGPerS = evaporation.rateGPerS;
  // a = (R·T/V)·(QR₀/M) in kPa/s; θ = Psat/a.
  const aKPaPerS = ((GAS_CONSTANT_J_PER_MOL_K * tempK) / input.freeVolumeM3) * (rateGPerS / input.molarMassGPerMol) / 1000;
  const thetaS = psatKPa / aKPaPerS;
  const massG = input.liquidVolumeL * input.liquidDensityKgPerM3; // L × kg/m³ = g
  const inventoryKPa = ((massG / input.molarMassGPerMol) * GAS_CONSTANT_J_PER_MOL_K * tempK) / input.freeVolumeM3 / 1000;
  const lflKPa = (input.lflVolPercent / 100) * input.ambientPressureKPa;
  const maxKPa = Math.min(psatKPa, inventoryKPa);
  const times: EnclosedSpillTime[] = input.lflFractions.map((lflFraction) => {
    const targetKPa = lflFraction * lflKPa;
    if (targetKPa >= psatKPa) return { lflFraction, minutes: null, limitedBy: 'saturation' };
    if (targetKPa > inventoryKPa) return { lflFraction, minutes: null, limitedBy: 'inventory' };
    return { lflFraction, minutes: (-thetaS * Math.log(1 - targetKPa / psatKPa)) / 60, limitedBy: null };
  });
  const timeText = times
    .map((t) =>
      t.minutes === null
        ? `${formatSig(t.lflFraction * 100, 3)} % LFL (${formatSig(t.lflFraction * lflKPa, 4)} kPa): never — ${t.limitedBy === 'saturation' ? 'above the saturation pressure' : 'more than the whole bottle gives'}`
        : `${formatSig(t.lflFraction * 100, 3)} % LFL (${formatSig(t.lflFraction * lflKPa, 4)} kPa): t = −${formatSig(thetaS / 60, 4)} × ln(1 − ${formatSig(t.lflFraction * lflKPa, 4)}/${formatSig(psatKPa, 4)}) = ${formatSig(t.minutes, 3)} min`,
    )
    .join('; ');
  const result = traceValue('Time to the first fraction of the LFL', 't', times[0]?.minutes ?? '—', 'min');
  return {
    rateGPerS,
    timeConstantMin: thetaS / 60,
    maxLflFraction: maxKPa / lflKPa,
    times,
    trace: {
      method: 'A broken bottle in a closed space: pool evaporation into still air, slowed as the air saturates',
      source:
        'Evaporation rate US EPA RMP Offsite Consequence Analysis Guidance (EPA 550-B-99-009) App. D Eq. D-1, proportional to the vapor-pressure deficit (its mass-transfer basis, Mackay & Matsugu 1973); ideal gas in the free volume',
      inputs: [
        traceValue('Spilled volume', 'V_liq', input.liquidVolumeL, 'L'),
        traceValue('Free volume of the space', 'V', input.freeVolumeM3, 'm³'),
        traceValue('Pool area', 'A', input.poolAreaM2, 'm²'),
        traceValue('Air speed', 'U', input.windSpeedMPerS, 'm/s'),
        traceValue('Vapor pressure', 'Psat', psatKPa, 'kPa'),
        traceValue('LFL', 'LFL', input.lflVolPercent, '% by volume'),
      ],
      steps: [
        traceStep(
          'Evaporation rate into clean air (Eq. D-1)',
          'QR₀ = 0.284·U^0.78·MW^(2/3)·A·VP / (82.05·T)',
          `QR₀ = ${formatSig(rateGPerS, 4)} g/s`,
          traceValue('Evaporation rate', 'QR₀', rateGPerS, 'g/s'),
        ),
        traceStep(
          'Time constant of the approach to saturation',
          'θ = Psat·V·M / (R·T·QR₀)',
          `θ = ${formatSig(psatKPa * 1000, 5)} Pa × ${formatSig(input.freeVolumeM3, 4)} m³ × ${input.molarMassGPerMol} g/mol / (8.314 × ${formatSig(tempK, 5)} K × ${formatSig(rateGPerS, 4)} g/s) = ${formatSig(thetaS / 60, 4)} min`,
          traceValue('Time constant', 'θ', thetaS / 60, 'min'),
        ),
        traceStep(
          'Most the bottle can give: all of it evaporated',
          'p_max = (m/M)·R·T / V',
          `p_max = (${formatSig(massG, 4)} g / ${input.molarMassGPerMol} g/mol) × 8.314 × ${formatSig(tempK, 5)} K / ${formatSig(input.freeVolumeM3, 4)} m³ = ${formatSig(inventoryKPa, 4)} kPa`,
          traceValue('Partial pressure if all evaporated', 'p_max', inventoryKPa, 'kPa'),
        ),
        traceStep('Time to each fraction of the LFL', 'p(t) = Psat·(1 − e^(−t/θ)) ⇒ t = −θ·ln(1 − p*/Psat)', timeText, result),
      ],
      result,
      warnings: [
        ...evaporation.trace.warnings,
        'Screening estimate: a closed door and no air exchange; the pool area and the air speed inside the space are assumptions.',
      ],
    },
  };
}
