/** Temperature values and unit symbols as loggers write them. Pure. */
import { fahrenheitToCelsius, kelvinToCelsius, type TemperatureUnit } from "../units";

export type DecimalSeparator = "." | ",";


export const UNIT_LABELS: Record<TemperatureUnit, string> = { C: "°C", F: "°F", K: "K" };

/**
 * "C", "°C", "ºC" (the ordinal sign typed for a degree sign), "degC", "deg C", "Celsius", "°F",
 * "Fahrenheit", "K", "Kelvin"; any case, with or without spaces. Null when it is none of them.
 */
export function readUnit(text: string): TemperatureUnit | null {
  const key = text.trim().toLowerCase().replace(/[\s_.]+/g, "").replace(/^(°|º|˚|deg(rees?)?)/, "");
  switch (key) {
    case "c":
    case "celsius":
    case "centigrade":
      return "C";
    case "f":
    case "fahrenheit":
      return "F";
    case "k":
    case "kelvin":
      return "K";
    default:
      return null;
  }
}

/** The unit a header names: "Temperature (°F)", "Temp [°C]", "temp_degF", "Value K" (a lone K only in brackets). */
export function unitInHeader(header: string): TemperatureUnit | null {
  const h = header.toLowerCase();
  if (/(°|º|˚|deg\s*)f\b|fahrenheit/.test(h)) return "F";
  if (/(°|º|˚|deg\s*)c\b|celsius/.test(h)) return "C";
  if (/[([]\s*k\s*[)\]]|kelvin/.test(h)) return "K";
  return null;
}

const DOT_NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)$/;
const COMMA_NUMBER = /^[+-]?(?:\d+(?:,\d*)?|,\d+)$/;
/** A number with the unit written after it in the same cell: "4.5 °C", "40F". */
const WITH_UNIT = /^(.*?)\s*((?:°|º|˚|deg\s*)?\s*[CcFfKk]|celsius|fahrenheit|kelvin)$/i;

export type TemperatureCell = { ok: true; value: number; unit: TemperatureUnit | null } | { ok: false; message: string };

/** A temperature cell: a number with the chosen decimal mark, optionally followed by its unit. */
export function readTemperature(text: string, decimal: DecimalSeparator): TemperatureCell {
  let value = text.trim();
  // The common case first: a plain number.
  if (decimal === "." ? DOT_NUMBER.test(value) : COMMA_NUMBER.test(value)) {
    return { ok: true, value: Number(decimal === "," ? value.replace(",", ".") : value), unit: null };
  }
  if (value === "") return { ok: false, message: "The temperature is empty." };
  value = value.replace(/^−/, "-");
  let unit: TemperatureUnit | null = null;
  const withUnit = WITH_UNIT.exec(value);
  if (withUnit && withUnit[1] !== "") {
    unit = readUnit(withUnit[2]);
    value = withUnit[1];
  }
  if (decimal === "." ? DOT_NUMBER.test(value) : COMMA_NUMBER.test(value)) {
    return { ok: true, value: Number(decimal === "," ? value.replace(",", ".") : value), unit };
  }
  if (decimal === "." && COMMA_NUMBER.test(value)) {
    return { ok: false, message: `“${text.trim()}” has a decimal comma; choose the comma as the decimal separator if the logger writes them.` };
  }
  if (decimal === "," && DOT_NUMBER.test(value)) {
    return { ok: false, message: `“${text.trim()}” has a decimal point; choose the point as the decimal separator if the logger writes them.` };
  }
  return { ok: false, message: `“${text.trim()}” is not a number.` };
}

/**
 * °C for storage. Conversion noise of binary floating point is rounded off at 10⁻⁶ °C (46.4 °F is
 * exactly 8 °C, not 7.999999999999999); a value in °C is kept as read.
 */
export function storedTempC(value: number, unit: TemperatureUnit): number {
  if (unit === "C") return value;
  const tempC = unit === "F" ? fahrenheitToCelsius(value) : kelvinToCelsius(value);
  return Math.round(tempC * 1e6) / 1e6;
}
