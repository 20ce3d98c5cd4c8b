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
  it('Antoine: the coefficients with their source, the equation with numbers, y, ppm, Vm, mg/m³', () => {
    const seed = seedByCas(CAS.toluene);
    const { result, trace } = traceSaturatedConcentration({
      props: propsByCas(CAS.toluene),
      tempC: 20,
      substanceName: 'toluene',
      propertySources: seed.sources,
      tempSource: 'storeroom design maximum',
    });
    expectRenderable(trace);
    expect(trace.method).toBe('Saturated vapor concentration of toluene (antoine)');
    expect(trace.inputs.find((input) => input.symbol === 'M')?.source).toBe(seed.sources.molarMassGPerMol);
    expect(trace.steps[0].formula).toBe('log10(P/bar) = A − B/(T/K + C)');
    expect(trace.steps.map((step) => step.result.symbol)).toEqual(['Psat', 'y', 'C_sat', 'Vm', 'C_sat']);
    expect(trace.result.value).toBe(result.ppm);
  });

  it('DIPPR-101 at −20 °C for ethanol', () => {
    const { trace } = traceSaturatedConcentration({ props: propsByCas(CAS.ethanol), tempC: -20 });
    expectRenderable(trace);
    expect(trace.steps[0].formula).toMatch(/C1 \+ C2\/T/);
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
