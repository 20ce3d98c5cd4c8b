import { describe, expect, it } from 'vitest';
import { mgPerM3ToPpm, molarVolumeLPerMol, ppmToMgPerM3, saturatedConcentration, type VaporProperties } from '@/lib/hazard';
import { CAS, propsByCas, relativeDeviation } from './library';

const MMHG_KPA = 101.325 / 760;

/** A property set whose vapor pressure is a fixed value (Antoine with B = 0), to test the concentration step alone. */
function fixedVaporPressure(pressureMmHg: number, molarMassGPerMol: number): VaporProperties {
  return {
    molarMassGPerMol,
    correlations: [
      { kind: 'antoine', log: 'log10', pressureUnit: 'mmHg', temperatureUnit: 'C', a: Math.log10(pressureMmHg), b: 0, c: 0, tMinC: -50, tMaxC: 100 },
    ],
  };
}

describe('saturatedConcentration (worked examples)', () => {
  it('toluene, 22 torr at 20 °C (J. Chem. Educ. CLIP "Toluene": "approximately 29,000 ppm")', () => {
    // Recomputed: 22/760 × 10⁶ = 28 947 ppm; 110 877 mg/m³ with the 20 °C molar volume (worked
    // example 2a/2d). Tolerance 0.01 %: the arithmetic is exact, only R and the last digit round.
    const result = saturatedConcentration(fixedVaporPressure(22, 92.14), 20);
    expect(relativeDeviation(result.ppm, 28947)).toBeLessThan(1e-4);
    expect(relativeDeviation(result.mgPerM3, 110877)).toBeLessThan(1e-4);
    expect(result.volumePercent).toBeCloseTo(2.8947, 3);
    expect(result.boils).toBe(false);
    expect(relativeDeviation(result.ppm, 29000)).toBeLessThan(0.01);
  });

  it('toluene from the seeded Poling set at 20 °C is within 2 % of the CLIP "approximately 29,000 ppm"', () => {
    const result = saturatedConcentration(propsByCas(CAS.toluene), 20);
    expect(relativeDeviation(result.ppm, 29000)).toBeLessThan(0.02);
  });

  it('N,N-dimethylformamide at 20 °C: 3,550 ppm (NIOSH IDLH documentation, A.D. Little), implied 2.70 mmHg', () => {
    // Tolerance 0.5 %: the implied pressure is rounded to 2.70.
    expect(relativeDeviation(saturatedConcentration(fixedVaporPressure(2.7, 73.095), 20).ppm, 3550)).toBeLessThan(0.005);
  });

  it('2-ethoxyethyl acetate at 20 °C: 2,600 ppm in saturated air (NIOSH IDLH documentation), implied 1.98 mmHg', () => {
    expect(relativeDeviation(saturatedConcentration(fixedVaporPressure(1.98, 132.16), 20).ppm, 2600)).toBeLessThan(0.005);
  });

  it('mg/m³ of the saturated vapor depends only on Psat and T, not on Patm (ideal-gas identity, mg/m³ = Psat·M/(R·T))', () => {
    const props = fixedVaporPressure(22, 92.14);
    const sea = saturatedConcentration(props, 20, 101.325);
    const altitude = saturatedConcentration(props, 20, 83.4);
    expect(altitude.mgPerM3).toBeCloseTo(sea.mgPerM3, 6);
    expect(altitude.ppm / sea.ppm).toBeCloseTo(101.325 / 83.4, 10);
  });

  it('boils at or above the boiling point: diethyl ether at 40 °C (Tb 34.4 °C, CRC)', () => {
    const result = saturatedConcentration(propsByCas(CAS.diethylEther), 40);
    expect(result.boils).toBe(true);
    expect(result.ppm).toBe(1e6);
    expect(result.volumePercent).toBe(100);
    expect(result.pressureKPa).toBeGreaterThan(101.325);
    expect(result.warnings.join(' ')).toMatch(/boils.*capped at 100 % by volume/);
  });

  it('acetaldehyde boils in a 25 °C room and n-pentane just above 36.06 °C (CRC boiling points)', () => {
    expect(saturatedConcentration(propsByCas(CAS.acetaldehyde), 25).boils).toBe(true);
    expect(saturatedConcentration(propsByCas(CAS.nPentane), 35).boils).toBe(false);
    expect(saturatedConcentration(propsByCas(CAS.nPentane), 37).boils).toBe(true);
  });

  it('boils at a lower temperature at altitude: ether at 30 °C at 83.4 kPa (the Denver pressure of OpenStax §10.3)', () => {
    expect(saturatedConcentration(propsByCas(CAS.diethylEther), 30).boils).toBe(false);
    expect(saturatedConcentration(propsByCas(CAS.diethylEther), 30, 83.4).boils).toBe(true);
  });
});

describe('ppm ↔ mg/m³', () => {
  it('1,4-dioxane: 1 ppm = 3.6 mg/m³ at 25 °C (US EPA Air Toxics hazard summary; 88.106/24.45 = 3.6035)', () => {
    // Tolerance 0.2 %: R·T/P = 24.465 L/mol vs the rounded 24.45 (CCOHS OSH Answers).
    expect(relativeDeviation(ppmToMgPerM3(1, 88.106), 3.6035)).toBeLessThan(0.002);
  });

  it.each([
    // NIOSH Pocket Guide "1 ppm =" factors (25 °C, 1 atm), printed to 3 significant figures.
    ['ethanol', 46.07, 1.89],
    ['2-propanol', 60.1, 2.46],
    ['n-butanol', 74.12, 3.03],
    ['benzene', 78.11, 3.19],
    ['n-hexane', 86.18, 3.53],
    ['toluene', 92.14, 3.77],
    ['styrene', 104.15, 4.26],
  ])('%s: 1 ppm = %s → %s mg/m³ (NIOSH Pocket Guide)', (_name, molarMass, factor) => {
    // Tolerance 0.5 %: 3-significant-figure rounding (≤ 0.3 %) plus 24.45 vs 24.465 (0.06 %).
    expect(relativeDeviation(ppmToMgPerM3(1, molarMass), factor)).toBeLessThan(0.005);
  });

  it.each([
    // OEL pairs printed by NIOSH (IDLH documents and NPG), mg/m³ rounded to 2 significant figures.
    ['acetone REL', 250, 58.08, 590],
    ['methanol REL', 200, 32.042, 260],
    ['2-propanol REL', 400, 60.096, 980],
    ['toluene REL', 100, 92.141, 375],
    ['ethanol', 1000, 46.069, 1900],
    ['styrene REL', 50, 104.152, 215],
    ['n-hexane REL', 50, 86.178, 180],
  ])('%s %s ppm = %s g/mol → %s mg/m³ (NIOSH)', (_name, ppm, molarMass, mgPerM3) => {
    // Tolerance 2.5 %: the two-significant-figure rounding of the printed mg/m³ (NIOSH).
    expect(relativeDeviation(ppmToMgPerM3(ppm, molarMass), mgPerM3)).toBeLessThan(0.025);
  });

  it('general T and P form (CCOHS: mg/m³ = P[mmHg] × MW × ppm / (62.4 × (273.2 + T)))', () => {
    // Tolerance 0.2 % between formulations (CCOHS rounds R to 62.4 and the offset to 273.2).
    const ccohs = (ppm: number, molarMass: number, tempC: number, pressureMmHg: number) =>
      (pressureMmHg * molarMass * ppm) / (62.4 * (273.2 + tempC));
    expect(relativeDeviation(ppmToMgPerM3(100, 92.14, 4, 700 * MMHG_KPA), ccohs(100, 92.14, 4, 700))).toBeLessThan(0.002);
    expect(relativeDeviation(ppmToMgPerM3(100, 92.14, -20), ccohs(100, 92.14, -20, 760))).toBeLessThan(0.002);
  });

  it('round-trips', () => {
    expect(mgPerM3ToPpm(ppmToMgPerM3(123.4, 58.08, 4, 95), 58.08, 4, 95)).toBeCloseTo(123.4, 10);
  });

  it.each([
    // NIOSH NMAM Appendix A molar volumes at 760 mmHg (4 significant figures).
    [0, 22.41],
    [10, 23.23],
    [20, 24.05],
    [25, 24.46],
    [30, 24.87],
    [40, 25.7],
  ])('molar volume at %s °C is %s L/mol (NIOSH NMAM Appendix A)', (tempC, litres) => {
    expect(relativeDeviation(molarVolumeLPerMol(tempC, 101.325), litres)).toBeLessThan(0.0005);
  });

  it.each([
    // Cold-storage molar volumes derived from NIOSH NMAM Appendix A's Vm = 62.36·T/760 (our arithmetic).
    [4, 22.74],
    [-20, 20.77],
    [-80, 15.85],
  ])('molar volume at %s °C is %s L/mol (derived from NIOSH NMAM Appendix A)', (tempC, litres) => {
    expect(relativeDeviation(molarVolumeLPerMol(tempC, 101.325), litres)).toBeLessThan(0.0005);
  });
});
