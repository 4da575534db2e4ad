import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { studentTQuantile } from "./distributions";
import { meanCI, meanCIFromSummary, welchTest } from "./intervals";

describe("meanCIFromSummary", () => {
  it("matches the NIST/SEMATECH e-Handbook 1.3.5.2 heat-flow meter interval", () => {
    // e-Handbook 1.3.5.2: n = 195, mean 9.261460, sd 0.02278881
    // t(0.975, 194) = 1.97226753258213; CI [9.25824137657844, 9.26467862342156] (computed, R 4.2.2)
    expect(studentTQuantile(0.975, 194)).toBeCloseTo(1.97226753258213, 13);
    const ci = meanCIFromSummary({ n: 195, mean: 9.26146, sd: 0.02278881 });
    expect(ci.df).toBe(194);
    expect(ci.lower).toBeCloseTo(9.25824137657844, 13);
    expect(ci.upper).toBeCloseTo(9.26467862342156, 13);
  });

  it("uses the closed-form t quantile for 2 degrees of freedom", () => {
    // For df = 2, t_p = (2p − 1) / √(2p(1 − p)) exactly.
    const p = 0.975;
    expect(studentTQuantile(p, 2)).toBeCloseTo((2 * p - 1) / Math.sqrt(2 * p * (1 - p)), 13);
  });
});

describe("welchTest", () => {
  // Student (1908) sleep data as in R's `sleep`.
  const group1 = [0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0, 2.0];
  const group2 = [1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4];

  it("matches R t.test(extra ~ group, data = sleep)", () => {
    const r = welchTest(group1, group2);
    expect(r.diff).toBeCloseTo(-1.58, 14);
    expect(r.t).toBeCloseTo(-1.86081346748685, 13); // R t.test
    expect(r.df).toBeCloseTo(17.7764735161785, 12); // R t.test
    expect(r.p).toBeCloseTo(0.0793941401873582, 14); // R t.test
    expect(r.lower).toBeCloseTo(-3.36548323071171, 13); // R t.test
    expect(r.upper).toBeCloseTo(0.20548323071171, 13); // R t.test
  });

  it("changes sign, not size, when the groups swap", () => {
    const r = welchTest(group2, group1);
    expect(r.t).toBeCloseTo(1.86081346748685, 13);
    expect(r.lower).toBeCloseTo(-0.20548323071171, 13);
  });
});

const sample = fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: 2, maxLength: 40 });
const spreadSample = sample.filter((xs) => xs.some((x) => Math.abs(x - xs[0]) > 1e-6));

describe("interval properties", () => {
  it("contain their estimate", () => {
    fc.assert(
      fc.property(sample, fc.double({ min: 0.5, max: 0.999, noNaN: true }), (xs, level) => {
        const ci = meanCI(xs, level);
        expect(ci.lower).toBeLessThanOrEqual(ci.mean);
        expect(ci.upper).toBeGreaterThanOrEqual(ci.mean);
      }),
    );
    fc.assert(
      fc.property(spreadSample, spreadSample, (a, b) => {
        const r = welchTest(a, b);
        expect(r.lower).toBeLessThan(r.diff);
        expect(r.upper).toBeGreaterThan(r.diff);
      }),
    );
  });

  it("widen as the level rises", () => {
    fc.assert(
      fc.property(
        spreadSample,
        fc.double({ min: 0.5, max: 0.98, noNaN: true }),
        fc.double({ min: 0.001, max: 0.019, noNaN: true }),
        (xs, level, step) => {
          const narrow = meanCI(xs, level);
          const wide = meanCI(xs, level + step);
          expect(wide.upper - wide.lower).toBeGreaterThan(narrow.upper - narrow.lower);
        },
      ),
    );
  });

  it("shrink as n grows", () => {
    fc.assert(
      fc.property(spreadSample, (xs) => {
        const once = meanCI(xs);
        const twice = meanCI([...xs, ...xs]);
        expect(twice.upper - twice.lower).toBeLessThan(once.upper - once.lower);
      }),
    );
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 500 }),
        fc.integer({ min: 1, max: 500 }),
        fc.double({ min: 0.001, max: 100, noNaN: true }),
        (n, extra, sd) => {
          const small = meanCIFromSummary({ n, mean: 50, sd });
          const large = meanCIFromSummary({ n: n + extra, mean: 50, sd });
          expect(large.upper - large.lower).toBeLessThan(small.upper - small.lower);
        },
      ),
    );
  });
});
