/**
 * A calculation trace: everything an auditor needs to redo a result by hand. Plain data only
 * (strings, finite numbers, booleans, arrays, objects) so it can be stored as JSON in SQLite and
 * written to an Excel sheet unchanged.
 */
export type TraceValue = {
  /** Plain-language name, e.g. "Saturation vapor pressure". */
  name: string;
  /** The symbol used in the formulas, e.g. "Psat". */
  symbol: string;
  value: number | string | boolean;
  /** Unit text, e.g. "kPa", "°C", "ppm"; "" for dimensionless values. */
  unit: string;
  /** Where the value came from: the library field, the user's input, a standard, a default. */
  source?: string;
};

export type TraceStep = {
  /** The step in words. */
  description: string;
  /** The equation in symbols. */
  formula: string;
  /** The equation with the numbers put in. */
  substituted: string;
  result: TraceValue;
};

export type Trace = {
  /** Name of the method, e.g. "Integrated Clausius–Clapeyron". */
  method: string;
  /** The published source of the method. */
  source: string;
  inputs: TraceValue[];
  steps: TraceStep[];
  result: TraceValue;
  warnings: string[];
};

export function traceValue(
  name: string,
  symbol: string,
  value: number | string | boolean,
  unit: string,
  source?: string,
): TraceValue {
  return source === undefined ? { name, symbol, value, unit } : { name, symbol, value, unit, source };
}

export function traceStep(
  description: string,
  formula: string,
  substituted: string,
  result: TraceValue,
): TraceStep {
  return { description, formula, substituted, result };
}
