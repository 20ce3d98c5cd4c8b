import { describe, expect, it } from 'vitest';
import { traceSaturatedConcentration, type Trace } from '@/lib/hazard';
import { CAS, propsByCas, seedByCas } from './library';

function expectRenderable(trace: Trace): void {
  expect(trace.method.length).toBeGreaterThan(0);
  expect(trace.source.length).toBeGreaterThan(0);
  for (const step of trace.steps) {
    expect(step.description.length).toBeGreaterThan(0);
    expect(step.formula.length).toBeGreaterThan(0);
    expect(step.substituted.length).toBeGreaterThan(0);
  }
  for (const value of [...trace.inputs, trace.result, ...trace.steps.map((step) => step.result)]) {
    if (typeof value.value === 'number') expect(Number.isFinite(value.value)).toBe(true);
  }
  // Stored as JSON in SQLite and exported to Excel: must survive a round trip unchanged.
  expect(JSON.parse(JSON.stringify(trace))).toEqual(trace);
}

describe('saturated-concentration trace', () => {
  it('Wagner: the reducing point and coefficients with their source, the equation with numbers, y, ppm, Vm, mg/m³', () => {
    const seed = seedByCas(CAS.toluene);
    const { result, trace } = traceSaturatedConcentration({
      props: propsByCas(CAS.toluene),
      tempC: 20,
      substanceName: 'toluene',
      propertySources: seed.sources,
      tempSource: 'storeroom design maximum',
    });
    expectRenderable(trace);
    expect(trace.method).toBe('Saturated vapor concentration of toluene (wagner)');
    expect(trace.inputs.find((input) => input.symbol === 'M')?.source).toBe(seed.sources.molarMassGPerMol);
    expect(trace.inputs.find((input) => input.symbol === 'Tc')?.value).toBe(591.75);
    expect(trace.inputs.find((input) => input.symbol === 'n1')?.source).toMatch(/VDI Heat Atlas, 2nd ed\./);
    expect(trace.steps[0].description).toBe('Wagner equation (2.5-5 form)');
    expect(trace.steps[0].formula).toBe('ln(P/Pc) = (Tc/T)·(n1·τ + n2·τ^1.5 + n3·τ^2.5 + n4·τ^5), τ = 1 − T/Tc, T in K');
    expect(trace.steps.map((step) => step.result.symbol)).toEqual(['Psat', 'y', 'C_sat', 'Vm', 'C_sat']);
    expect(trace.result.value).toBe(result.ppm);
  });

  it('Antoine: the coefficients and the equation as published (Poling 5th ed. App. A toluene set)', () => {
    const toluene = { kind: 'antoine' as const, log: 'log10' as const, pressureUnit: 'bar' as const, temperatureUnit: 'K' as const, a: 4.05043, b: 1327.62, c: -55.525, tMinC: 13.29, tMaxC: 136.46, source: "Poling, Prausnitz & O'Connell 5th ed., App. A" };
    const { trace } = traceSaturatedConcentration({ props: { molarMassGPerMol: 92.141, correlations: [toluene] }, tempC: 20, substanceName: 'toluene' });
    expectRenderable(trace);
    expect(trace.method).toBe('Saturated vapor concentration of toluene (antoine)');
    expect(trace.steps[0].formula).toBe('log10(P/bar) = A − B/(T/K + C)');
  });

  it('DIPPR-101 at −20 °C for m-xylene (Perry 8th ed. Table 2-8 set)', () => {
    const { trace } = traceSaturatedConcentration({ props: propsByCas('108-38-3'), tempC: -20 });
    expectRenderable(trace);
    expect(trace.steps[0].formula).toMatch(/C1 \+ C2\/T/);
  });

  it('Wagner sublimation line for dry ice at −78.5 °C names the triple point', () => {
    const { trace } = traceSaturatedConcentration({ props: propsByCas(CAS.carbonDioxide), tempC: -78.5 });
    expectRenderable(trace);
    expect(trace.steps[0].description).toBe('Wagner equation (exponents 1, 1.9, 2.9, sublimation line)');
    expect(trace.inputs.find((input) => input.symbol === 'Tt')?.value).toBe(216.592);
    expect(trace.inputs.find((input) => input.symbol === 'Pt')?.value).toBe(517.95);
  });

  it('Trouton fallback shows the estimated ΔHvap as its own step and carries the warnings', () => {
    const { trace } = traceSaturatedConcentration({ props: { molarMassGPerMol: 58.08, normalBoilingPointC: 56.08 }, tempC: 25 });
    expectRenderable(trace);
    expect(trace.steps[0].formula).toBe('ΔHvap ≈ 88 J/(mol·K) × Tb');
    expect(trace.warnings.join(' ')).toMatch(/Trouton/);
  });

  it('a boiling liquid says so in the trace', () => {
    const { trace } = traceSaturatedConcentration({ props: propsByCas(CAS.acetaldehyde), tempC: 30 });
    expectRenderable(trace);
    expect(trace.steps.find((step) => step.result.symbol === 'y')?.description).toMatch(/boils/);
  });
});
