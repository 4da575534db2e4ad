/**
 * Degrees Fahrenheit to degrees Celsius: t/°C = (t/°F − 32)/1.8 (NIST SP 811, B.9). A logger set
 * to °F writes readings to a tenth of a degree; the result is kept unrounded.
 */
export function fahrenheitToCelsius(fahrenheit: number): number {
  return (fahrenheit - 32) / 1.8;
}
