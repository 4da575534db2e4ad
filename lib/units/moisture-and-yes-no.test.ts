import { describe, expect, it } from "vitest";
import { drySubstrateGrams, parseMoisture, parseYesNo } from "./index";

function fraction(text: string, decimal?: "." | ","): number {
  const result = parseMoisture(text, { decimal });
  if ("error" in result) throw new Error(result.error);
  return result.fraction;
}

describe("parseMoisture", () => {
  it("reads 62 %, 62%, 0.62 and 62 as 0.62 (wet basis)", () => {
    for (const text of ["62 %", "62%", "0.62", "62"]) expect(fraction(text)).toBeCloseTo(0.62, 12);
    expect(fraction("62,5 %", ",")).toBeCloseTo(0.625, 12);
    expect(fraction("0 %")).toBe(0);
    expect(fraction("100 %")).toBe(1);
  });

  it("rejects moisture outside 0–100 % and unreadable text", () => {
    for (const text of ["105 %", "101", "-3 %", "wet", ""]) expect(parseMoisture(text)).toHaveProperty("error");
  });
});

describe("drySubstrateGrams", () => {
  // docs/references.md, computed: 2.5 kg block at 62 % -> 0.95 kg dry; 5 lb at 60 % -> exactly 2 lb dry.
  it("is wet mass x (1 - moisture)", () => {
    expect(drySubstrateGrams(2500, 0.62)).toBeCloseTo(950, 9);
    expect(drySubstrateGrams(5 * 453.59237, 0.6)).toBeCloseTo(2 * 453.59237, 9);
  });

  // IRRI Rice Knowledge Bank worked example: 1000 kg at 25 % dried to 14 % weighs 1000 x 75/86 = 872.093 kg.
  it("keeps the dry matter when moisture changes", () => {
    const dryMatter = drySubstrateGrams(1_000_000, 0.25);
    expect(dryMatter / (1 - 0.14) / 1000).toBeCloseTo(872.093, 3);
  });
});

describe("parseYesNo", () => {
  it("reads yes/no, y/n, true/false, 1/0 and x; blank is not stated", () => {
    for (const text of ["yes", "Y", "TRUE", "1", "x", " X "]) expect(parseYesNo(text)).toEqual({ value: true });
    for (const text of ["no", "N", "false", "0"]) expect(parseYesNo(text)).toEqual({ value: false });
    expect(parseYesNo("  ")).toEqual({ value: null });
  });

  it("reads the words of other languages and the booleans spreadsheets export in them", () => {
    // LibreOffice Calc 7.4 CSV export of TRUE()/FALSE() under de-DE, fr-FR and en-US (tests/fixtures/spreadsheets/README.md).
    for (const text of [
      "ja",
      "Ja",
      "WAHR",
      "oui",
      "VRAI",
      "sí",
      "si",
      "VERDADERO",
      "sì",
      "VERO",
      "sim",
      "waar",
      "sant",
      "tak",
      "kyllä",
      "=TRUE()",
    ])
      expect(parseYesNo(text), text).toEqual({ value: true });
    for (const text of ["nein", "FALSCH", "non", "FAUX", "FALSO", "não", "nee", "ONWAAR", "nej", "nie", "ei", "FALSE"])
      expect(parseYesNo(text), text).toEqual({ value: false });
  });

  it("says what to write for anything else, with a code", () => {
    const result = parseYesNo("maybe");
    expect("code" in result && result.code).toBe("not_yes_or_no");
    expect(result).toHaveProperty("error");
    expect("error" in result && result.error).toContain("Write yes or no");
  });
});
