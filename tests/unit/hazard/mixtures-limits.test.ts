import { describe, expect, it } from 'vitest';
import {
  additiveExposureIndex,
  exposureLimitPpm,
  exposureRatios,
  massToMoleFractions,
  raoultMixture,
  saturatedConcentration,
  type VaporProperties,
} from '@/lib/hazard';
import { CAS, propsByCas, relativeDeviation, seedByCas } from './library';

const MMHG_KPA = 101.325 / 760;

describe("Raoult's law", () => {
  it('acetonitrile (1) / nitromethane (2) at 75 °C, x1 = 0.6 (Smith, Van Ness & Abbott 7th ed. Example 10.1, memory)', () => {
    // Published (memory): P1sat 83.21, P2sat 41.98, P 66.72 kPa, y1 0.7483; recomputed 66.717 kPa and
    // 0.74829. Tolerance 0.01 %: the Antoine equations are those of the example itself.
    const antoine = (a: number, b: number, c: number): VaporProperties => ({
      molarMassGPerMol: 50,
      correlations: [{ kind: 'antoine', log: 'ln', pressureUnit: 'kPa', temperatureUnit: 'C', a, b, c, tMinC: 0, tMaxC: 120 }],
    });
    const result = raoultMixture({
      tempC: 75,
      components: [
        { name: 'acetonitrile', moleFraction: 0.6, props: antoine(14.2724, 2945.47, 224.0) },
        { name: 'nitromethane', moleFraction: 0.4, props: antoine(14.2043, 2972.64, 209.0) },
      ],
    });
    expect(relativeDeviation(result.totalPressureKPa, 66.717)).toBeLessThan(1e-4);
    expect(relativeDeviation(result.components[0].vaporMoleFraction, 0.74829)).toBeLessThan(1e-4);
    expect(relativeDeviation(result.components[0].saturationPressureKPa, 83.207)).toBeLessThan(1e-4);
    expect(relativeDeviation(result.components[1].saturationPressureKPa, 41.983)).toBeLessThan(1e-4);
    expect(result.trace.warnings[0]).toMatch(/ideal solution/);
  });

  it('benzene / toluene 1:2 at 25 °C with the seeded Poling sets (textbook problem, memory): P = 50.6 mmHg, y_benzene = 0.626', () => {
    // Recomputed 50.63 mmHg and 0.6261; tolerance 0.5 % (the pure-component values agree with the
    // printed 95.1 and 28.4 mmHg to 0.1 %).
    const result = raoultMixture({
      tempC: 25,
      components: [
        { name: 'benzene', moleFraction: 1 / 3, props: propsByCas(CAS.benzene) },
        { name: 'toluene', moleFraction: 2 / 3, props: propsByCas(CAS.toluene) },
      ],
    });
    expect(relativeDeviation(result.totalPressureKPa / MMHG_KPA, 50.63)).toBeLessThan(0.005);
    expect(relativeDeviation(result.components[0].vaporMoleFraction, 0.6261)).toBeLessThan(0.005);
    // Each component's concentration in air is its partial pressure over Patm.
    expect(result.components[0].concentrationPpm).toBeCloseTo((result.components[0].partialPressureKPa / 101.325) * 1e6, 6);
  });

  it('a pure component gives the pure saturated concentration', () => {
    const toluene = propsByCas(CAS.toluene);
    const result = raoultMixture({ tempC: 20, components: [{ moleFraction: 1, props: toluene }] });
    expect(result.components[0].concentrationPpm).toBeCloseTo(saturatedConcentration(toluene, 20).ppm, 6);
  });

  it('mass → mole fractions: 50/50 ethanol–water by mass is x_ethanol = 0.2811', () => {
    // Derivation: (50/46.069) / (50/46.069 + 50/18.015) = 1.08533 / 3.86079 = 0.28112.
    const fractions = massToMoleFractions([
      { massFraction: 50, molarMassGPerMol: 46.069 },
      { massFraction: 50, molarMassGPerMol: 18.015 },
    ]);
    expect(fractions[0]).toBeCloseTo(0.28112, 5);
    expect(fractions[0] + fractions[1]).toBeCloseTo(1, 12);
  });
});

describe('exposure limits', () => {
  it('OSHA 1910.1000(d)(2)(i) worked example: 500/1000 + 45/200 + 40/200 = 0.925, acceptable', () => {
    const limit = (value: number) => ({ kind: 'TWA' as const, value, unit: 'ppm' as const, body: 'OSHA' });
    const result = additiveExposureIndex([
      { concentrationPpm: 500, molarMassGPerMol: 58.08, limit: limit(1000) },
      { concentrationPpm: 45, molarMassGPerMol: 86.18, limit: limit(200) },
      { concentrationPpm: 40, molarMassGPerMol: 92.14, limit: limit(200) },
    ]);
    expect(result.index).toBeCloseTo(0.925, 12);
    expect(result.exceeded).toBe(false);
    expect(result.trace.steps[0].substituted).toContain('0.925');
  });

  it('saturated toluene at 20 °C is about 290 × the NIOSH REL of 100 ppm (J. Chem. Educ. CLIP "Toluene": 22 torr ≈ 29 000 ppm)', () => {
    const toluene = seedByCas(CAS.toluene);
    const nioshTwa = toluene.exposureLimits.find((limit) => limit.body === 'NIOSH' && limit.kind === 'TWA')!;
    const result = exposureRatios({ concentrationPpm: 28947, molarMassGPerMol: toluene.molarMassGPerMol, limits: [nioshTwa] });
    expect(result.ratios[0].ratio).toBeCloseTo(289.47, 2);
    expect(result.ratios[0].exceeded).toBe(true);
  });

  it('converts an mg/m³ limit at its reference temperature: methanol REL 260 mg/m³ ≈ 200 ppm (NIOSH pair)', () => {
    // Tolerance 2.5 %: NIOSH prints mg/m³ to 2 significant figures.
    const ppm = exposureLimitPpm({ kind: 'TWA', value: 260, unit: 'mg/m3' }, 32.042);
    expect(relativeDeviation(ppm, 200)).toBeLessThan(0.025);
    // An EU-style limit stated at 20 °C converts with the 20 °C molar volume instead.
    const at20 = exposureLimitPpm({ kind: 'TWA', value: 260, unit: 'mg/m3', referenceTempC: 20 }, 32.042);
    expect(at20 / ppm).toBeCloseTo(293.15 / 298.15, 10);
  });

  it('reports every limit and the highest ratio', () => {
    const seed = seedByCas(CAS.acetone);
    const result = exposureRatios({ concentrationPpm: 2500, molarMassGPerMol: seed.molarMassGPerMol, limits: seed.exposureLimits });
    expect(result.ratios.map((item) => `${item.limit.body} ${item.limit.kind}`)).toEqual(['OSHA TWA', 'NIOSH TWA', 'NIOSH IDLH']);
    expect(result.highestRatio).toBeCloseTo(10, 12); // 2500/250 NIOSH REL
    expect(result.ratios.find((item) => item.limit.kind === 'IDLH')!.ratio).toBeCloseTo(1, 12);
  });
});
