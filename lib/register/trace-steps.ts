/**
 * A finding's stored calculation trace as a model for the finding page: every input, formula,
 * substituted formula, result and warning the workbook prints (lib/register/trace-text.ts), with
 * the numbers in sensible significant figures and units, and each part recognised by its kind so
 * the page can draw it as such — the vapor-pressure correlation with its coefficients, valid range
 * and source; the saturated concentration in ppm and mg/m³; the enclosure bound (saturated or
 * inventory-limited); each substance's share of the LFL and the sum (Le Chatelier); Raoult's law;
 * the severity step. Pure: no React, no database.
 *
 * The trace is free-form JSON (see lib/assessment/rules/types.ts FindingTrace): an engine trace
 * `{ method, source, inputs, steps, result, warnings }` with the rule's own `rule`, `scenario`,
 * `parts` (engine traces) and `containers`. Keys the model does not know are kept as "other"
 * rows, so nothing stored goes unshown.
 */

/** A source this long or longer is cited by number and listed once under the trace. */
export const CITE_FROM_CHARS = 100;

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/**
 * A computed number for people: a value stored with up to six significant figures (an input as
 * entered, a published constant) is shown as stored; anything longer (a computed result carrying
 * float noise) is rounded to four. ×10ⁿ from 10⁶ up and below 10⁻³; a true minus sign.
 */
export function formatTraceNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return "0";
  const shown = Number(value.toPrecision(6)) === value ? value : Number(value.toPrecision(4));
  const magnitude = Math.abs(shown);
  let text: string;
  if (magnitude >= 1e6 || magnitude < 1e-3) {
    const [mantissa, exponent] = shown.toExponential().split("e");
    const power = String(Number(exponent))
      .split("")
      .map((ch) => SUPERSCRIPT[ch])
      .join("");
    text = `${mantissa} × 10${power}`;
  } else {
    text = shown.toLocaleString("en-GB", { maximumFractionDigits: 12, useGrouping: magnitude >= 1e4 });
  }
  return text.replace(/^-/, "−");
}

/** A published coefficient exactly as stored (up to ten significant figures, no float noise). */
export function formatCoefficient(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const shown = Number(value.toPrecision(10));
  const magnitude = Math.abs(shown);
  if (shown !== 0 && (magnitude >= 1e6 || magnitude < 1e-3)) {
    const [mantissa, exponent] = shown.toExponential().split("e");
    return `${mantissa} × 10${String(Number(exponent))
      .split("")
      .map((ch) => SUPERSCRIPT[ch])
      .join("")}`.replace(/^-/, "−");
  }
  return String(shown).replace(/^-/, "−");
}

/** "−43.44…55.16" (a stored range) → "−43.44 to 55.16". */
function rangeText(text: string): string {
  return text
    .split("…")
    .map((part) => part.trim().replace(/^-/, "−"))
    .join(" to ");
}

/** A stored value with its unit: temperatures to 0.1 °C, other numbers by formatTraceNumber. */
export function formatTraceValue(value: unknown, unit: string | null | undefined): string {
  const suffix = unit ? (unit === "%" ? " %" : ` ${unit}`) : "";
  if (typeof value === "number") {
    if (unit === "°C" && Number.isFinite(value)) return `${value.toFixed(1).replace(/^-/, "−")} °C`;
    return `${formatTraceNumber(value)}${suffix}`;
  }
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (value == null) return "—";
  const text = String(value);
  if (text.includes("…")) return `${rangeText(text)}${suffix}`;
  return /^-?\d/.test(text) ? `${text.replace(/^-/, "−")}${suffix}` : `${text}${suffix}`;
}

// ---------------------------------------------------------------------------------------------
// The model
// ---------------------------------------------------------------------------------------------

/** A value as shown: its name, symbol, value with unit, and its source (or its citation number). */
export type ShownValue = { label: string; symbol: string | null; text: string; source: string | null; citation: number | null };

export type StepKind = "vapor-pressure" | "trouton" | "mole-fraction" | "concentration" | "molar-volume" | "enclosure-bound" | "lfl-sum" | "ratio" | "severity" | "generic";

export type ShownStep = {
  kind: StepKind;
  description: string;
  formula: string | null;
  substituted: string | null;
  result: ShownValue | null;
  /** The severity a severity step gives. */
  severity: string | null;
};

export type CorrelationView = {
  /** "Antoine", "DIPPR-101", "Wagner", or the Clausius–Clapeyron estimate from the boiling point. */
  name: string;
  equation: string | null;
  substituted: string | null;
  coefficients: ShownValue[];
  /** The stored valid range, e.g. "−43.44 to 55.16 °C". */
  range: string | null;
  /** True inside the range, false outside (extrapolated), null without a range. */
  inRange: boolean | null;
  source: string | null;
  citation: number | null;
  temperature: ShownValue | null;
  pressure: ShownValue | null;
  pressureKPa: number | null;
  tempC: number | null;
};

export type ShareRow = { name: string; concentration: string; limit: string; share: string; sharePercentLfl: string };

export type SectionKind =
  | "vapor-pressure"
  | "enclosure-bound"
  | "lfl-fraction"
  | "le-chatelier"
  | "raoult"
  | "exposure-ratio"
  | "spill"
  | "room-model"
  | "generic";

export type TraceSection = {
  kind: SectionKind;
  title: string;
  source: string | null;
  citation: number | null;
  inputs: ShownValue[];
  steps: ShownStep[];
  result: ShownValue | null;
  warnings: string[];
  /** vapor-pressure and enclosure-bound: the correlation used. */
  correlation: CorrelationView | null;
  /** enclosure-bound: which bound set the concentration. */
  bound: { saturated: string; inventory: string; used: string; limitedBy: "saturation" | "inventory" } | null;
  /** lfl-fraction: each substance's Cᵢ/LFLᵢ and the sum; le-chatelier and raoult: their tables. */
  shares: { rows: ShareRow[]; sum: string | null } | null;
  table: { head: string[]; rows: string[][] } | null;
};

export type TraceContainerRef = {
  containerId: number;
  label: string;
  content: string;
  amountText: string;
  state: string;
};

export type TraceModel = {
  /** The rule's own part: its inputs, its steps (limit, ratio, severity) and the finding's result. */
  rule: TraceSection | null;
  /** The engine's parts, the vapor pressures first (the other parts use them). */
  parts: TraceSection[];
  containers: TraceContainerRef[];
  /** Anything else stored in the trace, as label–value rows. */
  other: { label: string; text: string }[];
  /** Long sources, cited in the sections by their number. */
  sources: string[];
};

type Obj = Record<string, unknown>;
const isObject = (v: unknown): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const str = (v: unknown): string | null => (typeof v === "string" && v !== "" ? v : null);
const num = (v: unknown): number | null => (typeof v === "number" && Number.isFinite(v) ? v : null);

class Citations {
  readonly list: string[] = [];
  private readonly index = new Map<string, number>();
  /** The source inline when short; else its citation number. */
  cite(source: string | null): { source: string | null; citation: number | null } {
    if (!source || source.length < CITE_FROM_CHARS) return { source, citation: null };
    let n = this.index.get(source);
    if (n === undefined) {
      this.list.push(source);
      n = this.list.length;
      this.index.set(source, n);
    }
    return { source: null, citation: n };
  }
}

function shownValue(v: unknown, citations: Citations, coefficient = false): ShownValue | null {
  if (!isObject(v) || typeof v.name !== "string" || !("value" in v)) return null;
  const unit = str(v.unit);
  const text = coefficient && typeof v.value === "number" ? `${formatCoefficient(v.value)}${unit ? ` ${unit}` : ""}` : formatTraceValue(v.value, unit);
  return { label: v.name, symbol: str(v.symbol), text, ...citations.cite(str(v.source)) };
}

// Wagner-type sets carry their reducing point (Tc, Pc; Tt, Pt for a sublimation line) and up to eight coefficients n1…n8.
const COEFFICIENT_SYMBOLS = new Set(["A", "B", "C", "C1", "C2", "C3", "C4", "C5", "Tc", "Pc", "Tt", "Pt", "n1", "n2", "n3", "n4", "n5", "n6", "n7", "n8"]);
const CORRELATION_NAME = /Antoine|DIPPR|Wagner/;
const CORRELATION_INPUT = (v: Obj) => (typeof v.symbol === "string" && COEFFICIENT_SYMBOLS.has(v.symbol) && CORRELATION_NAME.test(String(v.name))) || v.symbol === "T range";

function stepKind(step: Obj): StepKind {
  const result = isObject(step.result) ? step.result : {};
  const symbol = str(result.symbol) ?? "";
  const description = str(step.description) ?? str(step.label) ?? "";
  if (symbol === "Psat" || /Antoine|DIPPR|Wagner|Clausius/.test(description)) return "vapor-pressure";
  if (symbol === "ΔHvap") return "trouton";
  if (symbol === "severity") return "severity";
  if (symbol === "y") return "mole-fraction";
  if (symbol === "Vm") return "molar-volume";
  if (symbol === "C_inv" || symbol === "C_max" || symbol === "m") return "enclosure-bound";
  if (symbol === "C_sat" || symbol === "C(t)" || symbol === "C_ss") return "concentration";
  if (symbol.startsWith("ΣC") || symbol === "f") return "lfl-sum";
  if (/^r(_|$)|^E$/.test(symbol)) return "ratio";
  return "generic";
}

function shownStep(step: unknown, citations: Citations): ShownStep | null {
  if (!isObject(step)) return null;
  const result = shownValue(step.result, citations) ?? (("value" in step && !isObject(step.value)) ? { label: str(step.label) ?? "Value", symbol: null, text: formatTraceValue(step.value, str(step.unit)), source: null, citation: null } : null);
  const kind = stepKind(step);
  return {
    kind,
    description: str(step.description) ?? str(step.label) ?? "Step",
    formula: str(step.formula),
    substituted: str(step.substituted),
    result,
    severity: kind === "severity" && isObject(step.result) ? String(step.result.value) : null,
  };
}

function sectionKind(trace: Obj): SectionKind {
  const method = str(trace.method) ?? "";
  const inputs = Array.isArray(trace.inputs) ? trace.inputs.filter(isObject) : [];
  const symbols = inputs.map((i) => String(i.symbol ?? ""));
  if (method.startsWith("Closed-enclosure bound")) return "enclosure-bound";
  if (method.startsWith("Saturated vapor concentration")) return "vapor-pressure";
  if (method.startsWith("Fraction of the lower flammable limit") || (symbols.some((s) => /^C\d+$/.test(s)) && symbols.some((s) => /^LFL\d+$/.test(s)))) return "lfl-fraction";
  if (method.startsWith("Le Chatelier")) return "le-chatelier";
  if (method.startsWith("Raoult")) return "raoult";
  if (method.startsWith("Ratio of concentration") || method.startsWith("Additive mixture rule")) return "exposure-ratio";
  if (method.startsWith("Pool evaporation") || method.startsWith("Spill pool area")) return "spill";
  if (method.startsWith("Well-mixed room model")) return "room-model";
  return "generic";
}

function correlationOf(trace: Obj, steps: ShownStep[], citations: Citations): CorrelationView | null {
  const rawInputs = Array.isArray(trace.inputs) ? trace.inputs.filter(isObject) : [];
  const rawSteps = Array.isArray(trace.steps) ? trace.steps.filter(isObject) : [];
  const vpIndex = steps.findIndex((s) => s.kind === "vapor-pressure");
  if (vpIndex < 0) return null;
  const raw = rawSteps[vpIndex];
  const description = steps[vpIndex].description;
  const coefficientInputs = rawInputs.filter((v) => typeof v.symbol === "string" && COEFFICIENT_SYMBOLS.has(v.symbol) && CORRELATION_NAME.test(String(v.name)));
  const rangeInput = rawInputs.find((v) => v.symbol === "T range") ?? null;
  const tempInput = rawInputs.find((v) => v.symbol === "T") ?? null;
  const tempC = tempInput ? num(tempInput.value) : null;
  let inRange: boolean | null = null;
  if (rangeInput && typeof rangeInput.value === "string" && tempC !== null) {
    const [low, high] = rangeInput.value.split("…").map((part) => Number(part.trim()));
    if (Number.isFinite(low) && Number.isFinite(high)) inRange = tempC >= low && tempC <= high;
  }
  const source = str(coefficientInputs[0]?.source) ?? str(rangeInput?.source) ?? null;
  const name = /DIPPR/.test(description)
    ? "DIPPR-101"
    : /Antoine/.test(description)
      ? "Antoine"
      : /Wagner/.test(description)
        ? description.replace(/ equation/, "")
        : "Clausius–Clapeyron (from the normal boiling point)";
  const resultValue = isObject(raw?.result) ? raw.result : null;
  return {
    name,
    equation: steps[vpIndex].formula,
    substituted: steps[vpIndex].substituted,
    coefficients: coefficientInputs.flatMap((v) => {
      const shown = shownValue(v, citations, true);
      return shown ? [{ ...shown, source: null, citation: null }] : [];
    }),
    range: rangeInput ? formatTraceValue(rangeInput.value, str(rangeInput.unit)) : null,
    inRange,
    ...citations.cite(source),
    temperature: tempInput ? shownValue(tempInput, citations) : null,
    pressure: steps[vpIndex].result,
    pressureKPa: resultValue && str(resultValue.unit) === "kPa" ? num(resultValue.value) : null,
    tempC,
  };
}

function boundOf(trace: Obj): TraceSection["bound"] {
  const rawSteps = Array.isArray(trace.steps) ? trace.steps.filter(isObject) : [];
  const valueOf = (symbol: string, unit: string) => {
    const step = rawSteps.find((s) => isObject(s.result) && s.result.symbol === symbol && s.result.unit === unit);
    return step && isObject(step.result) ? num(step.result.value) : null;
  };
  const saturated = valueOf("C_sat", "ppm");
  const inventory = valueOf("C_inv", "ppm");
  const used = valueOf("C_max", "ppm");
  if (saturated === null || inventory === null || used === null) return null;
  return {
    saturated: formatTraceValue(saturated, "ppm"),
    inventory: formatTraceValue(inventory, "ppm"),
    used: formatTraceValue(used, "ppm"),
    limitedBy: inventory < saturated ? "inventory" : "saturation",
  };
}

/** Pairs the numbered inputs (C1, LFL1, x1, P1sat…) into rows by their number. */
function numbered(trace: Obj): Map<number, Record<string, Obj>> {
  const rows = new Map<number, Record<string, Obj>>();
  for (const input of Array.isArray(trace.inputs) ? trace.inputs : []) {
    if (!isObject(input) || typeof input.symbol !== "string") continue;
    const match = /^([A-Za-z]+)(\d+)(\w*)$/.exec(input.symbol);
    if (!match) continue;
    const n = Number(match[2]);
    const row = rows.get(n) ?? {};
    row[match[1] + match[3]] = input;
    rows.set(n, row);
  }
  return rows;
}

/** "Concentration of diethyl ether" → "diethyl ether". */
function subjectOf(name: unknown): string {
  return String(name ?? "").replace(/^(Concentration|LFL|Liquid mole fraction|Mole fraction|Saturation pressure) of /, "").replace(/ \((antoine|dippr101|wagner|clausius-clapeyron[\w-]*)\)$/, "");
}

function sharesOf(trace: Obj, steps: ShownStep[]): TraceSection["shares"] {
  const rows: ShareRow[] = [];
  for (const [, row] of [...numbered(trace)].sort((a, b) => a[0] - b[0])) {
    const c = row.C;
    const lfl = row.LFL;
    if (!c || !lfl) continue;
    const ppm = num(c.value);
    const lflPercent = num(lfl.value);
    if (ppm === null || lflPercent === null || !(lflPercent > 0)) continue;
    // 1 % by volume = 10 000 ppm.
    const share = ppm / (lflPercent * 10_000);
    rows.push({
      name: subjectOf(c.name),
      concentration: formatTraceValue(ppm, "ppm"),
      limit: formatTraceValue(lflPercent, str(lfl.unit) ?? "% by volume"),
      share: formatTraceNumber(share),
      sharePercentLfl: formatTraceValue(share * 100, "% LFL"),
    });
  }
  if (rows.length === 0) return null;
  const sum = steps.find((s) => s.kind === "lfl-sum")?.result ?? null;
  return { rows, sum: sum ? sum.text : null };
}

function tableOf(kind: SectionKind, trace: Obj, steps: ShownStep[]): TraceSection["table"] {
  const rows = [...numbered(trace)].sort((a, b) => a[0] - b[0]).map(([, row]) => row);
  if (kind === "le-chatelier") {
    const body = rows.filter((r) => r.x && r.LFL).map((r) => [subjectOf(r.LFL.name), formatTraceValue(r.x.value, ""), formatTraceValue(r.LFL.value, str(r.LFL.unit))]);
    return body.length ? { head: ["Substance", "Mole fraction in the vapor (xᵢ)", "LFLᵢ"], rows: body } : null;
  }
  if (kind === "raoult") {
    const partials = steps.filter((s) => s.result?.symbol && /^p\d+$/.test(s.result.symbol));
    const body = rows
      .filter((r) => r.x && r.Psat)
      .map((r, i) => [subjectOf(r.x.name), formatTraceValue(r.x.value, ""), formatTraceValue(r.Psat.value, str(r.Psat.unit)), partials[i]?.result?.text ?? "—"]);
    return body.length ? { head: ["Substance", "Liquid mole fraction (xᵢ)", "Pᵢsat", "pᵢ = xᵢ·Pᵢsat"], rows: body } : null;
  }
  return null;
}

const KNOWN_KEYS = new Set(["method", "source", "inputs", "steps", "result", "warnings", "parts", "rule", "scenario", "containers"]);

function section(trace: Obj, citations: Citations, asRule = false): TraceSection {
  const kind: SectionKind = asRule ? "generic" : sectionKind(trace);
  const steps = (Array.isArray(trace.steps) ? trace.steps : []).flatMap((s) => {
    const shown = shownStep(s, citations);
    return shown ? [shown] : [];
  });
  const withCorrelation = kind === "vapor-pressure" || kind === "enclosure-bound";
  const rawInputs = Array.isArray(trace.inputs) ? trace.inputs : [];
  const correlation = withCorrelation ? correlationOf(trace, steps, citations) : null;
  const inputs = rawInputs.flatMap((v) => {
    if (correlation && isObject(v) && CORRELATION_INPUT(v)) return [];
    const shown = shownValue(v, citations);
    return shown ? [shown] : [];
  });
  return {
    kind,
    title: str(trace.method) ?? "Calculation",
    ...citations.cite(str(trace.source)),
    inputs,
    steps,
    result: shownValue(trace.result, citations),
    warnings: (Array.isArray(trace.warnings) ? trace.warnings : []).filter((w): w is string => typeof w === "string"),
    correlation,
    bound: kind === "enclosure-bound" ? boundOf(trace) : null,
    shares: kind === "lfl-fraction" ? sharesOf(trace, steps) : null,
    table: tableOf(kind, trace, steps),
  };
}

const AMOUNT_STATE: Record<string, string> = { sealed: "sealed", opened: "open", in_use: "in use", empty: "empty", disposed: "disposed" };

/** The contributing containers stored in the trace (rules' `containers`), in their order. */
export function traceContainers(trace: unknown): TraceContainerRef[] {
  const parsed = parse(trace);
  if (!isObject(parsed) || !Array.isArray(parsed.containers)) return [];
  return parsed.containers.flatMap((c) => {
    if (!isObject(c) || num(c.containerId) === null) return [];
    const amount = num(c.amount);
    return [
      {
        containerId: c.containerId as number,
        label: String(c.label ?? ""),
        content: String(c.content ?? ""),
        amountText: amount === null ? "—" : formatTraceValue(amount, str(c.amountUnit)),
        state: AMOUNT_STATE[String(c.state)] ?? String(c.state ?? ""),
      },
    ];
  });
}

function parse(trace: unknown): unknown {
  if (typeof trace !== "string") return trace;
  try {
    return JSON.parse(trace);
  } catch {
    return trace;
  }
}

function otherRows(value: unknown, label: string, out: { label: string; text: string }[], depth = 0): void {
  if (value === null || value === undefined || depth > 8) return;
  if (Array.isArray(value)) {
    value.forEach((item, i) => otherRows(item, `${label} ${i + 1}`, out, depth + 1));
    return;
  }
  if (isObject(value)) {
    if (typeof value.name === "string" && "value" in value && !isObject(value.value)) {
      out.push({ label: `${label}: ${value.name}`, text: formatTraceValue(value.value, str(value.unit)) });
      return;
    }
    for (const key of Object.keys(value)) otherRows(value[key], `${label} · ${key}`, out, depth + 1);
    return;
  }
  out.push({ label, text: typeof value === "number" ? formatTraceNumber(value) : String(value) });
}

/** The whole trace as the page draws it. A trace stored as a JSON string is parsed first. */
export function traceModel(trace: unknown): TraceModel {
  const citations = new Citations();
  const root = parse(trace);
  const empty: TraceModel = { rule: null, parts: [], containers: [], other: [], sources: [] };
  if (!isObject(root)) {
    if (root == null) return empty;
    return { ...empty, other: [{ label: "Trace", text: String(root) }] };
  }
  const isEngine = typeof root.method === "string";
  const rule = isEngine ? section(root, citations, true) : null;
  const rawParts = Array.isArray(root.parts) ? root.parts.filter(isObject) : [];
  const parts = rawParts.map((part) => section(part, citations));
  // The vapor pressures first: the enclosure, spill and mixture parts use them. Stable otherwise.
  const order = (s: TraceSection) => (s.kind === "vapor-pressure" ? 0 : 1);
  const sorted = parts.map((s, i) => ({ s, i })).sort((a, b) => order(a.s) - order(b.s) || a.i - b.i).map(({ s }) => s);
  const other: { label: string; text: string }[] = [];
  for (const key of Object.keys(root)) {
    if (isEngine && KNOWN_KEYS.has(key)) continue;
    if (!isEngine && (key === "containers" || key === "rule" || key === "scenario")) continue;
    if (!isEngine && key === "steps" && Array.isArray(root.steps)) {
      for (const step of root.steps) {
        const shown = shownStep(step, citations);
        if (shown) other.push({ label: shown.description, text: shown.result?.text ?? shown.substituted ?? "" });
      }
      continue;
    }
    otherRows(root[key], key, other);
  }
  return { rule, parts: sorted, containers: traceContainers(root), other, sources: citations.list };
}

/** The point (T, Psat) the trace used for a substance, for marking it on the vapor-pressure chart. */
export function vaporPressurePoints(model: TraceModel): { title: string; tempC: number; pressureKPa: number }[] {
  return model.parts.flatMap((part) =>
    part.correlation && part.correlation.tempC !== null && part.correlation.pressureKPa !== null
      ? [{ title: part.title, tempC: part.correlation.tempC, pressureKPa: part.correlation.pressureKPa }]
      : [],
  );
}
