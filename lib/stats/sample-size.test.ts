import jStat from "jstat";
import { describe, expect, it } from "vitest";
import { noncentralTLowerTail } from "./distributions";
import { powerTwoMeans, sampleSizeTwoMeans } from "./sample-size";

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
