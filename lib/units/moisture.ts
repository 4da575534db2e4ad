import { type DecimalMark, parseDecimalNumber } from "./number";

const percentValue = /^([-+]?)\s*([\d.,]+)\s*(%?)$/;

/**
 * Reads substrate moisture, wet basis, as a fraction: "62 %", "62%", "62,5 %" and "62"
 * are percent; "0.62" (a bare number up to 1) is already a fraction. Rejects values
 * outside 0–100 %.
 */
export function parseMoisture(
  text: string,
  options: { decimal?: DecimalMark } = {},
): { fraction: number } | { error: string; code: "moisture_unreadable" | "moisture_out_of_range" } {
  const written = text.trim();
  const match = percentValue.exec(written);
  const value = match === null ? null : parseDecimalNumber(match[2], options.decimal ?? ".");
  if (match === null || value === null) {
    return {
      code: "moisture_unreadable",
      error: `"${written}" is not a moisture we can read. Write the moisture content (wet basis) as a percentage such as "62 %" or a fraction such as "0.62".`,
    };
  }
  const negative = match[1] === "-" && value !== 0;
  const fraction = match[3] === "%" || value > 1 ? value / 100 : value;
  if (negative || fraction > 1) {
    return {
      code: "moisture_out_of_range",
      error: `"${written}" is outside 0–100 %. Moisture (wet basis) is the water share of the wet substrate: enter a value such as "62 %".`,
    };
  }
  return { fraction };
}

/** Dry substrate mass from wet mass and moisture content on a wet basis: wet × (1 − moisture) (IRRI Rice Knowledge Bank). */
export function drySubstrateGrams(wetGrams: number, moisture: number): number {
  return wetGrams * (1 - moisture);
}
