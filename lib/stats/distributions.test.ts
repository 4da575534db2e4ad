import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  chiSquareUpperTail,
  fUpperTail,
  logGamma,
  regularizedBeta,
  studentTLowerTail,
  studentTQuantile,
  studentTTwoSidedP,
  studentizedRangeLowerTail,
  studentizedRangeQuantile,
  studentizedRangeUpperTail,
} from "./distributions";

describe("distribution functions", () => {
  it("log-gamma hits factorials and √π", () => {
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    expect(logGamma(11)).toBeCloseTo(Math.log(3628800), 13);
    expect(logGamma(1)).toBeCloseTo(0, 14);
  });

  it("chi-square with 2 df has the exact tail e^(−x/2)", () => {
    for (const x of [0.1, 1, 8, 40, 120]) {
      expect(chiSquareUpperTail(x, 2) / Math.exp(-x / 2)).toBeCloseTo(1, 12);
    }
  });

  it("F(1, d) tail equals the two-sided t tail with d df", () => {
    for (const [t, d] of [
      [2.1, 7],
      [0.4, 30],
      [9, 3],
    ]) {
      expect(fUpperTail(t * t, 1, d)).toBeCloseTo(2 * (1 - studentTLowerTail(t, d)), 13);
    }
  });

  it("the incomplete beta is symmetric: I_x(a, b) = 1 − I_{1−x}(b, a)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: 0.999, noNaN: true }),
        fc.double({ min: 0.1, max: 200, noNaN: true }),
        fc.double({ min: 0.1, max: 200, noNaN: true }),
        (x, a, b) => {
          expect(regularizedBeta(x, a, b)).toBeCloseTo(1 - regularizedBeta(1 - x, b, a), 11);
        },
      ),
    );
  });

  it("the t distribution stays exact near its centre (a quantile test once failed at p 0.4986, 672 df)", () => {
    expect(studentTLowerTail(studentTQuantile(0.4986013551713794, 671.878468957373), 671.878468957373)).toBeCloseTo(0.4986013551713794, 14);
    // Symmetry about 0 to full precision: P(T ≤ −t) = 1 − P(T ≤ t).
    expect(studentTLowerTail(-0.0035, 672) + studentTLowerTail(0.0035, 672)).toBeCloseTo(1, 15);
  });

  it("the t quantile inverts the t distribution", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 0.999, noNaN: true }), fc.double({ min: 1, max: 5000, noNaN: true }), (p, df) => {
        expect(studentTLowerTail(studentTQuantile(p, df), df)).toBeCloseTo(p, 11);
      }),
    );
  });

  it("the studentized range of two means is √2·|t| (exact), for any degrees of freedom", () => {
    for (const df of [1, 2, 5, 23, 400]) {
      expect(studentizedRangeQuantile(0.95, 2, df)).toBeCloseTo(Math.SQRT2 * studentTQuantile(0.975, df), 12);
      expect(studentizedRangeUpperTail(Math.SQRT2 * 1.7, 2, df)).toBeCloseTo(studentTTwoSidedP(1.7, df), 14);
    }
  });

  it("the studentized range quantile inverts its distribution function (R's qtukey stops ~1e-7 short)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.5, max: 0.995, noNaN: true }),
        fc.integer({ min: 3, max: 12 }),
        fc.integer({ min: 3, max: 2000 }),
        (p, groups, df) => {
          expect(studentizedRangeLowerTail(studentizedRangeQuantile(p, groups, df), groups, df)).toBeCloseTo(p, 11);
        },
      ),
      { numRuns: 40 },
    );
    // SciPy 1.10.1 studentized_range.ppf(0.95, 3, 23) / √2 = 2.5043364009103732 (R's qtukey gives 2.50433657…).
    expect(studentizedRangeQuantile(0.95, 3, 23) / Math.SQRT2).toBeCloseTo(2.5043364009103732, 10);
  });
});
