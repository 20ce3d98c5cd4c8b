/**
 * A finding's calculation trace as spreadsheet rows, so an auditor can redo it by hand. Pure.
 *
 * The trace is stored JSON of any shape. Recognised parts read best:
 * - an engine trace `{ method, source, inputs: [value…], steps: [step…], result, warnings }`
 *   (lib/hazard/trace.ts) becomes a "Method" row, one row per input, per step (formula and the
 *   formula with the numbers put in), the result and each warning;
 * - a step `{ label | description, value | result, unit, formula?, note? }` becomes one row;
 * - a value `{ name, symbol?, value, unit, source? }` becomes one row.
 * Anything else is walked key by key (objects) and item by item (arrays, numbered from 1), so a
 * trace nested per scenario or per component keeps every value; the path column says where in the
 * trace a row came from ("controlLost.steps[2]").
 */

export type TraceCellValue = number | string | boolean | null;

export type TraceRow = {
  /** Where in the trace the row comes from, e.g. "steps[2]" or "inControl.result". */
  path: string;
  label: string | null;
  /** The formula in symbols, or the method's name. */
  formula: string | null;
  /** The formula with the numbers put in. */
  substituted: string | null;
  value: TraceCellValue;
  unit: string | null;
  /** The value's source, a warning, or anything else said about the row. */
  note: string | null;
};

const MAX_DEPTH = 24;

type Obj = Record<string, unknown>;

const isObject = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const str = (v: unknown): string | null => (typeof v === "string" && v !== "" ? v : null);

function cellValue(v: unknown): TraceCellValue {
  if (v === null || v === undefined) return null;
  if (typeof v === "number") return Number.isFinite(v) ? v : String(v);
  if (typeof v === "string" || typeof v === "boolean") return v;
  return JSON.stringify(v);
}

function join(path: string, key: string): string {
  return path ? `${path}.${key}` : key;
}

function row(path: string, fields: Partial<Omit<TraceRow, "path">>): TraceRow {
  return { path, label: null, formula: null, substituted: null, value: null, unit: null, note: null, ...fields };
}

/** `{ name, value, unit?, symbol?, source? }` — a named quantity. */
function isNamedValue(v: Obj): boolean {
  return typeof v.name === "string" && "value" in v && !isObject(v.value) && !Array.isArray(v.value);
}

function namedValueLabel(v: Obj): string {
  const name = String(v.name);
  const symbol = str(v.symbol);
  return symbol && symbol !== name ? `${name} (${symbol})` : name;
}

/** `{ description|label, formula?, substituted?, result: { … } }` or `{ label, value, unit }` — one step. */
function isStep(v: Obj): boolean {
  const hasLabel = typeof v.description === "string" || typeof v.label === "string";
  const hasValue = ("value" in v && !isObject(v.value) && !Array.isArray(v.value)) || (isObject(v.result) && isNamedValue(v.result));
  return hasLabel && (hasValue || typeof v.formula === "string");
}

function isEngineTrace(v: Obj): boolean {
  return typeof v.method === "string" && (Array.isArray(v.steps) || Array.isArray(v.inputs));
}

function rest(out: TraceRow[], v: Obj, used: readonly string[], path: string, depth: number): void {
  for (const key in v) if (!used.includes(key)) walk(out, v[key], join(path, key), key, depth + 1);
}

function namedValueRows(out: TraceRow[], v: Obj, path: string, depth: number, prefix = ""): void {
  out.push(row(path, { label: prefix + namedValueLabel(v), value: cellValue(v.value), unit: str(v.unit), note: str(v.source) ?? str(v.note) }));
  rest(out, v, ["name", "symbol", "value", "unit", "source", "note"], path, depth);
}

function stepRows(out: TraceRow[], v: Obj, path: string, depth: number): void {
  const result = isObject(v.result) && isNamedValue(v.result) ? v.result : null;
  const resultNote = result ? [namedValueLabel(result), str(result.source)].filter(Boolean).join("; ") : null;
  out.push(row(path, {
    label: str(v.description) ?? str(v.label),
    formula: str(v.formula) ?? str(v.method),
    substituted: str(v.substituted),
    value: cellValue(result ? result.value : v.value),
    unit: str(result ? result.unit : v.unit),
    note: [str(v.note), str(v.source), resultNote].filter(Boolean).join("; ") || null,
  }));
  rest(out, v, ["description", "label", "formula", "method", "substituted", "value", "unit", "note", "source", "result"].filter((k) => k !== "result" || result), path, depth);
}

function engineTraceRows(out: TraceRow[], v: Obj, path: string, depth: number): void {
  out.push(row(join(path, "method"), { label: "Method", formula: String(v.method), note: str(v.source) }));
  const inputs = Array.isArray(v.inputs) ? v.inputs : [];
  for (let i = 0; i < inputs.length; i++) {
    const input = inputs[i];
    const at = `${join(path, "inputs")}[${i + 1}]`;
    if (isObject(input) && isNamedValue(input)) namedValueRows(out, input, at, depth + 1, "Input: ");
    else walk(out, input, at, "input", depth + 1);
  }
  const steps = Array.isArray(v.steps) ? v.steps : [];
  for (let i = 0; i < steps.length; i++) walk(out, steps[i], `${join(path, "steps")}[${i + 1}]`, "step", depth + 1);
  if (isObject(v.result) && isNamedValue(v.result)) namedValueRows(out, v.result, join(path, "result"), depth + 1, "Result: ");
  else if (v.result !== undefined) walk(out, v.result, join(path, "result"), "result", depth + 1);
  const warnings = Array.isArray(v.warnings) ? v.warnings : v.warnings === undefined ? [] : [v.warnings];
  for (let i = 0; i < warnings.length; i++) {
    const at = `${join(path, "warnings")}[${i + 1}]`;
    if (typeof warnings[i] === "string") out.push(row(at, { label: "Warning", note: warnings[i] as string }));
    else walk(out, warnings[i], at, "warning", depth + 1);
  }
  rest(out, v, ["method", "source", "inputs", "steps", "result", "warnings"], path, depth);
}

function walk(out: TraceRow[], node: unknown, path: string, key: string, depth: number): void {
  if (node === null || node === undefined) return;
  if (depth > MAX_DEPTH) {
    out.push(row(path, { label: key, value: cellValue(node), note: "nested too deeply to unfold; shown as JSON" }));
    return;
  }
  if (Array.isArray(node)) {
    for (let i = 0; i < node.length; i++) walk(out, node[i], `${path}[${i + 1}]`, key, depth + 1);
    return;
  }
  if (!isObject(node)) {
    out.push(row(path, { label: key || null, value: cellValue(node) }));
    return;
  }
  if (isEngineTrace(node)) engineTraceRows(out, node, path, depth);
  else if (isStep(node)) stepRows(out, node, path, depth);
  else if (isNamedValue(node)) namedValueRows(out, node, path, depth);
  else for (const childKey in node) walk(out, node[childKey], join(path, childKey), childKey, depth + 1);
}

/** The rows of one stored trace, in the trace's own order. A trace stored as a JSON string is parsed first. */
export function traceRows(trace: unknown): TraceRow[] {
  let value = trace;
  if (typeof value === "string") {
    try {
      value = JSON.parse(value);
    } catch {
      return [row("", { label: "Trace", value: cellValue(value) })];
    }
  }
  const out: TraceRow[] = [];
  walk(out, value, "", "", 0);
  return out;
}
