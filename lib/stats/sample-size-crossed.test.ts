import jStat from "jstat";
import { describe, expect, it } from "vitest";
import { powerCrossedBlocked, powerPairwiseBlocked, sampleSizeCrossedBlocked } from "./sample-size";

// Crossed trials (e.g. fruiting method × strain, farms as blocks): n blocks per combination.
describe("sampleSizeCrossedBlocked", () => {
  it("for two methods averaged over two strains is the noncentral t of the full model (checked with jstat)", () => {
    // δ 6, σ 5, 2 × 2 combinations on 4 farms: df = 4n − 4 − 4 + 1, ncp = √(n·2/2)·6/5, critical qt(0.975, df).
    const { nPerGroup: n } = sampleSizeCrossedBlocked({ delta: 6, sd: 5, levels: 2, otherLevels: 2, farms: 4, comparison: "averaged" });
    const df = 4 * n - 4 - 4 + 1;
    const byJstat = 1 - jStat.noncentralt.cdf(jStat.studentt.inv(0.975, df), df, Math.sqrt(n) * (6 / 5));
    expect(Math.abs(byJstat - 0.8)).toBeLessThan(1e-7);
    // Within one strain the comparison has half the blocks behind it: ncp = √(n/2)·δ/σ.
    const within = sampleSizeCrossedBlocked({ delta: 6, sd: 5, levels: 2, otherLevels: 2, farms: 4, comparison: "within" }).nPerGroup;
    const dfWithin = 4 * within - 7;
    const withinByJstat = 1 - jStat.noncentralt.cdf(jStat.studentt.inv(0.975, dfWithin), dfWithin, Math.sqrt(within / 2) * (6 / 5));
    expect(Math.abs(withinByJstat - 0.8)).toBeLessThan(1e-7);
  });

  it("needs about 1/b of the blocks per combination for a comparison averaged over b levels (large-sample limit)", () => {
    const design = { delta: 1, sd: 10, levels: 3, farms: 5 } as const;
    const within = sampleSizeCrossedBlocked({ ...design, otherLevels: 3, comparison: "within" }).nPerGroup;
    const averaged = sampleSizeCrossedBlocked({ ...design, otherLevels: 3, comparison: "averaged" }).nPerGroup;
    expect(averaged * 3).toBeGreaterThan(within * 0.99);
    expect(averaged * 3).toBeLessThan(within * 1.01);
    expect(powerCrossedBlocked(averaged, { ...design, otherLevels: 3, comparison: "averaged", alpha: 0.05 })).toBeCloseTo(0.8, 9);
  });

  it("within one level of the other factor, is Tukey over the factor's levels with the whole model's error df", () => {
    // 3 methods within one strain of 2: Tukey over 3 (not over all 6 arms), with the error df of 6 arms, a little more than 3 arms have.
    const n = 20;
    const crossed = powerCrossedBlocked(n, { delta: 5, sd: 10, levels: 3, otherLevels: 2, farms: 4, comparison: "within", alpha: 0.05 });
    const three = powerPairwiseBlocked(n, { delta: 5, sd: 10, arms: 3, farms: 4, alpha: 0.05 });
    const six = powerPairwiseBlocked(n, { delta: 5, sd: 10, arms: 6, farms: 4, alpha: 0.05 });
    expect(crossed).toBeGreaterThan(six);
    expect(crossed).toBeGreaterThan(three);
    expect(crossed - three).toBeLessThan(0.01);
  });

  it("names what to fix for impossible designs", () => {
    expect(() => sampleSizeCrossedBlocked({ delta: 6, sd: 5, levels: 1, otherLevels: 2, farms: 4, comparison: "within" })).toThrow(
      /levels of the factor compared 1 must be a whole number, 2 or more/,
    );
  });
});
