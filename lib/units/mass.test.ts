import { describe, expect, it } from "vitest";
import { GRAMS_PER_OUNCE, GRAMS_PER_POUND, formatMass, parseMass, readMass } from "./index";

function grams(text: string, options?: Parameters<typeof parseMass>[1]): number {
  const result = parseMass(text, options);
  if ("error" in result) throw new Error(result.error);
  return result.grams;
}

function error(text: string, options?: Parameters<typeof parseMass>[1]): string {
  const result = parseMass(text, options);
  if (!("error" in result)) throw new Error(`expected an error for "${text}", got ${result.grams} g`);
  return result.error;
}

describe("mass constants", () => {
  it("1 lb = 0.453 592 37 kg exactly and 1 oz = 1/16 lb = 28.349 523 125 g (NIST Handbook 44, Appendix C)", () => {
    expect(GRAMS_PER_POUND).toBe(453.59237);
    expect(GRAMS_PER_OUNCE).toBe(28.349523125);
  });
});

describe("parseMass", () => {
  it("reads g, kg, lb, lbs and oz", () => {
    expect(grams("850 g")).toBe(850);
    expect(grams("2.5 kg")).toBe(2500);
    expect(grams("2.5kg")).toBe(2500);
    expect(grams("1 lb")).toBe(453.59237);
    expect(grams("2 lbs")).toBe(907.18474);
    expect(grams("16 oz")).toBeCloseTo(453.59237, 9);
    expect(grams("3 Kilograms")).toBe(3000);
  });

  // Check values computed from NIST Handbook 44 Appendix C (docs/references.md, "computed from the above").
  it("5 lb = 2 267.961 85 g, 6 lb = 2 721.554 22 g, 1 lb 4 oz = 566.990 462 5 g", () => {
    expect(grams("5 lb")).toBeCloseTo(2267.96185, 9);
    expect(grams("6 lb")).toBeCloseTo(2721.55422, 9);
    expect(grams("1 lb 4 oz")).toBeCloseTo(566.9904625, 9);
  });

  it("reads compound pounds and ounces with or without spaces", () => {
    expect(grams("4 lb 3 oz")).toBeCloseTo(4 * 453.59237 + 3 * 28.349523125, 9);
    expect(grams("4lb3oz")).toBeCloseTo(grams("4 lb 3 oz"), 12);
    expect(grams("5 pounds 8 ounces")).toBeCloseTo(5.5 * 453.59237, 9);
    expect(readMass("4 lb 3 oz")).toMatchObject({ unit: "lb+oz" });
  });

  it("reads decimal commas and thousands separators", () => {
    expect(grams("1 234,5 g", { decimal: "," })).toBe(1234.5);
    expect(grams("1,234.5 g")).toBe(1234.5);
    expect(grams("1.234,5 g")).toBe(1234.5);
    expect(grams("2,5 kg", { decimal: "," })).toBe(2500);
    expect(grams("2,5 kg")).toBe(2500);
    expect(grams("1,234 g")).toBe(1234);
    expect(grams("1,234 g", { decimal: "," })).toBeCloseTo(1.234, 12);
    expect(grams("1\u00a0234,5 g", { decimal: "," })).toBe(1234.5);
  });

  it("uses the default unit only for bare numbers", () => {
    expect(grams("2.5", { defaultUnit: "kg" })).toBe(2500);
    expect(grams("12", { defaultUnit: "oz" })).toBeCloseTo(12 * 28.349523125, 9);
    expect(grams("500 g", { defaultUnit: "lb" })).toBe(500);
  });

  it("says how to fix a bare number with no unit anywhere", () => {
    const message = error("2500");
    expect(message).toContain("has no unit");
    expect(message).toContain("default unit");
  });

  it("never reads a troy ounce as an ounce (NIST Handbook 44, Appendix C: 31.103 476 8 g)", () => {
    for (const text of ["1 ozt", "1 troy oz", "1 oz t", "2 t oz", "1 Troy ounce"]) expect(error(text)).toContain("troy");
  });

  it("rejects negative, blank and unreadable masses and unknown units", () => {
    expect(error("-2 kg")).toContain("negative");
    expect(error("\u22122 kg")).toContain("negative");
    expect(error("-1 lb 2 oz")).toContain("negative");
    expect(error("")).toContain("blank");
    expect(error("two kilos")).toContain("not a weight");
    expect(error("2,5,0 kg")).toContain("not a number");
    expect(error("2.5 st")).toContain("not a unit we accept");
    expect(error("2.5 gr")).toContain("not a unit we accept");
  });

  it("keeps zero as a valid weight", () => {
    expect(grams("0 g")).toBe(0);
    expect(grams("-0 g")).toBe(0);
  });
});

describe("formatMass", () => {
  it("shows metric as g under a kilogram and kg with two decimals above", () => {
    expect(formatMass(850, "metric")).toBe("850 g");
    expect(formatMass(2267.96185, "metric")).toBe("2.27 kg");
    expect(formatMass(999.6, "metric")).toBe("1.00 kg");
  });

  it("shows imperial as lb and whole oz, ounces alone under a pound", () => {
    expect(formatMass(2267.96185, "imperial")).toBe("5 lb 0 oz");
    expect(formatMass(566.9904625, "imperial")).toBe("1 lb 4 oz");
    expect(formatMass(12.5 * 28.349523125, "imperial")).toBe("12.5 oz");
    expect(formatMass(453.59237 * 2 - 1, "imperial")).toBe("2 lb 0 oz");
    expect(formatMass(Number.NaN, "imperial")).toBe("");
  });
});
