import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { describe as describeValues } from "./describe";

function readValues(name: string): number[] {
  const file = path.resolve(__dirname, "../../tests/fixtures/stats", name);
  return readFileSync(file, "utf8")
    .split("\n")
    .filter((line) => line.trim() !== "" && !line.startsWith("#"))
    .flatMap((line) => line.trim().split(/\s+/).map(Number));
}

function significantDigits(actual: number, expected: number): number {
  return actual === expected ? 16 : -Math.log10(Math.abs(actual - expected) / Math.abs(expected));
}

describe("describe", () => {
  it("reproduces the NIST StRD certified values for Michelso", () => {
    const xs = readValues("Michelso.dat");
    expect(xs).toHaveLength(100);
    const d = describeValues(xs);
    // NIST StRD Michelso certified: mean 299.852400000000, sd 0.0790105478190518
    expect(significantDigits(d.mean, 299.8524)).toBeGreaterThan(13);
    expect(significantDigits(d.sd, 0.0790105478190518)).toBeGreaterThan(12);
    expect(d.se).toBeCloseTo(0.0790105478190518 / 10, 14);
  });

  it("reproduces the NIST StRD certified values for Mavro", () => {
    const xs = readValues("Mavro.dat");
    expect(xs).toHaveLength(50);
    const d = describeValues(xs);
    // NIST StRD Mavro certified: mean 2.00185600000000, sd 0.000429123454003053
    expect(significantDigits(d.mean, 2.001856)).toBeGreaterThan(14);
    expect(significantDigits(d.sd, 0.000429123454003053)).toBeGreaterThan(11);
    expect(d.min).toBe(2.0013);
    expect(d.max).toBe(2.0027);
  });

  it("gives R's default (type 7) quartiles", () => {
    // R: quantile(1:10) -> 1, 3.25, 5.5, 7.75, 10
    const d = describeValues([10, 9, 8, 7, 6, 5, 4, 3, 2, 1]);
    expect(d.q1).toBe(3.25);
    expect(d.median).toBe(5.5);
    expect(d.q3).toBe(7.75);
    expect([d.min, d.max]).toEqual([1, 10]);
    // R: quantile(c(1, 2, 4, 8)) -> 1, 1.75, 3, 5, 8 (by hand: h = 3p, linear between order statistics)
    const e = describeValues([8, 1, 4, 2]);
    expect([e.q1, e.median, e.q3]).toEqual([1.75, 3, 5]);
  });

  it("uses the sample (n − 1) standard deviation", () => {
    // By hand: values 2, 4, 4, 4, 5, 5, 7, 9 have SS 32, so the sample sd is √(32/7).
    expect(describeValues([2, 4, 4, 4, 5, 5, 7, 9]).sd).toBeCloseTo(Math.sqrt(32 / 7), 15);
  });
});
