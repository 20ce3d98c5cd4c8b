/** Temperature units of logger files. Pure. */
export type TemperatureUnit = "C" | "F";

/** t/°C = (t/°F − 32) × 5/9 (definition of the Fahrenheit scale, NIST SP 811 B.9). */
export function fahrenheitToCelsius(tempF: number): number {
  return ((tempF - 32) * 5) / 9;
}

export function toCelsius(value: number, unit: TemperatureUnit): number {
  if (!Number.isFinite(value)) throw new RangeError(`Temperature must be a finite number, got ${value}.`);
  const tempC = unit === "F" ? fahrenheitToCelsius(value) : value;
  if (tempC < -273.15) throw new RangeError(`${value} °${unit} is below absolute zero.`);
  return tempC;
}
