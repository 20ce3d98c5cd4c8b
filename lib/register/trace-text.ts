/**
 * A finding's calculation trace as readable lines of text, for the workbook's "Finding traces"
 * sheet (one row per finding). Pure.
 *
 * Why text and not one spreadsheet row per step: a trace has 10–60 steps, so a register of
 * 100,000 findings would need millions of rows (more than a worksheet holds) and minutes to write.
 * One cell per finding keeps every input, formula, substituted formula, result and warning, and
 * the finding's own numbers stay numbers on the Findings sheet.
 *
 * Long source texts (the substance data's citations, the severity thresholds' sources) repeat in
 * nearly every trace; `cite` replaces each with a short reference ("[S12]") that the workbook's
 * "Trace sources" sheet resolves. Short notes stay inline. The lines come from traceRows, so a
 * trace of any shape keeps every value.
 */
import { xmlSafeText } from "@/lib/exports/safe-text";
import { traceRows, type TraceCellValue, type TraceRow } from "@/lib/exports/trace-rows";

/** A note (a source, or a step's note with its source) this long or longer is cited rather than written out. */
export const CITE_FROM_CHARS = 100;

/** Keys of the top level that the Findings sheet already shows. */
const SKIPPED_PATHS = new Set(["rule", "scenario"]);

/** Up to six significant figures, enough to redo a step by hand; the engine keeps full precision. */
export function traceNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (Number.isInteger(value) && Math.abs(value) < 1e15) return String(value);
  return String(Number(value.toPrecision(6)));
}

function valueText(value: TraceCellValue, unit: string | null): string {
  if (value === null) return "";
  const text = typeof value === "number" ? traceNumber(value) : String(value);
  return unit ? `${text} ${unit}` : text;
}

/** The note, or its citation when it is long. */
function noteText(note: string | null, cite: (source: string) => string): string {
  if (!note) return "";
  return note.length < CITE_FROM_CHARS ? note : cite(note);
}

/** How deep in nested engine traces ("parts[2].parts[1]…") a row is. */
function depthOf(path: string): number {
  let depth = 0;
  for (let at = path.indexOf("parts["); at >= 0; at = path.indexOf("parts[", at + 1)) depth += 1;
  return depth;
}

/** "… = 41.602 kPa": the formula with the numbers already ends in its result. */
function endsWithResult(substituted: string | null): boolean {
  if (!substituted || !substituted.includes("=")) return false;
  const tail = substituted.slice(substituted.lastIndexOf("=") + 1).trim();
  // A number, then at most a unit (no further digits: "6.1 − 1000/(28 + 230)" is not a result).
  return /^[-+−]?\d[\d.,]*(?:[eE][-+]?\d+)?(?:\s+\D+)?$/.test(tail);
}

function line(row: TraceRow, cite: (source: string) => string): string | null {
  const label = row.label ?? "";
  const note = noteText(row.note, cite);
  const withNote = (text: string) => (note ? `${text} — ${note}` : text);
  if (label === "Warning") return `Warning: ${row.note ?? valueText(row.value, row.unit)}`;
  if (label === "Method") {
    const part = /parts\[(\d+)\]\.method$/.exec(row.path);
    return withNote(`${part ? `Part ${part[1]}: ` : "Method: "}${row.formula ?? ""}`);
  }
  if (label.startsWith("Input: ")) return withNote(`${label.slice(7)} = ${valueText(row.value, row.unit)}`);
  if (label.startsWith("Result: ")) return withNote(`Result: ${label.slice(8)} = ${valueText(row.value, row.unit)}`);
  if (row.formula || row.substituted) {
    const shown = [row.formula, row.substituted].filter(Boolean).join("; ");
    const result = row.value === null || endsWithResult(row.substituted) ? "" : ` → ${valueText(row.value, row.unit)}`;
    return withNote(`${label ? `${label}: ` : ""}${shown}${result}`);
  }
  const value = valueText(row.value, row.unit);
  if (!label && !value && !note) return null;
  return withNote(label && value ? `${label}: ${value}` : label || value);
}

/**
 * The trace as lines joined by "\n"; parts of the calculation are indented by two spaces per
 * level. XML-safe (xmlSafeText): no character XML cannot hold, no carriage return, so the workbook
 * can copy the stored text's bytes (db/schema.ts findingTraces.textXmlSafe).
 */
export function traceText(trace: unknown, cite: (source: string) => string = (source) => source): string {
  const lines: string[] = [];
  for (const row of traceRows(trace)) {
    if (SKIPPED_PATHS.has(row.path) || row.path.startsWith("containers[")) continue;
    const text = line(row, cite);
    if (text === null) continue;
    const depth = depthOf(row.path);
    const indent = depth > 0 && !/parts\[\d+\]\.method$/.test(row.path) ? "  ".repeat(depth) : "  ".repeat(Math.max(0, depth - 1));
    lines.push(indent + text);
  }
  lines.push(...containerLines(trace));
  return xmlSafeText(lines.join("\n"));
}

/**
 * The contributing containers the rules record (FindingTrace.containers), one line each:
 * "Contributing container: C-1000 — Diethyl ether, 2.5 L, opened".
 */
function containerLines(trace: unknown): string[] {
  let value = trace;
  if (typeof value === "string") {
    try {
      value = JSON.parse(value);
    } catch {
      return [];
    }
  }
  if (typeof value !== "object" || value === null || Array.isArray(value)) return [];
  const list = (value as { containers?: unknown }).containers;
  if (!Array.isArray(list)) return [];
  return list.flatMap((c) => {
    if (typeof c !== "object" || c === null) return [];
    const { label, content, amount, amountUnit, state } = c as Record<string, unknown>;
    const amountText = typeof amount === "number" ? `${traceNumber(amount)}${typeof amountUnit === "string" ? ` ${amountUnit}` : ""}` : "";
    const details = [content, amountText, typeof state === "string" ? state.replace("_", " ") : null].filter((part) => typeof part === "string" && part !== "");
    return [`Contributing container: ${String(label ?? "")}${details.length ? ` — ${details.join(", ")}` : ""}`];
  });
}

/**
 * Collects the references of one trace's text: `cite` gives "[S<id>]" for a source's id (from the
 * caller's lookup) and remembers the id.
 */
export function citingWith(idOf: (source: string) => number): { cite: (source: string) => string; ids: () => number[] } {
  const used = new Set<number>();
  return {
    cite: (source) => {
      const id = idOf(source);
      used.add(id);
      return `[S${id}]`;
    },
    ids: () => [...used].sort((a, b) => a - b),
  };
}
