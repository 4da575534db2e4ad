import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  addTrialArms,
  emptyReleaseContents,
  planRelease,
  type ReleaseContents,
  type ReleaseFlushRow,
  type ReleaseSeasonRow,
  type ReleaseStrainRow,
} from "./releases";
import { flushWindows } from "./types";

// Invented figures: what matters is which farms' parts change between releases, not the values.

interface FarmCell {
  farm: string;
  recipe: string;
  /** BE of the farm's fruited blocks; `unfruited` more blocks have none yet. */
  efficiencies: number[];
  unfruited?: number;
  /** Blocks whose last flush is in: they feed the flush profile. */
  finished?: number;
  /** The season of each fruited block, in the order of `efficiencies` (2025 when not given). */
  seasons?: number[];
}

function contents(cells: FarmCell[]): ReleaseContents {
  const strainRows: ReleaseStrainRow[] = cells.flatMap((cell) =>
    flushWindows.map((flushWindow) => {
      // The first flush gives 60 % of the total, the first two 90 %.
      const share = flushWindow === "all" ? 1 : flushWindow === "1-2" ? 0.9 : 0.6;
      const values = cell.efficiencies.map((value) => value * share);
      const bins: Record<string, number> = {};
      for (const value of values) bins[Math.floor(value)] = (bins[Math.floor(value)] ?? 0) + 1;
      return {
        farmId: cell.farm,
        speciesId: "oyster",
        strainId: "grey-morning",
        substrateRecipeId: cell.recipe,
        fruitingMethodId: "slits",
        flushWindow,
        blocks: values.length + (cell.unfruited ?? 0),
        blocksContaminated: 0,
        efficiencyBlocks: values.length,
        efficiencySum: values.reduce((sum, value) => sum + value, 0),
        efficiencySquares: values.reduce((sum, value) => sum + value * value, 0),
        efficiencyBins: bins,
        firstHarvestBlocks: values.length,
        firstHarvestDaysSum: 31 * values.length,
      };
    }),
  );
  const flushRows: ReleaseFlushRow[] = cells.flatMap((cell) =>
    cell.finished
      ? [1, 2].map((flush) => ({
          farmId: cell.farm,
          speciesId: "oyster",
          strainId: "grey-morning",
          substrateRecipeId: cell.recipe,
          fruitingMethodId: "slits",
          flush,
          finishedBlocks: cell.finished!,
          blocksFruiting: cell.finished!,
          shareSum: cell.finished! * (flush === 1 ? 0.6 : 0.4),
          shareSquares: cell.finished! * (flush === 1 ? 0.36 : 0.16),
          cumulativeSum: cell.finished! * (flush === 1 ? 0.6 : 1),
          cumulativeSquares: cell.finished! * (flush === 1 ? 0.36 : 1),
        }))
      : [],
  );
  const seasonRows: ReleaseSeasonRow[] = cells.flatMap((cell) =>
    flushWindows.flatMap((flushWindow) => {
      const share = flushWindow === "all" ? 1 : flushWindow === "1-2" ? 0.9 : 0.6;
      const bySeason = new Map<number, number[]>();
      cell.efficiencies.forEach((value, index) => {
        const season = cell.seasons?.[index] ?? 2025;
        bySeason.set(season, [...(bySeason.get(season) ?? []), value * share]);
      });
      return [...bySeason].map(([seasonYear, values]) => ({
        farmId: cell.farm,
        speciesId: "oyster",
        strainId: "grey-morning",
        substrateRecipeId: cell.recipe,
        fruitingMethodId: "slits",
        seasonYear,
        flushWindow,
        efficiencyBlocks: values.length,
        efficiencySum: values.reduce((sum, value) => sum + value, 0),
        efficiencySquares: values.reduce((sum, value) => sum + value * value, 0),
      }));
    }),
  );
  return { strainRows, flushRows, seasonRows, dryingRows: [], regimeRows: [] };
}

const empty: ReleaseContents = emptyReleaseContents;
const sortRows = <Row extends object>(rows: Row[]) => rows.map((row) => JSON.stringify(row, Object.keys(row).sort())).sort();

/** Each farm's part of each figure, as the invariants below compare them. */
function parts(release: ReleaseContents): Map<string, Map<string, string>> {
  const figures = new Map<string, Map<string, string>>();
  const add = (figure: string, farm: string, value: unknown) => {
    if (!figures.has(figure)) figures.set(figure, new Map());
    figures.get(figure)!.set(farm, `${figures.get(figure)!.get(farm) ?? ""}${JSON.stringify(value)}`);
  };
  for (const row of release.strainRows) {
    if (row.flushWindow === "all" && row.blocks > 0)
      add(`${row.substrateRecipeId} counts`, row.farmId, [row.blocks, row.blocksContaminated]);
    if (row.flushWindow === "all" && row.firstHarvestBlocks > 0)
      add(`${row.substrateRecipeId} first`, row.farmId, [row.firstHarvestDaysSum]);
    if (row.efficiencyBlocks > 0)
      add(`${row.substrateRecipeId} BE ${row.flushWindow}`, row.farmId, [row.efficiencyBlocks, row.efficiencySum]);
  }
  for (const row of release.flushRows) add(`${row.substrateRecipeId} flushes`, row.farmId, [row.flush, row.shareSum]);
  for (const row of release.seasonRows)
    add(`${row.substrateRecipeId} seasons ${row.flushWindow}`, row.farmId, [row.seasonYear, row.efficiencyBlocks, row.efficiencySum]);
  return figures;
}

describe("planning a release", () => {
  const threeFarms: FarmCell[] = ["A", "B", "C"].map((farm, index) => ({
    farm,
    recipe: "r1",
    efficiencies: [80 + index, 90 + index],
    finished: 2,
  }));

  it("publishes the first release's figures with enough farms and leaves out a figure of one farm", () => {
    const live = contents([...threeFarms, { farm: "D", recipe: "r2", efficiencies: [120, 125], finished: 2 }]);
    const plan = planRelease(empty, live, 3);
    expect(sortRows(plan.next.strainRows)).toEqual(sortRows(contents(threeFarms).strainRows));
    expect(sortRows(plan.next.flushRows)).toEqual(sortRows(contents(threeFarms).flushRows));
    expect(plan.farmsChanged).toBe(3);
    expect(plan.heldBack).toEqual([]);
  });

  it("holds a figure back while fewer than the minimum number of farms changed it, and says how many did", () => {
    const first = planRelease(empty, contents(threeFarms), 3).next;
    const oneFarmLater = contents(
      threeFarms.map((cell) => (cell.farm === "A" ? { ...cell, efficiencies: [...cell.efficiencies, 137.3] } : cell)),
    );
    const plan = planRelease(first, oneFarmLater, 3);
    expect(plan.figuresChanged).toBe(0);
    expect(sortRows(plan.next.strainRows)).toEqual(sortRows(first.strainRows));
    expect(plan.farmsChanged).toBe(1);
    expect(plan.heldBack.map((figure) => [figure.kind, figure.farmsChanged])).toEqual([
      ["counts", 1],
      ["first-harvest", 1],
      ["efficiency:all", 1],
      ["efficiency:1-2", 1],
      ["efficiency:1", 1],
      ["seasons:all", 1],
      ["seasons:1-2", 1],
      ["seasons:1", 1],
    ]);
  });

  it("takes the new figures once three farms changed them", () => {
    const first = planRelease(empty, contents(threeFarms), 3).next;
    const live = contents(threeFarms.map((cell) => ({ ...cell, efficiencies: [...cell.efficiencies, 100] })));
    const plan = planRelease(first, live, 3);
    expect(plan.heldBack).toEqual([]);
    expect(plan.figuresChanged).toBe(8);
    expect(sortRows(plan.next.strainRows)).toEqual(sortRows(live.strainRows));
  });

  it("counts only the figure's own farms: a late flush on one farm is held back even when two others added unfruited blocks", () => {
    const first = planRelease(empty, contents(threeFarms), 3).next;
    const live = contents(
      threeFarms.map((cell) =>
        cell.farm === "A" ? { ...cell, efficiencies: cell.efficiencies.map((value) => value + 4) } : { ...cell, unfruited: 3 },
      ),
    );
    const plan = planRelease(first, live, 3);
    // A's counts are unchanged; B and C added blocks, so the counts changed on two farms: held back too.
    expect(plan.heldBack.map((figure) => `${figure.kind}:${figure.farmsChanged}`).sort()).toEqual(
      ["counts:2", "efficiency:1-2:1", "efficiency:1:1", "efficiency:all:1", "seasons:all:1", "seasons:1-2:1", "seasons:1:1"].sort(),
    );
    expect(plan.figuresChanged).toBe(0);
  });

  it("moves a cell's seasons on when enough farms moved blocks between seasons and its BE did not change", () => {
    const first = planRelease(empty, contents(threeFarms), 3).next;
    const live = contents(threeFarms.map((cell) => ({ ...cell, seasons: [2025, 2026] })));
    const plan = planRelease(first, live, 3);
    expect(plan.heldBack).toEqual([]);
    expect(plan.figuresChanged).toBe(3);
    expect(sortRows(plan.next.seasonRows)).toEqual(sortRows(live.seasonRows));
    expect(sortRows(plan.next.strainRows)).toEqual(sortRows(first.strainRows));
  });

  it("holds a cell's seasons back while its BE is held back, though enough farms changed the seasons", () => {
    // One farm adds a harvest (BE changes on one farm: held back); three farms move a block to
    // another season. Publishing the new seasons beside the old BE would give, as their
    // difference, that one farm's new block.
    const four = [...threeFarms, { farm: "D", recipe: "r1", efficiencies: [70, 75], finished: 2 }];
    const first = planRelease(empty, contents(four), 3).next;
    const live = contents(
      four.map((cell) => (cell.farm === "A" ? { ...cell, efficiencies: [...cell.efficiencies, 111] } : { ...cell, seasons: [2025, 2026] })),
    );
    const plan = planRelease(first, live, 3);
    expect(plan.heldBack.filter((figure) => figure.kind.startsWith("seasons")).map((figure) => figure.farmsChanged)).toEqual([4, 4, 4]);
    expect(sortRows(plan.next.seasonRows)).toEqual(sortRows(first.seasonRows));
  });

  it("does not count float noise from a refresh summing in another order as a change", () => {
    const first = planRelease(empty, contents(threeFarms), 3).next;
    const noisy = contents(threeFarms);
    for (const row of noisy.strainRows) row.efficiencySum *= 1 + 1e-14;
    for (const row of noisy.seasonRows) row.efficiencySum *= 1 + 1e-14;
    const plan = planRelease(first, noisy, 3);
    expect(plan.farmsChanged).toBe(0);
    expect(plan.heldBack).toEqual([]);
    expect(plan.next).toEqual(first);
  });

  it("keeps a farm that left in the figure until enough farms changed it (taking it out alone would reveal its part)", () => {
    const four = [...threeFarms, { farm: "D", recipe: "r1", efficiencies: [70, 75], finished: 2 }];
    const first = planRelease(empty, contents(four), 3).next;
    const plan = planRelease(first, contents(threeFarms), 3);
    expect(plan.figuresChanged).toBe(0);
    expect(plan.next.strainRows.some((row) => row.farmId === "D")).toBe(true);
  });

  it("drops a figure whose farms fall below the minimum once three changed at once", () => {
    const four = [...threeFarms, { farm: "D", recipe: "r1", efficiencies: [70, 75], finished: 2 }];
    const first = planRelease(empty, contents(four), 3).next;
    const plan = planRelease(first, contents([four[3]]), 3);
    expect(plan.next).toEqual(empty);
  });

  it("adds a farm's trial arms together, bins included", () => {
    const [row] = contents([threeFarms[0]]).strainRows;
    const merged = addTrialArms([row, { ...row, blocks: 1, efficiencyBlocks: 1, efficiencySum: 81.5, efficiencyBins: { "81": 1 } }]);
    expect(merged).toHaveLength(1);
    expect(merged[0]).toMatchObject({
      blocks: 3,
      efficiencyBlocks: 3,
      efficiencySum: 80 + 90 + 81.5,
      efficiencyBins: { "80": 1, "81": 1, "90": 1 },
    });
  });

  it("never lets a release hold, or change by, the data of fewer than the minimum number of farms", () => {
    const minimumFarms = 3;
    const farms = ["A", "B", "C", "D", "E", "F"];
    fc.assert(
      fc.property(
        fc.array(
          fc.array(
            fc.record({
              farm: fc.constantFrom(...farms),
              recipe: fc.constantFrom("r1", "r2"),
              fruited: fc.integer({ min: 0, max: 3 }),
              unfruited: fc.integer({ min: 0, max: 2 }),
              finished: fc.integer({ min: 0, max: 2 }),
              level: fc.integer({ min: 60, max: 140 }),
              lateSeason: fc.integer({ min: 0, max: 3 }),
            }),
            { maxLength: 10 },
          ),
          { minLength: 1, maxLength: 6 },
        ),
        (states) => {
          let release = empty;
          for (const state of states) {
            const cells = new Map<string, FarmCell>();
            for (const entry of state) {
              const key = `${entry.farm}|${entry.recipe}`;
              if (cells.has(key) || entry.fruited + entry.unfruited === 0) continue;
              cells.set(key, {
                farm: entry.farm,
                recipe: entry.recipe,
                efficiencies: Array.from({ length: entry.fruited }, (_, index) => entry.level + index),
                unfruited: entry.unfruited,
                finished: Math.min(entry.finished, entry.fruited),
                // The last `lateSeason` fruited blocks belong to 2026, the rest to 2025.
                seasons: Array.from({ length: entry.fruited }, (_, index) => (index >= entry.fruited - entry.lateSeason ? 2026 : 2025)),
              });
            }
            const next = planRelease(release, contents([...cells.values()]), minimumFarms).next;
            const before = parts(release);
            const after = parts(next);
            for (const byFarm of after.values()) expect(byFarm.size).toBeGreaterThanOrEqual(minimumFarms);
            for (const figure of new Set([...before.keys(), ...after.keys()])) {
              const old = before.get(figure) ?? new Map<string, string>();
              const now = after.get(figure) ?? new Map<string, string>();
              const changed = [...new Set([...old.keys(), ...now.keys()])].filter((farm) => old.get(farm) !== now.get(farm));
              expect(changed.length === 0 || changed.length >= minimumFarms).toBe(true);
            }
            // Every farm's seasons add up to its BE of the same cell and window in the same release.
            for (const row of next.strainRows) {
              const seasons = next.seasonRows.filter(
                (season) =>
                  season.farmId === row.farmId &&
                  season.substrateRecipeId === row.substrateRecipeId &&
                  season.flushWindow === row.flushWindow,
              );
              expect(seasons.reduce((sum, season) => sum + season.efficiencyBlocks, 0)).toBe(row.efficiencyBlocks);
            }
            release = next;
          }
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("drying ratio and climate regime figures in a release", () => {
  const drying = (farm: string, blocks: number, ratio: number) => ({
    farmId: farm,
    speciesId: "oyster",
    strainId: "grey-morning",
    substrateRecipeId: "r1",
    fruitingMethodId: "slits",
    driedBlocks: blocks,
    ratioSum: blocks * ratio,
    ratioSquares: blocks * ratio * ratio,
  });
  const regime = (farm: string, regimeKindId: string, rooms: number, mean: number) => ({
    farmId: farm,
    speciesId: "oyster",
    regimeKindId,
    rooms,
    blocks: 6 * rooms,
    blocksContaminated: rooms,
    contaminationRoomSum: rooms / 6,
    contaminationRoomSquares: rooms / 36,
    efficiencyRooms: rooms,
    efficiencyRoomSum: rooms * mean,
    efficiencyRoomSquares: rooms * mean * mean,
    efficiencyBlocks: 5 * rooms,
    blockEfficiencySum: 5 * rooms * mean,
    blockEfficiencySquares: 5 * rooms * (mean * mean + 4),
    roomWeightedSquares: 5 * rooms * mean * mean,
    roomSizeSquares: 25 * rooms,
  });
  const live = (dryingRows: ReturnType<typeof drying>[], regimeRows: ReturnType<typeof regime>[]): ReleaseContents => ({
    ...emptyReleaseContents,
    dryingRows,
    regimeRows,
  });

  it("leaves out a drying ratio or a regime with fewer than the minimum farms and keeps those with enough", () => {
    const plan = planRelease(
      empty,
      live(
        [drying("A", 4, 0.09), drying("B", 3, 0.1), drying("C", 5, 0.11), { ...drying("D", 2, 0.08), strainId: "valley-wild" }],
        [regime("A", "misted", 2, 80), regime("B", "misted", 1, 85), regime("C", "misted", 3, 70), regime("A", "soaked", 2, 90)],
      ),
      3,
    );
    expect(plan.next.dryingRows.map((row) => row.farmId).sort()).toEqual(["A", "B", "C"]);
    expect(plan.next.regimeRows.map((row) => `${row.regimeKindId}:${row.farmId}`).sort()).toEqual(["misted:A", "misted:B", "misted:C"]);
  });

  it("holds a regime's figures back while one farm changed them, and publishes them when three did", () => {
    const three = [regime("A", "misted", 2, 80), regime("B", "misted", 1, 85), regime("C", "misted", 3, 70)];
    const first = planRelease(empty, live([], three), 3).next;
    const oneLater = planRelease(first, live([], [regime("A", "misted", 3, 82), three[1], three[2]]), 3);
    expect(oneLater.next.regimeRows).toEqual(first.regimeRows);
    expect(oneLater.heldBack.map((figure) => `${figure.kind}:${figure.farmsChanged}:${figure.regimeKindId}`).sort()).toEqual([
      "regime:contamination:1:misted",
      "regime:efficiency:1:misted",
    ]);
    const allLater = live([], [regime("A", "misted", 3, 82), regime("B", "misted", 2, 86), regime("C", "misted", 4, 71)]);
    expect(planRelease(first, allLater, 3).next.regimeRows).toEqual(allLater.regimeRows);
  });

  it("holds a strain's drying ratio back while one farm changed it", () => {
    const three = [drying("A", 4, 0.09), drying("B", 3, 0.1), drying("C", 5, 0.11)];
    const first = planRelease(empty, live(three, []), 3).next;
    const plan = planRelease(first, live([drying("A", 5, 0.095), three[1], three[2]], []), 3);
    expect(plan.next.dryingRows).toEqual(first.dryingRows);
    expect(plan.heldBack.map((figure) => figure.kind)).toEqual(["drying"]);
  });
});
