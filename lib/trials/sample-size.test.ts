import { describe, expect, it } from "vitest";
import { trialSampleSize } from "./sample-size";

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
    const panel = trialSampleSize({ difference: 1, sd: 1, plannedFarms: 4, expectedLoss: 0.1, arms: 3 });
    if (!panel.ok) throw new Error("expected a result");
    // 16.71 / 0.9 = 18.57 blocks per arm → 4.64 per farm → 5 per farm → 20 per arm, 60 in all.
    expect(panel.rows[0]).toMatchObject({ perFarmPerArm: 5, perArmToMake: 20, totalBlocks: 60 });
    // 22.02 / 0.9 = 24.47 → 6.12 per farm → 7 per farm → 28 per arm.
    expect(panel.rows[1]).toMatchObject({ perFarmPerArm: 7, perArmToMake: 28, totalBlocks: 84 });
  });

  it("names the field to fix instead of giving a number for impossible input", () => {
    const panel = trialSampleSize({ difference: 0, sd: -2, plannedFarms: 0, expectedLoss: 1, arms: 2 });
    expect(panel.ok).toBe(false);
    if (panel.ok) return;
    expect(Object.keys(panel.problems).sort()).toEqual(["expectedLoss", "expectedSd", "plannedFarms", "smallestDifference"]);
  });
});
