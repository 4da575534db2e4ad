import { describe, expect, it } from "vitest";
import { ownBlocksForChart } from "./own-blocks";

describe("the viewer's own blocks for the boxplot dots", () => {
  it("keeps every block of a strain at or under the limit, lowest first, to the tenth of a point", () => {
    const blocks = [
      { strainId: "A", efficiency: 71.26 },
      { strainId: "B", efficiency: 40 },
      { strainId: "A", efficiency: 58.04 },
    ];
    expect(ownBlocksForChart(blocks, 2)).toEqual([
      { strainId: "A", blocks: 2, efficiencies: [58, 71.3] },
      { strainId: "B", blocks: 1, efficiencies: [40] },
    ]);
  });

  it("over the limit, keeps that many evenly spaced by rank, from the lowest block to the highest", () => {
    // Ranks 0…999 of the values 1…1000, shuffled; 100 kept are ranks round(k · 999 / 99).
    const values = Array.from({ length: 1000 }, (_, index) => ((index * 617) % 1000) + 1);
    const [strain] = ownBlocksForChart(
      values.map((efficiency) => ({ strainId: "A", efficiency })),
      100,
    );
    expect(strain.blocks).toBe(1000);
    expect(strain.efficiencies).toHaveLength(100);
    expect(strain.efficiencies[0]).toBe(1);
    expect(strain.efficiencies[99]).toBe(1000);
    expect(strain.efficiencies[50]).toBe(Math.round((50 * 999) / 99) + 1);
    const gaps = strain.efficiencies.slice(1).map((value, index) => value - strain.efficiencies[index]);
    expect(Math.min(...gaps)).toBeGreaterThanOrEqual(10);
    expect(Math.max(...gaps)).toBeLessThanOrEqual(11);
  });
});
