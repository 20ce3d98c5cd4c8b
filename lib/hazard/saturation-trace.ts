import { traceStep, traceValue, type Trace, type TraceStep, type TraceValue } from './trace';
import { GAS_CONSTANT_J_PER_MOL_K, KELVIN_OFFSET, STANDARD_ATMOSPHERE_KPA, formatSig, molarVolumeLPerMol } from './units';
import {
  TROUTON_ENTROPY_J_PER_MOL_K,
  saturatedConcentration,
  selectCorrelation,
  wagnerEquationText,
  wagnerFormName,
  type SaturatedConcentrationResult,
  type VaporPressureCorrelation,
  type VaporProperties,
} from './vapor-pressure';

/** Where each property came from, by field name of VaporProperties (e.g. from the substance library's `sources`). */
export type PropertySources = Partial<Record<keyof VaporProperties | string, string>>;

const METHOD_SOURCES = {
  antoine: 'Antoine equation (C. Antoine, 1888) with the published coefficient set named in the inputs',
  dippr101: "DIPPR equation 101 (Perry's Chemical Engineers' Handbook 8th ed., Table 2-8)",
  wagner: 'Wagner-type vapor-pressure equation (W. Wagner, Cryogenics 13 (1973) 470) with the published coefficient set named in the inputs',
  'clausius-clapeyron': 'Integrated Clausius–Clapeyron equation with constant ΔHvap (e.g. OpenStax Chemistry 2e §10.3)',
  'clausius-clapeyron-trouton':
    "Integrated Clausius–Clapeyron equation with ΔHvap from Trouton's rule (88 J/(mol·K) × Tb, common practice)",
} as const;

function correlationSteps(correlation: VaporPressureCorrelation, tempC: number, pressureKPa: number): TraceStep[] {
  const tempK = tempC + KELVIN_OFFSET;
  const result = traceValue('Saturation vapor pressure', 'Psat', pressureKPa, 'kPa');
  if (correlation.kind === 'antoine') {
    const logName = correlation.log === 'log10' ? 'log10' : 'ln';
    const tText = correlation.temperatureUnit === 'K' ? 'T/K' : 't/°C';
    const tValue = correlation.temperatureUnit === 'K' ? tempK : tempC;
    return [
      traceStep(
        'Antoine equation',
        `${logName}(P/${correlation.pressureUnit}) = A − B/(${tText} + C)`,
        `${logName}(P/${correlation.pressureUnit}) = ${correlation.a} − ${correlation.b}/(${formatSig(tValue, 6)} + ${correlation.c}); P = ${formatSig(pressureKPa, 5)} kPa`,
        result,
      ),
    ];
  }
  if (correlation.kind === 'wagner') {
    const sublimation = correlation.line === 'solid-vapor';
    const tau = 1 - tempK / correlation.reducingTempK;
    const terms = correlation.coefficients.map((n, i) => `${n}·${formatSig(tau, 6)}${correlation.exponents[i] === 1 ? '' : `^${correlation.exponents[i]}`}`).join(' + ');
    return [
      traceStep(
        `Wagner equation (${wagnerFormName(correlation.exponents)}${sublimation ? ', sublimation line' : ''})`,
        wagnerEquationText(correlation),
        `τ = 1 − ${formatSig(tempK, 6)}/${correlation.reducingTempK} = ${formatSig(tau, 6)}; ln(P/${formatSig(correlation.reducingPressureKPa, 6)} kPa) = (${correlation.reducingTempK}/${formatSig(tempK, 6)})·(${terms}); P = ${formatSig(pressureKPa, 5)} kPa`,
        result,
      ),
    ];
  }
  return [
    traceStep(
      'DIPPR equation 101',
      'ln(P/Pa) = C1 + C2/T + C3·ln T + C4·T^C5, T in K',
      `ln(P/Pa) = ${correlation.c1} + ${correlation.c2}/${formatSig(tempK, 6)} + ${correlation.c3}·ln ${formatSig(tempK, 6)} + ${correlation.c4}·${formatSig(tempK, 6)}^${correlation.c5}; P = ${formatSig(pressureKPa, 5)} kPa`,
      result,
    ),
  ];
}

function correlationInputs(correlation: VaporPressureCorrelation, source: string | undefined): TraceValue[] {
  const from = correlation.source ?? source;
  const range = traceValue('Valid range', 'T range', `${correlation.tMinC}…${correlation.tMaxC}`, '°C', from);
  if (correlation.kind === 'antoine') {
    return [
      traceValue('Antoine A', 'A', correlation.a, '', from),
      traceValue('Antoine B', 'B', correlation.b, correlation.temperatureUnit === 'K' ? 'K' : '°C', from),
      traceValue('Antoine C', 'C', correlation.c, correlation.temperatureUnit === 'K' ? 'K' : '°C', from),
      range,
    ];
  }
  if (correlation.kind === 'wagner') {
    const sublimation = correlation.line === 'solid-vapor';
    return [
      traceValue(sublimation ? 'Wagner Tt (triple point)' : 'Wagner Tc (critical temperature)', sublimation ? 'Tt' : 'Tc', correlation.reducingTempK, 'K', from),
      traceValue(sublimation ? 'Wagner Pt (triple point)' : 'Wagner Pc (critical pressure)', sublimation ? 'Pt' : 'Pc', correlation.reducingPressureKPa, 'kPa', from),
      ...correlation.coefficients.map((n, i) => traceValue(`Wagner n${i + 1} (τ^${correlation.exponents[i]})`, `n${i + 1}`, n, '', from)),
      range,
    ];
  }
  return [
    traceValue('DIPPR-101 C1', 'C1', correlation.c1, '', from),
    traceValue('DIPPR-101 C2', 'C2', correlation.c2, 'K', from),
    traceValue('DIPPR-101 C3', 'C3', correlation.c3, '', from),
    traceValue('DIPPR-101 C4', 'C4', correlation.c4, '', from),
    traceValue('DIPPR-101 C5', 'C5', correlation.c5, '', from),
    range,
  ];
}

/**
 * Saturated concentration with its full calculation trace: the property values and their
 * sources, the vapor-pressure step in the method actually used, y = Psat/Patm, ppm and mg/m³.
 */
export function traceSaturatedConcentration(input: {
  props: VaporProperties;
  tempC: number;
  ambientPressureKPa?: number;
  substanceName?: string;
  propertySources?: PropertySources;
  /** Where the temperature came from (design maximum, logger reading, excursion peak…). */
  tempSource?: string;
}): { result: SaturatedConcentrationResult; trace: Trace } {
  const ambientPressureKPa = input.ambientPressureKPa ?? STANDARD_ATMOSPHERE_KPA;
  const result = saturatedConcentration(input.props, input.tempC, ambientPressureKPa);
  const { props, tempC } = input;
  const sources = input.propertySources ?? {};
  const tempK = tempC + KELVIN_OFFSET;
  const inputs: TraceValue[] = [
    traceValue('Temperature', 'T', tempC, '°C', input.tempSource),
    traceValue('Ambient pressure', 'Patm', ambientPressureKPa, 'kPa', input.ambientPressureKPa === undefined ? 'default: standard atmosphere' : undefined),
    traceValue('Molar mass', 'M', props.molarMassGPerMol, 'g/mol', sources.molarMassGPerMol),
  ];
  let steps: TraceStep[];
  const selected = selectCorrelation(props, tempC);
  if (selected) {
    inputs.push(...correlationInputs(selected.correlation, sources.correlations));
    steps = correlationSteps(selected.correlation, tempC, result.pressureKPa);
  } else {
    const boilingPointC = props.normalBoilingPointC as number;
    const enthalpyKJPerMol =
      props.enthalpyOfVaporizationKJPerMol ?? (TROUTON_ENTROPY_J_PER_MOL_K * (boilingPointC + KELVIN_OFFSET)) / 1000;
    inputs.push(traceValue('Normal boiling point', 'Tb', boilingPointC, '°C', sources.normalBoilingPointC));
    steps = [];
    if (props.enthalpyOfVaporizationKJPerMol === undefined) {
      steps.push(
        traceStep(
          "ΔHvap from Trouton's rule (common practice)",
          'ΔHvap ≈ 88 J/(mol·K) × Tb',
          `ΔHvap = 88 × ${formatSig(boilingPointC + KELVIN_OFFSET, 6)} K = ${formatSig(enthalpyKJPerMol, 4)} kJ/mol`,
          traceValue('Enthalpy of vaporization', 'ΔHvap', enthalpyKJPerMol, 'kJ/mol'),
        ),
      );
    } else {
      inputs.push(traceValue('Enthalpy of vaporization at Tb', 'ΔHvap', enthalpyKJPerMol, 'kJ/mol', sources.enthalpyOfVaporizationKJPerMol));
    }
    steps.push(
      traceStep(
        'Integrated Clausius–Clapeyron from the normal boiling point',
        'ln(P/P₀) = −(ΔHvap/R)·(1/T − 1/Tb), P₀ = 101.325 kPa',
        `P = 101.325 × exp(−(${formatSig(enthalpyKJPerMol * 1000, 6)}/${GAS_CONSTANT_J_PER_MOL_K})·(1/${formatSig(tempK, 6)} − 1/${formatSig(boilingPointC + KELVIN_OFFSET, 6)})) = ${formatSig(result.pressureKPa, 5)} kPa`,
        traceValue('Saturation vapor pressure', 'Psat', result.pressureKPa, 'kPa'),
      ),
    );
  }
  const moleFraction = result.volumePercent / 100;
  const molarVolume = molarVolumeLPerMol(tempC, ambientPressureKPa);
  steps.push(
    traceStep(
      result.boils ? 'Vapor mole fraction (the liquid boils: capped at 1)' : 'Vapor mole fraction in air',
      'y = min(1, Psat/Patm)',
      `y = min(1, ${formatSig(result.pressureKPa, 5)}/${formatSig(ambientPressureKPa, 6)}) = ${formatSig(moleFraction, 5)}`,
      traceValue('Vapor mole fraction', 'y', moleFraction, ''),
    ),
    traceStep('Concentration in ppm', 'C = 10⁶·y', `C = 10⁶ × ${formatSig(moleFraction, 5)} = ${formatSig(result.ppm, 5)} ppm`, traceValue('Saturated concentration', 'C_sat', result.ppm, 'ppm')),
    traceStep(
      'Molar volume of air at T and Patm',
      'Vm = R·T/Patm',
      `Vm = ${GAS_CONSTANT_J_PER_MOL_K} × ${formatSig(tempK, 6)} / ${formatSig(ambientPressureKPa, 6)} = ${formatSig(molarVolume, 5)} L/mol`,
      traceValue('Molar volume', 'Vm', molarVolume, 'L/mol'),
    ),
    traceStep(
      'Concentration in mg/m³',
      'C[mg/m³] = C[ppm] × M / Vm',
      `C = ${formatSig(result.ppm, 5)} × ${props.molarMassGPerMol} / ${formatSig(molarVolume, 5)} = ${formatSig(result.mgPerM3, 5)} mg/m³`,
      traceValue('Saturated concentration', 'C_sat', result.mgPerM3, 'mg/m³'),
    ),
  );
  return {
    result,
    trace: {
      method: `Saturated vapor concentration${input.substanceName ? ` of ${input.substanceName}` : ''} (${result.method})`,
      source: `${METHOD_SOURCES[result.method]}; y = Psat/Patm and mg/m³ = ppm × M/Vm (Dalton's law; mg/m³ from ppm as in CCOHS OSH Answers and NIOSH NMAM Appendix A)`,
      inputs,
      steps,
      result: traceValue('Saturated concentration', 'C_sat', result.ppm, 'ppm'),
      warnings: [...result.warnings],
    },
  };
}
