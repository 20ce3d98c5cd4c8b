import { mgPerM3ToPpm } from './concentration';
import { HazardInputError } from './errors';
import { traceStep, traceValue, type Trace, type TraceValue } from './trace';
import { STANDARD_ATMOSPHERE_KPA, formatSig } from './units';
import { assertNonEmpty, assertNonNegative, assertPositive, assertTempC } from './validate';

export type ExposureLimitKind = 'TWA' | 'STEL' | 'ceiling' | 'IDLH';
export type ExposureLimitUnit = 'ppm' | 'mg/m3';

export type ExposureLimit = {
  kind: ExposureLimitKind;
  value: number;
  unit: ExposureLimitUnit;
  /** Issuing body, e.g. OSHA, NIOSH, an EU directive. */
  body?: string;
  source?: string;
  /**
   * Temperature at which an mg/m³ limit is stated; 25 °C for US and ACGIH limits (the 24.45 L/mol
   * convention). Take another list's reference conditions from the list itself.
   */
  referenceTempC?: number;
};

export type ExposureRatio = {
  limit: ExposureLimit;
  /** The limit in ppm, converted at the limit's own reference conditions when it is in mg/m³. */
  limitPpm: number;
  /** C / limit. */
  ratio: number;
  exceeded: boolean;
};

function validateLimit(limit: ExposureLimit, field: string): void {
  if (limit === null || typeof limit !== 'object') throw new HazardInputError('empty-input', field, `${field} is missing`);
  if (!['TWA', 'STEL', 'ceiling', 'IDLH'].includes(limit.kind)) {
    throw new HazardInputError('invalid-option', `${field}.kind`, `Unknown exposure-limit kind "${String(limit.kind)}"`);
  }
  if (limit.unit !== 'ppm' && limit.unit !== 'mg/m3') {
    throw new HazardInputError('invalid-option', `${field}.unit`, `Exposure-limit unit must be "ppm" or "mg/m3" (got "${String(limit.unit)}")`);
  }
  assertPositive(limit.value, `${field}.value`);
  if (limit.referenceTempC !== undefined) assertTempC(limit.referenceTempC, `${field}.referenceTempC`);
}

/** An exposure limit in ppm; mg/m³ limits are converted at their reference conditions (CCOHS OSH Answers; NIOSH NMAM Appendix A). */
export function exposureLimitPpm(limit: ExposureLimit, molarMassGPerMol: number): number {
  validateLimit(limit, 'limit');
  if (limit.unit === 'ppm') return limit.value;
  return mgPerM3ToPpm(limit.value, molarMassGPerMol, limit.referenceTempC ?? 25, STANDARD_ATMOSPHERE_KPA);
}

function limitLabel(limit: ExposureLimit): string {
  return `${limit.body ? `${limit.body} ` : ''}${limit.kind} ${formatSig(limit.value, 4)} ${limit.unit === 'mg/m3' ? 'mg/m³' : 'ppm'}`;
}

/**
 * Ratio of a concentration to each exposure limit (the "vapor hazard ratio" C/OEL when C is the
 * saturated concentration). Every limit is reported; which one controls is the caller's policy.
 */
export function exposureRatios(input: {
  concentrationPpm: number;
  molarMassGPerMol: number;
  limits: ExposureLimit[];
}): { ratios: ExposureRatio[]; highestRatio: number | null; trace: Trace } {
  assertNonNegative(input.concentrationPpm, 'concentrationPpm');
  assertPositive(input.molarMassGPerMol, 'molarMassGPerMol');
  if (!Array.isArray(input.limits)) throw new HazardInputError('empty-input', 'limits', 'limits must be an array');
  input.limits.forEach((limit, i) => validateLimit(limit, `limits[${i}]`));
  const ratios = input.limits.map((limit) => {
    const limitPpm = exposureLimitPpm(limit, input.molarMassGPerMol);
    const ratio = input.concentrationPpm / limitPpm;
    return { limit, limitPpm, ratio, exceeded: ratio > 1 };
  });
  const highestRatio = ratios.length === 0 ? null : Math.max(...ratios.map((item) => item.ratio));
  const result = traceValue('Highest ratio to a limit', 'max(C/L)', highestRatio ?? 'no limits given', '');
  return {
    ratios,
    highestRatio,
    trace: {
      method: 'Ratio of concentration to exposure limits',
      source: 'Limit kinds and conversions: OSHA 29 CFR 1910.1000, NIOSH Pocket Guide; ppm ↔ mg/m³ at 25 °C, 1 atm (ACGIH/CCOHS)',
      inputs: [
        traceValue('Concentration', 'C', input.concentrationPpm, 'ppm'),
        traceValue('Molar mass', 'M', input.molarMassGPerMol, 'g/mol'),
        ...input.limits.map((limit) => traceValue(limitLabel(limit), `L_${limit.kind}`, limit.value, limit.unit, limit.source)),
      ],
      steps: ratios.map((item) =>
        traceStep(
          `Ratio to ${limitLabel(item.limit)}`,
          item.limit.unit === 'ppm' ? 'r = C / L' : 'r = C / (L × Vm(T_ref) / M)',
          `r = ${formatSig(input.concentrationPpm, 4)} / ${formatSig(item.limitPpm, 4)} = ${formatSig(item.ratio, 4)}`,
          traceValue(`Ratio to ${item.limit.kind}`, `r_${item.limit.kind}`, item.ratio, ''),
        ),
      ),
      result,
      warnings: [],
    },
  };
}

/**
 * Additive exposure index for several substances in the same air, applied separately for each
 * kind of limit: E_m = Σ Cᵢ/Lᵢ, and E_m > 1 exceeds the mixture limit
 * (OSHA 29 CFR 1910.1000(d)(2)(i); WAC 296-841-20005).
 */
export function additiveExposureIndex(
  components: { name?: string; concentrationPpm: number; molarMassGPerMol: number; limit: ExposureLimit }[],
): { index: number; exceeded: boolean; terms: number[]; trace: Trace } {
  assertNonEmpty(components, 'components');
  const kind = components[0]?.limit?.kind;
  const inputs: TraceValue[] = [];
  const terms = components.map((component, i) => {
    assertNonNegative(component.concentrationPpm, `components[${i}].concentrationPpm`);
    assertPositive(component.molarMassGPerMol, `components[${i}].molarMassGPerMol`);
    validateLimit(component.limit, `components[${i}].limit`);
    if (component.limit.kind !== kind) {
      throw new HazardInputError(
        'invalid-option',
        `components[${i}].limit.kind`,
        `The additive index is applied to one kind of limit at a time (got ${kind} and ${component.limit.kind})`,
      );
    }
    const label = component.name ?? `substance ${i + 1}`;
    inputs.push(traceValue(`Concentration of ${label}`, `C${i + 1}`, component.concentrationPpm, 'ppm'));
    inputs.push(traceValue(`${limitLabel(component.limit)} for ${label}`, `L${i + 1}`, component.limit.value, component.limit.unit, component.limit.source));
    return component.concentrationPpm / exposureLimitPpm(component.limit, component.molarMassGPerMol);
  });
  const index = terms.reduce((sum, term) => sum + term, 0);
  const result = traceValue(`Additive exposure index (${kind})`, 'E_m', index, '');
  return {
    index,
    exceeded: index > 1,
    terms,
    trace: {
      method: 'Additive mixture rule',
      source: 'OSHA 29 CFR 1910.1000(d)(2)(i): E_m = C₁/L₁ + … + Cₙ/Lₙ, not to exceed 1',
      inputs,
      steps: [
        traceStep(
          'Sum the ratios of each concentration to its limit',
          'E_m = Σ Cᵢ/Lᵢ',
          `E_m = ${terms.map((term) => formatSig(term, 4)).join(' + ')} = ${formatSig(index, 4)}`,
          result,
        ),
      ],
      result,
      warnings: ['The additive rule assumes similar modes of toxic action; a qualified person decides whether it applies'],
    },
  };
}
