import { describe, expect, it } from "vitest";
import { resultsInBrief } from "./in-brief";
import type { PooledResults, StrainResult } from "./results";

// Wording checks on hand-made figures: the figures themselves are checked against lib/stats and
// published values in pooled.test.ts and tests/integration/pooled-results.test.ts.
const strain = (strainName: string, estimate: number | null): StrainResult =>
  ({
    strainId: strainName,
    strainName,
    efficiency:
      estimate === null
        ? { status: "suppressed", message: "fewer than 3 farms" }
        : {
            status: "published",
            value: { estimate, lower: estimate - 4, upper: estimate + 4, adjustedForFarm: true, farms: 5, blocks: 40 },
          },
  }) as StrainResult;

const results = (
  strains: StrainResult[],
  pairs: { a: string; b: string; estimate: number; lower: number; upper: number }[],
): PooledResults => ({
  minimumFarms: 3,
  filtered: false,
  strains,
  pairwise: {
    status: "published",
    value: pairs.map((pair) => ({
      strainA: pair.a,
      strainB: pair.b,
      estimate: pair.estimate,
      lower: pair.lower,
      upper: pair.upper,
      pAdjusted: 0.01,
      sentence: "",
    })),
  },
  heterogeneity: { status: "suppressed", message: "" },
});

describe("the results in brief", () => {
  it("names the best strain, its lead over the next from the Tukey comparison, and that the lead is no chance", () => {
    const brief = resultsInBrief(
      results(
        [strain("Beech Hollow", 53.3), strain("Snowdrift", 51.7), strain("Fernbrook Isolate 4", 41.2)],
        [
          { a: "Beech Hollow", b: "Snowdrift", estimate: -1.6, lower: -9.3, upper: 6.2 },
          { a: "Snowdrift", b: "Fernbrook Isolate 4", estimate: -10.4, lower: -17.5, upper: -3.4 },
        ],
      ),
    );
    expect(brief[0]).toBe(
      "Beech Hollow gave the most: 53.3 % biological efficiency on average (95 % interval 49.3 to 57.3), from 5 farms and 40 blocks, allowing for the farm each block grew on.",
    );
    // Snowdrift − Beech Hollow = −1.6 (−9.3 to 6.2), turned round: Beech Hollow leads by 2 (−6 to 9).
    expect(brief[1]).toBe("Snowdrift came next, 2 BE points lower (95 % interval -6 to 9).");
    expect(brief[2]).toMatch(/cannot yet tell Beech Hollow and Snowdrift apart/);
  });

  it("says the lead is unlikely to be chance when the whole interval is above zero", () => {
    const brief = resultsInBrief(results([strain("A", 60), strain("B", 50)], [{ a: "B", b: "A", estimate: 10, lower: 3, upper: 17 }]));
    expect(brief.slice(1)).toEqual([
      "That is 10 BE points more than B, the next best (95 % interval 3 to 17).",
      "The whole interval is above zero, so the lead is unlikely to be chance, though A may gain more or less than that in your own rooms.",
    ]);
  });

  it("says what is missing when only one strain, or none, can be published", () => {
    expect(resultsInBrief(results([strain("A", 60), strain("B", null)], []))[0]).toMatch(/^Only A has enough data to publish: 60\.0 %/);
    expect(resultsInBrief(results([strain("B", null)], []))).toEqual([expect.stringMatching(/at least 3 farms/)]);
  });
});
