import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { blockedAnova, meanCI } from "@/lib/stats";
import { seededRandom } from "@/lib/random";
import { binQuantile, binsOf, percentileOf, publishablePercentile, publishableSpread } from "./bins";
import { blockedModelFromCells } from "./cell-models";
import { filterIsSafe } from "./privacy";
import { buildPooledResults, type PooledResultsInput, type StrainResult } from "./results";
import { comparisonSentence } from "./sentences";
import type { FlushStatisticsRow, StrainStatisticsRow } from "./types";

/** A farm's row built from its blocks' BE values, as the refresh writes it. */
function row(farmId: string, strainId: string, efficiencies: number[], extra: Partial<StrainStatisticsRow> = {}): StrainStatisticsRow {
  const bins: Record<string, number> = {};
  for (const value of efficiencies) bins[Math.floor(value)] = (bins[Math.floor(value)] ?? 0) + 1;
  return {
    farmId,
    strainId,
    substrateRecipeId: "recipe-1",
    fruitingMethodId: "method-1",
    blocks: efficiencies.length,
    blocksContaminated: 0,
    efficiencyBlocks: efficiencies.length,
    efficiencySum: efficiencies.reduce((sum, value) => sum + value, 0),
    efficiencySquares: efficiencies.reduce((sum, value) => sum + value * value, 0),
    efficiencyBins: bins,
    firstHarvestBlocks: efficiencies.length,
    firstHarvestDaysSum: 30 * efficiencies.length,
    ...extra,
  };
}

function input(rows: StrainStatisticsRow[], overrides: Partial<PooledResultsInput> = {}): PooledResultsInput {
  return {
    rows,
    flushRows: [],
    strains: [
      { id: "a", name: "Grey Morning" },
      { id: "b", name: "Valley Wild" },
    ],
    filters: {},
    minimumFarms: 3,
    showPerFarmEstimates: false,
    viewerFarmId: null,
    random: seededRandom("test"),
    ...overrides,
  };
}

const blocksOf = (random: ReturnType<typeof seededRandom>, mean: number, n: number) =>
  Array.from({ length: n }, () => random.normal(mean, 8));

describe("the farm-blocked model from cell sums", () => {
  // One-way Tukey on pooled blocks is gone from Co-op results: the pairwise differences now come
  // from the same farm-blocked model as the adjusted means (issue 14 §3), so this checks that model.
  it("gives the blocked model the same answers, means and comparisons, from cell sums as from the real block values", () => {
    const random = seededRandom("equivalence");
    const real: { treatment: string; block: string; y: number }[] = [];
    for (const farm of ["f1", "f2", "f3", "f4"]) {
      for (const [strain, mean] of [
        ["a", 80],
        ["b", 90],
        ["c", 75],
      ] as const) {
        // Farm f4 never grew strain c: a farm missing an arm.
        if (farm === "f4" && strain === "c") continue;
        for (const y of blocksOf(random, mean + farm.length, 3 + (real.length % 4))) real.push({ treatment: strain, block: farm, y });
      }
    }
    const cells = new Map<string, { n: number; sum: number; squares: number; treatment: string; block: string }>();
    for (const o of real) {
      const key = `${o.treatment}|${o.block}`;
      const cell = cells.get(key) ?? { n: 0, sum: 0, squares: 0, treatment: o.treatment, block: o.block };
      cells.set(key, { ...cell, n: cell.n + 1, sum: cell.sum + o.y, squares: cell.squares + o.y * o.y });
    }
    const fromReal = blockedAnova(real);

    const fromCells = blockedModelFromCells([...cells.values()]);
    fromReal.means.forEach((mean, index) => {
      expect(fromCells.means[index].treatment).toBe(mean.treatment);
      expect(fromCells.means[index].estimate).toBeCloseTo(mean.estimate, 8);
      expect(fromCells.means[index].lower).toBeCloseTo(mean.lower, 8);
      expect(fromCells.means[index].upper).toBeCloseTo(mean.upper, 8);
    });
    expect(fromCells.residual.ss).toBeCloseTo(fromReal.residual.ss, 6);
    fromReal.comparisons.forEach((pair, index) => {
      expect(fromCells.comparisons[index]).toMatchObject({ a: pair.a, b: pair.b });
      expect(fromCells.comparisons[index].difference).toBeCloseTo(pair.difference, 8);
      expect(fromCells.comparisons[index].se).toBeCloseTo(pair.se, 8);
      expect(fromCells.comparisons[index].lower).toBeCloseTo(pair.lower, 8);
      expect(fromCells.comparisons[index].pAdjusted).toBeCloseTo(pair.pAdjusted, 8);
    });
  });

  it("shows pairwise differences that are the differences of the farm-adjusted means beside them", () => {
    const random = seededRandom("agree");
    // Farms differ a lot and grow the strains unevenly, so pooled one-way means would disagree.
    const rows = [
      row("f1", "a", blocksOf(random, 60, 8)),
      row("f1", "b", blocksOf(random, 70, 2)),
      row("f2", "a", blocksOf(random, 100, 2)),
      row("f2", "b", blocksOf(random, 110, 8)),
      row("f3", "a", blocksOf(random, 80, 5)),
      row("f3", "b", blocksOf(random, 90, 5)),
    ];
    const results = buildPooledResults(input(rows));
    if (results.pairwise.status !== "published") throw new Error("pairwise should be published");
    const [a, b] = results.strains;
    if (a.efficiency.status !== "published" || b.efficiency.status !== "published") throw new Error("means should be published");
    expect(a.efficiency.value.adjustedForFarm).toBe(true);
    const [pair] = results.pairwise.value;
    expect(pair).toMatchObject({ strainA: "Grey Morning", strainB: "Valley Wild" });
    expect(pair.estimate).toBeCloseTo(b.efficiency.value.estimate - a.efficiency.value.estimate, 10);
    // Raw pooled means differ by far more than the farm-adjusted 10 or so: (8·110 + 2·70 + 5·90)/15 − (8·60 + 2·100 + 5·80)/15 ≈ 27.
    expect(pair.estimate).toBeGreaterThan(5);
    expect(pair.estimate).toBeLessThan(15);
    expect(pair.sentence).toMatch(/^Valley Wild gave \d+ BE points more than Grey Morning/);
  });
});

describe("minimum-farms suppression", () => {
  it("publishes a strain grown on 3 farms and withholds every figure of one grown on 2", () => {
    const random = seededRandom("suppression");
    const rows = [
      ...["f1", "f2", "f3"].map((farm) => row(farm, "a", blocksOf(random, 80, 6))),
      ...["f1", "f2"].map((farm) => row(farm, "b", blocksOf(random, 90, 6), { blocksContaminated: 1 })),
    ];
    const results = buildPooledResults(input(rows));
    const [a, b] = results.strains;
    expect(a.efficiency.status).toBe("published");
    expect(a.farms).toEqual({ status: "published", value: 3 });
    for (const figure of [b.farms, b.blocks, b.efficiency, b.contamination, b.firstHarvestDays, b.spread, b.flushProfile]) {
      expect(figure.status).toBe("suppressed");
    }
    expect(b.contamination).toEqual({ status: "suppressed", message: "fewer than 3 farms" });
    expect(b.sentence).toContain("not enough data");
    expect(results.pairwise.status).toBe("suppressed");
    expect(JSON.stringify(results)).not.toMatch(/f1|f2|f3/);
  });

  it("follows the co-op's minimum: the same data is published at 2 and withheld at 4", () => {
    const random = seededRandom("minimum");
    const rows = ["f1", "f2", "f3"].map((farm) => row(farm, "a", blocksOf(random, 80, 6)));
    expect(buildPooledResults(input(rows, { minimumFarms: 2 })).strains[0].efficiency.status).toBe("published");
    expect(buildPooledResults(input(rows, { minimumFarms: 4 })).strains[0].efficiency).toEqual({
      status: "suppressed",
      message: "fewer than 4 farms",
    });
  });
});

describe("the differencing guard", () => {
  // Farms 1–3 grow strain a on recipe 1; farm 4 alone on recipe 2. "Any recipe" (4 farms) minus
  // "recipe 1" (3 farms) would be farm 4's own figure.
  const random = seededRandom("differencing");
  const rows = [
    ...["f1", "f2", "f3"].map((farm) => row(farm, "a", blocksOf(random, 80, 5))),
    row("f4", "a", blocksOf(random, 120, 5), { substrateRecipeId: "recipe-2" }),
  ];

  it("publishes the unfiltered figure but withholds the filtered one that would single out farm 4", () => {
    const all = buildPooledResults(input(rows));
    const recipeOne = buildPooledResults(input(rows, { filters: { substrateRecipeId: "recipe-1" } }));
    expect(all.strains[0].efficiency.status).toBe("published");
    expect(recipeOne.strains[0].efficiency.status).toBe("suppressed");
    expect(recipeOne.strains[0].contamination.status).toBe("suppressed");
    expect(recipeOne.strains[0].efficiency.status === "suppressed" && recipeOne.strains[0].efficiency.message).toMatch(/withheld/);
  });

  it("allows the filter once every recipe × fruiting-method cell has the minimum", () => {
    const more = [...rows, ...["f5", "f6"].map((farm) => row(farm, "a", blocksOf(random, 110, 5), { substrateRecipeId: "recipe-2" }))];
    expect(filterIsSafe(more, { substrateRecipeId: "recipe-1" }, 3, (r) => r.blocks)).toBe(true);
    expect(buildPooledResults(input(more, { filters: { substrateRecipeId: "recipe-1" } })).strains[0].efficiency.status).toBe("published");
  });

  it("guards a fruiting-method filter against a small cell on the other axis", () => {
    // Recipe and method cells: (r1, m1) farms 1–3, (r1, m2) farm 4, (r2, m2) farms 5–7. Each margin has ≥ 3
    // farms, but recipe 1 minus method 1 would be farm 4 alone.
    const crossed = [
      ...["f1", "f2", "f3"].map((farm) => row(farm, "a", [80, 82])),
      row("f4", "a", [150, 151], { fruitingMethodId: "method-2" }),
      ...["f5", "f6", "f7"].map((farm) => row(farm, "a", [90, 92], { substrateRecipeId: "recipe-2", fruitingMethodId: "method-2" })),
    ];
    expect(filterIsSafe(crossed, { substrateRecipeId: "recipe-1" }, 3, (r) => r.blocks)).toBe(false);
    expect(filterIsSafe(crossed, { fruitingMethodId: "method-1" }, 3, (r) => r.blocks)).toBe(false);
    expect(filterIsSafe(crossed, {}, 3, (r) => r.blocks)).toBe(true);
  });

  it("never publishes two figures whose difference comes from fewer farms than the minimum", () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            farm: fc.integer({ min: 1, max: 8 }),
            recipe: fc.integer({ min: 1, max: 3 }),
            method: fc.integer({ min: 1, max: 2 }),
          }),
          { minLength: 1, maxLength: 30 },
        ),
        (cells) => {
          const generated = cells.map((cell) =>
            row(`f${cell.farm}`, "a", [80], { substrateRecipeId: `r${cell.recipe}`, fruitingMethodId: `m${cell.method}` }),
          );
          const filterSets = [
            {},
            ...[1, 2, 3].map((r) => ({ substrateRecipeId: `r${r}` })),
            ...[1, 2].map((m) => ({ fruitingMethodId: `m${m}` })),
          ];
          const farmsOf = (filters: { substrateRecipeId?: string; fruitingMethodId?: string }) =>
            new Set(
              generated
                .filter(
                  (r) =>
                    (!filters.substrateRecipeId || r.substrateRecipeId === filters.substrateRecipeId) &&
                    (!filters.fruitingMethodId || r.fruitingMethodId === filters.fruitingMethodId),
                )
                .map((r) => `${r.farmId}|${r.substrateRecipeId}|${r.fruitingMethodId}`),
            );
          const published = filterSets.filter((filters) => {
            const result = buildPooledResults(input(generated, { filters, strains: [{ id: "a", name: "A" }] }));
            return result.strains[0]?.blocks.status === "published";
          });
          for (const bigger of published) {
            for (const smaller of published) {
              const big = farmsOf(bigger);
              const small = farmsOf(smaller);
              if (![...small].every((key) => big.has(key)) || small.size === big.size) continue;
              const leftover = new Set([...big].filter((key) => !small.has(key)).map((key) => key.split("|")[0]));
              expect(leftover.size).toBeGreaterThanOrEqual(3);
            }
          }
        },
      ),
    );
  });
});

describe("the differencing guard counts the farms that contribute to each figure", () => {
  it("withholds 'recipe 1' BE where the other recipe's farms have blocks but only one has a BE", () => {
    // Recipe 1: farms 1–3 with fruited blocks. Recipe 2: farm 4 fruited, farms 5 and 6 blocks not yet fruited.
    // Three farms have blocks on recipe 2, so counts may be filtered; only farm 4 gives recipe 2 a BE.
    const random = seededRandom("contributing");
    const rows = [
      ...["f1", "f2", "f3"].map((farm) => row(farm, "a", blocksOf(random, 80, 4))),
      row("f4", "a", blocksOf(random, 120, 4), { substrateRecipeId: "recipe-2" }),
      ...["f5", "f6"].map((farm) =>
        row(farm, "a", [], {
          substrateRecipeId: "recipe-2",
          blocks: 2,
          firstHarvestBlocks: 0,
          firstHarvestDaysSum: 0,
        }),
      ),
    ];
    const all = buildPooledResults(input(rows)).strains[0];
    const recipeOne = buildPooledResults(input(rows, { filters: { substrateRecipeId: "recipe-1" } })).strains[0];
    expect(all.efficiency.status).toBe("published");
    expect(recipeOne.efficiency.status === "suppressed" && recipeOne.efficiency.message).toMatch(/withheld/);
    expect(recipeOne.spread.status).toBe("suppressed");
    expect(recipeOne.firstHarvestDays.status).toBe("suppressed");
    // Counts come from three farms on recipe 2, so 'any recipe' minus 'recipe 1' covers three farms: published.
    expect(recipeOne.blocks).toEqual({ status: "published", value: 12 });
  });

  it("never publishes two figures of one kind whose difference comes from fewer contributing farms than the minimum", () => {
    const kinds = {
      counts: { figure: (s: StrainResult) => s.blocks, contributes: (r: StrainStatisticsRow) => r.blocks },
      efficiency: { figure: (s: StrainResult) => s.efficiency, contributes: (r: StrainStatisticsRow) => r.efficiencyBlocks },
      spread: { figure: (s: StrainResult) => s.spread, contributes: (r: StrainStatisticsRow) => r.efficiencyBlocks },
      firstHarvest: { figure: (s: StrainResult) => s.firstHarvestDays, contributes: (r: StrainStatisticsRow) => r.firstHarvestBlocks },
    };
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            farm: fc.integer({ min: 1, max: 7 }),
            recipe: fc.integer({ min: 1, max: 2 }),
            method: fc.integer({ min: 1, max: 2 }),
            blocks: fc.integer({ min: 1, max: 12 }),
            // Often none: farms whose blocks have not fruited, been dated or finished are the case the guard must count right.
            fruited: fc.oneof(fc.constant(0), fc.integer({ min: 1, max: 12 })),
            dated: fc.oneof(fc.constant(0), fc.integer({ min: 1, max: 12 })),
            finished: fc.oneof(fc.constant(0), fc.integer({ min: 2, max: 12 })),
          }),
          { minLength: 1, maxLength: 40 },
        ),
        (cells) => {
          const generated = cells.map((cell) => {
            const fruited = Math.min(cell.fruited, cell.blocks);
            return row(
              `f${cell.farm}`,
              "a",
              Array.from({ length: fruited }, (_, index) => 70 + ((cell.farm * 7 + index * 13) % 40)),
              {
                substrateRecipeId: `r${cell.recipe}`,
                fruitingMethodId: `m${cell.method}`,
                blocks: cell.blocks,
                // Contaminated blocks that fruited count towards days to first harvest but not BE, so the two differ.
                firstHarvestBlocks: Math.min(cell.dated, cell.blocks),
                firstHarvestDaysSum: 30 * Math.min(cell.dated, cell.blocks),
              },
            );
          });
          const flushRows: FlushStatisticsRow[] = cells.flatMap((cell) => {
            const finished = Math.min(cell.finished, cell.fruited, cell.blocks);
            return [1, 2].map((flush) => ({
              farmId: `f${cell.farm}`,
              strainId: "a",
              substrateRecipeId: `r${cell.recipe}`,
              fruitingMethodId: `m${cell.method}`,
              flush,
              finishedBlocks: finished,
              blocksFruiting: finished,
              shareSum: finished * (flush === 1 ? 0.6 : 0.4),
              shareSquares: finished * (flush === 1 ? 0.37 : 0.17),
              cumulativeSum: finished * (flush === 1 ? 0.6 : 1),
              cumulativeSquares: finished * (flush === 1 ? 0.37 : 1),
            }));
          });
          const filterSets = [
            {},
            ...[1, 2].map((r) => ({ substrateRecipeId: `r${r}` })),
            ...[1, 2].map((m) => ({ fruitingMethodId: `m${m}` })),
            ...[1, 2].flatMap((r) => [1, 2].map((m) => ({ substrateRecipeId: `r${r}`, fruitingMethodId: `m${m}` }))),
          ];
          const inFilter = (
            filters: { substrateRecipeId?: string; fruitingMethodId?: string },
            r: { substrateRecipeId: string | null; fruitingMethodId: string | null },
          ) =>
            (!filters.substrateRecipeId || r.substrateRecipeId === filters.substrateRecipeId) &&
            (!filters.fruitingMethodId || r.fruitingMethodId === filters.fruitingMethodId);
          const results = filterSets.map((filters) => ({
            filters,
            strain: buildPooledResults(input(generated, { filters, flushRows, strains: [{ id: "a", name: "A" }] })).strains[0],
          }));
          const check = (
            published: { filters: (typeof filterSets)[number] }[],
            contributors: (filters: (typeof filterSets)[number]) => Set<string>,
          ) => {
            for (const bigger of published) {
              const big = contributors(bigger.filters);
              // Primary suppression: a published figure has the minimum number of contributing farms itself.
              expect(new Set([...big].map((key) => key.split("|")[0])).size).toBeGreaterThanOrEqual(3);
              for (const smaller of published) {
                const small = contributors(smaller.filters);
                if (![...small].every((key) => big.has(key)) || small.size === big.size) continue;
                const leftover = new Set([...big].filter((key) => !small.has(key)).map((key) => key.split("|")[0]));
                expect(leftover.size).toBeGreaterThanOrEqual(3);
              }
            }
          };
          for (const kind of Object.values(kinds)) {
            check(
              results.filter((result) => result.strain && kind.figure(result.strain).status === "published"),
              (filters) =>
                new Set(
                  generated
                    .filter((r) => inFilter(filters, r) && kind.contributes(r) > 0)
                    .map((r) => `${r.farmId}|${r.substrateRecipeId}|${r.fruitingMethodId}`),
                ),
            );
          }
          check(
            results.filter((result) => result.strain?.flushProfile.status === "published"),
            (filters) =>
              new Set(
                flushRows
                  .filter((r) => inFilter(filters, r) && r.finishedBlocks > 0)
                  .map((r) => `${r.farmId}|${r.substrateRecipeId}|${r.fruitingMethodId}`),
              ),
          );
        },
      ),
      { numRuns: 1000 },
    );
  });
});

describe("per-farm estimates in the forest chart", () => {
  const random = seededRandom("forest");
  const farms = ["f1", "f2", "f3", "f4"];
  const rows = farms.flatMap((farm, index) => [row(farm, "a", blocksOf(random, 80, 8)), row(farm, "b", blocksOf(random, 88 + index, 8))]);

  it("shows only the pooled estimate and the viewer's own farm by default", () => {
    const results = buildPooledResults(input(rows, { viewerFarmId: "f2" }));
    expect(results.heterogeneity.status).toBe("published");
    if (results.heterogeneity.status !== "published") return;
    const forest = results.heterogeneity.value.strains[0].forest;
    expect(forest.map((entry) => entry.label)).toEqual(["Your farm", "All farms (pooled)"]);
  });

  it("adds the other farms anonymised when the co-op allows it, and never their ids", () => {
    const results = buildPooledResults(input(rows, { viewerFarmId: "f2", showPerFarmEstimates: true }));
    if (results.heterogeneity.status !== "published") throw new Error("expected published heterogeneity");
    const forest = results.heterogeneity.value.strains[0].forest;
    expect(forest.filter((entry) => entry.own)).toHaveLength(1);
    expect(forest.filter((entry) => !entry.own && !entry.pooled).map((entry) => entry.label)).toEqual(["Farm A", "Farm B", "Farm C"]);
    expect(JSON.stringify(results)).not.toMatch(/"f[1-4]"/);
  });

  it("shows an observer no farm row at all by default", () => {
    const results = buildPooledResults(input(rows));
    if (results.heterogeneity.status !== "published") throw new Error("expected published heterogeneity");
    expect(results.heterogeneity.value.strains[0].forest.map((entry) => entry.label)).toEqual(["All farms (pooled)"]);
  });
});

describe("plain-language sentences and percentiles", () => {
  it("words a difference the way the issue asks", () => {
    expect(
      comparisonSentence({ better: "Strain B", base: "strain A", estimate: 9.2, lower: 3.4, upper: 15.1, farms: 7, blocks: 412 }),
    ).toBe("Strain B gave 9 BE points more than strain A (95 % interval 3 to 15), from 7 farms and 412 blocks.");
    expect(comparisonSentence({ better: "B", base: "A", estimate: -4, lower: -9, upper: 1, farms: 3, blocks: 40 })).toContain(
      "cannot tell them apart",
    );
  });

  it("places a farm in the co-op distribution", () => {
    const bins = { "70": 10, "80": 10, "90": 10, "100": 10 };
    // 30 of 40 blocks lie in lower bins; a value inside a bin counts half of that bin's blocks.
    expect(percentileOf(bins, 95)).toBe(75);
    expect(percentileOf(bins, 80.5)).toBe(37.5);
    expect(binQuantile(bins, 0.5)).toBe(80.5);
    expect(binQuantile(bins, 0.9)).toBe(100.5);
  });

  it("publishes a percentile only with three blocks at or beyond it: whiskers from 21 blocks, quartiles from 9", () => {
    const blocks = (n: number) => binsOf(Array.from({ length: n }, (_, index) => 60 + 2 * index));
    // 20 blocks: the 10th percentile is the block at rank ⌊0.1 × 19⌋ = 1 (from 0), the second lowest: withheld.
    expect(publishablePercentile(blocks(20), 0.1)).toBeNull();
    expect(publishablePercentile(blocks(21), 0.1)).toBe(64.5);
    expect(publishablePercentile(blocks(21), 0.9)).toBe(96.5);
    expect(publishableSpread(blocks(8))).toBeNull();
    expect(publishableSpread(blocks(9))).toEqual([null, 64.5, 68.5, 72.5, null]);
  });
});

describe("the drying ratio", () => {
  // Invented blocks' dry ÷ fresh ratios; the interval is lib/stats meanCI over blocks (checked there
  // against the NIST/SEMATECH e-Handbook 1.3.5.2).
  const ratios: Record<string, number[]> = { f1: [0.091, 0.094, 0.088], f2: [0.102, 0.097], f3: [0.085, 0.09, 0.093, 0.089] };
  const drying = (farmId: string, values: number[], recipe = "recipe-1") => ({
    farmId,
    strainId: "a",
    substrateRecipeId: recipe,
    fruitingMethodId: "method-1",
    driedBlocks: values.length,
    ratioSum: values.reduce((sum, value) => sum + value, 0),
    ratioSquares: values.reduce((sum, value) => sum + value * value, 0),
  });
  const strainRows = ["f1", "f2", "f3", "f4"].map((farm) => row(farm, "a", [80, 85, 90]));

  it("is the mean of blocks' ratios with a t interval, from farms that dry, where the minimum number of farms dried", () => {
    const dryingRows = Object.entries(ratios).map(([farm, values]) => drying(farm, values));
    const strain = buildPooledResults(input(strainRows, { dryingRows })).strains.find((s) => s.strainId === "a")!;
    const all = Object.values(ratios).flat();
    const expected = meanCI(all);
    if (strain.drying.status !== "published") throw new Error(strain.drying.message);
    expect(strain.drying.value).toMatchObject({ farms: 3, blocks: 9 });
    expect(strain.drying.value.estimate).toBeCloseTo(expected.mean, 12);
    expect(strain.drying.value.lower).toBeCloseTo(expected.lower, 12);
    expect(strain.drying.value.upper).toBeCloseTo(expected.upper, 12);
    const twoFarms = buildPooledResults(input(strainRows, { dryingRows: dryingRows.slice(0, 2) })).strains[0];
    expect(twoFarms.drying).toEqual({ status: "suppressed", message: "fewer than 3 farms" });
    expect(buildPooledResults(input(strainRows)).strains[0].drying.status).toBe("suppressed");
  });

  it("is withheld under a filter when another recipe has fewer than the minimum farms drying, so 'any' minus 'recipe 1' shows no farm", () => {
    const dryingRows = [...Object.entries(ratios).map(([farm, values]) => drying(farm, values)), drying("f4", [0.12, 0.125], "recipe-2")];
    const rows = [...strainRows, row("f4", "a", [70, 72], { substrateRecipeId: "recipe-2" })];
    const recipeOne = buildPooledResults(input(rows, { dryingRows, filters: { substrateRecipeId: "recipe-1" } })).strains[0];
    expect(recipeOne.drying.status === "suppressed" && recipeOne.drying.message).toMatch(/^withheld/);
    const any = buildPooledResults(input(rows, { dryingRows })).strains[0];
    expect(any.drying.status).toBe("published");
  });
});
