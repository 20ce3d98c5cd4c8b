/**
 * Numbers for people: sensible significant figures, tabular figures in the UI, units always
 * beside the value. Never a raw float.
 */
const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

/** 3 significant figures by default; ×10ⁿ notation from 10⁵ up or below 10⁻³; a true minus sign. */
export function formatNumber(value: number | null | undefined, significant = 3): string {
  return formatMagnitude(value, significant).replace(/^-/, "−");
}

function formatMagnitude(value: number | null | undefined, significant: number): string {
  if (value == null || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  const magnitude = Math.abs(value);
  if (magnitude >= 1e5 || magnitude < 1e-3) {
    const exponent = Math.floor(Math.log10(magnitude));
    const mantissa = value / 10 ** exponent;
    const digits = mantissa.toFixed(Math.max(0, significant - 1)).replace(/\.?0+$/, "");
    const power = String(exponent)
      .split("")
      .map((ch) => SUPERSCRIPT[ch])
      .join("");
    return `${digits} × 10${power}`;
  }
  const rounded = Number(value.toPrecision(significant));
  return rounded.toLocaleString("en-GB", { maximumFractionDigits: Math.max(0, significant - 1 - Math.floor(Math.log10(magnitude))) });
}

export function formatQuantity(value: number | null | undefined, unit: string, significant = 3): string {
  const text = formatNumber(value, significant);
  return text === "—" ? text : `${text} ${unit}`;
}

/** Temperatures to one decimal: 31.2 °C. */
export function formatTempC(value: number | null | undefined): string {
  if (value == null || !Number.isFinite(value)) return "—";
  return `${value.toFixed(1).replace("-", "−")} °C`;
}

export function formatCount(value: number): string {
  return value.toLocaleString("en-GB");
}

export function formatDateTime(value: Date | number | null | undefined): string {
  if (value == null) return "—";
  const date = typeof value === "number" ? new Date(value) : value;
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/** "2 h 5 min", "3 days 4 h", "45 min". */
export function formatDurationMin(durationMin: number): string {
  const total = Math.max(0, Math.round(durationMin));
  if (total < 60) return `${total} min`;
  const days = Math.floor(total / 1440);
  const hours = Math.floor((total % 1440) / 60);
  const minutes = total % 60;
  if (days > 0) return `${days} day${days === 1 ? "" : "s"}${hours ? ` ${hours} h` : ""}`;
  return `${hours} h${minutes ? ` ${minutes} min` : ""}`;
}
