import { describe, expect, it } from 'vitest';
import { ghsFlammableCategory, nfpaLiquidClass, saturationPressure, validateVaporProperties } from '@/lib/hazard';
import { substanceLibrary } from '@/db/seed/substance-library';
import { propsOf } from './library';

// The 41 CAS numbers of the library's liquids (as listed in the CRC Handbook 95th ed. transcription in
// CalebBell/chemicals), plus CO₂ and N₂.
const LIQUID_CAS = [
  '67-64-1', '67-56-1', '64-17-5', '67-63-0', '71-23-8', '71-36-3', '60-29-7', '109-99-9', '123-91-1', '141-78-6',
  '79-20-9', '75-05-8', '75-09-2', '67-66-3', '56-23-5', '71-43-2', '108-88-3', '95-47-6', '108-38-3', '106-42-3',
  '100-41-4', '100-42-5', '109-66-0', '78-78-4', '110-54-3', '142-82-5', '110-82-7', '1634-04-4', '75-15-0', '75-07-0',
  '64-19-7', '64-18-6', '110-86-1', '121-44-8', '68-12-2', '67-68-5', '7732-18-5', '75-52-5', '78-93-3', '108-10-1',
  '107-06-2',
];

describe('substance library seed', () => {
  it('holds the 41 volatile liquids, dry ice and liquid nitrogen, once each', () => {
    const cas = substanceLibrary.map((seed) => seed.cas);
    expect(new Set(cas).size).toBe(cas.length);
    expect([...cas].sort()).toEqual([...LIQUID_CAS, '124-38-9', '7727-37-9'].sort());
    expect(substanceLibrary.find((seed) => seed.cas === '124-38-9')?.physicalState).toBe('solid');
    expect(substanceLibrary.find((seed) => seed.cas === '7727-37-9')?.physicalState).toBe('cryogen');
  });

  it.each(substanceLibrary.map((seed) => [seed.name, seed] as const))('%s: every value has a source', (_name, seed) => {
    const valueFields = Object.keys(seed).filter((key) => key !== 'sources');
    for (const field of valueFields) expect(seed.sources[field], `${seed.name}.${field}`).toBeTruthy();
    for (const correlation of seed.correlations) expect(correlation.source).toBeTruthy();
    for (const limit of seed.exposureLimits) expect(limit.source).toBeTruthy();
  });

  it.each(substanceLibrary.map((seed) => [seed.name, seed] as const))('%s: valid engine input', (_name, seed) => {
    expect(() => validateVaporProperties(propsOf(seed))).not.toThrow();
    expect(seed.molarMassGPerMol).toBeGreaterThan(0);
  });

  it('every liquid has a correlation covering 20 °C, listed first', () => {
    for (const seed of substanceLibrary.filter((entry) => entry.physicalState === 'liquid')) {
      const first = seed.correlations[0];
      expect(first.tMinC <= 20 && first.tMaxC >= 20, seed.name).toBe(true);
      expect(saturationPressure(propsOf(seed), 20).extrapolated, seed.name).toBe(false);
    }
  });

  it('warm storeroom (40 °C) is covered without extrapolation for every liquid', () => {
    for (const seed of substanceLibrary.filter((entry) => entry.physicalState === 'liquid')) {
      expect(saturationPressure(propsOf(seed), 40).extrapolated, seed.name).toBe(false);
    }
  });

  it('refrigerator (4 °C) is covered for every liquid that is liquid at 4 °C (pyridine too since the 2026-12-06 edition)', () => {
    const uncovered = substanceLibrary
      .filter((seed) => seed.physicalState === 'liquid' && (seed.meltingPointC ?? -999) < 4)
      .filter((seed) => saturationPressure(propsOf(seed), 4).extrapolated)
      .map((seed) => seed.name);
    expect(uncovered).toEqual([]);
  });

  it('DMSO has a flash point (87 °C, ICSC 0459) and an LFL (2.6 %, NTP): GHS Category 4 and NFPA 30 Class IIIA; dichloromethane has neither', () => {
    const dmso = substanceLibrary.find((seed) => seed.cas === '67-68-5')!;
    expect(dmso.flashPointC).toBe(87);
    expect(ghsFlammableCategory(dmso.flashPointC!, dmso.normalBoilingPointC)).toBe(4);
    expect(nfpaLiquidClass(dmso.flashPointC!, dmso.normalBoilingPointC)).toBe('IIIA');
    expect(dmso.sources.flashPointC).toMatch(/ICSC 0459/);
    // LEL 2.6 %, UEL 63 % (NTP Chemical Repository data sheet, 1991): with a flash point and an LFL, no missing-data finding.
    expect([dmso.lflVolPercent, dmso.uflVolPercent]).toEqual([2.6, 63]);
    const dcm = substanceLibrary.find((seed) => seed.cas === '75-09-2')!;
    expect(dcm.flashPointC).toBeUndefined();
    expect(dcm.lflVolPercent).toBeUndefined();
    expect(dcm.sources.flashPointC).toMatch(/not flammable under normal conditions.*ICSC 0058/);
    // The published range stays beside it: NIOSH IDLH documentation LEL 13 %; OSHA 62 FR 1494 (1997) LEL 12 %, UEL 19 %.
    expect(dcm.alternativeFlammability.map((alt) => alt.lflVolPercent).sort()).toEqual([12, 13]);
  });

  it('dry ice: Span & Wagner sublimation line below the triple point, liquid–vapor line above it', () => {
    const co2 = substanceLibrary.find((seed) => seed.cas === '124-38-9')!;
    // Sublimation point −78.5 °C at 101.325 kPa (sources of normalBoilingPointC, rounded to 0.1 K, ±0.4 %).
    expect(Math.abs(saturationPressure(propsOf(co2), -78.5).pressureKPa / 101.325 - 1)).toBeLessThan(0.005);
    // Both lines meet at the triple point, 216.592 K and 0.51795 MPa (Span & Wagner 1996).
    const below = saturationPressure(propsOf(co2), 216.592 - 273.15 - 1e-6).pressureKPa;
    const above = saturationPressure(propsOf(co2), 216.592 - 273.15 + 1e-6).pressureKPa;
    expect(Math.abs(above / below - 1)).toBeLessThan(1e-4);
    // 20 °C on the liquid–vapor line (Span & Wagner Eq. 3.13 evaluated): 5.729 MPa, not an extrapolated sublimation line.
    expect(saturationPressure(propsOf(co2), 20).pressureKPa).toBeCloseTo(5729.2, 0);
    // Above the critical point (304.1282 K) the engine holds the critical pressure and says so.
    const hot = saturationPressure(propsOf(co2), 40);
    expect(hot.pressureKPa).toBeCloseTo(7377.3, 6);
    expect(hot.extrapolated).toBe(true);
    expect(hot.warnings.join(' ')).toMatch(/no liquid is left/);
  });

  it('keeps disagreeing flammability values beside the primary ones (acetone UFL 14.3 IEC vs 12.8 NFPA 497)', () => {
    const acetone = substanceLibrary.find((seed) => seed.cas === '67-64-1')!;
    expect(acetone.uflVolPercent).toBe(14.3);
    expect(acetone.alternativeFlammability.find((alt) => alt.source.startsWith('NFPA 497'))?.uflVolPercent).toBe(12.8);
  });

  it('states every source as a citation or as common practice, never as how a value was found', () => {
    const howFound = /memory|recalled|verify before relying|not read/i;
    for (const seed of substanceLibrary) {
      for (const [field, text] of Object.entries(seed.sources)) expect(text, `${seed.name}.sources.${field}`).not.toMatch(howFound);
      for (const note of seed.notes) expect(note, `${seed.name}.notes`).not.toMatch(howFound);
      for (const correlation of seed.correlations) expect(correlation.source, `${seed.name} correlation`).not.toMatch(howFound);
      for (const limit of seed.exposureLimits) {
        expect(limit.source, `${seed.name} ${limit.kind}`).not.toMatch(howFound);
        expect(limit.note ?? '', `${seed.name} ${limit.kind} note`).not.toMatch(howFound);
      }
      for (const alt of seed.alternativeFlammability) {
        expect(alt.source, `${seed.name} alternative`).not.toMatch(howFound);
        expect(Object.keys(alt), `${seed.name} alternative`).not.toContain('recalledFromMemory');
      }
    }
  });

  it.each(substanceLibrary.map((seed) => [seed.name, seed] as const))('%s: every field with a value has a source', (_name, seed) => {
    for (const [field, value] of Object.entries(seed)) {
      if (field === 'sources' || value == null) continue;
      expect(seed.sources[field]?.trim(), `${seed.name}.${field}`).toBeTruthy();
    }
    for (const alt of seed.alternativeFlammability) {
      expect(alt.source.trim(), `${seed.name} alternative`).toBeTruthy();
      const values = [alt.flashPointC, alt.lflVolPercent, alt.uflVolPercent, alt.autoignitionC].filter((v) => v != null);
      expect(values.length, `${seed.name} alternative "${alt.source}" carries a value`).toBeGreaterThan(0);
    }
  });

  it('cites each liquid density as the CRC Handbook 95th ed. value at its stated temperature, equal to the seeded value', () => {
    for (const seed of substanceLibrary.filter((entry) => entry.physicalState === 'liquid')) {
      const match = /^CRC Handbook of Chemistry and Physics 95th ed\. \(Haynes ed\., 2014\), Physical Constants of (?:Organic|Inorganic) Compounds: ([0-9.]+) g\/cm³ at (\d+) °C/.exec(
        seed.sources.liquidDensityGPerMl,
      );
      expect(match, seed.name).not.toBeNull();
      expect(Number(match![1]), seed.name).toBe(seed.liquidDensityGPerMl);
      expect(Number(match![2]), seed.name).toBeGreaterThanOrEqual(18);
      expect(Number(match![2]), seed.name).toBeLessThanOrEqual(25);
    }
    // Spot values (CRC 95th ed., Physical Constants of Organic/Inorganic Compounds): acetone 0.7845 at 25 °C,
    // benzene 0.8765 at 20 °C, acetaldehyde 0.7834 at 18 °C, water 0.9970 at 25 °C.
    const density = (cas: string) => substanceLibrary.find((seed) => seed.cas === cas)!.liquidDensityGPerMl;
    expect(density('67-64-1')).toBe(0.7845);
    expect(density('71-43-2')).toBe(0.8765);
    expect(density('75-07-0')).toBe(0.7834);
    expect(density('7732-18-5')).toBe(0.997);
  });

  it('dry ice: the seeded ΔHsub carries the sublimation curve from −78.5 °C / 1 atm through the triple point (216.592 K, 517.95 kPa)', () => {
    // Triple point: Span & Wagner (1996) CO₂ reference equation, melting-line reference point; CRC Handbook
    // 95th ed. lists the melting point 216.589 K.
    const co2 = substanceLibrary.find((seed) => seed.cas === '124-38-9')!;
    expect(co2.enthalpyOfVaporizationKJPerMol).toBe(26.1);
    const atTriplePoint = saturationPressure(propsOf(co2), 216.592 - 273.15);
    expect(Math.abs(atTriplePoint.pressureKPa / 517.95 - 1)).toBeLessThan(0.005);
  });
});
