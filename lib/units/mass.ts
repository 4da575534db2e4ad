import { type DecimalMark, parseDecimalNumber } from "./number";

export type MassUnit = "g" | "kg" | "lb" | "oz";
/** The unit that applied to a mass as written: one unit, or pounds and ounces together. */
export type MassUnitAsWritten = MassUnit | "lb+oz";
/** How a member reads masses (db enum display_units). */
export const displayUnitNames = ["metric", "imperial"] as const;
export type MassDisplay = (typeof displayUnitNames)[number];

/** Grams in one avoirdupois pound, exact by definition (NIST Handbook 44, Appendix C; 1959 international yard and pound agreement). */
export const GRAMS_PER_POUND = 453.59237;
/** One ounce is 1/16 pound (NIST Handbook 44, Appendix C) = 28.349523125 g. */
export const GRAMS_PER_OUNCE = GRAMS_PER_POUND / 16;
export const GRAMS_PER_KILOGRAM = 1000;

export const gramsPerUnit: Readonly<Record<MassUnit, number>> = {
  g: 1,
  kg: GRAMS_PER_KILOGRAM,
  lb: GRAMS_PER_POUND,
  oz: GRAMS_PER_OUNCE,
};

export interface MassOptions {
  /** Unit for a bare number such as "2.5": from the column header or the upload's setting. */
  defaultUnit?: MassUnit;
  decimal?: DecimalMark;
}

/** Why a mass could not be read; the same codes name the problem in an import report. */
export type MassErrorCode =
  "mass_blank" | "troy_ounce" | "mass_unreadable" | "number_unreadable" | "mass_negative" | "unit_unknown" | "mass_without_unit";

export type MassReading = { grams: number; unit: MassUnitAsWritten } | { error: string; code: MassErrorCode };

const unitWords: Readonly<Record<string, MassUnit>> = {
  g: "g",
  gram: "g",
  grams: "g",
  gramme: "g",
  grammes: "g",
  kg: "kg",
  kgs: "kg",
  kilo: "kg",
  kilos: "kg",
  kilogram: "kg",
  kilograms: "kg",
  kilogramme: "kg",
  kilogrammes: "kg",
  lb: "lb",
  lbs: "lb",
  pound: "lb",
  pounds: "lb",
  oz: "oz",
  ozs: "oz",
  ounce: "oz",
  ounces: "oz",
};

/** Looks up a unit word such as "lbs" or "Kilograms"; null when it is not a mass unit we accept. */
export function massUnitFromWord(word: string): MassUnit | null {
  return unitWords[word.toLowerCase()] ?? null;
}

// A troy ounce (31.1034768 g) is a precious-metals unit, never a harvest-scale "oz" (NIST Handbook 44, Appendix C).
const troyOunce = /\btroy\b|\bozt\b|\boz\.?\s*t\b|\bt\.?\s*oz\b/;
const poundsAndOunces = /^([-+]?)\s*([\d.,]+)\s*(?:lbs?|pounds?)\.?\s*([\d.,]+)\s*(?:oz|ounces?)\.?$/;
const numberThenUnit = /^([-+]?)\s*([\d.,][\d.,\s'\u00a0\u202f\u2019]*?)\s*([a-z]+)?\.?$/;
const unicodeMinus = /\u2212/g;

const howToWrite = 'Write it as a number and a unit, for example "2.5 kg", "850 g", "5 lb" or "4 lb 3 oz".';

/** Reads a mass as written by a grower and converts it to grams, keeping the unit that applied. */
export function readMass(text: string, options: MassOptions = {}): MassReading {
  const decimal = options.decimal ?? ".";
  const written = text.trim().toLowerCase().replace(unicodeMinus, "-");
  if (written === "") return { code: "mass_blank", error: "The mass is blank. Enter the weight or leave the row out." };
  if (troyOunce.test(written)) {
    return {
      code: "troy_ounce",
      error: `"${text.trim()}" is in troy ounces, a unit for precious metals, not for a harvest scale. Weigh in g, kg, lb or oz (avoirdupois) and enter that.`,
    };
  }
  const compound = poundsAndOunces.exec(written);
  if (compound !== null) {
    const pounds = parseDecimalNumber(compound[2], decimal);
    const ounces = parseDecimalNumber(compound[3], decimal);
    if (pounds === null || ounces === null) {
      return { code: "mass_unreadable", error: `"${text.trim()}" is not a weight we can read. ${howToWrite}` };
    }
    if (compound[1] === "-") {
      return { code: "mass_negative", error: `"${text.trim()}" is negative. A weight cannot be below zero: correct the value.` };
    }
    return { grams: pounds * GRAMS_PER_POUND + ounces * GRAMS_PER_OUNCE, unit: "lb+oz" };
  }
  const single = numberThenUnit.exec(written);
  if (single === null) {
    return { code: "mass_unreadable", error: `"${text.trim()}" is not a weight we can read. ${howToWrite}` };
  }
  const value = parseDecimalNumber(single[2].trim(), decimal);
  if (value === null) {
    return { code: "number_unreadable", error: `"${text.trim()}" is not a number we can read. ${howToWrite}` };
  }
  if (single[1] === "-" && value !== 0) {
    return { code: "mass_negative", error: `"${text.trim()}" is negative. A weight cannot be below zero: correct the value.` };
  }
  let unit: MassUnit | undefined = options.defaultUnit;
  if (single[3] !== undefined) {
    const named = unitWords[single[3]];
    if (named === undefined) {
      return {
        code: "unit_unknown",
        error: `"${single[3]}" in "${text.trim()}" is not a unit we accept. Use g, kg, lb or oz, for example "2.5 kg".`,
      };
    }
    unit = named;
  }
  if (unit === undefined) {
    return {
      code: "mass_without_unit",
      error: `"${text.trim()}" has no unit. Write the unit after the number (for example "${text.trim()} g"), name it in the column header (for example "Fresh weight (g)"), or choose a default unit for the upload.`,
    };
  }
  return { grams: value * gramsPerUnit[unit], unit };
}

/** The number of a single mass as written ("2,5" of "2,5 kg"), for what it says about the decimal mark; null for compound masses. */
export function massNumberText(text: string): string | null {
  const single = numberThenUnit.exec(text.trim().toLowerCase().replace(unicodeMinus, "-"));
  return single === null ? null : single[2].trim();
}

/** Converts a mass as written ("2,5 kg", "4 lb 3 oz", "850") to grams. */
export function parseMass(text: string, options: MassOptions = {}): { grams: number } | { error: string } {
  const reading = readMass(text, options);
  return "error" in reading ? { error: reading.error } : { grams: reading.grams };
}

function trimZeros(fixed: string): string {
  return fixed.includes(".") ? fixed.replace(/\.?0+$/, "") : fixed;
}

/**
 * Formats grams for display in the reader's preferred system: metric as "850 g" or
 * "2.27 kg", imperial as "12.5 oz" under a pound and "5 lb 0 oz" from a pound up.
 */
export function formatMass(grams: number, display: MassDisplay): string {
  if (!Number.isFinite(grams)) return "";
  const sign = grams < 0 ? "-" : "";
  const size = Math.abs(grams);
  if (display === "metric") {
    if (Math.round(size) < 1000) return `${sign}${Math.round(size)} g`;
    return `${sign}${(size / GRAMS_PER_KILOGRAM).toFixed(2)} kg`;
  }
  const totalOunces = size / GRAMS_PER_OUNCE;
  if (totalOunces < 15.95) return `${sign}${trimZeros(totalOunces.toFixed(1))} oz`;
  let pounds = Math.floor(totalOunces / 16);
  let ounces = Math.round(totalOunces - pounds * 16);
  if (ounces === 16) {
    pounds += 1;
    ounces = 0;
  }
  return `${sign}${pounds} lb ${ounces} oz`;
}
