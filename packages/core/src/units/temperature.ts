export function fahrenheitToCelsius(f: number): number {
  return ((f - 32) * 5) / 9;
}

export function celsiusToFahrenheit(c: number): number {
  return (c * 9) / 5 + 32;
}

/** Absolute temperature in degrees Rankine (°F + 459.67). */
export function fahrenheitToRankine(f: number): number {
  return f + 459.67;
}
