/** Temperature units of logger files. Pure. */
export type TemperatureUnit = "C" | "F" | "K";

/** t/°C = (t/°F − 32) × 5/9 (definition of the Fahrenheit scale, NIST SP 811 B.9). */
export function fahrenheitToCelsius(tempF: number): number {
  return ((tempF - 32) * 5) / 9;
}

/** t/°C = T/K − 273.15 (definition of the Celsius scale, NIST SP 811 §4.2.1.1). */
export function kelvinToCelsius(tempK: number): number {
  return tempK - 273.15;
}

export function toCelsius(value: number, unit: TemperatureUnit): number {
  if (!Number.isFinite(value)) throw new RangeError(`Temperature must be a finite number, got ${value}.`);
  const tempC = unit === "F" ? fahrenheitToCelsius(value) : unit === "K" ? kelvinToCelsius(value) : value;
  if (tempC < -273.15) throw new RangeError(`${value} ${unit === "K" ? "K" : `°${unit}`} is below absolute zero.`);
  return tempC;
}
