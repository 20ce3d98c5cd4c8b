import { HazardInputError } from './errors';
import { assertPositive, assertTempC } from './validate';

/**
 * Newton's law of heating for a temperature-controlled unit after its cooling fails: it warms
 * towards its room's temperature as T(t) = T_room − (T_room − T_start)·e^(−t/τ), with τ the unit's
 * time constant (its heat capacity over the heat conductance of its walls and seals).
 */
export type WarmUp = {
  /** The temperature the unit warms towards (its room's), °C. */
  roomTempC: number;
  /** The unit's temperature when the cooling fails, °C. */
  startTempC: number;
  /** The time constant τ, minutes. */
  tauMin: number;
};

function validateWarmUp(warmUp: WarmUp): void {
  assertTempC(warmUp.roomTempC, 'roomTempC');
  assertTempC(warmUp.startTempC, 'startTempC');
  assertPositive(warmUp.tauMin, 'tauMin');
}

/** The unit's temperature `minutes` after the failure, °C. */
export function warmUpTemperatureC(warmUp: WarmUp, minutes: number): number {
  validateWarmUp(warmUp);
  if (typeof minutes !== 'number' || !Number.isFinite(minutes) || minutes < 0) {
    throw new HazardInputError('out-of-range', 'minutes', `minutes must be a finite number ≥ 0 (got ${String(minutes)})`);
  }
  return warmUp.roomTempC - (warmUp.roomTempC - warmUp.startTempC) * Math.exp(-minutes / warmUp.tauMin);
}

/**
 * Minutes after the failure at which the unit reaches `targetTempC`: t = −τ·ln((T_room − T)/(T_room − T_start)).
 * 0 when the unit is already at or above the target at the start; null when it never gets there
 * (the target is at or above the room's temperature, which the unit only approaches).
 */
export function warmUpMinutesToReach(warmUp: WarmUp, targetTempC: number): number | null {
  validateWarmUp(warmUp);
  assertTempC(targetTempC, 'targetTempC');
  if (targetTempC <= warmUp.startTempC) return 0;
  if (targetTempC >= warmUp.roomTempC) return null;
  return -warmUp.tauMin * Math.log((warmUp.roomTempC - targetTempC) / (warmUp.roomTempC - warmUp.startTempC));
}
