import { describe, expect, it } from "vitest";
import { seededRandom } from "@/lib/random";
import { buildPooledResults } from "./results";
import { roundPooledResults, roundTo } from "./rounding";
import type { FlushStatisticsRow, StrainStatisticsRow } from "./types";

// Invented co-op: four farms, two strains, one recipe and fruiting method.
function rows(): { rows: StrainStatisticsRow[]; flushRows: FlushStatisticsRow[] } {
  const random = seededRandom("rounding");
  const strainRows: StrainStatisticsRow[] = [];
  const flushRows: FlushStatisticsRow[] = [];
  for (const farm of ["f1", "f2", "f3", "f4"]) {
    for (const [strain, level] of [
      ["a", 81.37],
      ["b", 88.91],
    ] as const) {
      const values = Array.from({ length: 12 }, () => random.normal(level + farm.length, 7.3));
      const bins: Record<string, number> = {};
      for (const value of values) bins[Math.floor(value)] = (bins[Math.floor(value)] ?? 0) + 1;
      strainRows.push({
        farmId: farm,
        strainId: strain,
        substrateRecipeId: "r",
        fruitingMethodId: "m",
        blocks: 13,
        blocksContaminated: 1,
        efficiencyBlocks: 12,
        efficiencySum: values.reduce((s, v) => s + v, 0),
        efficiencySquares: values.reduce((s, v) => s + v * v, 0),
        efficiencyBins: bins,
        firstHarvestBlocks: 12,
        firstHarvestDaysSum: 12 * 33.4167,
      });
      for (const flush of [1, 2]) {
        flushRows.push({
          farmId: farm,
          strainId: strain,
          substrateRecipeId: "r",
          fruitingMethodId: "m",
          flush,
          finishedBlocks: 6,
          blocksFruiting: 6,
          shareSum: 6 * (flush === 1 ? 0.6137 : 0.3863),
          shareSquares: 6 * (flush === 1 ? 0.3781 : 0.1511),
          cumulativeSum: 6 * (flush === 1 ? 0.6137 : 1),
          cumulativeSquares: 6 * (flush === 1 ? 0.3781 : 1),
        });
      }
    }
  }
  return { rows: strainRows, flushRows };
}

/** Decimal places of a number as JavaScript prints it. */
const decimals = (value: number) => (String(value).split(".")[1] ?? "").length;

describe("publishing pooled figures rounded to what the page shows", () => {
  it("rounds to a step without binary noise", () => {
    expect(roundTo(80.25, 0.1)).toBe(80.3);
    expect(roundTo(80.349999, 0.1)).toBe(80.3);
    expect(roundTo(0.6137, 0.01)).toBe(0.61);
    expect(roundTo(33.4167, 1)).toBe(33);
    expect(roundTo(0.0004, 0.001)).toBe(0);
  });

  it("leaves no figure finer than its step, and words the sentences from the rounded figures", () => {
    const exact = buildPooledResults({
      ...rows(),
      strains: [
        { id: "a", name: "Grey Morning" },
        { id: "b", name: "Valley Wild" },
      ],
      filters: {},
      minimumFarms: 3,
      showPerFarmEstimates: true,
      viewerFarmId: "f1",
      random: seededRandom("order"),
    });
    const published = roundPooledResults(exact);
    for (const strain of published.strains) {
      if (strain.efficiency.status !== "published" || strain.contamination.status !== "published") throw new Error("expected figures");
      for (const value of [strain.efficiency.value.estimate, strain.efficiency.value.lower, strain.efficiency.value.upper])
        expect(decimals(value)).toBeLessThanOrEqual(1);
      for (const value of [strain.contamination.value.estimate, strain.contamination.value.lower])
        expect(Number.isInteger(value)).toBe(true);
      if (strain.firstHarvestDays.status !== "published") throw new Error("expected days");
      expect(strain.firstHarvestDays.value.mean).toBe(33);
      if (strain.flushProfile.status !== "published") throw new Error("expected a flush profile");
      for (const share of strain.flushProfile.value) expect(decimals(share.meanShare)).toBeLessThanOrEqual(2);
      expect(strain.sentence).toContain(`averaged ${strain.efficiency.value.estimate.toFixed(1)} %`);
    }
    if (published.pairwise.status !== "published" || published.heterogeneity.status !== "published")
      throw new Error("expected comparisons");
    for (const pair of published.pairwise.value) {
      expect(decimals(pair.estimate)).toBeLessThanOrEqual(1);
      expect(decimals(pair.pAdjusted)).toBeLessThanOrEqual(3);
      expect(pair.sentence).toContain(`(95 % interval ${Math.round(pair.lower)} to ${Math.round(pair.upper)})`);
      expect(pair.sentence).toMatch(/from 4 farms and 96 blocks/);
    }
    for (const strain of published.heterogeneity.value.strains) {
      expect(Number.isInteger(strain.i2)).toBe(true);
      for (const row of strain.forest) expect(decimals(row.estimate)).toBeLessThanOrEqual(1);
    }
    // The exact figures differ from the published ones beyond the step: the rounding is not a no-op.
    const exactStrain = exact.strains[0];
    if (exactStrain.efficiency.status !== "published") throw new Error("expected BE");
    expect(decimals(exactStrain.efficiency.value.estimate)).toBeGreaterThan(1);
  });
});
