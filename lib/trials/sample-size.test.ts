import { describe, expect, it } from "vitest";
import jStat from "jstat";
import { powerPairwiseBlocked, sampleSizeCrossedBlocked } from "@/lib/stats";
import { crossingOf, enrolmentWarnings, trialSampleSize } from "./sample-size";

describe("trial sample-size panel", () => {
  it("matches R power.t.test(delta = 1, sd = 1, power = 0.8 / 0.9) — docs/references.md", () => {
    const panel = trialSampleSize({ difference: 1, sd: 1, plannedFarms: 1, expectedLoss: 0, arms: 2 });
    if (!panel.ok) throw new Error("expected a result");
    // R: n = 16.7147681423283 (root finder stops at ~1e-4); power 0.9 → 22.0210977038512.
    expect(Math.abs(panel.rows[0].exactPerArm - 16.7147681423283)).toBeLessThan(1e-4);
    expect(Math.abs(panel.rows[1].exactPerArm - 22.0210977038512)).toBeLessThan(1e-4);
    expect(panel.rows[0].perArmToMake).toBe(17);
    expect(panel.rows[1].perArmToMake).toBe(23);
  });

  it("scales with the difference in BE points: delta 10, sd 10 is the same as 1 and 1", () => {
    const panel = trialSampleSize({ difference: 10, sd: 10, plannedFarms: 1, expectedLoss: 0, arms: 2 });
    if (!panel.ok) throw new Error("expected a result");
    expect(Math.abs(panel.rows[0].exactPerArm - 16.7147681423283)).toBeLessThan(1e-4);
  });

  it("allows for the expected loss and rounds up to a whole number per farm", () => {
    // Three arms on four farms: every pair is compared with Tukey's adjustment on BE ~ arm + farm, so the
    // size is no longer the two-sample t test's 16.71 (behaviour changed with issue 14; R check below).
    const panel = trialSampleSize({ difference: 1, sd: 1, plannedFarms: 4, expectedLoss: 0.1, arms: 3 });
    if (!panel.ok) throw new Error("expected a result");
    expect(panel.pairs).toBe(3);
    // R 4.2.2 (docs/references.md): 21.22397010189861 at 80 %, 27.20785870497318 at 90 %.
    expect(Math.abs(panel.rows[0].exactPerArm - 21.22397010189861)).toBeLessThan(1e-5);
    expect(Math.abs(panel.rows[1].exactPerArm - 27.20785870497318)).toBeLessThan(1e-5);
    // 21.22 / 0.9 = 23.58 blocks per arm → 5.90 per farm → 6 per farm → 24 per arm, 72 in all.
    expect(panel.rows[0]).toMatchObject({ perFarmPerArm: 6, perArmToMake: 24, totalBlocks: 72 });
    // 27.21 / 0.9 = 30.23 → 7.56 per farm → 8 per farm → 32 per arm.
    expect(panel.rows[1]).toMatchObject({ perFarmPerArm: 8, perArmToMake: 32, totalBlocks: 96 });
  });

  it("costs one error degree of freedom per farm: two arms on four farms need a little more than power.t.test", () => {
    const panel = trialSampleSize({ difference: 10, sd: 10, plannedFarms: 4, expectedLoss: 0.05, arms: 2 });
    if (!panel.ok) throw new Error("expected a result");
    expect(panel.pairs).toBe(1);
    // R 4.2.2: 16.82027074584617 (power.t.test on one farm: 16.7147598311578).
    expect(Math.abs(panel.rows[0].exactPerArm - 16.82027074584617)).toBeLessThan(1e-8);
    // 16.82 / 0.95 = 17.71 → 4.43 per farm → 5 → 20 per arm, as the design form's browser test expects.
    expect(panel.rows[0].perArmToMake).toBe(20);
  });

  it("names the field to fix instead of giving a number for impossible input", () => {
    const panel = trialSampleSize({ difference: 0, sd: -2, plannedFarms: 0, expectedLoss: 1, arms: 2 });
    expect(panel.ok).toBe(false);
    if (panel.ok) return;
    expect(Object.keys(panel.problems).sort()).toEqual(["expectedLoss", "expectedSd", "plannedFarms", "smallestDifference"]);
  });
});

describe("warnings before a trial starts", () => {
  // The design form's plan: 10 BE points, SD 10, 4 farms, 5 % loss, 2 arms → 20 blocks per arm (test above, R-checked).
  const plan = { difference: 10, sd: 10, plannedFarms: 4, expectedLoss: 0.05, arms: 2 };

  it("says nothing when the farms and blocks the plan needs have been committed", () => {
    expect(enrolmentWarnings(plan, { acceptedFarms: 4, blocksPerArm: 20, minimumFarms: 3 })).toEqual([]);
  });

  it("warns of too few farms, fewer than planned, and fewer blocks, with the power they give", () => {
    const warnings = enrolmentWarnings(plan, { acceptedFarms: 2, blocksPerArm: 10, minimumFarms: 3 });
    expect(warnings.map((warning) => warning.kind)).toEqual([
      "below_minimum_farms",
      "fewer_farms_than_planned",
      "fewer_blocks_than_planned",
    ]);
    expect(warnings[0].message).toMatch(/^2 farms have accepted; a trial starts only with at least 3/);
    expect(warnings[1].message).toBe("2 farms of the 4 planned have accepted.");
    // The power of what is committed: 10 × 0.95 = 9.5 blocks per arm on 2 farms, df = 2·9.5 − 2 − 2 + 1 = 16,
    // ncp = √(9.5/2)·10/10; checked against jstat's noncentral t (docs/references.md, "Enrolment short of the plan").
    const power = powerPairwiseBlocked(9.5, { delta: 10, sd: 10, arms: 2, farms: 2, alpha: 0.05 });
    const byJstat = 1 - jStat.noncentralt.cdf(jStat.studentt.inv(0.975, 16), 16, Math.sqrt(9.5 / 2));
    expect(Math.abs(power - byJstat)).toBeLessThan(1e-7);
    expect(warnings[2].message).toContain(`the plan needs 20 for 80 % power to find 10 BE points once 5 % are lost`);
    expect(warnings[2].message).toContain(`the power is about ${Math.round(power * 100)} %`);
  });

  it("gives only the co-op's minimum when the design has no sample-size figures", () => {
    expect(enrolmentWarnings(null, { acceptedFarms: 5, blocksPerArm: 1, minimumFarms: 3 })).toEqual([]);
    expect(enrolmentWarnings(null, { acceptedFarms: 1, blocksPerArm: 1, minimumFarms: 3 })[0].message).toMatch(/^1 farm has accepted/);
  });
});

describe("sample size of a trial crossing strains with fruiting methods", () => {
  it("sizes the comparison of methods within a strain, and says what the comparison averaged over strains needs", () => {
    const plan = { difference: 6, sd: 5, plannedFarms: 4, expectedLoss: 0, arms: 4, crossing: { methods: 2, strains: 2 } };
    const panel = trialSampleSize(plan);
    if (!panel.ok) throw new Error("expected a result");
    const within = sampleSizeCrossedBlocked({ delta: 6, sd: 5, levels: 2, otherLevels: 2, farms: 4, comparison: "within" }).nPerGroup;
    expect(panel.rows[0].exactPerArm).toBe(within);
    expect(panel.pairs).toBe(1);
    expect(panel.averagedPerArm).toBeLessThan(within);
    // All pairs of 4 arms with Tukey would ask for more than the crossed analysis needs.
    const allPairs = trialSampleSize({ ...plan, crossing: null });
    if (!allPairs.ok) throw new Error("expected a result");
    expect(allPairs.rows[0].exactPerArm).toBeGreaterThan(within);
    expect(allPairs.averagedPerArm).toBeUndefined();
  });

  it("reads the crossing off the arms of a crossed trial only", () => {
    const arms = [
      { strainId: "s1", treatmentId: "m1" },
      { strainId: "s1", treatmentId: "m2" },
      { strainId: "s2", treatmentId: "m1" },
      { strainId: "s2", treatmentId: "m2" },
    ];
    expect(crossingOf("strain_by_method", arms)).toEqual({ methods: 2, strains: 2 });
    expect(crossingOf("one_factor", arms)).toBeNull();
  });
});
