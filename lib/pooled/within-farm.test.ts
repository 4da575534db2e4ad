import { describe, expect, it } from "vitest";
import { describe as describeValues } from "@/lib/stats";
import { withinFarmSpread } from "./within-farm";

describe("the spread of block BE within farms", () => {
  it("pools each farm's squares about its own mean, as a one-way ANOVA's residual does", () => {
    // Invented blocks; the check value is the residual SD of farm as a factor, computed here from the blocks themselves.
    const farms = { f1: [71.2, 80.4, 77.9], f2: [95.1, 88.6, 90.2, 93.3], f3: [60.5, 64.1] };
    const rows = Object.entries(farms).map(([farmId, values]) => ({
      farmId,
      efficiencyBlocks: values.length,
      efficiencySum: values.reduce((s, v) => s + v, 0),
      efficiencySquares: values.reduce((s, v) => s + v * v, 0),
    }));
    const residual = Object.values(farms).reduce((sum, values) => sum + describeValues(values).sd ** 2 * (values.length - 1), 0);
    const spread = withinFarmSpread(rows)!;
    expect(spread.blocks).toBe(9);
    expect(spread.farms).toBe(3);
    expect(spread.sd).toBeCloseTo(Math.sqrt(residual / (9 - 3)), 10);
  });

  it("gives nothing without more blocks than farms", () => {
    expect(withinFarmSpread([{ farmId: "f1", efficiencyBlocks: 1, efficiencySum: 80, efficiencySquares: 6400 }])).toBeNull();
  });
});
