import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { normalQuantile } from "./distributions";
import { wilsonInterval } from "./wilson";

describe("wilsonInterval", () => {
  it("uses the exact normal quantile", () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 15); // Newcombe 1998 / R qnorm(0.975)
  });

  it("matches Newcombe (1998), Stat Med 17:857–872, Table II", () => {
    const cases: [number, number, number, number][] = [
      [81, 263, 0.2552885199, 0.366209577],
      [15, 148, 0.0623863995, 0.1604872417],
      [0, 20, 0, 0.1611251581],
      [1, 29, 0.0061132143, 0.1717552188],
    ];
    for (const [x, n, lower, upper] of cases) {
      const ci = wilsonInterval(x, n);
      expect(ci.p).toBe(x / n);
      expect(ci.lower).toBeCloseTo(lower, 10);
      expect(ci.upper).toBeCloseTo(upper, 10);
    }
  });

  const counts = fc
    .tuple(fc.integer({ min: 1, max: 2000 }), fc.double({ min: 0, max: 1, noNaN: true }))
    .map(([n, share]) => ({ n, x: Math.round(share * n) }));

  it("contains its estimate and stays in [0, 1]", () => {
    fc.assert(
      fc.property(counts, fc.double({ min: 0.5, max: 0.999, noNaN: true }), ({ n, x }, level) => {
        const ci = wilsonInterval(x, n, level);
        expect(ci.lower).toBeGreaterThanOrEqual(0);
        expect(ci.upper).toBeLessThanOrEqual(1);
        expect(ci.lower).toBeLessThanOrEqual(ci.p + 1e-15);
        expect(ci.upper).toBeGreaterThanOrEqual(ci.p - 1e-15);
      }),
    );
  });

  it("widens as the level rises", () => {
    fc.assert(
      fc.property(counts, fc.double({ min: 0.5, max: 0.98, noNaN: true }), ({ n, x }, level) => {
        const narrow = wilsonInterval(x, n, level);
        const wide = wilsonInterval(x, n, level + 0.01);
        expect(wide.upper - wide.lower).toBeGreaterThan(narrow.upper - narrow.lower);
      }),
    );
  });

  it("shrinks as n grows at the same proportion", () => {
    fc.assert(
      fc.property(counts, fc.integer({ min: 2, max: 10 }), ({ n, x }, k) => {
        const small = wilsonInterval(x, n);
        const large = wilsonInterval(k * x, k * n);
        expect(large.upper - large.lower).toBeLessThan(small.upper - small.lower);
      }),
    );
  });
});
