import { describe, expect, it } from 'vitest';
import {
  enclosureBound,
  epaRmpEvaporationRate,
  mackayMatsuguEvaporationRate,
  saturatedConcentration,
  spillPoolArea,
  wellMixedRoom,
} from '@/lib/hazard';
import { CAS, propsByCas, relativeDeviation, seedByCas } from './library';

describe('closed-enclosure bound C = min(C_sat, m·Vm/(M·V_free))', () => {
  const acetone = propsByCas(CAS.acetone);

  it('inventory-limited: 10 g of acetone in a 0.15 m³ refrigerator at 4 °C', () => {
    // By hand: Vm(4 °C) = 22.74 L/mol (62.36·T/760, NIOSH NMAM Appendix A); (10/58.08) × 22.74 /
    // (1000 × 0.15) × 10⁶ = 26 104 ppm, below C_sat (≈ 10 % by volume at 4 °C). Tolerance 0.01 %.
    const result = enclosureBound({
      props: acetone,
      tempC: 4,
      freeVolumeM3: 0.15,
      containers: [{ massG: 10, open: false }, { massG: 4, open: true }],
      scenario: 'largest-container',
    });
    expect(result.limitedBy).toBe('inventory');
    expect(relativeDeviation(result.concentrationPpm, 26104.45)).toBeLessThan(1e-4);
    expect(result.concentrationMgPerM3).toBeCloseTo((result.concentrationPpm * 58.08) / 22.7422, 0);
    expect(result.releasableMassG).toBe(10);
  });

  it('all open containers only counts the open ones', () => {
    const result = enclosureBound({
      props: acetone,
      tempC: 4,
      freeVolumeM3: 0.15,
      containers: [{ massG: 10, open: false }, { massG: 4, open: true }, { massG: 1, open: true }],
      scenario: 'all-open-containers',
    });
    expect(result.releasableMassG).toBe(5);
    expect(result.inventoryPpm).toBeCloseTo(26104.45 / 2, 0);
  });

  it('saturation-limited: a 2.5 L bottle in the same refrigerator reaches C_sat', () => {
    const result = enclosureBound({
      props: acetone,
      tempC: 4,
      freeVolumeM3: 0.15,
      containers: [{ massG: 1975, open: false }],
      scenario: 'largest-container',
    });
    expect(result.limitedBy).toBe('saturation');
    expect(result.concentrationPpm).toBeCloseTo(saturatedConcentration(acetone, 4).ppm, 6);
  });

  it('the trace carries every input with its source and the formula of every step', () => {
    const seed = seedByCas(CAS.acetone);
    const result = enclosureBound({
      props: acetone,
      propertySources: { molarMassGPerMol: seed.sources.molarMassGPerMol },
      substanceName: 'acetone',
      tempC: 25,
      tempSource: 'room design maximum',
      freeVolumeM3: 0.15,
      containers: [{ label: 'bottle A-12', massG: 10, open: false }],
      scenario: 'largest-container',
    });
    const { trace } = result;
    expect(trace.method).toBe('Closed-enclosure bound');
    expect(trace.inputs.find((input) => input.symbol === 'T')?.source).toBe('room design maximum');
    expect(trace.inputs.find((input) => input.symbol === 'M')?.source).toMatch(/CIAAW/);
    expect(trace.inputs.find((input) => input.symbol === 'Tc')?.source).toMatch(/VDI Heat Atlas/);
    expect(trace.steps.map((step) => step.formula)).toContain('C_max = min(C_sat, C_inv)');
    expect(trace.steps.every((step) => step.substituted.length > 0 && step.description.length > 0)).toBe(true);
    expect(trace.result.value).toBe(result.concentrationPpm);
    // JSON-serialisable without loss (stored in SQLite, exported to Excel)
    expect(JSON.parse(JSON.stringify(trace))).toEqual(trace);
  });

  it('a boiling liquid is flagged and capped at 100 % by volume', () => {
    const result = enclosureBound({
      props: propsByCas(CAS.diethylEther),
      tempC: 40,
      freeVolumeM3: 0.1,
      containers: [{ massG: 500, open: false }],
      scenario: 'largest-container',
    });
    expect(result.boils).toBe(true);
    expect(result.concentrationPpm).toBeLessThanOrEqual(1e6);
  });
});

describe('spill pool and evaporation', () => {
  it('1 L spreads to 0.1 m² at the EPA RMP guidance depth of 1 cm', () => {
    const pool = spillPoolArea({ volumeL: 1 });
    expect(pool.areaM2).toBeCloseTo(0.1, 12);
    expect(pool.depthM).toBe(0.01);
    expect(pool.trace.inputs[1].source).toMatch(/EPA RMP/);
  });

  it('is limited by the bund or floor area when given', () => {
    const pool = spillPoolArea({ volumeL: 20, maxAreaM2: 1.5 });
    expect(pool.areaM2).toBe(1.5);
    expect(pool.limitedByMaxArea).toBe(true);
  });

  it('EPA RMP Eq. D-1 by hand: U 1 m/s, MW 58.08, A 1 m², VP 200 mmHg, 25 °C', () => {
    // QR = 0.284 × 1^0.78 × 58.08^(2/3) × (1/0.09290304 ft²) × 200 / (82.05 × 298.15)
    //    = 0.284 × 14.997 × 10.764 × 200 / 24463 = 0.37482 lb/min = 2.8336 g/s (× 453.59237/60).
    const result = epaRmpEvaporationRate({ molarMassGPerMol: 58.08, vaporPressureKPa: 200 * (101.325 / 760), tempC: 25, poolAreaM2: 1, windSpeedMPerS: 1 });
    expect(relativeDeviation(result.rateLbPerMin, 0.37482)).toBeLessThan(1e-4);
    expect(relativeDeviation(result.rateGPerS, 2.83359)).toBeLessThan(1e-4);
    expect(result.trace.warnings).toEqual([]);
  });

  it('warns at indoor air speeds', () => {
    const result = epaRmpEvaporationRate({ molarMassGPerMol: 58.08, vaporPressureKPa: 30, tempC: 25, poolAreaM2: 1, windSpeedMPerS: 0.1 });
    expect(result.trace.warnings[0]).toMatch(/outdoor wind/);
  });

  it('Mackay–Matsugu by hand: k_m = 0.0292 × 3600^0.78 × 1.1284^(−0.11) × 1.5^(−0.67) = 13.048 m/h', () => {
    // Same pool; N = (13.048/3600) × 1 × 26 664 Pa × 58.08 / (8.3145 × 298.15) = 2.2643 g/s.
    const result = mackayMatsuguEvaporationRate({
      molarMassGPerMol: 58.08,
      vaporPressureKPa: 200 * (101.325 / 760),
      tempC: 25,
      poolAreaM2: 1,
      windSpeedMPerS: 1,
      schmidtNumber: 1.5,
    });
    expect(relativeDeviation(result.massTransferCoefficientMPerS * 3600, 13.0481)).toBeLessThan(1e-4);
    expect(relativeDeviation(result.rateGPerS, 2.26431)).toBeLessThan(1e-4);
  });

  it('the two models agree within a factor of 1.5 (Eq. D-1 is built on the Mackay–Matsugu coefficient)', () => {
    const input = { molarMassGPerMol: 92.14, vaporPressureKPa: 2.9, tempC: 20, poolAreaM2: 0.5, windSpeedMPerS: 1.5 };
    const ratio = epaRmpEvaporationRate(input).rateGPerS / mackayMatsuguEvaporationRate({ ...input, schmidtNumber: 1.5 }).rateGPerS;
    expect(ratio).toBeGreaterThan(1 / 1.5);
    expect(ratio).toBeLessThan(1.5);
  });
});

describe('well-mixed room model', () => {
  // By hand: G = 1 g/s, V = 100 m³, 6 ACH → Q = 0.16667 m³/s; k = 0.5 → k·Q = 0.08333 m³/s;
  // C_ss = 1000 mg/s / 0.08333 = 12 000 mg/m³; at t = V/(kQ) = 1200 s, C = C_ss(1 − e⁻¹) = 7585.5;
  // t95 = ln 20 × 1200 = 3594.9 s (≈ 3.0 V/Q′, solution of the AIHA well-mixed room mass balance).
  const base = { generationRateGPerS: 1, roomVolumeM3: 100, airChangesPerHour: 6, mixingFactor: 0.5, molarMassGPerMol: 92.14, tempC: 25 };

  it('steady state and transient', () => {
    const result = wellMixedRoom({ ...base, elapsedS: 1200 });
    expect(result.ventilationM3PerS).toBeCloseTo(1 / 6, 12);
    expect(result.steadyStateMgPerM3).toBeCloseTo(12000, 6);
    expect(result.atElapsedMgPerM3).toBeCloseTo(12000 * (1 - Math.exp(-1)), 6);
    expect(result.timeTo95PercentS).toBeCloseTo(Math.log(20) * 1200, 6);
    // ppm at 25 °C, 1 atm: 12 000 × 24.465 / 92.14 = 3186 ppm
    expect(result.steadyStatePpm).toBeCloseTo((12000 * 24.4654) / 92.14, 0);
  });

  it('is capped at saturation', () => {
    const result = wellMixedRoom({ ...base, saturatedPpm: 1000 });
    expect(result.cappedAtSaturation).toBe(true);
    expect(result.steadyStatePpm).toBeCloseTo(1000, 6);
  });

  it('without ventilation the concentration grows as G·t/V until saturation', () => {
    const result = wellMixedRoom({ ...base, airChangesPerHour: 0, elapsedS: 60, saturatedPpm: 28947 });
    expect(result.atElapsedMgPerM3).toBeCloseTo((1000 * 60) / 100, 6);
    expect(result.steadyStatePpm).toBeCloseTo(28947, 6);
    expect(result.timeTo95PercentS).toBeNull();
  });

  it('rejects an ACGIH-style mixing factor above 1 with a hint', () => {
    expect(() => wellMixedRoom({ ...base, mixingFactor: 3 })).toThrow(/1\/K/);
  });
});
