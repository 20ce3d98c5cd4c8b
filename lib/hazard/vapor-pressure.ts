import { HazardInputError } from './errors';
import { formatNumber, formatSig, type PressureUnit } from './units';

// This module is the hot path (saturationPressure + saturatedConcentration run for every
// location × substance × temperature on each re-evaluation). It keeps its constants and guards
// local: bundlers and tsx turn imported bindings into getter calls, which cost more than the
// physics. Values are the same as in units.ts.
const KELVIN_OFFSET = 273.15;
const GAS_CONSTANT_J_PER_MOL_K = 8.314462618;
const STANDARD_ATMOSPHERE_KPA = 101.325;
const KPA_PER_MMHG = 101.325 / 760;

function kPaPerUnit(unit: PressureUnit): number {
  switch (unit) {
    case 'Pa':
      return 0.001;
    case 'kPa':
      return 1;
    case 'bar':
      return 100;
    case 'mmHg':
      return KPA_PER_MMHG;
    default:
      return STANDARD_ATMOSPHERE_KPA; // 'atm'; other units are rejected by validateCorrelation
  }
}

function assertTempC(tempC: number, field = 'tempC'): void {
  if (typeof tempC !== 'number' || !(tempC > -KELVIN_OFFSET) || tempC === Number.POSITIVE_INFINITY) {
    if (typeof tempC === 'number' && tempC <= -KELVIN_OFFSET && tempC !== Number.NEGATIVE_INFINITY) {
      throw new HazardInputError('below-absolute-zero', field, `${field} = ${tempC} °C is at or below absolute zero (−273.15 °C)`);
    }
    throw new HazardInputError('not-finite', field, `${field} must be a finite temperature in °C (got ${String(tempC)})`);
  }
}

function assertPositive(value: number, field: string): void {
  if (typeof value !== 'number' || !(value > 0) || value === Number.POSITIVE_INFINITY) {
    if (typeof value === 'number' && Number.isFinite(value)) {
      throw new HazardInputError('not-positive', field, `${field} must be greater than zero (got ${value})`);
    }
    throw new HazardInputError('not-finite', field, `${field} must be a finite number (got ${String(value)})`);
  }
}

/**
 * A vapor-pressure correlation as published, with its valid range converted to °C.
 *
 * - Antoine: log(P) = A − B/(T + C), with log10 or ln, P in the stated unit and T in K or °C
 *   (Antoine 1888; the forms of Poling, Prausnitz & O'Connell 5th ed. App. A and the NIST
 *   Chemistry WebBook are both covered).
 * - DIPPR equation 101: ln(P/Pa) = C1 + C2/T + C3·ln T + C4·T^C5 with T in K (Perry's Chemical
 *   Engineers' Handbook 8th ed., Table 2-8).
 * - Wagner type: ln(P/Pr) = (Tr/T)·Σ nᵢ·τ^tᵢ with τ = 1 − T/Tr (W. Wagner, Cryogenics 13 (1973) 470).
 *   For a liquid–vapor line Tr and Pr are the critical point; the published sets differ only in
 *   their exponents, stored with each set so that every one is represented exactly: "2.5-5"
 *   (1, 1.5, 2.5, 5: Poling, Prausnitz & O'Connell 5th ed. §7-3; VDI Heat Atlas 2nd ed. D3.1),
 *   "3-6" (1, 1.5, 3, 6: McGarry 1983), Span & Wagner's CO₂ equation (1, 1.5, 2, 4), Wagner &
 *   Pruss's water equation (1, 1.5, 3, 3.5, 4, 7.5). A sublimation line of the same form (Span &
 *   Wagner's CO₂ eq. 3.12, exponents 1, 1.9, 2.9) is reduced by the triple point instead.
 */
export type VaporPressureCorrelation =
  | {
      kind: 'antoine';
      log: 'log10' | 'ln';
      pressureUnit: PressureUnit;
      temperatureUnit: 'K' | 'C';
      a: number;
      b: number;
      c: number;
      tMinC: number;
      tMaxC: number;
      source?: string;
    }
  | {
      kind: 'dippr101';
      c1: number;
      c2: number;
      c3: number;
      c4: number;
      c5: number;
      tMinC: number;
      tMaxC: number;
      source?: string;
    }
  | {
      kind: 'wagner';
      /** Tr: the critical temperature of a liquid–vapor line, the triple-point temperature of a sublimation line. */
      reducingTempK: number;
      /** Pr: the critical pressure (liquid–vapor line) or the triple-point pressure (sublimation line). */
      reducingPressureKPa: number;
      /** nᵢ, in the published order. */
      coefficients: number[];
      /** tᵢ, one per coefficient: e.g. [1, 1.5, 2.5, 5] for the "2.5-5" form, [1, 1.5, 3, 6] for the "3-6" form. */
      exponents: number[];
      /** Which equilibrium the set describes; liquid–vapor when absent. A solid–vapor (sublimation) set is reduced by the triple point. */
      line?: 'liquid-vapor' | 'solid-vapor';
      tMinC: number;
      tMaxC: number;
      source?: string;
    };

export type VaporProperties = {
  molarMassGPerMol: number;
  /** In order of preference. */
  correlations?: VaporPressureCorrelation[];
  /** At 101.325 kPa. For a subliming solid (dry ice) the sublimation point. */
  normalBoilingPointC?: number;
  /** At the normal boiling point (ΔHsub for a subliming solid). */
  enthalpyOfVaporizationKJPerMol?: number;
  meltingPointC?: number;
  flashPointC?: number;
  lflVolPercent?: number;
  uflVolPercent?: number;
};

export type SaturationPressureMethod = 'antoine' | 'dippr101' | 'wagner' | 'clausius-clapeyron' | 'clausius-clapeyron-trouton';

export type SaturationPressureResult = {
  pressureKPa: number;
  method: SaturationPressureMethod;
  /** True when T lies outside the chosen correlation's range, or for a one-point Clausius–Clapeyron estimate. */
  extrapolated: boolean;
  warnings: string[];
};

export type SaturatedConcentrationResult = {
  /** Equilibrium vapor concentration, capped at 10⁶ ppm (100 % by volume) when the liquid boils. */
  ppm: number;
  mgPerM3: number;
  volumePercent: number;
  /** Psat ≥ ambient pressure: the liquid boils and a closed container can pressurize. */
  boils: boolean;
  /** The saturation vapor pressure itself (not capped). */
  pressureKPa: number;
  warnings: string[];
  /** Added for the trace; the public shape above is what callers rely on. */
  method: SaturationPressureMethod;
  extrapolated: boolean;
};

/**
 * Trouton's rule: ΔSvap(Tb) = ΔHvap/Tb ≈ 88 J·mol⁻¹·K⁻¹ for non-associated liquids (common
 * practice; Atkins quotes ≈ 85). About 25 % off for alcohols and water, fails for carboxylic acids.
 */
export const TROUTON_ENTROPY_J_PER_MOL_K = 88;

const LN10 = Math.LN10;
const LN_KPA_PER_PA = Math.log(0.001);

const CORRELATION_LABEL = { antoine: 'Antoine', dippr101: 'DIPPR-101', wagner: 'Wagner' } as const;

/** At most this many terms in a Wagner-type set (the water equation has six). */
const WAGNER_MAX_TERMS = 8;

function invalidCorrelation(index: number, message: string): HazardInputError {
  return new HazardInputError('invalid-correlation', `props.correlations[${index}]`, `Correlation ${index + 1}: ${message}`);
}

function validateCorrelation(correlation: VaporPressureCorrelation, index: number): void {
  if (correlation === null || typeof correlation !== 'object') throw invalidCorrelation(index, 'is not an object');
  const { tMinC, tMaxC } = correlation;
  if (!Number.isFinite(tMinC) || !Number.isFinite(tMaxC) || tMinC >= tMaxC) {
    throw invalidCorrelation(index, `has no usable temperature range (tMinC = ${tMinC}, tMaxC = ${tMaxC}; need tMinC < tMaxC)`);
  }
  if (tMinC <= -KELVIN_OFFSET) throw invalidCorrelation(index, `range starts at or below absolute zero (${tMinC} °C)`);
  if (correlation.kind === 'antoine') {
    if (!Number.isFinite(correlation.a) || !Number.isFinite(correlation.b) || !Number.isFinite(correlation.c)) {
      throw invalidCorrelation(index, 'Antoine coefficients A, B and C must be finite numbers');
    }
    if (correlation.log !== 'log10' && correlation.log !== 'ln') {
      throw invalidCorrelation(index, `Antoine log must be "log10" or "ln" (got "${String(correlation.log)}")`);
    }
    if (correlation.temperatureUnit !== 'K' && correlation.temperatureUnit !== 'C') {
      throw invalidCorrelation(index, `Antoine temperatureUnit must be "K" or "C" (got "${String(correlation.temperatureUnit)}")`);
    }
    switch (correlation.pressureUnit) {
      case 'Pa':
      case 'kPa':
      case 'bar':
      case 'mmHg':
      case 'atm':
        break;
      default:
        throw invalidCorrelation(index, `unknown pressure unit "${String(correlation.pressureUnit)}"`);
    }
  } else if (correlation.kind === 'dippr101') {
    if (
      !Number.isFinite(correlation.c1) ||
      !Number.isFinite(correlation.c2) ||
      !Number.isFinite(correlation.c3) ||
      !Number.isFinite(correlation.c4) ||
      !Number.isFinite(correlation.c5)
    ) {
      throw invalidCorrelation(index, 'DIPPR-101 coefficients C1…C5 must be finite numbers');
    }
  } else if (correlation.kind === 'wagner') {
    validateWagner(correlation, index);
  } else {
    throw invalidCorrelation(index, `unknown kind "${String((correlation as { kind?: unknown }).kind)}"`);
  }
}

function validateWagner(correlation: Extract<VaporPressureCorrelation, { kind: 'wagner' }>, index: number): void {
  const { reducingTempK, reducingPressureKPa, coefficients, exponents } = correlation;
  if (typeof reducingTempK !== 'number' || !Number.isFinite(reducingTempK) || reducingTempK <= 0) {
    throw invalidCorrelation(index, `Wagner reducing temperature (Tc, or Tt for a sublimation line) must be a positive number of kelvin (got ${String(reducingTempK)})`);
  }
  if (typeof reducingPressureKPa !== 'number' || !Number.isFinite(reducingPressureKPa) || reducingPressureKPa <= 0) {
    throw invalidCorrelation(index, `Wagner reducing pressure (Pc, or Pt for a sublimation line) must be a positive number of kPa (got ${String(reducingPressureKPa)})`);
  }
  if (!Array.isArray(coefficients) || coefficients.length === 0 || coefficients.length > WAGNER_MAX_TERMS) {
    throw invalidCorrelation(index, `Wagner coefficients must be a list of 1 to ${WAGNER_MAX_TERMS} numbers`);
  }
  if (!Array.isArray(exponents) || exponents.length !== coefficients.length) {
    throw invalidCorrelation(index, `Wagner exponents must be a list with one exponent per coefficient (${coefficients.length})`);
  }
  for (let i = 0; i < coefficients.length; i++) {
    if (typeof coefficients[i] !== 'number' || !Number.isFinite(coefficients[i])) {
      throw invalidCorrelation(index, `Wagner coefficient ${i + 1} must be a finite number (got ${String(coefficients[i])})`);
    }
    if (typeof exponents[i] !== 'number' || !Number.isFinite(exponents[i]) || exponents[i] <= 0) {
      throw invalidCorrelation(index, `Wagner exponent ${i + 1} must be a positive number (got ${String(exponents[i])})`);
    }
  }
  if (correlation.line !== undefined && correlation.line !== 'liquid-vapor' && correlation.line !== 'solid-vapor') {
    throw invalidCorrelation(index, `Wagner line must be "liquid-vapor" or "solid-vapor" (got "${String(correlation.line)}")`);
  }
  if (correlation.tMinC + KELVIN_OFFSET >= reducingTempK) {
    throw invalidCorrelation(index, `range starts at or above the reducing temperature (${reducingTempK} K), where the Wagner form has no liquid or solid left`);
  }
}

function assertOptionalFinite(value: number | undefined, field: string): void {
  if (value !== undefined && (typeof value !== 'number' || !Number.isFinite(value))) {
    throw new HazardInputError('not-finite', field, `${field} must be a finite number when given (got ${String(value)})`);
  }
}

// Forms of a compiled correlation. Perry's DIPPR-101 sets use C5 = 1, 2 or 6; for those the power
// T^C5 is a product, several times faster than Math.pow.
const FORM_ANTOINE = 0;
const FORM_DIPPR_T1 = 1;
const FORM_DIPPR_T2 = 2;
const FORM_DIPPR_T6 = 3;
const FORM_DIPPR_POW = 4;
const FORM_WAGNER_25_5 = 5;
const FORM_WAGNER_3_6 = 6;
const FORM_WAGNER_ANY = 7;
const NO_TERMS: readonly number[] = Object.freeze([]);

/**
 * A correlation reduced to plain numbers in one fixed shape, so the hot path does no unit
 * switches and sees a single object layout:
 * Antoine: ln(P/kPa) = k0 − k1/(T/K + k2); DIPPR-101: ln(P/kPa) = k0 + k1/T + k2·ln T + k3·T^k4;
 * Wagner: ln(P/kPa) = k0 + (k5/T)·(k1·τ + k2·τ^t₂ + k3·τ^t₃ + k4·τ^t₄), τ = 1 − T/k5, with the
 * exponents of the form fixed (2.5-5, 3-6) or read from `t` (any other set, coefficients in `n`).
 */
type CompiledCorrelation = {
  readonly tMinC: number;
  readonly tMaxC: number;
  readonly form: number;
  readonly method: 'antoine' | 'dippr101' | 'wagner';
  readonly k0: number;
  readonly k1: number;
  readonly k2: number;
  readonly k3: number;
  readonly k4: number;
  readonly k5: number;
  readonly n: readonly number[];
  readonly t: readonly number[];
};

// Compiled objects are built by these factories as object literals, not as classes: a class
// field is first defined as undefined and only then set, which makes V8 store every number in it
// boxed; a literal's numeric fields stay unboxed doubles. One factory, one object layout.
function newCompiledCorrelation(
  tMinC: number,
  tMaxC: number,
  form: number,
  method: 'antoine' | 'dippr101' | 'wagner',
  k0: number,
  k1: number,
  k2: number,
  k3: number,
  k4: number,
  k5 = 0,
  n: readonly number[] = NO_TERMS,
  t: readonly number[] = NO_TERMS,
): CompiledCorrelation {
  return { tMinC, tMaxC, form, method, k0, k1, k2, k3, k4, k5, n, t };
}

function sameExponents(exponents: readonly number[], form: readonly number[]): boolean {
  return exponents.length === form.length && exponents.every((value, i) => value === form[i]);
}

function compileWagner(correlation: Extract<VaporPressureCorrelation, { kind: 'wagner' }>): CompiledCorrelation {
  const { coefficients, exponents } = correlation;
  const lnReducingKPa = Math.log(correlation.reducingPressureKPa);
  const fixed = sameExponents(exponents, [1, 1.5, 2.5, 5]) ? FORM_WAGNER_25_5 : sameExponents(exponents, [1, 1.5, 3, 6]) ? FORM_WAGNER_3_6 : FORM_WAGNER_ANY;
  if (fixed !== FORM_WAGNER_ANY) {
    return newCompiledCorrelation(
      correlation.tMinC,
      correlation.tMaxC,
      fixed,
      'wagner',
      lnReducingKPa,
      coefficients[0],
      coefficients[1],
      coefficients[2],
      coefficients[3],
      correlation.reducingTempK,
    );
  }
  return newCompiledCorrelation(
    correlation.tMinC,
    correlation.tMaxC,
    FORM_WAGNER_ANY,
    'wagner',
    lnReducingKPa,
    0,
    0,
    0,
    0,
    correlation.reducingTempK,
    Object.freeze([...coefficients]),
    Object.freeze([...exponents]),
  );
}

/**
 * ln(P/Pr)·T/Tr of a Wagner-type set. At or above the reducing temperature τ is held at 0, so the
 * value is Pr itself: above the critical temperature no liquid is left, and the critical pressure
 * is the lowest pressure a closed container of the substance can hold there.
 */
function wagnerSum(form: number, k1: number, k2: number, k3: number, k4: number, n: readonly number[], t: readonly number[], tau: number): number {
  if (!(tau > 0)) return 0;
  if (form === FORM_WAGNER_25_5) {
    const root = Math.sqrt(tau);
    const square = tau * tau;
    return k1 * tau + k2 * tau * root + k3 * square * root + k4 * square * square * tau;
  }
  if (form === FORM_WAGNER_3_6) {
    const cube = tau * tau * tau;
    return k1 * tau + k2 * tau * Math.sqrt(tau) + k3 * cube + k4 * cube * cube;
  }
  let sum = 0;
  for (let i = 0; i < n.length; i++) sum += n[i] * Math.pow(tau, t[i]);
  return sum;
}

function dipprForm(exponent: number): number {
  if (exponent === 2) return FORM_DIPPR_T2;
  if (exponent === 6) return FORM_DIPPR_T6;
  if (exponent === 1) return FORM_DIPPR_T1;
  return FORM_DIPPR_POW;
}

function compileCorrelation(correlation: VaporPressureCorrelation): CompiledCorrelation {
  if (correlation.kind === 'antoine') {
    const logFactor = correlation.log === 'log10' ? LN10 : 1;
    return newCompiledCorrelation(
      correlation.tMinC,
      correlation.tMaxC,
      FORM_ANTOINE,
      'antoine',
      correlation.a * logFactor + Math.log(kPaPerUnit(correlation.pressureUnit)),
      correlation.b * logFactor,
      correlation.temperatureUnit === 'K' ? correlation.c : correlation.c - KELVIN_OFFSET,
      0,
      0,
    );
  }
  if (correlation.kind === 'wagner') return compileWagner(correlation);
  return newCompiledCorrelation(
    correlation.tMinC,
    correlation.tMaxC,
    dipprForm(correlation.c5),
    'dippr101',
    correlation.c1 + LN_KPA_PER_PA,
    correlation.c2,
    correlation.c3,
    correlation.c4,
    correlation.c5,
  );
}

/** ln(P/kPa) of one compiled correlation; NaN where the Antoine form is undefined (T + C ≤ 0). */
function evaluateCompiledKPa(compiled: CompiledCorrelation, tempC: number): number {
  const tempK = tempC + KELVIN_OFFSET;
  const form = compiled.form;
  if (form === FORM_ANTOINE) {
    const denominator = tempK + compiled.k2;
    return denominator <= 0 ? Number.NaN : Math.exp(compiled.k0 - compiled.k1 / denominator);
  }
  if (form === FORM_WAGNER_25_5) {
    // The common published form, written out: τ^1.5 = τ·√τ, τ^2.5 = τ²·√τ, τ^5 = τ⁴·τ.
    const reducingTempK = compiled.k5;
    const tau = 1 - tempK / reducingTempK;
    if (tau > 0) {
      const root = Math.sqrt(tau);
      const square = tau * tau;
      const sum = compiled.k1 * tau + (compiled.k2 * tau + compiled.k3 * square) * root + compiled.k4 * square * square * tau;
      return Math.exp(compiled.k0 + (reducingTempK / tempK) * sum);
    }
    return Math.exp(compiled.k0);
  }
  if (form >= FORM_WAGNER_3_6) {
    const reducingTempK = compiled.k5;
    const sum = wagnerSum(form, compiled.k1, compiled.k2, compiled.k3, compiled.k4, compiled.n, compiled.t, 1 - tempK / reducingTempK);
    return Math.exp(compiled.k0 + (reducingTempK / tempK) * sum);
  }
  let power: number;
  if (form === FORM_DIPPR_T2) power = tempK * tempK;
  else if (form === FORM_DIPPR_T6) {
    const cube = tempK * tempK * tempK;
    power = cube * cube;
  } else if (form === FORM_DIPPR_T1) power = tempK;
  else power = Math.pow(tempK, compiled.k4);
  return Math.exp(compiled.k0 + compiled.k1 / tempK + compiled.k2 * Math.log(tempK) + compiled.k3 * power);
}

/**
 * What the hot path needs of a property set, read once when the set is first seen: its compiled
 * correlations and the two scalars it uses. Property objects arrive in many shapes (seed rows,
 * API payloads, test literals); reading them only here keeps the hot path's property loads
 * monomorphic.
 */
type CompiledProperties = {
  readonly correlations: CompiledCorrelation[];
  /** −Infinity when no melting point is given, so `tempC < meltingPointC` is simply false. */
  readonly meltingPointC: number;
  readonly molarMassGPerMol: number;
};

/**
 * Property sets already checked, with their compiled correlations. Library entries are static
 * data evaluated millions of times (every location × substance × temperature), so each object is
 * validated and compiled once and then treated as an immutable value: to change a property,
 * build a new object rather than editing one in place.
 */
const compiledProperties = new WeakMap<VaporProperties, CompiledProperties>();

/**
 * One-entry identity cache in front of the WeakMap: callers usually evaluate one substance at
 * several temperatures, or its pressure and then its concentration, in a row. A const object
 * rather than module-level `let`s, whose every read would carry a not-yet-initialised check.
 */
const lastSeen: { props: VaporProperties | null; compiled: CompiledProperties | null } = { props: null, compiled: null };

function compiledFor(props: VaporProperties): CompiledProperties {
  if (props === lastSeen.props) return lastSeen.compiled as CompiledProperties;
  const compiled = compiledProperties.get(props) ?? compileProperties(props);
  lastSeen.props = props;
  lastSeen.compiled = compiled;
  return compiled;
}

/** Checks every field of the property set; throws HazardInputError on the first bad one. */
export function validateVaporProperties(props: VaporProperties): void {
  if (compiledProperties.get(props) === undefined) compileProperties(props);
}

function compileProperties(props: VaporProperties): CompiledProperties {
  if (props === null || typeof props !== 'object') {
    throw new HazardInputError('empty-input', 'props', 'Vapor properties are missing');
  }
  assertPositive(props.molarMassGPerMol, 'props.molarMassGPerMol');
  const correlations = props.correlations;
  const compiled: CompiledCorrelation[] = [];
  if (correlations !== undefined) {
    if (!Array.isArray(correlations)) {
      throw new HazardInputError('invalid-correlation', 'props.correlations', 'props.correlations must be an array');
    }
    for (let i = 0; i < correlations.length; i++) {
      validateCorrelation(correlations[i], i);
      compiled.push(compileCorrelation(correlations[i]));
    }
  }
  if (props.normalBoilingPointC !== undefined) assertTempC(props.normalBoilingPointC, 'props.normalBoilingPointC');
  if (props.enthalpyOfVaporizationKJPerMol !== undefined) {
    assertPositive(props.enthalpyOfVaporizationKJPerMol, 'props.enthalpyOfVaporizationKJPerMol');
  }
  assertOptionalFinite(props.meltingPointC, 'props.meltingPointC');
  assertOptionalFinite(props.flashPointC, 'props.flashPointC');
  if (props.lflVolPercent !== undefined) assertPositive(props.lflVolPercent, 'props.lflVolPercent');
  if (props.uflVolPercent !== undefined) assertPositive(props.uflVolPercent, 'props.uflVolPercent');
  const result: CompiledProperties = {
    correlations: compiled,
    meltingPointC: props.meltingPointC === undefined ? Number.NEGATIVE_INFINITY : props.meltingPointC,
    molarMassGPerMol: props.molarMassGPerMol,
  };
  compiledProperties.set(props, result);
  return result;
}

/**
 * Evaluates one correlation in kPa, without range checks. Returns NaN where the Antoine form is
 * undefined (T + C ≤ 0), which the callers turn into an error or a zero.
 */
export function evaluateCorrelationKPa(correlation: VaporPressureCorrelation, tempC: number): number {
  if (correlation.kind === 'antoine') {
    const tempInUnit = correlation.temperatureUnit === 'K' ? tempC + KELVIN_OFFSET : tempC;
    const denominator = tempInUnit + correlation.c;
    if (denominator <= 0) return Number.NaN;
    const exponent = correlation.a - correlation.b / denominator;
    const pressureInUnit = correlation.log === 'log10' ? Math.exp(exponent * LN10) : Math.exp(exponent);
    return pressureInUnit * kPaPerUnit(correlation.pressureUnit);
  }
  if (correlation.kind === 'wagner') {
    const tempKelvin = tempC + KELVIN_OFFSET;
    const tau = 1 - tempKelvin / correlation.reducingTempK;
    let sum = 0;
    if (tau > 0) for (let i = 0; i < correlation.coefficients.length; i++) sum += correlation.coefficients[i] * Math.pow(tau, correlation.exponents[i]);
    return correlation.reducingPressureKPa * Math.exp((correlation.reducingTempK / tempKelvin) * sum);
  }
  const tempK = tempC + KELVIN_OFFSET;
  const exponent = correlation.c5;
  // Perry's sets use C5 = 1, 2 or 6; multiplying is several times faster than Math.pow.
  let power: number;
  if (exponent === 2) power = tempK * tempK;
  else if (exponent === 6) {
    const cube = tempK * tempK * tempK;
    power = cube * cube;
  } else if (exponent === 1) power = tempK;
  else power = Math.pow(tempK, exponent);
  const lnPressurePa = correlation.c1 + correlation.c2 / tempK + correlation.c3 * Math.log(tempK) + correlation.c4 * power;
  return Math.exp(lnPressurePa) * 0.001;
}

function rangeWarning(correlation: VaporPressureCorrelation, tempC: number): string {
  const text = `${CORRELATION_LABEL[correlation.kind]} range is ${formatNumber(correlation.tMinC)}\u2026${formatNumber(
    correlation.tMaxC,
  )} °C; ${formatNumber(tempC)} °C is extrapolated`;
  if (correlation.kind === 'wagner' && tempC + KELVIN_OFFSET >= correlation.reducingTempK) {
    return `${text}. ${formatNumber(tempC)} °C is at or above the reducing temperature ${formatNumber(
      correlation.reducingTempK - KELVIN_OFFSET,
    )} °C (the critical point of a liquid–vapor line): no liquid is left, and the value shown is the reducing pressure, ${formatSig(
      correlation.reducingPressureKPa,
      5,
    )} kPa, the least a closed container holds there`;
  }
  return text;
}

function supercooledWarning(meltingPointC: number, tempC: number): string {
  return `${formatNumber(tempC)} °C is below the melting point (${formatNumber(
    meltingPointC,
  )} °C): the value is that of the supercooled liquid; the solid's vapor pressure is lower`;
}

/**
 * The correlation to use at tempC: the first whose range covers it (returns its index i ≥ 0),
 * else the one whose range is nearest (returns −(i + 1), i.e. "extrapolated").
 */
function chooseCorrelation(correlations: readonly { tMinC: number; tMaxC: number }[], tempC: number): number {
  const count = correlations.length;
  for (let i = 0; i < count; i++) {
    const correlation = correlations[i];
    if (tempC >= correlation.tMinC && tempC <= correlation.tMaxC) return i;
  }
  let bestIndex = 0;
  let bestDistance = Number.POSITIVE_INFINITY;
  for (let i = 0; i < count; i++) {
    const correlation = correlations[i];
    const distance = tempC < correlation.tMinC ? correlation.tMinC - tempC : tempC - correlation.tMaxC;
    if (distance < bestDistance) {
      bestDistance = distance;
      bestIndex = i;
    }
  }
  return -(bestIndex + 1);
}

/** The correlation saturationPressure would use at tempC (null when it falls back to Clausius–Clapeyron). */
export function selectCorrelation(
  props: VaporProperties,
  tempC: number,
): { correlation: VaporPressureCorrelation; index: number; covered: boolean } | null {
  validateVaporProperties(props);
  const correlations = props.correlations;
  if (correlations === undefined || correlations.length === 0) return null;
  const choice = chooseCorrelation(correlations, tempC);
  const index = choice >= 0 ? choice : -choice - 1;
  return { correlation: correlations[index], index, covered: choice >= 0 };
}

function assertUsablePressure(pressureKPa: number, correlation: VaporPressureCorrelation | null, tempC: number): void {
  if (Number.isNaN(pressureKPa) && correlation?.kind === 'antoine') {
    throw new HazardInputError(
      'correlation-singular',
      'tempC',
      `The Antoine equation is undefined at ${formatNumber(tempC)} °C (T + C ≤ 0); ${rangeWarning(correlation, tempC)} too far`,
    );
  }
  if (!Number.isFinite(pressureKPa) || pressureKPa <= 0) {
    throw new HazardInputError(
      'out-of-range',
      'tempC',
      `No finite vapor pressure can be computed at ${formatNumber(tempC)} °C; the temperature is far outside the data`,
    );
  }
}

/**
 * Integrated Clausius–Clapeyron equation with constant ΔHvap:
 * ln(P/P₀) = −(ΔHvap/R)·(1/T − 1/T₀) (e.g. OpenStax Chemistry 2e §10.3; Atkins, Physical Chemistry).
 * Returns P in kPa.
 */
export function integratedClausiusClapeyron(
  ref: { tempC: number; pressureKPa: number; enthalpyKJPerMol: number },
  tempC: number,
): number {
  if (ref === null || typeof ref !== 'object') throw new HazardInputError('empty-input', 'ref', 'The reference point is missing');
  assertTempC(ref.tempC, 'ref.tempC');
  assertPositive(ref.pressureKPa, 'ref.pressureKPa');
  assertPositive(ref.enthalpyKJPerMol, 'ref.enthalpyKJPerMol');
  assertTempC(tempC);
  const pressureKPa = clausiusClapeyronKPa(ref.tempC, ref.pressureKPa, ref.enthalpyKJPerMol, tempC);
  assertUsablePressure(pressureKPa, null, tempC);
  return pressureKPa;
}

function clausiusClapeyronKPa(refTempC: number, refPressureKPa: number, enthalpyKJPerMol: number, tempC: number): number {
  const refTempK = refTempC + KELVIN_OFFSET;
  const tempK = tempC + KELVIN_OFFSET;
  return refPressureKPa * Math.exp(((-enthalpyKJPerMol * 1000) / GAS_CONSTANT_J_PER_MOL_K) * (1 / tempK - 1 / refTempK));
}

/**
 * The same equation solved for T: 1/T = 1/T₀ − R·ln(P/P₀)/ΔHvap. Returns °C.
 * (OpenStax Chemistry 2e §10.3, "Estimating Temperature (or Vapor Pressure)".)
 */
export function clausiusClapeyronTemperatureC(
  ref: { tempC: number; pressureKPa: number; enthalpyKJPerMol: number },
  pressureKPa: number,
): number {
  assertTempC(ref.tempC, 'ref.tempC');
  assertPositive(ref.pressureKPa, 'ref.pressureKPa');
  assertPositive(ref.enthalpyKJPerMol, 'ref.enthalpyKJPerMol');
  assertPositive(pressureKPa, 'pressureKPa');
  const inverseK =
    1 / (ref.tempC + KELVIN_OFFSET) - (GAS_CONSTANT_J_PER_MOL_K * Math.log(pressureKPa / ref.pressureKPa)) / (ref.enthalpyKJPerMol * 1000);
  if (!(inverseK > 0)) {
    throw new HazardInputError('out-of-range', 'pressureKPa', `No temperature reaches ${pressureKPa} kPa with this reference point`);
  }
  return 1 / inverseK - KELVIN_OFFSET;
}

/** Trouton's rule (common practice): ΔHvap ≈ 88 J·mol⁻¹·K⁻¹ × Tb, in kJ/mol. */
export function troutonEnthalpyKJPerMol(normalBoilingPointC: number): number {
  assertTempC(normalBoilingPointC, 'normalBoilingPointC');
  return (TROUTON_ENTROPY_J_PER_MOL_K * (normalBoilingPointC + KELVIN_OFFSET)) / 1000;
}

// Side results of computeSaturationKPa (the general path), read immediately by the two public
// wrappers. Module-level scratch of one fixed shape instead of a returned object keeps that path
// free of an allocation; everything here is synchronous, so no other call can interleave.
const scratch: { method: SaturationPressureMethod; extrapolated: boolean; warnings: string[] | undefined } = {
  method: 'antoine',
  extrapolated: false,
  warnings: undefined,
};
/**
 * Results without warnings share this one frozen empty array, so the hot path allocates nothing
 * but the result object. Treat every result's `warnings` as read-only: copy it to add to it.
 */
const NO_WARNINGS = Object.freeze([]) as unknown as string[];

/**
 * The common case, checked before anything else: the first correlation whose range covers tempC,
 * with the liquid above its melting point. Null sends the caller down the general path, which
 * makes the same choice (and also handles extrapolation, warnings, errors and the fallbacks).
 */
function coveringCorrelation(compiled: CompiledProperties, tempC: number): CompiledCorrelation | null {
  if (tempC < compiled.meltingPointC) return null;
  const correlations = compiled.correlations;
  const count = correlations.length;
  for (let i = 0; i < count; i++) {
    const correlation = correlations[i];
    if (tempC >= correlation.tMinC && tempC <= correlation.tMaxC) return correlation;
  }
  return null;
}

/**
 * The last covered evaluation. The register asks for a substance's pressure and then for its
 * concentration at the same temperature (lib/substances does the same); the second call then
 * reuses the pressure instead of evaluating exp/ln again. Keyed on the compiled correlation,
 * which belongs to one immutable property set, and on the exact temperature, so the value
 * returned is bit-for-bit what a fresh evaluation would give.
 */
const lastEvaluation: { correlation: CompiledCorrelation | null; tempC: number; pressureKPa: number } = {
  correlation: null,
  tempC: 0.5,
  pressureKPa: 0.5,
};

function coveredPressureKPa(correlation: CompiledCorrelation, tempC: number): number {
  if (correlation === lastEvaluation.correlation && tempC === lastEvaluation.tempC) return lastEvaluation.pressureKPa;
  const pressureKPa = evaluateCompiledKPa(correlation, tempC);
  lastEvaluation.correlation = correlation;
  lastEvaluation.tempC = tempC;
  lastEvaluation.pressureKPa = pressureKPa;
  return pressureKPa;
}

function computeSaturationKPa(props: VaporProperties, compiledProps: CompiledProperties, tempC: number): number {
  const compiled = compiledProps.correlations;
  let warnings: string[] | undefined;
  const meltingPointC = compiledProps.meltingPointC;
  if (tempC < meltingPointC) warnings = [supercooledWarning(meltingPointC, tempC)];
  if (compiled.length > 0) {
    const choice = chooseCorrelation(compiled, tempC);
    const covered = choice >= 0;
    const index = covered ? choice : -choice - 1;
    const pressureKPa = evaluateCompiledKPa(compiled[index], tempC);
    if (!(pressureKPa > 0) || pressureKPa === Number.POSITIVE_INFINITY) {
      assertUsablePressure(pressureKPa, (props.correlations as VaporPressureCorrelation[])[index], tempC);
    }
    if (!covered) {
      const correlation = (props.correlations as VaporPressureCorrelation[])[index];
      if (warnings === undefined) warnings = [rangeWarning(correlation, tempC)];
      else warnings.unshift(rangeWarning(correlation, tempC));
    }
    scratch.method = compiled[index].method;
    scratch.extrapolated = !covered;
    scratch.warnings = warnings;
    return pressureKPa;
  }
  const boilingPointC = props.normalBoilingPointC;
  if (boilingPointC === undefined) {
    throw new HazardInputError(
      'no-method',
      'props',
      'No vapor-pressure method is available: give a correlation, or at least the normal boiling point',
    );
  }
  const known = props.enthalpyOfVaporizationKJPerMol;
  const enthalpyKJPerMol = known ?? (TROUTON_ENTROPY_J_PER_MOL_K * (boilingPointC + KELVIN_OFFSET)) / 1000;
  const pressureKPa = clausiusClapeyronKPa(boilingPointC, STANDARD_ATMOSPHERE_KPA, enthalpyKJPerMol, tempC);
  assertUsablePressure(pressureKPa, null, tempC);
  const list = warnings ?? [];
  const fallback = [
    `No vapor-pressure correlation: integrated Clausius–Clapeyron from the normal boiling point (${formatNumber(
      boilingPointC,
    )} °C, 101.325 kPa) with constant ΔHvap = ${formatNumber(enthalpyKJPerMol, 2)} kJ/mol; an estimate that grows less certain away from the boiling point`,
  ];
  if (known === undefined) {
    fallback.push(
      "ΔHvap estimated by Trouton's rule (88 J/(mol·K) × Tb, common practice): about 25 % off for alcohols and water, and it fails for carboxylic acids",
    );
  }
  list.unshift(...fallback);
  scratch.method = known === undefined ? 'clausius-clapeyron-trouton' : 'clausius-clapeyron';
  scratch.extrapolated = true;
  scratch.warnings = list;
  return pressureKPa;
}

/**
 * Saturation vapor pressure of the pure liquid at tempC.
 * Method: the first correlation whose range covers T; else the nearest-range correlation,
 * extrapolated (warning names the range); else integrated Clausius–Clapeyron from the normal
 * boiling point (101.325 kPa) with ΔHvap; else the same with ΔHvap from Trouton's rule.
 */
export function saturationPressure(props: VaporProperties, tempC: number): SaturationPressureResult {
  assertTempC(tempC);
  const compiled = compiledFor(props);
  const correlation = coveringCorrelation(compiled, tempC);
  if (correlation !== null) {
    const pressureKPa = coveredPressureKPa(correlation, tempC);
    if (pressureKPa > 0 && pressureKPa !== Number.POSITIVE_INFINITY) {
      return { pressureKPa, method: correlation.method, extrapolated: false, warnings: NO_WARNINGS };
    }
  }
  const pressureKPa = computeSaturationKPa(props, compiled, tempC);
  return { pressureKPa, method: scratch.method, extrapolated: scratch.extrapolated, warnings: scratch.warnings ?? NO_WARNINGS };
}

/**
 * Saturation pressure without warnings or validation, for root finding. Returns 0 where an
 * Antoine form is undefined so that bisection sees "below the target".
 */
function saturationPressureForSolverKPa(props: VaporProperties, tempC: number): number {
  const compiled = compiledFor(props).correlations;
  if (compiled.length > 0) {
    const choice = chooseCorrelation(compiled, tempC);
    const pressureKPa = evaluateCompiledKPa(compiled[choice >= 0 ? choice : -choice - 1], tempC);
    return Number.isNaN(pressureKPa) ? 0 : pressureKPa;
  }
  const boilingPointC = props.normalBoilingPointC as number;
  const enthalpyKJPerMol =
    props.enthalpyOfVaporizationKJPerMol ?? (TROUTON_ENTROPY_J_PER_MOL_K * (boilingPointC + KELVIN_OFFSET)) / 1000;
  return clausiusClapeyronKPa(boilingPointC, STANDARD_ATMOSPHERE_KPA, enthalpyKJPerMol, tempC);
}

/**
 * Temperature (°C) at which the saturation pressure reaches targetKPa, by bisection on the same
 * method choice as saturationPressure. Used for the boiling temperature at a site's pressure and
 * for the lower flammable temperature.
 */
export function temperatureAtSaturationPressureC(props: VaporProperties, targetKPa: number): number {
  validateVaporProperties(props);
  assertPositive(targetKPa, 'targetKPa');
  if ((props.correlations === undefined || props.correlations.length === 0) && props.normalBoilingPointC === undefined) {
    throw new HazardInputError('no-method', 'props', 'No vapor-pressure method is available');
  }
  const stepK = 25;
  const minimumC = -KELVIN_OFFSET + 1;
  const maximumC = 3000;
  let highC = props.normalBoilingPointC ?? 25;
  while (saturationPressureForSolverKPa(props, highC) < targetKPa) {
    highC += stepK;
    if (highC > maximumC) {
      throw new HazardInputError('out-of-range', 'targetKPa', `The vapor pressure never reaches ${targetKPa} kPa below ${maximumC} °C`);
    }
  }
  let lowC = highC - stepK;
  while (lowC > minimumC && saturationPressureForSolverKPa(props, lowC) >= targetKPa) lowC -= stepK;
  if (lowC <= minimumC) lowC = minimumC;
  for (let i = 0; i < 100 && highC - lowC > 1e-9; i++) {
    const midC = 0.5 * (lowC + highC);
    if (saturationPressureForSolverKPa(props, midC) < targetKPa) lowC = midC;
    else highC = midC;
  }
  return 0.5 * (lowC + highC);
}

function boilsWarning(tempC: number, pressureKPa: number, ambientPressureKPa: number): string {
  return `At ${formatNumber(tempC)} °C the vapor pressure (${formatSig(pressureKPa, 4)} kPa) reaches the ambient pressure (${formatSig(
    ambientPressureKPa,
    5,
  )} kPa): the liquid boils, the concentration is capped at 100 % by volume, and a closed container can pressurize`;
}

/**
 * Equilibrium (saturated) vapor concentration above the pure liquid in still air:
 * y = Psat/Patm; ppm = 10⁶·y; mg/m³ = ppm × M / Vm(T) with Vm = R·T/Patm
 * (Dalton's law; Vm as in NIOSH NMAM Appendix A; e.g. J. Chem. Educ. CLIP "Toluene": 22 torr at 20 °C ≈ 29 000 ppm).
 */
export function saturatedConcentration(
  props: VaporProperties,
  tempC: number,
  ambientPressureKPa = STANDARD_ATMOSPHERE_KPA,
): SaturatedConcentrationResult {
  if (!(ambientPressureKPa > 0) || ambientPressureKPa === Number.POSITIVE_INFINITY) {
    throw new HazardInputError(
      Number.isFinite(ambientPressureKPa) ? 'not-positive' : 'not-finite',
      'ambientPressureKPa',
      `ambientPressureKPa must be a finite pressure above zero (got ${String(ambientPressureKPa)})`,
    );
  }
  assertTempC(tempC);
  const compiled = compiledFor(props);
  // mg/m³ = ppm·M/Vm = y·10⁶·M·Patm/(R·T); with Patm in kPa the 10³ of Pa and the 10³ of g→mg cancel.
  const correlation = coveringCorrelation(compiled, tempC);
  if (correlation !== null) {
    const pressureKPa = coveredPressureKPa(correlation, tempC);
    if (pressureKPa > 0 && pressureKPa < ambientPressureKPa) {
      const ppm = (pressureKPa / ambientPressureKPa) * 1e6;
      return {
        ppm,
        mgPerM3: (ppm * compiled.molarMassGPerMol * ambientPressureKPa) / (GAS_CONSTANT_J_PER_MOL_K * (tempC + KELVIN_OFFSET)),
        volumePercent: (pressureKPa / ambientPressureKPa) * 100,
        boils: false,
        pressureKPa,
        warnings: NO_WARNINGS,
        method: correlation.method,
        extrapolated: false,
      };
    }
  }
  const pressureKPa = computeSaturationKPa(props, compiled, tempC);
  const boils = pressureKPa >= ambientPressureKPa;
  const moleFraction = boils ? 1 : pressureKPa / ambientPressureKPa;
  const ppm = moleFraction * 1e6;
  const mgPerM3 = (ppm * compiled.molarMassGPerMol * ambientPressureKPa) / (GAS_CONSTANT_J_PER_MOL_K * (tempC + KELVIN_OFFSET));
  let warnings = scratch.warnings;
  if (boils) {
    if (warnings === undefined) warnings = [];
    warnings.push(boilsWarning(tempC, pressureKPa, ambientPressureKPa));
  }
  return {
    ppm,
    mgPerM3,
    volumePercent: moleFraction * 100,
    boils,
    pressureKPa,
    warnings: warnings ?? NO_WARNINGS,
    method: scratch.method,
    extrapolated: scratch.extrapolated,
  };
}

/**
 * The named variant of a Wagner-type set's exponents ("2.5-5", "3-6"), or the exponents
 * themselves, for labels and traces.
 */
export function wagnerFormName(exponents: readonly number[]): string {
  if (sameExponents(exponents, [1, 1.5, 2.5, 5])) return '2.5-5 form';
  if (sameExponents(exponents, [1, 1.5, 3, 6])) return '3-6 form';
  return `exponents ${exponents.join(', ')}`;
}

/** The equation of a Wagner-type set in symbols, e.g. "ln(P/Pc) = (Tc/T)·(n1·τ + n2·τ^1.5 + n3·τ^2.5 + n4·τ^5), τ = 1 − T/Tc". */
export function wagnerEquationText(correlation: { exponents: readonly number[]; line?: 'liquid-vapor' | 'solid-vapor' }): string {
  const sublimation = correlation.line === 'solid-vapor';
  const tr = sublimation ? 'Tt' : 'Tc';
  const pr = sublimation ? 'Pt' : 'Pc';
  const terms = correlation.exponents.map((exponent, i) => `n${i + 1}·τ${exponent === 1 ? '' : `^${exponent}`}`).join(' + ');
  return `ln(P/${pr}) = (${tr}/T)·(${terms}), τ = 1 − T/${tr}, T in K`;
}

/** Where the choice of correlation changes between two temperatures, and how far the curve steps there. */
export type CorrelationHandover = {
  /** The last temperature on the first correlation (°C); the next scan step is on the second. */
  atC: number;
  fromIndex: number;
  toIndex: number;
  /** 100·(P_to/P_from − 1) with both correlations evaluated at atC: the step the curve takes. */
  stepPercent: number;
};

/**
 * Scans fromC…toC in steps of stepK, as saturationPressure chooses its correlation, and reports
 * every hand-over from one correlation to another with the size of the step there. A curve that
 * hands over between sets fitted to different data steps at the hand-over; the library keeps
 * these steps within 0.5 % over −40…60 °C by choosing sets that need no hand-over there.
 */
export function correlationHandovers(props: VaporProperties, fromC = -40, toC = 60, stepK = 0.1): CorrelationHandover[] {
  validateVaporProperties(props);
  const correlations = props.correlations ?? [];
  if (correlations.length < 2) return [];
  const handovers: CorrelationHandover[] = [];
  const count = Math.round((toC - fromC) / stepK);
  let previous = chooseCorrelation(correlations, fromC);
  for (let i = 1; i <= count; i++) {
    const tempC = fromC + i * stepK;
    const choice = chooseCorrelation(correlations, tempC);
    if (choice !== previous) {
      const fromIndex = previous >= 0 ? previous : -previous - 1;
      const toIndex = choice >= 0 ? choice : -choice - 1;
      if (fromIndex !== toIndex) {
        const atC = fromC + (i - 1) * stepK;
        const fromKPa = evaluateCorrelationKPa(correlations[fromIndex], atC);
        const toKPa = evaluateCorrelationKPa(correlations[toIndex], atC);
        handovers.push({ atC, fromIndex, toIndex, stepPercent: (toKPa / fromKPa - 1) * 100 });
      }
    }
    previous = choice;
  }
  return handovers;
}
