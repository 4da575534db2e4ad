import jStat from "jstat";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { noncentralTLowerTail } from "./distributions";
import { powerPairwiseBlocked, powerTwoMeans, sampleSizePairwiseBlocked, sampleSizeTwoMeans } from "./sample-size";

describe("sampleSizeTwoMeans", () => {
  it("matches R power.t.test(delta = 1, sd = 1, power = 0.8)", () => {
    const r = sampleSizeTwoMeans({ delta: 1, sd: 1 });
    expect(Math.abs(r.nPerGroup - 16.7147681423283)).toBeLessThan(1e-4); // as R prints it
    expect(Math.abs(r.nPerGroup - 16.7147598311578)).toBeLessThan(1e-8); // exact root (docs/references.md, computed)
    expect(r.nPerGroupCeil).toBe(17);
  });

  it("matches R power.t.test(delta = 1, sd = 1, power = 0.9)", () => {
    const r = sampleSizeTwoMeans({ delta: 1, sd: 1, power: 0.9 });
    expect(Math.abs(r.nPerGroup - 22.0210977038512)).toBeLessThan(1e-4); // R
    expect(r.nPerGroupCeil).toBe(23);
    expect(powerTwoMeans(r.nPerGroup, 1, 1, 0.05)).toBeCloseTo(0.9, 10);
  });

  it("depends only on delta / sd and needs more blocks for smaller differences", () => {
    const a = sampleSizeTwoMeans({ delta: 10, sd: 10 });
    expect(a.nPerGroup).toBeCloseTo(16.7147598311578, 7);
    const b = sampleSizeTwoMeans({ delta: 5, sd: 10 });
    expect(b.nPerGroup).toBeGreaterThan(4 * a.nPerGroup - 4);
  });

  it("returns the two-block floor when the difference is huge", () => {
    expect(sampleSizeTwoMeans({ delta: 100, sd: 1 })).toEqual({ nPerGroup: 2, nPerGroupCeil: 2 });
  });
});

describe("sampleSizePairwiseBlocked: Tukey over all pairs of arms, farms as blocks", () => {
  // R 4.2.2 (docs/references.md): uniroot on pt(crit, df, ncp, lower.tail = FALSE) with
  // df = k·n − k − F + 1, crit = qtukey(0.95, k, df)/√2 (qt(0.975, df) for k = 2), ncp = δ/(σ√(2/n)).
  // R's qtukey is good to ~1e-7 relative, so n agrees to ~1e-6.
  const cases: [number, number, number, number, number, number][] = [
    [1, 1, 2, 4, 0.8, 16.82027074584622],
    [1, 1, 3, 1, 0.8, 21.17839237621716],
    [10, 14, 3, 5, 0.8, 40.67242551946181],
    [10, 14, 3, 5, 0.9, 52.41542090737308],
    [5, 10, 4, 6, 0.8, 93.81964077918536],
    [8, 12, 6, 8, 0.9, 77.41791005040911],
  ];
  it.each(cases)("δ %d, σ %d, %d arms on %d farms, power %s → R's n", (delta, sd, arms, farms, power, expected) => {
    const r = sampleSizePairwiseBlocked({ delta, sd, arms, farms, power });
    expect(Math.abs(r.nPerGroup - expected)).toBeLessThan(2e-6);
    expect(powerPairwiseBlocked(r.nPerGroup, { delta, sd, arms, farms, alpha: 0.05 })).toBeCloseTo(power, 9);
  });

  it("is power.t.test for two arms on one farm", () => {
    expect(Math.abs(sampleSizePairwiseBlocked({ delta: 1, sd: 1 }).nPerGroup - 16.7147598311578)).toBeLessThan(1e-8);
  });

  it("needs more blocks for more arms and for more farms, never fewer than leave an error estimate", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.3, max: 2, noNaN: true }),
        fc.integer({ min: 2, max: 5 }),
        fc.integer({ min: 1, max: 8 }),
        (effect, arms, farms) => {
          const n = (a: number, f: number) => sampleSizePairwiseBlocked({ delta: effect, sd: 1, arms: a, farms: f }).nPerGroup;
          const base = n(arms, farms);
          expect(n(arms + 1, farms)).toBeGreaterThan(base);
          expect(n(arms, farms + 1)).toBeGreaterThanOrEqual(base);
          expect(arms * base - arms - farms + 1).toBeGreaterThanOrEqual(arms > 2 ? 3 - 1e-9 : 1 - 1e-9);
        },
      ),
      { numRuns: 8 },
    );
    // Each run solves three designs with numerically integrated Tukey quantiles: up to 20 s on a busy 2-core machine.
  }, 120_000);

  it("comes close to the large-sample (normal) formula when many blocks are needed", () => {
    // Two arms: n ≈ 2(z₀.₉₇₅ + z₀.₈)²(σ/δ)² = 15.6978… per (σ/δ)² = 1; at σ/δ = 10 the t answer is within 0.1 %.
    const n = sampleSizePairwiseBlocked({ delta: 1, sd: 10, farms: 3 }).nPerGroup;
    const normal = 2 * (1.959963984540054 + 0.8416212335729143) ** 2 * 100;
    expect(n / normal).toBeGreaterThan(1);
    expect(n / normal).toBeLessThan(1.001);
  });
});

describe("noncentral t", () => {
  it("reduces to the central t when the noncentrality is 0", () => {
    // Central t with 1 df is Cauchy: P(T ≤ t) = 1/2 + atan(t)/π.
    expect(noncentralTLowerTail(2, 1, 0)).toBeCloseTo(0.5 + Math.atan(2) / Math.PI, 14);
  });

  it("agrees with jstat's series to jstat's accuracy (~1e-9)", () => {
    for (const [t, df, ncp] of [
      [2, 10, 1],
      [1, 30, 5],
      [-2, 4, -1],
      [2.04, 31.4, 2.89],
    ]) {
      expect(Math.abs(noncentralTLowerTail(t, df, ncp) - jStat.noncentralt.cdf(t, df, ncp))).toBeLessThan(1e-8);
    }
  });

  it("matches the normal limit for very many degrees of freedom", () => {
    // As df → ∞, T' → N(ncp, 1).
    expect(noncentralTLowerTail(3, 1e7, 2)).toBeCloseTo(jStat.normal.cdf(1, 0, 1), 5);
  });
});
