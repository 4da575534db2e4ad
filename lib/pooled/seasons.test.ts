import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { seasonBySeason, seasonsAreSafe, seasonsWithheldMessage } from "./seasons";
import type { SeasonStatisticsRow } from "./types";

// Invented farms and figures. One row is one farm's blocks of one strain in one recipe × season.
function row(farmId: string, seasonYear: number | null, values: number[], recipe = "r1", strainId = "grey-morning"): SeasonStatisticsRow {
  return {
    farmId,
    strainId,
    substrateRecipeId: recipe,
    fruitingMethodId: "slits",
    seasonYear,
    efficiencyBlocks: values.length,
    efficiencySum: values.reduce((sum, value) => sum + value, 0),
    efficiencySquares: values.reduce((sum, value) => sum + value * value, 0),
  };
}

const strains = [
  { id: "grey-morning", name: "Grey Morning" },
  { id: "slate-blue", name: "Slate Blue" },
];

describe("the differencing guard for BE season by season", () => {
  it("publishes when every recipe × season cell has the minimum", () => {
    const rows = ["A", "B", "C"].flatMap((farm) => [row(farm, 2025, [80]), row(farm, 2026, [90])]);
    expect(seasonsAreSafe(rows, 3)).toBe(true);
  });

  it("withholds when one season has one farm: all seasons minus the others would be that farm's BE", () => {
    const rows = [...["A", "B", "C"].map((farm) => row(farm, 2025, [80])), row("D", 2026, [120])];
    expect(seasonsAreSafe(rows, 3)).toBe(false);
  });

  it("withholds when seasons have enough farms but one farm is alone in a recipe within a season", () => {
    // A, B, C grew recipe 1 in 2025; D alone grew it in 2026, beside E, F, G on recipe 2. Season
    // 2026 has four farms, recipe 1 four, recipe 2 three, yet "recipe 1, all seasons" minus
    // "2025" would be D's 2026 BE.
    const rows = [
      ...["A", "B", "C"].map((farm) => row(farm, 2025, [80])),
      row("D", 2026, [120]),
      ...["E", "F", "G"].map((farm) => row(farm, 2026, [70], "r2")),
    ];
    expect(seasonsAreSafe(rows, 3)).toBe(false);
  });

  it("counts blocks with no season as a season of their own", () => {
    const rows = [...["A", "B", "C"].map((farm) => row(farm, 2025, [80])), row("A", null, [95])];
    expect(seasonsAreSafe(rows, 3)).toBe(false);
  });

  it("does not count a farm whose blocks there have no BE", () => {
    const rows = [...["A", "B", "C"].map((farm) => row(farm, 2025, [80])), row("D", 2026, [])];
    expect(seasonsAreSafe(rows, 3)).toBe(true);
  });
});

describe("a strain's BE season by season", () => {
  it("gives each season's mean block BE with its 95 % interval", () => {
    // Blocks 80, 90, 100: mean 90, s = 10; t(0.975, 2) = 4.303 (NIST/SEMATECH e-Handbook 1.3.6.7.2,
    // table of t critical values), half-width 4.303 × 10 / √3 = 24.84 → 65.2 to 114.8.
    const rows = [row("A", 2025, [80]), row("B", 2025, [90]), row("C", 2025, [100])];
    const breakdown = seasonBySeason({ rows, strains, minimumFarms: 3 });
    expect(breakdown.seasons).toEqual([2025]);
    expect(breakdown.strains[0].withheld).toBeNull();
    expect(breakdown.strains[0].seasons[0].efficiency).toEqual({
      status: "published",
      value: { estimate: 90, lower: 65.2, upper: 114.8, farms: 3, blocks: 3 },
    });
  });

  it("says once per strain why its seasons are withheld, and only 'withheld' in its cells", () => {
    const rows = [
      ...["A", "B", "C"].flatMap((farm) => [row(farm, 2025, [80, 82], "r1", "slate-blue"), row(farm, 2026, [84, 86], "r1", "slate-blue")]),
      ...["A", "B", "C"].map((farm) => row(farm, 2025, [70, 72])),
      row("D", 2026, [120, 121]),
    ];
    const breakdown = seasonBySeason({ rows, strains, minimumFarms: 3 });
    expect(breakdown.seasons).toEqual([2025, 2026]);
    const grey = breakdown.strains.find((strain) => strain.strainName === "Grey Morning")!;
    expect(grey.withheld).toBe(seasonsWithheldMessage(3));
    expect(grey.seasons.map((season) => season.efficiency)).toEqual([
      { status: "suppressed", message: "withheld" },
      { status: "suppressed", message: "withheld" },
    ]);
    const slate = breakdown.strains.find((strain) => strain.strainName === "Slate Blue")!;
    expect(slate.seasons.every((season) => season.efficiency?.status === "published")).toBe(true);
  });

  it("never publishes a season figure that, with the all-seasons sums, isolates fewer than the minimum farms", () => {
    const farms = ["A", "B", "C", "D", "E"];
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            farm: fc.constantFrom(...farms),
            recipe: fc.constantFrom("r1", "r2"),
            season: fc.constantFrom(2024, 2025, 2026, null),
            value: fc.integer({ min: 40, max: 140 }),
          }),
          { maxLength: 20 },
        ),
        (entries) => {
          const rows = entries.map((entry) => row(entry.farm, entry.season, [entry.value, entry.value + 1], entry.recipe));
          const breakdown = seasonBySeason({ rows, strains, minimumFarms: 3 });
          for (const strain of breakdown.strains) {
            for (const season of strain.seasons) {
              if (season.efficiency?.status !== "published") continue;
              // Any recipe's blocks in this season, and what the other seasons leave of each recipe: each has no farm or three.
              for (const recipe of ["r1", "r2"]) {
                const inSeason = new Set(entries.filter((e) => e.recipe === recipe && e.season === season.seasonYear).map((e) => e.farm));
                const outside = new Set(entries.filter((e) => e.recipe === recipe && e.season !== season.seasonYear).map((e) => e.farm));
                expect(inSeason.size === 0 || inSeason.size >= 3).toBe(true);
                for (const other of [2024, 2025, 2026, null]) {
                  const cell = new Set(entries.filter((e) => e.recipe === recipe && e.season === other).map((e) => e.farm));
                  expect(cell.size === 0 || cell.size >= 3).toBe(true);
                }
                expect(outside.size === 0 || outside.size >= 3).toBe(true);
              }
            }
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});
