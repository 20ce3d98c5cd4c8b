import { wagnerEquationText, wagnerFormName } from "@/lib/hazard";

// One wording of a stored vapor-pressure correlation for every place that prints one (the substance
// page, the workbook's substance sheet). Correlations are stored as JSON, so fields are read loosely.

type StoredCorrelation = Record<string, unknown>;

const numbers = (value: unknown): number[] => (Array.isArray(value) ? value.filter((v): v is number => typeof v === "number") : []);

/** The equation in symbols, with its name. */
export function correlationEquation(c: StoredCorrelation): string {
  if (c.kind === "dippr101") return "DIPPR 101: ln(P/Pa) = C1 + C2/T + C3·ln T + C4·T^C5, T in K";
  if (c.kind === "wagner") {
    const exponents = numbers(c.exponents);
    const line = c.line === "solid-vapor" ? "solid-vapor" : "liquid-vapor";
    return `Wagner (${wagnerFormName(exponents)}${line === "solid-vapor" ? ", sublimation line" : ""}): ${wagnerEquationText({ exponents, line })}`;
  }
  if (c.kind !== "antoine") return String(c.kind);
  const log = c.log === "ln" ? "ln" : "log10";
  const t = c.temperatureUnit === "C" ? "t/°C" : "T/K";
  return `Antoine: ${log}(P/${String(c.pressureUnit)}) = A − B/(${t} + C)`;
}

/** The coefficients as stored, e.g. "A = 4.2184; B = 1197.01; C = −45.09" or "Tc = 508.1 K; Pc = 4692 kPa; n1 = −7.67033; …". */
export function correlationCoefficients(c: StoredCorrelation): string {
  if (c.kind === "wagner") {
    const sublimation = c.line === "solid-vapor";
    const terms = numbers(c.coefficients).map((n, i) => `n${i + 1} = ${n}`);
    return [`${sublimation ? "Tt" : "Tc"} = ${String(c.reducingTempK)} K`, `${sublimation ? "Pt" : "Pc"} = ${String(c.reducingPressureKPa)} kPa`, ...terms].join("; ");
  }
  const keys = c.kind === "dippr101" ? ["c1", "c2", "c3", "c4", "c5"] : ["a", "b", "c"];
  return keys.map((k) => `${k.toUpperCase()} = ${String(c[k])}`).join("; ");
}
