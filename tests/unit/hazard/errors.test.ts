import { describe, expect, it } from 'vitest';
import {
  HazardInputError,
  additiveExposureIndex,
  dryIceRelease,
  enclosureBound,
  epaRmpEvaporationRate,
  ghsFlammableCategory,
  integratedClausiusClapeyron,
  leChatelierLflVolPercent,
  liquidNitrogenRelease,
  lowerFlammableTemperatureC,
  mgPerM3ToPpm,
  nfpaLiquidClass,
  ppmToMgPerM3,
  raoultMixture,
  rollUpQuantities,
  saturatedConcentration,
  saturationPressure,
  troutonEnthalpyKJPerMol,
  wellMixedRoom,
  type HazardErrorCode,
  type VaporPressureCorrelation,
  type VaporProperties,
} from '@/lib/hazard';

const antoine: VaporPressureCorrelation = {
  kind: 'antoine',
  log: 'log10',
  pressureUnit: 'bar',
  temperatureUnit: 'K',
  a: 4.05043,
  b: 1327.62,
  c: -55.525,
  tMinC: 13.29,
  tMaxC: 136.46,
};
const good: VaporProperties = { molarMassGPerMol: 92.141, correlations: [antoine] };

function expectHazardError(run: () => unknown, code: HazardErrorCode, field?: RegExp): void {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(HazardInputError);
    const hazardError = error as HazardInputError;
    expect(hazardError.code).toBe(code);
    expect(hazardError.message.length).toBeGreaterThan(10);
    if (field) expect(hazardError.field).toMatch(field);
    return;
  }
  throw new Error('expected a HazardInputError');
}

describe('saturationPressure and saturatedConcentration reject nonsense with the typed error', () => {
  it.each([
    ['NaN', Number.NaN, 'not-finite'],
    ['Infinity', Number.POSITIVE_INFINITY, 'not-finite'],
    ['−Infinity', Number.NEGATIVE_INFINITY, 'not-finite'],
    ['−300 °C (below 0 K)', -300, 'below-absolute-zero'],
    ['exactly 0 K', -273.15, 'below-absolute-zero'],
  ] as const)('temperature %s', (_label, tempC, code) => {
    expectHazardError(() => saturationPressure(good, tempC), code, /tempC/);
    expectHazardError(() => saturatedConcentration(good, tempC), code, /tempC/);
  });

  it.each([
    ['zero', 0, 'not-positive'],
    ['negative', -18, 'not-positive'],
    ['NaN', Number.NaN, 'not-finite'],
    ['Infinity', Number.POSITIVE_INFINITY, 'not-finite'],
  ] as const)('molar mass %s', (_label, molarMassGPerMol, code) => {
    expectHazardError(() => saturationPressure({ ...good, molarMassGPerMol }, 20), code, /molarMassGPerMol/);
  });

  it('a correlation whose range is empty or inverted (tMin ≥ tMax)', () => {
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...antoine, tMinC: 60, tMaxC: 60 }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...antoine, tMinC: 80, tMaxC: 10 }] }, 20), 'invalid-correlation');
  });

  it('a correlation with a NaN range', () => {
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...antoine, tMaxC: Number.NaN }] }, 20), 'invalid-correlation');
  });

  it('a correlation with NaN or infinite coefficients, even when another covers T', () => {
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...antoine, b: Number.NaN }] }, 20), 'invalid-correlation');
    expectHazardError(
      () => saturationPressure({ ...good, correlations: [antoine, { kind: 'dippr101', c1: 1, c2: 1, c3: 1, c4: Number.POSITIVE_INFINITY, c5: 2, tMinC: -50, tMaxC: 300 }] }, 20),
      'invalid-correlation',
      /correlations\[1\]/,
    );
  });

  it('a correlation with an unknown unit or form', () => {
    const badUnit = { ...antoine, pressureUnit: 'psi' } as unknown as VaporPressureCorrelation;
    expectHazardError(() => saturationPressure({ ...good, correlations: [badUnit] }, 20), 'invalid-correlation');
    const badLog = { ...antoine, log: 'log2' } as unknown as VaporPressureCorrelation;
    expectHazardError(() => saturationPressure({ ...good, correlations: [badLog] }, 20), 'invalid-correlation');
  });

  it('a Wagner set without a usable reducing point, coefficients or one exponent per coefficient, with the reason named', () => {
    // VDI Heat Atlas 2nd ed. (2010), D3.1: acetone, Wagner 2.5-5 form.
    const wagner = { kind: 'wagner' as const, reducingTempK: 508.1, reducingPressureKPa: 4692, coefficients: [-7.67033, 1.96469, -2.4438, -2.90162], exponents: [1, 1.5, 2.5, 5], tMinC: -94.8, tMaxC: 234.95 };
    expect(() => saturationPressure({ ...good, correlations: [wagner] }, 20)).not.toThrow();
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...wagner, exponents: [1, 1.5] }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [{ ...wagner, exponents: [1, 1.5] }] }, 20)).toThrow(/one exponent per coefficient \(4\)/);
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...wagner, reducingTempK: 0 }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [{ ...wagner, reducingTempK: 0 }] }, 20)).toThrow(/reducing temperature/);
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...wagner, reducingPressureKPa: -1 }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [{ ...wagner, reducingPressureKPa: -1 }] }, 20)).toThrow(/reducing pressure/);
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...wagner, coefficients: [] , exponents: [] }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [{ ...wagner, coefficients: [] , exponents: [] }] }, 20)).toThrow(/1 to 8 numbers/);
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...wagner, exponents: [1, 1.5, 2.5, -5] }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [{ ...wagner, exponents: [1, 1.5, 2.5, -5] }] }, 20)).toThrow(/exponent 4 must be a positive number/);
    expectHazardError(() => saturationPressure({ ...good, correlations: [{ ...wagner, tMinC: 240, tMaxC: 300 }] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [{ ...wagner, tMinC: 240, tMaxC: 300 }] }, 20)).toThrow(/at or above the reducing temperature/);
    const badLine = { ...wagner, line: 'solid-liquid' } as unknown as VaporPressureCorrelation;
    expectHazardError(() => saturationPressure({ ...good, correlations: [badLine] }, 20), 'invalid-correlation', /correlations\[0\]/);
    expect(() => saturationPressure({ ...good, correlations: [badLine] }, 20)).toThrow(/line must be/);
  });

  it('no method available (no correlation, no boiling point)', () => {
    expectHazardError(() => saturationPressure({ molarMassGPerMol: 50 }, 20), 'no-method');
    expectHazardError(() => saturationPressure({ molarMassGPerMol: 50, correlations: [] }, 20), 'no-method');
  });

  it('non-finite optional properties and a non-positive ΔHvap', () => {
    expectHazardError(() => saturationPressure({ molarMassGPerMol: 50, normalBoilingPointC: Number.NaN }, 20), 'not-finite');
    expectHazardError(() => saturationPressure({ molarMassGPerMol: 50, normalBoilingPointC: 60, enthalpyOfVaporizationKJPerMol: 0 }, 20), 'not-positive');
    expectHazardError(() => saturationPressure({ ...good, meltingPointC: Number.NaN }, 20), 'not-finite');
  });

  it('an Antoine set extrapolated to where T + C ≤ 0', () => {
    // The Poling toluene set has C = −55.525 K: undefined at and below 55.5 K (−217.6 °C).
    expectHazardError(() => saturationPressure(good, -230), 'correlation-singular');
  });

  it('an ambient pressure that is zero, negative or not finite', () => {
    expectHazardError(() => saturatedConcentration(good, 20, 0), 'not-positive', /ambientPressureKPa/);
    expectHazardError(() => saturatedConcentration(good, 20, -1), 'not-positive');
    expectHazardError(() => saturatedConcentration(good, 20, Number.NaN), 'not-finite');
  });

  it('missing properties', () => {
    expectHazardError(() => saturationPressure(null as unknown as VaporProperties, 20), 'empty-input');
  });
});

describe('the other entry points validate too', () => {
  it('Clausius–Clapeyron and Trouton', () => {
    expectHazardError(() => integratedClausiusClapeyron({ tempC: 56, pressureKPa: 0, enthalpyKJPerMol: 30 }, 25), 'not-positive');
    expectHazardError(() => integratedClausiusClapeyron({ tempC: 56, pressureKPa: 101.325, enthalpyKJPerMol: -1 }, 25), 'not-positive');
    expectHazardError(() => integratedClausiusClapeyron({ tempC: 56, pressureKPa: 101.325, enthalpyKJPerMol: 30 }, Number.NaN), 'not-finite');
    expectHazardError(() => troutonEnthalpyKJPerMol(-274), 'below-absolute-zero');
  });

  it('unit conversions', () => {
    expectHazardError(() => ppmToMgPerM3(-1, 58), 'negative');
    expectHazardError(() => ppmToMgPerM3(1, 0), 'not-positive');
    expectHazardError(() => mgPerM3ToPpm(1, 58, Number.NaN), 'not-finite');
    expectHazardError(() => mgPerM3ToPpm(1, 58, 25, 0), 'not-positive');
  });

  it('classification', () => {
    expectHazardError(() => ghsFlammableCategory(Number.NaN, 50), 'not-finite');
    expectHazardError(() => nfpaLiquidClass(10, Number.POSITIVE_INFINITY), 'not-finite');
  });

  it('flammability and mixtures', () => {
    expectHazardError(() => leChatelierLflVolPercent([]), 'empty-input');
    expectHazardError(() => leChatelierLflVolPercent([{ moleFraction: 0.5, lflVolPercent: 0 }]), 'not-positive');
    expectHazardError(() => leChatelierLflVolPercent([{ moleFraction: 0, lflVolPercent: 1 }]), 'not-positive');
    expectHazardError(() => lowerFlammableTemperatureC({ ...good, lflVolPercent: 150 }), 'out-of-range');
    expectHazardError(() => raoultMixture({ tempC: 20, components: [{ moleFraction: 0.5, props: good }] }), 'out-of-range');
    expectHazardError(
      () =>
        additiveExposureIndex([
          { concentrationPpm: 1, molarMassGPerMol: 58, limit: { kind: 'TWA', value: 1, unit: 'ppm' } },
          { concentrationPpm: 1, molarMassGPerMol: 58, limit: { kind: 'STEL', value: 1, unit: 'ppm' } },
        ]),
      'invalid-option',
    );
  });

  it('enclosure, spill and room', () => {
    expectHazardError(() => enclosureBound({ props: good, tempC: 20, freeVolumeM3: 0, containers: [{ massG: 1, open: true }], scenario: 'largest-container' }), 'not-positive');
    expectHazardError(() => enclosureBound({ props: good, tempC: 20, freeVolumeM3: 1, containers: [], scenario: 'largest-container' }), 'empty-input');
    expectHazardError(() => enclosureBound({ props: good, tempC: 20, freeVolumeM3: 1, containers: [{ massG: -5, open: true }], scenario: 'largest-container' }), 'negative');
    expectHazardError(() => epaRmpEvaporationRate({ molarMassGPerMol: 58, vaporPressureKPa: 30, tempC: 25, poolAreaM2: 1, windSpeedMPerS: 0 }), 'not-positive');
    expectHazardError(
      () => wellMixedRoom({ generationRateGPerS: 1, roomVolumeM3: 100, airChangesPerHour: -1, mixingFactor: 1, molarMassGPerMol: 58, tempC: 20 }),
      'negative',
    );
  });

  it('cryogens, dry ice and quantities', () => {
    expectHazardError(() => liquidNitrogenRelease({ liquidVolumeL: 10, roomVolumeM3: 0 }), 'not-positive');
    expectHazardError(() => dryIceRelease({ massKg: Number.NaN, roomVolumeM3: 20 }), 'not-finite');
    expectHazardError(() => rollUpQuantities({ items: [{ volumeL: -1 }], limits: [] }), 'negative');
    expectHazardError(() => rollUpQuantities({ items: [], limits: [{ name: 'x', maxVolumeL: 10 }] }), 'empty-input');
  });
});
