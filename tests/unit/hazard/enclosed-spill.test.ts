import { describe, expect, it } from 'vitest';
import { HazardInputError, enclosedSpillTimes } from '@/lib/hazard';

// A broken 1 L bottle of diethyl ether in a 250 L free volume at 4 °C; every figure worked by hand
// from EPA 550-B-99-009 App. D Eq. D-1 and p(t) = Psat·(1 − e^(−t/θ)).
const input = {
  liquidVolumeL: 1,
  liquidDensityKgPerM3: 713.4,
  molarMassGPerMol: 74.12,
  vaporPressureKPa: 25,
  tempC: 4,
  freeVolumeM3: 0.25,
  poolAreaM2: 0.1,
  windSpeedMPerS: 0.1,
  ambientPressureKPa: 101.325,
  lflVolPercent: 1.9,
  lflFractions: [0.25, 1],
};

describe('a broken bottle in a closed space', () => {
  const result = enclosedSpillTimes(input);

  it('evaporates at the Eq. D-1 rate: QR₀ = 0.284 × 0.1^0.78 × 74.12^(2/3) × 1.0764 ft² × 187.52 mmHg / (82.05 × 277.15) = 0.007382 lb/min = 0.05581 g/s', () => {
    expect(result.rateGPerS).toBeCloseTo(0.05581, 4);
  });

  it('approaches saturation with θ = Psat·V·M/(R·T·QR₀) = 25,000 × 0.25 × 74.12 / (8.3145 × 277.15 × 0.05581) = 3,602 s = 60.0 min', () => {
    expect(result.timeConstantMin).toBeCloseTo(60.04, 1);
  });

  it('reaches 25 % LFL (0.4813 kPa) after 70 s and the LFL (1.925 kPa) after 289 s', () => {
    // t = −3,602 × ln(1 − 0.4813/25) = 70.0 s; t = −3,602 × ln(1 − 1.9252/25) = 288.6 s.
    expect(result.times[0].minutes! * 60).toBeCloseTo(70.0, 0);
    expect(result.times[1].minutes! * 60).toBeCloseTo(288.6, 0);
    expect(result.times.map((t) => t.limitedBy)).toEqual([null, null]);
  });

  it('never reaches a level above the saturation pressure, or more than the whole bottle gives', () => {
    const weak = enclosedSpillTimes({ ...input, vaporPressureKPa: 1, lflFractions: [1] });
    expect(weak.times[0]).toEqual({ lflFraction: 1, minutes: null, limitedBy: 'saturation' });
    // 1 mL: (0.7134 g / 74.12) × 8.3145 × 277.15 / 0.25 m³ = 88.7 Pa < 1,925 Pa at the LFL.
    const small = enclosedSpillTimes({ ...input, liquidVolumeL: 0.001, lflFractions: [1] });
    expect(small.times[0].limitedBy).toBe('inventory');
    expect(small.maxLflFraction).toBeCloseTo(0.0887 / 1.925, 3);
  });

  it('rejects impossible input with a specific error', () => {
    expect(() => enclosedSpillTimes({ ...input, freeVolumeM3: 0 })).toThrow(HazardInputError);
    expect(() => enclosedSpillTimes({ ...input, lflFractions: [0] })).toThrow(/LFL fraction/);
  });
});
