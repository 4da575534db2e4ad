import { describe, expect, it } from "vitest";
import { decimalEvidence, parseDecimalNumber } from "./number";

describe("decimalEvidence", () => {
  it("says which mark a number settles, and when it reads two ways", () => {
    for (const text of ["2,5", "0,612", "1.234,5", "1 234,5", "1.234.567", "12,34", "1234,567"])
      expect(decimalEvidence(text), text).toBe(",");
    for (const text of ["2.5", "0.612", "1,234.5", "1,234,567", "1234.567", "2'720.5", "1 234.567"])
      expect(decimalEvidence(text), text).toBe(".");
    // A leading group of 1–3 digits not starting with 0, then exactly three digits: 2.72 or 2 720.
    for (const text of ["2.720", "1,205", "845.000", "12.345"]) expect(decimalEvidence(text), text).toBe("either");
    for (const text of ["2720", "845", "2 720", "2'720"]) expect(decimalEvidence(text), text).toBeNull();
  });
});

describe("parseDecimalNumber", () => {
  it("reads a number that reads two ways by the column's mark", () => {
    expect(parseDecimalNumber("2.720", ",")).toBe(2720);
    expect(parseDecimalNumber("2.720", ".")).toBe(2.72);
    expect(parseDecimalNumber("1,205", ".")).toBe(1205);
    expect(parseDecimalNumber("1,205", ",")).toBe(1.205);
  });

  it("never takes a group that starts with 0 as thousands grouping", () => {
    // "0.612" kg in a comma-decimal column is 0.612, not 612.
    expect(parseDecimalNumber("0.612", ",")).toBe(0.612);
    expect(parseDecimalNumber("0,612", ".")).toBe(0.612);
    expect(parseDecimalNumber("0.612.000", ",")).toBeNull();
  });

  it("reads the grouping marks locales write: 2'720 (de-CH), 2 720 and 2\u202f720 (fr-FR), 2.720 (de-DE)", () => {
    for (const text of ["2'720", "2\u2019720", "2 720", "2\u00a0720", "2\u202f720"]) expect(parseDecimalNumber(text, "."), text).toBe(2720);
    expect(parseDecimalNumber("2.720,5", ",")).toBe(2720.5);
  });
});
