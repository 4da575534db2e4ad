import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { holm } from "./holm";

describe("holm", () => {
  it("matches R p.adjust(c(0.01, 0.04, 0.03, 0.005), 'holm')", () => {
    const adjusted = holm([0.01, 0.04, 0.03, 0.005]);
    [0.03, 0.06, 0.06, 0.02].forEach((expected, i) => expect(adjusted[i]).toBeCloseTo(expected, 15));
  });

  it("caps at 1", () => {
    // By hand: 3 × 0.5 = 1.5 → 1.
    expect(holm([0.5, 0.9, 0.7])).toEqual([1, 1, 1]);
  });

  const pValues = fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 30 });

  it("never goes below the raw p-value nor above 1", () => {
    fc.assert(
      fc.property(pValues, (p) => {
        holm(p).forEach((adjusted, i) => {
          expect(adjusted).toBeGreaterThanOrEqual(p[i]);
          expect(adjusted).toBeLessThanOrEqual(1);
        });
      }),
    );
  });

  it("keeps the order of the raw p-values", () => {
    fc.assert(
      fc.property(pValues, (p) => {
        const adjusted = holm(p);
        for (let i = 0; i < p.length; i++) {
          for (let j = 0; j < p.length; j++) {
            if (p[i] < p[j]) expect(adjusted[i]).toBeLessThanOrEqual(adjusted[j]);
          }
        }
      }),
    );
  });
});
