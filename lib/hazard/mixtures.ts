import { HazardInputError } from './errors';
import { traceStep, traceValue, type Trace, type TraceStep } from './trace';
import { STANDARD_ATMOSPHERE_KPA, formatNumber, formatSig } from './units';
import { assertNonEmpty, assertNonNegative, assertPositive } from './validate';
import { saturationPressure, type SaturationPressureMethod, type VaporProperties } from './vapor-pressure';

const RAOULT_SOURCE =
  "Raoult's law for an ideal solution, pᵢ = xᵢ·Pᵢsat(T) (e.g. Smith, Van Ness & Abbott, Introduction to Chemical Engineering Thermodynamics, 7th ed., §10.4)";

/**
 * Mass fractions → mole fractions: xᵢ = (wᵢ/Mᵢ) / Σ(wⱼ/Mⱼ). The mass fractions are normalised,
 * so percentages or masses in grams work as well.
 */
export function massToMoleFractions(components: { massFraction: number; molarMassGPerMol: number }[]): number[] {
  assertNonEmpty(components, 'components');
  const moles = components.map((component, i) => {
    assertNonNegative(component.massFraction, `components[${i}].massFraction`);
    assertPositive(component.molarMassGPerMol, `components[${i}].molarMassGPerMol`);
    return component.massFraction / component.molarMassGPerMol;
  });
  const total = moles.reduce((sum, value) => sum + value, 0);
  if (!(total > 0)) throw new HazardInputError('not-positive', 'components', 'The mass fractions sum to zero');
  return moles.map((value) => value / total);
}

export type RaoultComponentResult = {
  name: string;
  moleFraction: number;
  saturationPressureKPa: number;
  method: SaturationPressureMethod;
  /** pᵢ = xᵢ·Pᵢsat. */
  partialPressureKPa: number;
  /** Vapor-phase mole fraction over the liquid, yᵢ = pᵢ/P. */
  vaporMoleFraction: number;
  /** Equilibrium concentration in air, pᵢ/Patm × 10⁶ (capped with the total at 10⁶ when the mixture boils). */
  concentrationPpm: number;
};

/**
 * Partial pressures over an ideal liquid mixture by Raoult's law: pᵢ = xᵢ·Pᵢsat(T), P = Σpᵢ,
 * yᵢ = pᵢ/P. Mole fractions must sum to 1 (within 10⁻⁶); use massToMoleFractions first for a
 * mixture given by mass.
 */
export function raoultMixture(input: {
  components: { name?: string; moleFraction: number; props: VaporProperties }[];
  tempC: number;
  ambientPressureKPa?: number;
}): { components: RaoultComponentResult[]; totalPressureKPa: number; boils: boolean; trace: Trace } {
  assertNonEmpty(input.components, 'components');
  const ambientPressureKPa = input.ambientPressureKPa ?? STANDARD_ATMOSPHERE_KPA;
  assertPositive(ambientPressureKPa, 'ambientPressureKPa');
  let sum = 0;
  input.components.forEach((component, i) => {
    assertNonNegative(component.moleFraction, `components[${i}].moleFraction`);
    sum += component.moleFraction;
  });
  if (Math.abs(sum - 1) > 1e-6) {
    throw new HazardInputError('out-of-range', 'components', `Liquid mole fractions must sum to 1 (they sum to ${sum})`);
  }
  const warnings: string[] = [
    "Raoult's law assumes an ideal solution; aqueous, alcohol–water, acetone–water and acid mixtures deviate strongly",
  ];
  const steps: TraceStep[] = [];
  const partial = input.components.map((component, i) => {
    const name = component.name ?? `component ${i + 1}`;
    const saturation = saturationPressure(component.props, input.tempC);
    for (const warning of saturation.warnings) warnings.push(`${name}: ${warning}`);
    const partialPressureKPa = component.moleFraction * saturation.pressureKPa;
    steps.push(
      traceStep(
        `Partial pressure of ${name}`,
        'pᵢ = xᵢ·Pᵢsat(T)',
        `p = ${formatSig(component.moleFraction, 4)} × ${formatSig(saturation.pressureKPa, 4)} kPa = ${formatSig(partialPressureKPa, 4)} kPa`,
        traceValue(`Partial pressure of ${name}`, `p${i + 1}`, partialPressureKPa, 'kPa'),
      ),
    );
    return { name, moleFraction: component.moleFraction, saturationPressureKPa: saturation.pressureKPa, method: saturation.method, partialPressureKPa };
  });
  const totalPressureKPa = partial.reduce((total, component) => total + component.partialPressureKPa, 0);
  const boils = totalPressureKPa >= ambientPressureKPa;
  const scale = boils ? 1 / totalPressureKPa : 1 / ambientPressureKPa;
  if (boils) {
    warnings.push(
      `At ${formatNumber(input.tempC)} °C the mixture's vapor pressure (${formatSig(totalPressureKPa, 4)} kPa) reaches the ambient pressure: it boils`,
    );
  }
  const result = traceValue('Total vapor pressure', 'P', totalPressureKPa, 'kPa');
  steps.push(
    traceStep('Total vapor pressure', 'P = Σ pᵢ', `P = ${partial.map((c) => formatSig(c.partialPressureKPa, 4)).join(' + ')} = ${formatSig(totalPressureKPa, 4)} kPa`, result),
  );
  return {
    components: partial.map((component) => ({
      ...component,
      vaporMoleFraction: totalPressureKPa > 0 ? component.partialPressureKPa / totalPressureKPa : 0,
      concentrationPpm: component.partialPressureKPa * scale * 1e6,
    })),
    totalPressureKPa,
    boils,
    trace: {
      method: "Raoult's law (ideal solution)",
      source: RAOULT_SOURCE,
      inputs: [
        traceValue('Temperature', 'T', input.tempC, '°C'),
        traceValue('Ambient pressure', 'Patm', ambientPressureKPa, 'kPa'),
        ...partial.flatMap((component, i) => [
          traceValue(`Liquid mole fraction of ${component.name}`, `x${i + 1}`, component.moleFraction, ''),
          traceValue(`Saturation pressure of ${component.name} (${component.method})`, `P${i + 1}sat`, component.saturationPressureKPa, 'kPa'),
        ]),
      ],
      steps,
      result,
      warnings,
    },
  };
}
