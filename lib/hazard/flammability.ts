import { HazardInputError } from './errors';
import { traceStep, traceValue, type Trace } from './trace';
import { STANDARD_ATMOSPHERE_KPA, formatSig } from './units';
import { assertFinite, assertNonEmpty, assertNonNegative, assertPositive, assertTempC } from './validate';
import { temperatureAtSaturationPressureC, validateVaporProperties, type VaporProperties } from './vapor-pressure';

const LE_CHATELIER_SOURCE =
  "Le Chatelier's mixing rule; C. V. Mashuga and D. A. Crowl, Process Safety Progress 19(2) (2000) 112–117";

/**
 * Lower flammable temperature: the temperature at which the saturated vapor over the liquid
 * reaches the LFL, i.e. Psat(T_L)/Patm = LFL (the equilibrium definition behind ASTM E1232's
 * lower temperature limit of flammability). Null when the substance has no LFL.
 */
export function lowerFlammableTemperatureC(props: VaporProperties, ambientPressureKPa = STANDARD_ATMOSPHERE_KPA): number | null {
  validateVaporProperties(props);
  assertPositive(ambientPressureKPa, 'ambientPressureKPa');
  if (props.lflVolPercent === undefined) return null;
  if (props.lflVolPercent > 100) {
    throw new HazardInputError('out-of-range', 'props.lflVolPercent', `LFL ${props.lflVolPercent} % by volume is above 100 %`);
  }
  return temperatureAtSaturationPressureC(props, (props.lflVolPercent / 100) * ambientPressureKPa);
}

/**
 * Le Chatelier's rule for the LFL of a combustible vapor mixture:
 * LFL_mix = 1 / Σ(yᵢ/LFLᵢ), yᵢ the mole fraction on a combustible-only basis (the given mole
 * fractions are normalised, so any basis will do). Mashuga & Crowl (2000); Crowl & Louvar ch. 6.
 */
export function leChatelierLflVolPercent(components: { moleFraction: number; lflVolPercent: number }[]): number {
  return leChatelierMixture(components).lflVolPercent;
}

export function leChatelierMixture(components: { name?: string; moleFraction: number; lflVolPercent: number }[]): {
  lflVolPercent: number;
  trace: Trace;
} {
  assertNonEmpty(components, 'components');
  let total = 0;
  components.forEach((component, i) => {
    assertNonNegative(component.moleFraction, `components[${i}].moleFraction`);
    assertPositive(component.lflVolPercent, `components[${i}].lflVolPercent`);
    total += component.moleFraction;
  });
  if (!(total > 0)) {
    throw new HazardInputError('not-positive', 'components', 'The mole fractions of the combustible components sum to zero');
  }
  let sum = 0;
  const terms: string[] = [];
  for (const component of components) {
    const y = component.moleFraction / total;
    sum += y / component.lflVolPercent;
    terms.push(`${formatSig(y, 4)}/${formatSig(component.lflVolPercent, 4)}`);
  }
  const lflVolPercent = 1 / sum;
  const result = traceValue('LFL of the mixture', 'LFL_mix', lflVolPercent, '% by volume');
  return {
    lflVolPercent,
    trace: {
      method: "Le Chatelier's mixing rule",
      source: LE_CHATELIER_SOURCE,
      inputs: components.flatMap((component, i) => [
        traceValue(`Mole fraction of ${component.name ?? `component ${i + 1}`}`, `x${i + 1}`, component.moleFraction, ''),
        traceValue(`LFL of ${component.name ?? `component ${i + 1}`}`, `LFL${i + 1}`, component.lflVolPercent, '% by volume'),
      ]),
      steps: [
        traceStep(
          'Normalise to the combustible-only basis and apply the rule',
          'LFL_mix = 1 / Σ(yᵢ/LFLᵢ), yᵢ = xᵢ/Σx',
          `LFL_mix = 1 / (${terms.join(' + ')}) = ${formatSig(lflVolPercent, 4)} %`,
          result,
        ),
      ],
      result,
      warnings: ['Le Chatelier is an ideal-mixing rule; it is less reliable for the UFL and with inert diluents'],
    },
  };
}

export type LflFractionResult = {
  /** C / LFL as a fraction (0.25 = 25 % LFL). */
  fractionOfLfl: number;
  percentOfLfl: number;
  /** The configured alarm fractions that are reached or exceeded, in ascending order. */
  alarmFractionsReached: number[];
  trace: Trace;
};

/**
 * Fraction of the LFL for one or more vapors in the same air: Σ Cᵢ/LFLᵢ (for a single vapor C/LFL).
 * The sum form follows from Le Chatelier's rule with yᵢ = Cᵢ/ΣC (Headroom's derivation).
 * Alarm fractions are settings (commonly 0.10 and 0.25; OSHA 1910.146 uses 10 %, NYC Fire Code
 * 25 %) and are passed in, never assumed.
 */
export function lflFraction(input: {
  components: { name?: string; concentrationPpm: number; lflVolPercent: number }[];
  alarmFractions?: number[];
}): LflFractionResult {
  assertNonEmpty(input.components, 'components');
  const alarms = [...(input.alarmFractions ?? [])].sort((a, b) => a - b);
  alarms.forEach((fraction, i) => assertPositive(fraction, `alarmFractions[${i}]`));
  let fractionOfLfl = 0;
  const terms: string[] = [];
  input.components.forEach((component, i) => {
    assertNonNegative(component.concentrationPpm, `components[${i}].concentrationPpm`);
    assertPositive(component.lflVolPercent, `components[${i}].lflVolPercent`);
    const lflPpm = component.lflVolPercent * 10_000;
    fractionOfLfl += component.concentrationPpm / lflPpm;
    terms.push(`${formatSig(component.concentrationPpm, 4)}/${formatSig(lflPpm, 4)}`);
  });
  const result = traceValue('Fraction of the LFL', 'ΣC/LFL', fractionOfLfl, '');
  return {
    fractionOfLfl,
    percentOfLfl: fractionOfLfl * 100,
    alarmFractionsReached: alarms.filter((fraction) => fractionOfLfl >= fraction),
    trace: {
      method: 'Fraction of the lower flammable limit',
      source: "Le Chatelier's rule in its additive form Σ Cᵢ/LFLᵢ (derived from LFL_mix = 1/Σ(yᵢ/LFLᵢ) with yᵢ = Cᵢ/ΣC)",
      inputs: input.components.flatMap((component, i) => [
        traceValue(`Concentration of ${component.name ?? `vapor ${i + 1}`}`, `C${i + 1}`, component.concentrationPpm, 'ppm'),
        traceValue(`LFL of ${component.name ?? `vapor ${i + 1}`}`, `LFL${i + 1}`, component.lflVolPercent, '% by volume'),
      ]),
      steps: [
        traceStep(
          'Sum the concentrations as fractions of each LFL (1 % by volume = 10 000 ppm)',
          'f = Σ Cᵢ/LFLᵢ',
          `f = ${terms.join(' + ')} = ${formatSig(fractionOfLfl, 4)}`,
          result,
        ),
      ],
      result,
      warnings: [],
    },
  };
}

/**
 * Flash-point margin: flags a storage temperature within marginC of the closed-cup flash point
 * (ASTM E502 says flammable vapor may be present from 5–10 °C below the flash point; OSHA's
 * heated-use rule uses 30 °F = 16.7 °C). The margin is a setting.
 */
export function flashPointMargin(input: { tempC: number; flashPointC: number; marginC: number }): {
  marginToFlashPointC: number;
  atOrAboveFlashPoint: boolean;
  withinMargin: boolean;
} {
  assertTempC(input.tempC);
  assertFinite(input.flashPointC, 'flashPointC');
  assertNonNegative(input.marginC, 'marginC');
  const marginToFlashPointC = input.flashPointC - input.tempC;
  return {
    marginToFlashPointC,
    atOrAboveFlashPoint: marginToFlashPointC <= 0,
    withinMargin: marginToFlashPointC <= input.marginC,
  };
}
