import { describe, expect, it } from 'vitest';
import { ghsFlammableCategory, nfpaLiquidClass } from '@/lib/hazard';
import { CAS, seedByCas } from './library';

describe('GHS flammable-liquid category (UN GHS 2.6 / OSHA 29 CFR 1910.106(a)(19))', () => {
  it.each([
    // Headroom's edge cases, derived from the published GHS and NFPA 30 criteria.
    [22.9, 80, 2],
    [10, 36, 2],
    [60.0, 150, 3],
    [93.2, 200, null],
    // The boundaries as written: FP < 23 and IBP ≤ 35 → 1; 23 ≤ FP ≤ 60 → 3; 60 < FP ≤ 93 → 4.
    [-45, 34.4, 1],
    [-45, 35, 1],
    [-45, 35.01, 2],
    [22.99, 50, 2],
    [23, 50, 3],
    [60.01, 150, 4],
    [93, 150, 4],
    [93.01, 150, null],
  ])('FP %s °C, IBP %s °C → %s', (flashPointC, boilingPointC, category) => {
    expect(ghsFlammableCategory(flashPointC, boilingPointC)).toBe(category);
  });
});

describe('NFPA 30 liquid class', () => {
  it.each([
    // Headroom's edge cases, derived from the published GHS and NFPA 30 criteria
    [22.9, 80, 'IC'],
    [10, 36, 'IA'],
    [60.0, 150, 'IIIA'],
    [93.2, 200, 'IIIA'],
    // Boundaries in °F converted exactly: 73 °F = 22.78 °C, 100 °F = 37.78 °C, 140 °F = 60 °C, 200 °F = 93.33 °C.
    [22.7, 37.7, 'IA'],
    [22.7, 37.8, 'IB'],
    [22.8, 80, 'IC'],
    [37.7, 150, 'IC'],
    [37.8, 150, 'II'],
    [59.9, 150, 'II'],
    [93.3, 200, 'IIIA'],
    [93.34, 200, 'IIIB'],
  ])('FP %s °C, BP %s °C → %s', (flashPointC, boilingPointC, liquidClass) => {
    expect(nfpaLiquidClass(flashPointC, boilingPointC)).toBe(liquidClass);
  });
});

describe('seeded substances classify as the crosswalk expects (IEC flash points, CRC boiling points)', () => {
  it.each([
    [CAS.diethylEther, 1, 'IA'],
    [CAS.acetone, 2, 'IB'],
    [CAS.ethanol, 2, 'IB'],
    [CAS.toluene, 2, 'IB'],
    [CAS.aceticAcid, 3, 'II'],
    [CAS.isopentane, 1, 'IA'],
  ])('%s → GHS %s, NFPA %s', (cas, category, liquidClass) => {
    const seed = seedByCas(cas);
    expect(ghsFlammableCategory(seed.flashPointC as number, seed.normalBoilingPointC)).toBe(category);
    expect(nfpaLiquidClass(seed.flashPointC as number, seed.normalBoilingPointC)).toBe(liquidClass);
  });
});
