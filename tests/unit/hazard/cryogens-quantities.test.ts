import { describe, expect, it } from 'vitest';
import {
  CARBON_DIOXIDE_NIOSH_LIMITS,
  dryIceRelease,
  liquidNitrogenExpansionRatio,
  liquidNitrogenRelease,
  oxygenAfterRelease,
  oxygenWithSteadyRelease,
  rollUpQuantities,
} from '@/lib/hazard';
import { relativeDeviation, seedByCas, CAS } from './library';

describe('liquid nitrogen', () => {
  it('expansion ratio ≈ 692 at 20 °C and ≈ 704 at 25 °C from 806.5 kg/m³ (UW-Madison LN₂ data; derived)', () => {
    expect(relativeDeviation(liquidNitrogenExpansionRatio(), 692.5)).toBeLessThan(0.001);
    expect(relativeDeviation(liquidNitrogenExpansionRatio({ referenceTempC: 25 }), 704.3)).toBeLessThan(0.001);
    // 1 L LN₂ = 24.54 ft³ N₂ at 70 °F (UW-Madison data) = 695 L: within 0.2 % at 21.1 °C.
    expect(relativeDeviation(liquidNitrogenExpansionRatio({ referenceTempC: 21.11 }), 695)).toBeLessThan(0.002);
  });

  it('uses the seeded liquid density', () => {
    expect(seedByCas(CAS.nitrogen).liquidDensityKgPerM3).toBe(806.5);
  });

  it('linear displacement formula: V_gas/V_room = 0.2 gives 16.8 % from 21 % (Univ. of Oxford Safety Office S4/03 Appendix 1)', () => {
    const result = oxygenAfterRelease({ gasVolumeM3: 20, roomVolumeM3: 100, baselineOxygenPercent: 21 });
    expect(result.oxygenPercent).toBeCloseTo(16.8, 10);
    expect(result.deficient).toBe(true);
  });

  it('10 L of LN₂ lost into a 60 m³ room: 6.925 m³ of gas, O₂ 18.49 % < 19.5 % (by hand)', () => {
    // 0.010 m³ × 692.5 = 6.925 m³; 20.9 × (1 − 6.925/60) = 18.488 %.
    const result = liquidNitrogenRelease({ liquidVolumeL: 10, roomVolumeM3: 60 });
    expect(result.gasVolumeM3).toBeCloseTo(6.925, 2);
    expect(result.oxygenPercent).toBeCloseTo(18.488, 2);
    expect(result.deficient).toBe(true);
    expect(result.trace.steps[0].formula).toMatch(/expansion ratio/);
  });

  it('a release larger than the room: well-mixed dilution, never zero or negative', () => {
    // 100 L × 692.5 = 69.25 m³ into 20 m³: V_gas/V_room = 3.4625; 20.9 × e^(−3.4625) = 0.655 % (by hand).
    const result = liquidNitrogenRelease({ liquidVolumeL: 100, roomVolumeM3: 20 });
    expect(result.exceedsRoomVolume).toBe(true);
    expect(result.oxygenPercent).toBeCloseTo(0.655, 2);
    expect(result.trace.steps.at(-1)?.formula).toBe('O₂ = O₂,air × e^(−V_gas/V_room)');
    expect(result.trace.warnings.join(' ')).toMatch(/pools near the floor/);
    // Just below the room's volume the published displacement form still applies.
    expect(oxygenAfterRelease({ gasVolumeM3: 19, roomVolumeM3: 20 }).oxygenPercent).toBeCloseTo(1.045, 3);
  });

  it('Oxford S4/03 worked example: 36 m³ basement, five 10 L dewars at 0.15 L/day, 0.4 ACH → 0.06 % drop', () => {
    // L = 2 × 700 × 0.75 / (24 × 1000) = 0.04375 m³/h; C_t = L/(V·N) = 0.0030; 0.21 × 100 × C_t = 0.06 %.
    const result = oxygenWithSteadyRelease({ gasReleaseM3PerH: 0.04375, roomVolumeM3: 36, airChangesPerHour: 0.4, baselineOxygenPercent: 21 });
    expect(21 - result.oxygenPercent).toBeCloseTo(0.06, 2);
    expect(result.deficient).toBe(false);
  });
});

describe('dry ice', () => {
  it('2.27 kg (5 lb) subliming in a sealed 22.5 m³ cold room: 1.24 m³ CO₂, ≈ 55 000 ppm, above the IDLH (our illustration; the room is hypothetical)', () => {
    // By hand: 2270/44.009 × 24.055 L = 1240.8 L; /22.5 m³ = 55 146 ppm. Published illustration 5.5 %.
    const result = dryIceRelease({ massKg: 2.27, roomVolumeM3: 22.5 });
    expect(result.gasVolumeM3).toBeCloseTo(1.24, 2);
    expect(relativeDeviation(result.carbonDioxidePpm, 55146)).toBeLessThan(1e-3);
    expect(relativeDeviation(result.carbonDioxidePpm, 55000)).toBeLessThan(0.01);
    expect(result.limitRatios.map((item) => [item.limit.kind, item.exceeded])).toEqual([
      ['TWA', true],
      ['STEL', true],
      ['IDLH', true],
    ]);
    // CO₂ is toxic well before it is an asphyxiant: O₂ is still above 19.5 %.
    expect(result.oxygenDeficient).toBe(false);
  });

  it('0.546 m³ of gas per kg at 20 °C (ideal gas; Univ. of Maine at Fort Kent and Univ. of York agree within 2 %)', () => {
    expect(relativeDeviation(dryIceRelease({ massKg: 1, roomVolumeM3: 100 }).gasVolumeM3, 0.546)).toBeLessThan(0.002);
  });

  it('O₂ reaches 19.5 % only at about 67 000 ppm CO₂ (derived: 20.9·(1 − x) = 19.5)', () => {
    const result = oxygenAfterRelease({ gasVolumeM3: 6.7, roomVolumeM3: 100 });
    expect(result.oxygenPercent).toBeCloseTo(19.5, 1);
  });

  it('the default CO₂ limits are the NIOSH values: TWA 5 000, STEL 30 000, IDLH 40 000 ppm (NIOSH IDLH documentation, 1994)', () => {
    expect(CARBON_DIOXIDE_NIOSH_LIMITS.map((limit) => [limit.kind, limit.value])).toEqual([
      ['TWA', 5000],
      ['STEL', 30000],
      ['IDLH', 40000],
    ]);
    const seeded = seedByCas(CAS.carbonDioxide).exposureLimits.filter((limit) => limit.body === 'NIOSH');
    expect(seeded.map((limit) => limit.value)).toEqual([5000, 30000, 40000]);
  });
});

describe('quantity roll-up by liquid class (limits are inputs)', () => {
  // Invented demo cabinet. Classes from the seeded IEC flash points and CRC boiling points:
  // ether IA (FP −45, BP 34.4), acetone IB (−20, 56.1), acetic acid II (39, 117.9).
  const ether = seedByCas(CAS.diethylEther);
  const acetone = seedByCas(CAS.acetone);
  const acetic = seedByCas(CAS.aceticAcid);
  const item = (seed: typeof ether, volumeL: number) => ({ label: seed.name, volumeL, flashPointC: seed.flashPointC, boilingPointC: seed.normalBoilingPointC });
  const items = [item(ether, 4), item(ether, 4), item(acetone, 4), item(acetone, 4), item(acetone, 4), item(acetic, 10), { label: 'water', volumeL: 20 }];

  it('sums by class and category and checks each configured limit', () => {
    const result = rollUpQuantities({
      items,
      limits: [
        // Example rows only (an organisation enters its own): OSHA 1910.106(d)(3) 60 gal of Category 1–3
        // per cabinet = 227.1 L; a policy of 5 L of Class IA outside a store room.
        { name: 'Cabinet, Category 1–3', ghsCategories: [1, 2, 3], maxVolumeL: 227.1, source: 'OSHA 29 CFR 1910.106(d)(3)(i), example' },
        { name: 'Class IA in the room', nfpaClasses: ['IA'], maxVolumeL: 5, source: 'organisation policy, example' },
      ],
    });
    // By hand: IA 8 L, IB 12 L, II 10 L; Cat 1 8 L, Cat 2 12 L, Cat 3 10 L; water 20 L unclassed.
    expect(result.totalsByNfpaClassL).toEqual({ IA: 8, IB: 12, IC: 0, II: 10, IIIA: 0, IIIB: 0 });
    expect(result.totalsByGhsCategoryL).toEqual({ '1': 8, '2': 12, '3': 10, '4': 0 });
    expect(result.unclassifiedL).toBe(20);
    expect(result.checks[0]).toMatchObject({ totalL: 30, exceeded: false });
    expect(result.checks[0].ratio).toBeCloseTo(30 / 227.1, 12);
    expect(result.checks[1]).toMatchObject({ totalL: 8, exceeded: true });
    expect(result.trace.warnings[0]).toMatch(/20 L/);
  });

  it('an empty inventory is within every limit', () => {
    const result = rollUpQuantities({ items: [], limits: [{ name: 'IB', nfpaClasses: ['IB'], maxVolumeL: 1 }] });
    expect(result.checks[0]).toMatchObject({ totalL: 0, exceeded: false });
  });
});
