/**
 * Numbers in finding titles: 3 significant figures, ×10ⁿ from 10⁵ up, a true minus sign, the
 * unit always beside the value (the same conventions as the app's number formatting).
 */
const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

export function formatSignificant(value: number, significant = 3): string {
  if (!Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  const text = magnitude >= 1e5 || magnitude < 1e-3 ? scientific(magnitude, significant) : plain(magnitude, significant);
  return value < 0 ? `\u2212${text}` : text;
}

function stripZeros(text: string): string {
  if (text.indexOf(".") < 0) return text;
  let end = text.length;
  while (text.charCodeAt(end - 1) === 48) end -= 1; // "0"
  if (text.charCodeAt(end - 1) === 46) end -= 1; // "."
  return text.slice(0, end);
}

function plain(magnitude: number, significant: number): string {
  const rounded = Number(magnitude.toPrecision(significant));
  const decimals = Math.max(0, significant - 1 - Math.floor(Math.log10(rounded)));
  const text = stripZeros(rounded.toFixed(decimals));
  if (rounded < 1_000) return text;
  // Thousands separators from four digits up, as in the app's tables: 2,060 and 12,300.
  const dot = text.indexOf(".");
  const whole = dot < 0 ? text : text.slice(0, dot);
  let grouped = "";
  for (let i = 0; i < whole.length; i++) {
    if (i > 0 && (whole.length - i) % 3 === 0) grouped += ",";
    grouped += whole[i];
  }
  return dot < 0 ? grouped : grouped + text.slice(dot);
}

function scientific(magnitude: number, significant: number): string {
  let exponent = Math.floor(Math.log10(magnitude));
  let mantissa = Number((magnitude / 10 ** exponent).toFixed(significant - 1));
  if (mantissa >= 10) {
    mantissa /= 10;
    exponent += 1;
  }
  const digits = stripZeros(mantissa.toFixed(Math.max(0, significant - 1)));
  let power = "";
  for (const ch of String(exponent)) power += SUPERSCRIPT[ch];
  return `${digits} × 10${power}`;
}

export function formatQuantity(value: number, unit: string, significant = 3): string {
  return `${formatSignificant(value, significant)} ${unit}`;
}

/** Temperatures to one decimal: 31.2 °C, −18.0 °C. */
export function formatTempC(tempC: number): string {
  const text = tempC.toFixed(1);
  return `${text.startsWith("-") ? `\u2212${text.slice(1)}` : text} °C`;
}

/** A fraction as a percentage: 2.1 → "210 %". */
export function formatPercent(fraction: number, significant = 3): string {
  return `${formatSignificant(fraction * 100, significant)} %`;
}

export function capitalise(text: string): string {
  return text.length === 0 ? text : text[0].toUpperCase() + text.slice(1);
}

/** Significant figures for trace text (the engine's convention): 4 by default, a true minus sign. */
export function formatSig(value: number, digits = 4): string {
  if (value === 0) return "0";
  const text = Number(value.toPrecision(digits)).toString();
  return text.startsWith("-") ? `\u2212${text.slice(1)}` : text;
}
