/** Molar gas constant, J·mol⁻¹·K⁻¹ (CODATA 2018 exact value, 8.314462618…). */
export const GAS_CONSTANT_J_PER_MOL_K = 8.314462618;
/** 0 °C in kelvin (ITS-90 definition). */
export const KELVIN_OFFSET = 273.15;
export const ABSOLUTE_ZERO_C = -273.15;
/** Standard atmosphere, kPa (ISO 2533 / the definition of the normal boiling point). */
export const STANDARD_ATMOSPHERE_KPA = 101.325;
/** 1 mmHg = 101.325/760 kPa (conventional millimetre of mercury). */
export const KPA_PER_MMHG = 101.325 / 760;
/** International avoirdupois pound, exact. */
export const KG_PER_LB = 0.45359237;
/** International foot, exact: 1 ft = 0.3048 m. */
export const M2_PER_FT2 = 0.3048 * 0.3048;
export const PPM_PER_VOLUME_PERCENT = 10_000;

export type PressureUnit = 'Pa' | 'kPa' | 'bar' | 'mmHg' | 'atm';

export function celsiusToKelvin(tempC: number): number {
  return tempC + KELVIN_OFFSET;
}

/**
 * Ideal-gas molar volume Vm = R·T/P in L/mol (with P in kPa, R·T/P comes out in L/mol because
 * 1 J = 1 kPa·L). 24.465 L/mol at 25 °C and 101.325 kPa; the rounded 24.45 L/mol of the
 * ACGIH/NIOSH conversion is 0.06 % lower.
 */
export function molarVolumeLPerMol(tempC: number, pressureKPa: number): number {
  return (GAS_CONSTANT_J_PER_MOL_K * (tempC + KELVIN_OFFSET)) / pressureKPa;
}

/** Format a number for a message: at most `decimals` decimals, a true minus sign (−). */
export function formatNumber(value: number, decimals = 1): string {
  const rounded = Number(value.toFixed(decimals));
  const text = String(Math.abs(rounded));
  return rounded < 0 ? `\u2212${text}` : text;
}

/** Significant-figure formatting for trace text (never raw floats). */
export function formatSig(value: number, digits = 4): string {
  if (value === 0) return '0';
  const text = Number(value.toPrecision(digits)).toString();
  return text.startsWith('-') ? `\u2212${text.slice(1)}` : text;
}
