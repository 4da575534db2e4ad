import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { loadMember, type Member } from "@/lib/data/members";
import { getPooledResults } from "@/lib/data/pooled-results";
import { getReleaseStatus } from "@/lib/data/pooled-releases";
import { updateCooperativeSettings } from "@/lib/data/pooled-settings";
import { listRegistries } from "@/lib/data/registries";
import { databaseRefusal, superuserPool } from "../support/database";
import { CoopFixture, fixtureEfficiency, mean, type FixtureBlock } from "./support/co-op-fixtures";
import { publishPooledFigures } from "./support/publish";

// An observer (or any member) who saves every figure the app publishes and subtracts them.
// Each test sets up the exact situation that gave one farm away and checks that it no longer does.

let inspector: Pool;
let fixture: CoopFixture;
let observer: Member;
let coordinator: Member;

async function memberByEmail(email: string): Promise<Member> {
  const { rows } = await inspector.query<{ id: string }>("select id from users where email = $1", [email]);
  return (await loadMember(rows[0].id))!;
}

const harvested = (grams: number[]): FixtureBlock[] => grams.map((fresh) => ({ flushes: [fresh * 0.7, fresh * 0.3] }));

beforeAll(async () => {
  inspector = superuserPool();
  fixture = new CoopFixture(inspector);
  observer = await memberByEmail("observer@extension.example");
  coordinator = await memberByEmail("coordinator@aldervalley.example");
});

afterAll(async () => {
  await fixture.dispose();
  await publishPooledFigures(inspector, []);
  await inspector.end();
  await closeDatabase();
});

describe("an observer subtracting published pooled figures", () => {
  it("cannot get one farm's mean BE from 'any recipe' minus one recipe, when the other recipe's farms have blocks but no harvest", async () => {
    // Farms 1–3 grow the strain on recipe 1; farm 4 alone has harvested blocks on recipe 2, where
    // farms 5 and 6 have blocks that have not fruited. Three farms have blocks on recipe 2, but
    // only farm 4 contributes to its biological efficiency.
    const species = await fixture.species("Differencing oyster", ["Lone Ridge"]);
    const [strain] = species.strainIds;
    const [recipeOne, recipeTwo] = [await fixture.recipe("Recipe one"), await fixture.recipe("Recipe two")];
    const method = await fixture.method("Slits");
    const farms = await Promise.all([1, 2, 3, 4, 5, 6].map((n) => fixture.farm(`Differencing farm ${n}`)));
    for (const [index, farm] of farms.slice(0, 3).entries()) {
      await fixture.blocks(
        farm.id,
        strain,
        harvested([780, 810, 840, 800].map((grams) => grams + 10 * index)).map((block) => ({
          ...block,
          recipeId: recipeOne,
          methodId: method,
        })),
      );
    }
    const lone = harvested([1190, 1230, 1260, 1215]).map((block) => ({ ...block, recipeId: recipeTwo, methodId: method }));
    await fixture.blocks(farms[3].id, strain, lone);
    for (const farm of farms.slice(4)) {
      await fixture.blocks(farm.id, strain, [
        { recipeId: recipeTwo, methodId: method },
        { recipeId: recipeTwo, methodId: method },
      ]);
    }
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );

    const anyRecipe = await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" });
    const onRecipeOne = await getPooledResults(observer, { speciesId: species.id, substrateRecipeId: recipeOne, flushWindow: "all" });
    const all = anyRecipe.results!.strains[0].efficiency;
    const one = onRecipeOne.results!.strains[0].efficiency;
    const farmFourMean = mean(lone.map(fixtureEfficiency));
    let revealed: number | null = null;
    if (all.status === "published" && one.status === "published" && all.value.blocks > one.value.blocks) {
      revealed = (all.value.blocks * all.value.estimate - one.value.blocks * one.value.estimate) / (all.value.blocks - one.value.blocks);
    }
    // The measured attack: revealed came out as farm 4's exact mean BE.
    expect(revealed === null || Math.abs(revealed - farmFourMean) > 0.5).toBe(true);
  });

  it("cannot get a farm's new block's BE from the same figure before and after that farm's upload", async () => {
    const species = await fixture.species("Timing oyster", ["Steady Bank"]);
    const [strain] = species.strainIds;
    const farms = await Promise.all([1, 2, 3, 4].map((n) => fixture.farm(`Timing farm ${n}`)));
    for (const [index, farm] of farms.entries())
      await fixture.blocks(farm.id, strain, harvested([800, 830, 860, 790, 815].map((g) => g + index)));
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );
    const before = (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).results!.strains[0].efficiency;

    // Farm 1 uploads one more block.
    const newBlock: FixtureBlock = { flushes: [961.3, 412.1] };
    await fixture.blocks(farms[0].id, strain, [newBlock]);
    const attempt = await publishPooledFigures(inspector, [farms[0].id]);
    // The release waits, and the coordinator is told why and what it needs.
    expect(attempt.outcome).toBe("waiting");
    const waiting = (await getReleaseStatus(coordinator)).now;
    if (waiting.outcome !== "waiting") throw new Error("the release should wait");
    expect(waiting.waiting).toContainEqual(expect.objectContaining({ strainName: "Steady Bank", farmsChanged: 1 }));
    expect(waiting.minimumFarms).toBe(3);
    const after = (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).results!.strains[0].efficiency;

    if (before.status !== "published" || after.status !== "published") throw new Error("the figure should be published");
    const revealed = after.value.blocks * after.value.estimate - before.value.blocks * before.value.estimate;
    // The measured attack: revealed equalled the new block's BE to 0.001 points.
    expect(after.value.blocks === before.value.blocks || Math.abs(revealed - fixtureEfficiency(newBlock)) > 0.5).toBe(true);

    // Once two more farms upload, the release goes out: the step between releases now mixes three farms' new blocks.
    const others: FixtureBlock[] = [{ flushes: [702.4, 301.9] }, { flushes: [655.0, 280.2] }];
    await fixture.blocks(farms[1].id, strain, [others[0]]);
    await fixture.blocks(farms[2].id, strain, [others[1]]);
    expect((await publishPooledFigures(inspector, [farms[1].id, farms[2].id])).outcome).toBe("cut");
    const later = (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).results!.strains[0].efficiency;
    if (later.status !== "published") throw new Error("the figure should be published");
    expect(later.value.blocks).toBe(before.value.blocks + 3);
    // Published at 0.1 BE point, so even the three blocks' total is known only to within about n × 0.05 points.
    expect(String(later.value.estimate).split(".")[1]?.length ?? 0).toBeLessThanOrEqual(1);
  });
});

describe("an observer subtracting a season from every season together", () => {
  const inSeason = (season: number, grams: number[], extra: Partial<FixtureBlock> = {}): FixtureBlock[] =>
    harvested(grams).map((block) => ({ ...block, inoculatedOn: `${season}-03-10`, ...extra }));

  /** (Σ all − Σ part) / (n all − n part), from two published means and their block counts: the rest's mean BE. */
  const rest = (all: { estimate: number; blocks: number }, part: { estimate: number; blocks: number }) =>
    (all.blocks * all.estimate - part.blocks * part.estimate) / (all.blocks - part.blocks);

  it("cannot get a lone farm's BE from 'all seasons' minus the season the other farms grew in", async () => {
    // Farms 1–3 grew the strain in 2025; farm 4 alone in 2026. Four farms stand behind the
    // all-seasons BE, so it is published; 2025 has three. Before the guard, all seasons minus
    // 2025 gave farm 4's mean BE.
    const species = await fixture.species("Season oyster", ["Early Frost"]);
    const [strain] = species.strainIds;
    const farms = await Promise.all([1, 2, 3, 4].map((n) => fixture.farm(`Season farm ${n}`)));
    for (const [index, farm] of farms.slice(0, 3).entries())
      await fixture.blocks(
        farm.id,
        strain,
        inSeason(
          2025,
          [780, 810, 840, 800].map((grams) => grams + 10 * index),
        ),
      );
    const lone = inSeason(2026, [1190, 1230, 1260, 1215]);
    await fixture.blocks(farms[3].id, strain, lone);
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );

    const page = await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" });
    const all = page.results!.strains[0].efficiency;
    if (all.status !== "published") throw new Error("the all-seasons BE should be published");
    const row = page.seasons!.strains.find((strain) => strain.strainName.startsWith("Early Frost"));
    // The strain's seasons are withheld, said once, and no season figure is published at all.
    expect(row?.withheld).toMatch(/fewer than 3 farms/);
    const published = row?.seasons.filter((season) => season.efficiency?.status === "published") ?? [];
    expect(published).toEqual([]);
    // And via the season filter, the same: nothing to subtract.
    const filtered = await getPooledResults(observer, { speciesId: species.id, flushWindow: "all", season: 2025 });
    expect(JSON.stringify(filtered.seasons)).not.toMatch(/"status":"published"/);
    // Had 2025 been published, the subtraction would be farm 4's mean to within rounding:
    const farmFourMean = mean(lone.map(fixtureEfficiency));
    for (const season of published)
      if (season.efficiency?.status === "published")
        expect(Math.abs(rest(all.value, season.efficiency.value) - farmFourMean)).toBeGreaterThan(0.5);
  });

  it("cannot get a farm alone in a recipe within a season from that recipe's figure minus a season", async () => {
    // Farms 1–3: recipe one in 2025. Farm 4: recipe one in 2026, beside farms 5–7 on recipe two in
    // 2026. Every season has at least three farms and so does every recipe, yet "recipe one, all
    // seasons" minus "2025" is farm 4's 2026 mean BE.
    const species = await fixture.species("Season recipe oyster", ["Wet Bank"]);
    const [strain] = species.strainIds;
    const [recipeOne, recipeTwo] = [await fixture.recipe("Season recipe one"), await fixture.recipe("Season recipe two")];
    const method = await fixture.method("Season slits");
    const farms = await Promise.all([1, 2, 3, 4, 5, 6, 7].map((n) => fixture.farm(`Season recipe farm ${n}`)));
    for (const [index, farm] of farms.slice(0, 3).entries())
      await fixture.blocks(
        farm.id,
        strain,
        inSeason(
          2025,
          [780, 810, 840, 800].map((grams) => grams + 10 * index),
          { recipeId: recipeOne, methodId: method },
        ),
      );
    const lone = inSeason(2026, [1190, 1230, 1260, 1215], { recipeId: recipeOne, methodId: method });
    await fixture.blocks(farms[3].id, strain, lone);
    for (const [index, farm] of farms.slice(4).entries())
      await fixture.blocks(
        farm.id,
        strain,
        inSeason(
          2026,
          [700, 720, 690].map((grams) => grams + 5 * index),
          { recipeId: recipeTwo, methodId: method },
        ),
      );
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );

    const onRecipeOne = (await getPooledResults(observer, { speciesId: species.id, substrateRecipeId: recipeOne, flushWindow: "all" }))
      .results!.strains[0].efficiency;
    // Rule 3 publishes the recipe filter: each recipe × fruiting-method cell has at least three farms.
    if (onRecipeOne.status !== "published") throw new Error("the recipe-one BE should be published");
    const seasons = (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).seasons!;
    const row = seasons.strains.find((strain) => strain.strainName.startsWith("Wet Bank"));
    expect(row?.withheld).toMatch(/fewer than 3 farms/);
    const season2025 = row?.seasons.find((season) => season.seasonYear === 2025)?.efficiency;
    const farmFourMean = mean(lone.map(fixtureEfficiency));
    if (season2025?.status === "published") expect(Math.abs(rest(onRecipeOne.value, season2025.value) - farmFourMean)).toBeGreaterThan(0.5);
    expect(season2025?.status).not.toBe("published");
  });

  it("publishes each season where every season of the strain has the minimum, equal to the mean of its blocks", async () => {
    const species = await fixture.species("Season even oyster", ["Long Light"]);
    const [strain] = species.strainIds;
    const farms = await Promise.all([1, 2, 3, 4, 5, 6].map((n) => fixture.farm(`Season even farm ${n}`)));
    const blocks = new Map<number, FixtureBlock[]>([
      [2025, []],
      [2026, []],
    ]);
    for (const [index, farm] of farms.entries()) {
      const season = index < 3 ? 2025 : 2026;
      const grown = inSeason(
        season,
        [760, 800, 830].map((grams) => grams + 20 * index),
      );
      blocks.get(season)!.push(...grown);
      await fixture.blocks(farm.id, strain, grown);
    }
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );
    const row = (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).seasons!.strains.find((strain) =>
      strain.strainName.startsWith("Long Light"),
    );
    expect(row?.withheld).toBeNull();
    for (const season of [2025, 2026]) {
      const figure = row?.seasons.find((entry) => entry.seasonYear === season)?.efficiency;
      if (figure?.status !== "published") throw new Error(`season ${season} should be published`);
      expect(figure.value.farms).toBe(3);
      expect(figure.value.blocks).toBe(9);
      // The mean of the season's blocks' BE (fixtureEfficiency: fresh ÷ dry substrate × 100), at the published 0.1 point.
      expect(Math.abs(figure.value.estimate - mean(blocks.get(season)!.map(fixtureEfficiency)))).toBeLessThanOrEqual(0.05 + 1e-9);
    }
  });
});

describe("counts per strain", () => {
  it("does not show how many blocks a strain has where fewer than the minimum number of farms grow it", async () => {
    const species = await fixture.species("Counted oyster", ["Only Here"]);
    const farm = await fixture.farm("Counting farm");
    await fixture.blocks(farm.id, species.strainIds[0], harvested([700, 720, 740]));
    await publishPooledFigures(inspector, [farm.id]);
    const entry = (await listRegistries(coordinator)).strains.find((strain) => strain.id === species.strainIds[0])!;
    expect(entry.blocks).not.toBe(3);
    expect(JSON.stringify(entry)).not.toMatch(/"blocks":3\b/);
  });
});

describe("the co-op's minimum number of farms", () => {
  it("cannot be set below 3, where each of two farms would learn the other's figures by subtracting its own", async () => {
    try {
      await expect(
        updateCooperativeSettings(coordinator, {
          minimumFarms: 2,
          showPerFarmEstimates: false,
          releaseSchedule: "daily",
          releaseHour: 2,
          releaseTimeZone: "UTC",
        }),
      ).rejects.toThrow(/cannot be below 3/);
      expect(await databaseRefusal(inspector.query("update cooperative_settings set minimum_farms = 2"))).toMatch(/check constraint/);
    } finally {
      await inspector.query("update cooperative_settings set minimum_farms = 3");
    }
  });
});

describe("an observer subtracting the figures by climate regime (the room as the unit)", () => {
  /** Blocks of one farm fruiting in a new room of the regime, all harvested on 2026-02-01. */
  async function roomOf(farmId: string, strainId: string, regimeKindId: string, grams: number[], contaminated = 0) {
    const room = await fixture.room(farmId, [{ startsOn: "2026-01-01", regimeKindId }]);
    const blocks = await fixture.blocks(farmId, strainId, [
      ...harvested(grams),
      ...Array.from({ length: contaminated }, () => ({ contaminated: true, contaminatedOn: "2026-01-20" })),
    ]);
    await fixture.move(farmId, blocks, room);
    return room;
  }

  it("publishes a regime only from the minimum number of farms, and never a farm's or a room's own figure", async () => {
    const species = await fixture.species("Regime oyster", ["Damp Hollow"]);
    const [strain] = species.strainIds;
    const [misted, soaked] = [await fixture.regimeKind("Misted all day"), await fixture.regimeKind("Soaked once a day")];
    const farms = await Promise.all([1, 2, 3].map((n) => fixture.farm(`Regime farm ${n}`)));
    const rooms: string[] = [];
    for (const [index, farm] of farms.entries()) {
      rooms.push(await roomOf(farm.id, strain, misted, [800 + index, 820, 790], 1));
      // Only two farms soak their rooms.
      if (index < 2) rooms.push(await roomOf(farm.id, strain, soaked, [900 + index, 950, 930]));
    }
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );
    const page = await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" });
    const regimes = page.regimes!.regimes;
    const mistedRow = regimes.find((regime) => regime.regimeKindId === misted)!;
    expect(mistedRow.rooms).toEqual({ status: "published", value: 3 });
    expect(mistedRow.farms).toEqual({ status: "published", value: 3 });
    expect(mistedRow.contamination.status).toBe("published");
    // Two farms soak: each would learn the other's rooms by subtracting its own, so the release
    // holds nothing of that regime at all, and the page has no row for it.
    expect(regimes.some((regime) => regime.regimeKindId === soaked)).toBe(false);
    const { rows: released } = await inspector.query("select 1 from pooled_release_regime_rows where regime_kind_id = $1", [soaked]);
    expect(released).toHaveLength(0);
    expect(page.regimes!.model.status).toBe("suppressed");
    // Published at the page's steps: contamination whole percent, BE to 0.1 point.
    if (mistedRow.contamination.status !== "published" || mistedRow.efficiency.status !== "published") throw new Error("published");
    expect(Number.isInteger(mistedRow.contamination.value.estimate)).toBe(true);
    expect(String(mistedRow.efficiency.value.estimate).split(".")[1]?.length ?? 0).toBeLessThanOrEqual(1);
    // No farm id, no room id, no block count per room leaves.
    const json = JSON.stringify(page.regimes);
    for (const id of [...farms.map((farm) => farm.id), ...rooms]) expect(json).not.toContain(id);
  });

  it("cannot get a farm's new room's mean BE from the same regime figure before and after that farm's upload", async () => {
    const species = await fixture.species("Regime timing oyster", ["Wet Shelf"]);
    const [strain] = species.strainIds;
    const misted = await fixture.regimeKind("Misted on a timer");
    const farms = await Promise.all([1, 2, 3, 4].map((n) => fixture.farm(`Regime timing farm ${n}`)));
    for (const [index, farm] of farms.entries()) await roomOf(farm.id, strain, misted, [800 + 7 * index, 830, 815]);
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );
    const regimeOf = async () =>
      (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all" })).regimes!.regimes.find(
        (regime) => regime.regimeKindId === misted,
      )!;
    const before = await regimeOf();

    // Farm 1 records a new room of the regime with blocks of its own.
    const newRoom = [1010.4, 1042.8, 998.1];
    await roomOf(farms[0].id, strain, misted, newRoom);
    const attempt = await publishPooledFigures(inspector, [farms[0].id]);
    expect(attempt.outcome).toBe("waiting");
    const waiting = (await getReleaseStatus(coordinator)).now;
    if (waiting.outcome !== "waiting") throw new Error("the release should wait");
    expect(waiting.waiting.find((entry) => entry.strainName.includes("Misted on a timer"))).toMatchObject({
      strainName: `Climate regime Misted on a timer ${fixture.run}`,
      farmsChanged: 1,
    });
    const after = await regimeOf();
    // The figures are those of the last release: the difference says nothing about the new room.
    expect(after).toEqual(before);

    // Once two more farms add rooms, the release goes out, and the step mixes three farms' new rooms.
    await roomOf(farms[1].id, strain, misted, [700, 720, 710]);
    await roomOf(farms[2].id, strain, misted, [760, 740, 750]);
    expect((await publishPooledFigures(inspector, [farms[1].id, farms[2].id])).outcome).toBe("cut");
    const later = await regimeOf();
    expect(later.rooms).toEqual({ status: "published", value: 7 });
    if (before.efficiency.status !== "published" || later.efficiency.status !== "published") throw new Error("published");
    const revealed = 7 * later.efficiency.value.estimate - 4 * before.efficiency.value.estimate;
    const newRoomMean = mean(newRoom.map((grams) => fixtureEfficiency(harvested([grams])[0])));
    expect(Math.abs(revealed / 3 - newRoomMean)).toBeGreaterThan(0.5);
  });
});

describe("an observer subtracting drying ratios", () => {
  const dried = (grams: number[], ratio: number): FixtureBlock[] =>
    harvested(grams).map((block) => ({ ...block, dried: block.flushes!.map((fresh) => fresh * ratio) }));

  it("cannot get one farm's drying ratio from 'any recipe' minus one recipe, nor from two releases", async () => {
    const species = await fixture.species("Drying oyster", ["Dry Creek"]);
    const [strain] = species.strainIds;
    const [recipeOne, recipeTwo] = [await fixture.recipe("Drying recipe one"), await fixture.recipe("Drying recipe two")];
    const farms = await Promise.all([1, 2, 3, 4].map((n) => fixture.farm(`Drying farm ${n}`)));
    for (const [index, farm] of farms.slice(0, 3).entries()) {
      await fixture.blocks(
        farm.id,
        strain,
        dried([800, 820, 810], 0.09 + index / 200).map((block) => ({ ...block, recipeId: recipeOne })),
      );
    }
    // Farm 4 alone dries on recipe 2.
    await fixture.blocks(
      farms[3].id,
      strain,
      dried([780, 760], 0.125).map((block) => ({ ...block, recipeId: recipeTwo })),
    );
    await publishPooledFigures(
      inspector,
      farms.map((farm) => farm.id),
    );
    const drying = async (substrateRecipeId?: string) =>
      (await getPooledResults(observer, { speciesId: species.id, flushWindow: "all", ...(substrateRecipeId ? { substrateRecipeId } : {}) }))
        .results!.strains[0].drying;
    const any = await drying();
    const one = await drying(recipeOne);
    let revealed: number | null = null;
    if (any.status === "published" && one.status === "published" && any.value.blocks > one.value.blocks) {
      revealed = (any.value.blocks * any.value.estimate - one.value.blocks * one.value.estimate) / (any.value.blocks - one.value.blocks);
    }
    // The measured risk: (any − recipe 1) would be farm 4's own ratio. Its lone cell never enters a release.
    expect(any).toMatchObject({ status: "published", value: { farms: 3 } });
    expect(revealed === null || Math.abs(revealed - 0.125) > 0.005).toBe(true);
    const { rows: released } = await inspector.query("select 1 from pooled_release_drying_rows where farm_id = $1", [farms[3].id]);
    expect(released).toHaveLength(0);

    // Farm 1 dries one more block: the figure holds until the minimum number of farms changed it.
    await fixture.blocks(
      farms[0].id,
      strain,
      dried([900], 0.2).map((block) => ({ ...block, recipeId: recipeOne })),
    );
    expect((await publishPooledFigures(inspector, [farms[0].id])).outcome).toBe("waiting");
    expect(await drying()).toEqual(any);
  });
});
