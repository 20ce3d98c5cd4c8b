import { describe, expect, it } from 'vitest';
import { HazardInputError, warmUpMinutesToReach, warmUpTemperatureC } from '@/lib/hazard';

// Analytic cases of the exponential approach T(t) = T_room − (T_room − T_start)·e^(−t/τ), by hand.
const fridge = { roomTempC: 25, startTempC: 5, tauMin: 120 };

describe("Newton's law of heating", () => {
  it('after one time constant the unit has closed 1 − 1/e = 63.2 % of the gap', () => {
    // 25 − 20·e^(−1) = 25 − 7.3576 = 17.642 °C
    expect(warmUpTemperatureC(fridge, 120)).toBeCloseTo(17.642, 3);
    expect(warmUpTemperatureC(fridge, 0)).toBe(5);
    // three time constants: 25 − 20·e^(−3) = 24.004 °C
    expect(warmUpTemperatureC(fridge, 360)).toBeCloseTo(24.004, 3);
  });

  it('time to reach a temperature inverts it: half the gap after τ·ln 2', () => {
    // 15 °C is half-way from 5 to 25: t = 120·ln 2 = 83.18 min
    expect(warmUpMinutesToReach(fridge, 15)).toBeCloseTo(83.178, 3);
    expect(warmUpTemperatureC(fridge, warmUpMinutesToReach(fridge, 21.3)!)).toBeCloseTo(21.3, 10);
  });

  it('already there at the start → 0; at or above the room temperature → never (null)', () => {
    expect(warmUpMinutesToReach(fridge, 4)).toBe(0);
    expect(warmUpMinutesToReach(fridge, 5)).toBe(0);
    expect(warmUpMinutesToReach(fridge, 25)).toBeNull();
    expect(warmUpMinutesToReach(fridge, 30)).toBeNull();
  });

  it('rejects a non-positive τ and negative times with a specific error', () => {
    expect(() => warmUpTemperatureC({ ...fridge, tauMin: 0 }, 10)).toThrow(HazardInputError);
    expect(() => warmUpTemperatureC(fridge, -1)).toThrow(/minutes must be/);
  });
});
