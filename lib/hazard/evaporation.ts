import { HazardInputError } from './errors';
import { traceStep, traceValue, type Trace } from './trace';
import { GAS_CONSTANT_J_PER_MOL_K, KELVIN_OFFSET, KG_PER_LB, KPA_PER_MMHG, M2_PER_FT2, formatSig } from './units';
import { assertPositive, assertTempC } from './validate';

/**
 * Depth to which an undiked spill spreads: 1 cm (US EPA RMP Offsite Consequence Analysis
 * Guidance, EPA 550-B-99-009; DOE-STD-3014-96). A default only; the caller may pass another.
 */
export const EPA_RMP_POOL_DEPTH_M = 0.01;

/** Grams per second in one pound per minute: 453.59237 g / 60 s. */
const G_PER_S_PER_LB_PER_MIN = (KG_PER_LB * 1000) / 60;

/**
 * Area of a spill pool: A = V/h, capped at the floor or bund area when one is given.
 */
export function spillPoolArea(input: { volumeL: number; depthM?: number; maxAreaM2?: number }): {
  areaM2: number;
  depthM: number;
  limitedByMaxArea: boolean;
  trace: Trace;
} {
  assertPositive(input.volumeL, 'volumeL');
  const depthM = input.depthM ?? EPA_RMP_POOL_DEPTH_M;
  assertPositive(depthM, 'depthM');
  if (input.maxAreaM2 !== undefined) assertPositive(input.maxAreaM2, 'maxAreaM2');
  const spreadAreaM2 = input.volumeL / 1000 / depthM;
  const limitedByMaxArea = input.maxAreaM2 !== undefined && input.maxAreaM2 < spreadAreaM2;
  const areaM2 = limitedByMaxArea ? (input.maxAreaM2 as number) : spreadAreaM2;
  const result = traceValue('Pool area', 'A', areaM2, 'm²');
  return {
    areaM2,
    depthM,
    limitedByMaxArea,
    trace: {
      method: 'Spill pool area from volume and depth',
      source: 'Pool depth 1 cm for an undiked spill: US EPA RMP Offsite Consequence Analysis Guidance (EPA 550-B-99-009); DOE-STD-3014-96',
      inputs: [
        traceValue('Spilled volume', 'V', input.volumeL, 'L'),
        traceValue('Pool depth', 'h', depthM, 'm', input.depthM === undefined ? 'default: EPA RMP guidance, 1 cm' : 'input'),
        ...(input.maxAreaM2 !== undefined ? [traceValue('Largest possible area (floor or bund)', 'A_max', input.maxAreaM2, 'm²')] : []),
      ],
      steps: [
        traceStep(
          limitedByMaxArea ? 'Pool area, limited by the floor or bund area' : 'Pool area',
          'A = min(V/h, A_max)',
          `A = ${formatSig(input.volumeL / 1000, 4)} m³ / ${depthM} m = ${formatSig(spreadAreaM2, 4)} m²${limitedByMaxArea ? ` → ${formatSig(areaM2, 4)} m²` : ''}`,
          result,
        ),
      ],
      result,
      warnings: [],
    },
  };
}

type PoolInput = {
  molarMassGPerMol: number;
  /** Saturation vapor pressure at the pool temperature. */
  vaporPressureKPa: number;
  tempC: number;
  poolAreaM2: number;
  windSpeedMPerS: number;
};

function validatePool(input: PoolInput): void {
  assertPositive(input.molarMassGPerMol, 'molarMassGPerMol');
  assertPositive(input.vaporPressureKPa, 'vaporPressureKPa');
  assertTempC(input.tempC);
  assertPositive(input.poolAreaM2, 'poolAreaM2');
  assertPositive(input.windSpeedMPerS, 'windSpeedMPerS');
}

function indoorWarnings(windSpeedMPerS: number): string[] {
  return windSpeedMPerS < 1
    ? [
        `Air speed ${formatSig(windSpeedMPerS, 3)} m/s: the correlation was fitted to outdoor wind; indoor air (≈ 0.1 m/s, 20 ft/min in laboratories) is outside its basis, so the rate is an order-of-magnitude estimate`,
      ]
    : [];
}

export type EvaporationRateResult = { rateGPerS: number; trace: Trace };

/**
 * US EPA RMP Offsite Consequence Analysis Guidance, Appendix D, Eq. D-1 (pool evaporation):
 * QR = 0.284·U^0.78·MW^(2/3)·A·VP / (82.05·T), QR in lb/min, U in m/s, A in ft², VP in mmHg,
 * T in K. SI: 1 lb/min = 7.5599 g/s, 1 ft² = 0.092903 m².
 */
export function epaRmpEvaporationRate(input: PoolInput): EvaporationRateResult & { rateLbPerMin: number } {
  validatePool(input);
  const tempK = input.tempC + KELVIN_OFFSET;
  const areaFt2 = input.poolAreaM2 / M2_PER_FT2;
  const vaporPressureMmHg = input.vaporPressureKPa / KPA_PER_MMHG;
  const rateLbPerMin =
    (0.284 * Math.pow(input.windSpeedMPerS, 0.78) * Math.pow(input.molarMassGPerMol, 2 / 3) * areaFt2 * vaporPressureMmHg) / (82.05 * tempK);
  const rateGPerS = rateLbPerMin * G_PER_S_PER_LB_PER_MIN;
  const result = traceValue('Evaporation rate', 'QR', rateGPerS, 'g/s');
  return {
    rateGPerS,
    rateLbPerMin,
    trace: {
      method: 'Pool evaporation, US EPA RMP Eq. D-1',
      source:
        'US EPA, Risk Management Program Guidance for Offsite Consequence Analysis (EPA 550-B-99-009), Appendix D, Eq. D-1; mass-transfer basis Mackay & Matsugu (1973)',
      inputs: [
        traceValue('Wind (air) speed', 'U', input.windSpeedMPerS, 'm/s'),
        traceValue('Molar mass', 'MW', input.molarMassGPerMol, 'g/mol'),
        traceValue('Pool area', 'A', input.poolAreaM2, 'm²'),
        traceValue('Vapor pressure at pool temperature', 'VP', input.vaporPressureKPa, 'kPa'),
        traceValue('Pool temperature', 'T', input.tempC, '°C'),
      ],
      steps: [
        traceStep(
          'Convert to the equation units',
          'A[ft²] = A[m²]/0.092903; VP[mmHg] = VP[kPa]/0.133322; T[K] = t + 273.15',
          `A = ${formatSig(areaFt2, 5)} ft²; VP = ${formatSig(vaporPressureMmHg, 5)} mmHg; T = ${formatSig(tempK, 6)} K`,
          traceValue('Pool area', 'A', areaFt2, 'ft²'),
        ),
        traceStep(
          'Evaporation rate, Eq. D-1',
          'QR = 0.284·U^0.78·MW^(2/3)·A·VP / (82.05·T)',
          `QR = 0.284 × ${input.windSpeedMPerS}^0.78 × ${input.molarMassGPerMol}^(2/3) × ${formatSig(areaFt2, 5)} × ${formatSig(vaporPressureMmHg, 5)} / (82.05 × ${formatSig(tempK, 6)}) = ${formatSig(rateLbPerMin, 5)} lb/min`,
          traceValue('Evaporation rate', 'QR', rateLbPerMin, 'lb/min'),
        ),
        traceStep('Convert to SI', 'QR[g/s] = QR[lb/min] × 453.59237/60', `QR = ${formatSig(rateGPerS, 5)} g/s`, result),
      ],
      result,
      warnings: indoorWarnings(input.windSpeedMPerS),
    },
  };
}

/**
 * Mackay & Matsugu (1973, Can. J. Chem. Eng.) mass-transfer correlation:
 * k_m = 0.0292·U^0.78·X^(−0.11)·Sc^(−0.67), k_m and U in m/h, X the pool diameter in m, Sc the
 * gas-phase Schmidt number; flux into clean air N = k_m·A·Psat·M/(R·T).
 * Check the coefficients against the paper before relying on the absolute value; the spill rules
 * use the EPA RMP equation (D-1) by default.
 */
export function mackayMatsuguEvaporationRate(
  input: PoolInput & { schmidtNumber: number; poolDiameterM?: number },
): EvaporationRateResult & { massTransferCoefficientMPerS: number } {
  validatePool(input);
  assertPositive(input.schmidtNumber, 'schmidtNumber');
  if (input.poolDiameterM !== undefined) assertPositive(input.poolDiameterM, 'poolDiameterM');
  const diameterM = input.poolDiameterM ?? Math.sqrt((4 * input.poolAreaM2) / Math.PI);
  const windMPerH = input.windSpeedMPerS * 3600;
  const coefficientMPerH = 0.0292 * Math.pow(windMPerH, 0.78) * Math.pow(diameterM, -0.11) * Math.pow(input.schmidtNumber, -0.67);
  const massTransferCoefficientMPerS = coefficientMPerH / 3600;
  const tempK = input.tempC + KELVIN_OFFSET;
  const rateGPerS =
    (massTransferCoefficientMPerS * input.poolAreaM2 * input.vaporPressureKPa * 1000 * input.molarMassGPerMol) / (GAS_CONSTANT_J_PER_MOL_K * tempK);
  if (!Number.isFinite(rateGPerS)) throw new HazardInputError('out-of-range', 'input', 'The evaporation rate is not finite');
  const result = traceValue('Evaporation rate', 'N', rateGPerS, 'g/s');
  return {
    rateGPerS,
    massTransferCoefficientMPerS,
    trace: {
      method: 'Pool evaporation, Mackay–Matsugu mass transfer',
      source: 'D. Mackay and R. S. Matsugu, Can. J. Chem. Eng. (1973); flux form N = k·A·Psat·M/(R·T) for evaporation into clean air',
      inputs: [
        traceValue('Wind (air) speed', 'U', input.windSpeedMPerS, 'm/s'),
        traceValue('Pool diameter', 'X', diameterM, 'm', input.poolDiameterM === undefined ? 'from the area, X = √(4A/π)' : 'input'),
        traceValue('Gas-phase Schmidt number', 'Sc', input.schmidtNumber, ''),
        traceValue('Pool area', 'A', input.poolAreaM2, 'm²'),
        traceValue('Vapor pressure at pool temperature', 'Psat', input.vaporPressureKPa, 'kPa'),
        traceValue('Molar mass', 'M', input.molarMassGPerMol, 'g/mol'),
        traceValue('Pool temperature', 'T', input.tempC, '°C'),
      ],
      steps: [
        traceStep(
          'Mass-transfer coefficient',
          'k_m[m/h] = 0.0292·U[m/h]^0.78·X^(−0.11)·Sc^(−0.67)',
          `k_m = 0.0292 × ${formatSig(windMPerH, 5)}^0.78 × ${formatSig(diameterM, 4)}^(−0.11) × ${input.schmidtNumber}^(−0.67) = ${formatSig(coefficientMPerH, 5)} m/h`,
          traceValue('Mass-transfer coefficient', 'k_m', massTransferCoefficientMPerS, 'm/s'),
        ),
        traceStep(
          'Evaporation rate into clean air',
          'N = k_m·A·Psat·M/(R·T)',
          `N = ${formatSig(massTransferCoefficientMPerS, 5)} × ${formatSig(input.poolAreaM2, 4)} × ${formatSig(input.vaporPressureKPa * 1000, 5)} × ${input.molarMassGPerMol} / (${GAS_CONSTANT_J_PER_MOL_K} × ${formatSig(tempK, 6)}) = ${formatSig(rateGPerS, 5)} g/s`,
          result,
        ),
      ],
      result,
      warnings: [
        ...indoorWarnings(input.windSpeedMPerS),
        ...(input.vaporPressureKPa > 0.5 * 101.325
          ? ['Vapor pressure above half an atmosphere: the dilute-flux form underestimates evaporation (Mackay correction not applied)']
          : []),
      ],
    },
  };
}
