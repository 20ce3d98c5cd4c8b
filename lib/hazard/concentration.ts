import { GAS_CONSTANT_J_PER_MOL_K, KELVIN_OFFSET, STANDARD_ATMOSPHERE_KPA } from './units';
import { assertNonNegative, assertPositive, assertTempC } from './validate';

/**
 * mg/m³ = ppm × M / Vm, with Vm = R·T/P the ideal-gas molar volume (24.45 L/mol at 25 °C and
 * 1 atm in the ACGIH/NIOSH rounding; R·T/P gives 24.465). CCOHS OSH Answers "Converting
 * occupational exposure limits"; NIOSH NMAM Appendix A.
 */
export function ppmToMgPerM3(
  ppm: number,
  molarMassGPerMol: number,
  tempC = 25,
  pressureKPa = STANDARD_ATMOSPHERE_KPA,
): number {
  assertNonNegative(ppm, 'ppm');
  assertPositive(molarMassGPerMol, 'molarMassGPerMol');
  assertTempC(tempC);
  assertPositive(pressureKPa, 'pressureKPa');
  return (ppm * molarMassGPerMol * pressureKPa) / (GAS_CONSTANT_J_PER_MOL_K * (tempC + KELVIN_OFFSET));
}

/** ppm = mg/m³ × Vm / M (inverse of ppmToMgPerM3, same sources). */
export function mgPerM3ToPpm(
  mgPerM3: number,
  molarMassGPerMol: number,
  tempC = 25,
  pressureKPa = STANDARD_ATMOSPHERE_KPA,
): number {
  assertNonNegative(mgPerM3, 'mgPerM3');
  assertPositive(molarMassGPerMol, 'molarMassGPerMol');
  assertTempC(tempC);
  assertPositive(pressureKPa, 'pressureKPa');
  return (mgPerM3 * GAS_CONSTANT_J_PER_MOL_K * (tempC + KELVIN_OFFSET)) / (molarMassGPerMol * pressureKPa);
}
