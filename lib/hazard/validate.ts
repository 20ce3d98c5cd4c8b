import { HazardInputError } from './errors';
import { ABSOLUTE_ZERO_C } from './units';

// Small guards shared by every entry point. They throw HazardInputError with the field name so
// that a caller can show the message beside the offending input.

export function assertFinite(value: number, field: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new HazardInputError('not-finite', field, `${field} must be a finite number (got ${String(value)})`);
  }
}

export function assertPositive(value: number, field: string): void {
  assertFinite(value, field);
  if (value <= 0) {
    throw new HazardInputError('not-positive', field, `${field} must be greater than zero (got ${value})`);
  }
}

export function assertNonNegative(value: number, field: string): void {
  assertFinite(value, field);
  if (value < 0) {
    throw new HazardInputError('negative', field, `${field} must not be negative (got ${value})`);
  }
}

/** A temperature in °C must be finite and strictly above 0 K (the formulas divide by T). */
export function assertTempC(tempC: number, field = 'tempC'): void {
  if (typeof tempC !== 'number' || !Number.isFinite(tempC)) {
    throw new HazardInputError('not-finite', field, `${field} must be a finite temperature in °C (got ${String(tempC)})`);
  }
  if (tempC <= ABSOLUTE_ZERO_C) {
    throw new HazardInputError(
      'below-absolute-zero',
      field,
      `${field} = ${tempC} °C is at or below absolute zero (−273.15 °C)`,
    );
  }
}

export function assertFraction(value: number, field: string): void {
  assertFinite(value, field);
  if (value < 0 || value > 1) {
    throw new HazardInputError('out-of-range', field, `${field} must lie between 0 and 1 (got ${value})`);
  }
}

export function assertNonEmpty<T>(items: readonly T[], field: string): void {
  if (!Array.isArray(items) || items.length === 0) {
    throw new HazardInputError('empty-input', field, `${field} must contain at least one entry`);
  }
}
