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
