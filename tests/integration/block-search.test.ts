/**
 * Blocks & harvests searched by block code and note, and the block page's co-op curve, against the
 * real database. Notes are a farm's own rows: a search runs through the farm's own context, so two
 * farms with the same words in their notes each find only their own blocks. The co-op's curve for a
 * strain is the one Co-op results publish, from the same release, or withheld.
 */
import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase } from "@/db/client";
import { listBlocks } from "@/lib/data/blocks";
import type { Member } from "@/lib/data/members";
import { countOwnLeftOut, getPooledResults, getStrainFlushCurve } from "@/lib/data/pooled-results";
import { memberOf, superuserPool, twoDemoFarms, type DemoFarm } from "./support/database";

let inspector: Pool;
let farmA: DemoFarm;
let farmB: DemoFarm;
let managerA: Member;
let managerB: Member;
const noted: { id: string; farmId: string; code: string }[] = [];
const run = Date.now().toString(36);
const strainCode = `ZZ-${run}`;
const methodsTaken: [string, string | null][] = [];

async function firstBlocks(farmId: string, how: number) {
  const { rows } = await inspector.query<{ id: string; code: string }>(
    "select id, code from blocks where farm_id = $1 order by code limit $2",
    [farmId, how],
  );
  return rows;
}

beforeAll(async () => {
  inspector = superuserPool();
  [farmA, farmB] = await twoDemoFarms(inspector);
  managerA = await memberOf(farmA.managerId);
  managerB = await memberOf(farmB.managerId);
  // The same words in both farms' notes; farm A's second note in other capitals.
  const [a1, a2] = await firstBlocks(farmA.id, 2);
  const [b1] = await firstBlocks(farmB.id, 1);
  for (const [block, farmId, note] of [
    [a1, farmA.id, `shelf 7 ${run}: green mould spots`],
    [a2, farmA.id, `SHELF 7 ${run.toUpperCase()} by the door`],
    [b1, farmB.id, `shelf 7 ${run}: green mould spots`],
  ] as const) {
    await inspector.query("update blocks set notes = $2 where id = $1", [block.id, note]);
    noted.push({ id: block.id, farmId, code: block.code });
  }
});

afterAll(async () => {
  await inspector.query("update blocks set notes = '' where id = any($1)", [noted.map((block) => block.id)]);
  for (const [id, methodId] of methodsTaken)
    await inspector.query("update blocks set fruiting_method_id = $2 where id = $1", [id, methodId]);
  await inspector.query("delete from strains where code = $1", [strainCode]);
  await inspector.end();
  await closeDatabase();
});

describe("searching blocks by note", () => {
  it("finds the farm's own blocks whatever the capitals, and never another farm's", async () => {
    const found = await listBlocks(managerA, { search: `shelf 7 ${run}` });
    expect(found.map((block) => block.id).sort()).toEqual(
      noted
        .filter((block) => block.farmId === farmA.id)
        .map((block) => block.id)
        .sort(),
    );
    const { rows } = await inspector.query<{ farm_id: string }>("select distinct farm_id from blocks where id = any($1)", [
      found.map((block) => block.id),
    ]);
    expect(rows.map((row) => row.farm_id)).toEqual([farmA.id]);
  });

  it("gives the other farm only its own block for the same words", async () => {
    const found = await listBlocks(managerB, { search: `green mould spots` });
    expect(found.map((block) => block.id)).toContain(noted[2].id);
    expect(found.some((block) => noted.slice(0, 2).some((own) => own.id === block.id))).toBe(false);
  });

  it("finds a block by part of its code, and reads a wildcard literally", async () => {
    const code = noted[0].code;
    const byCode = await listBlocks(managerA, { search: code.slice(1).toLowerCase() });
    expect(byCode.map((block) => block.code)).toContain(code);
    expect(byCode.every((block) => block.code.toLowerCase().includes(code.slice(1).toLowerCase()))).toBe(true);
    expect(await listBlocks(managerA, { search: "%" })).toEqual([]);
    expect(await listBlocks(managerA, { search: "_" })).toEqual([]);
  });

  it("keeps the season filter beside the search", async () => {
    const all = await listBlocks(managerA, { search: `shelf 7 ${run}` });
    const season = all[0].season;
    const inSeason = await listBlocks(managerA, { search: `shelf 7 ${run}`, season: season === null ? 1970 : season });
    expect(inSeason.length).toBeGreaterThan(0);
    expect(inSeason.every((block) => block.season === all[0].season)).toBe(true);
  });
});

describe("the co-op's curve on a block's page", () => {
  it("is the share of yield by flush Co-op results publish for the strain", async () => {
    const { rows } = await inspector.query<{ id: string; species_id: string }>("select id, species_id from strains where code = 'PO-01'");
    const curve = await getStrainFlushCurve(rows[0].id);
    const page = await getPooledResults(managerA, { speciesId: rows[0].species_id, flushWindow: "all" });
    const published = page.results?.strains.find((strain) => strain.strainId === rows[0].id)?.flushProfile;
    expect(published?.status).toBe("published");
    expect(curve.status).toBe("published");
    if (curve.status !== "published" || published?.status !== "published") return;
    expect(curve.releaseNumber).toBe(page.release?.number);
    expect(curve.shares).toEqual(published.value.map((share) => ({ flush: share.flush, meanShare: share.meanShare })));
  });

  it("is withheld, saying why, for a strain too few farms have finished", async () => {
    const { rows } = await inspector.query<{ id: string }>(
      "insert into strains (code, species_id, name, source) select $1, id, 'Test isolate', 'own_isolate' from species limit 1 returning id",
      [strainCode],
    );
    const curve = await getStrainFlushCurve(rows[0].id);
    expect(curve.status).toBe("withheld");
    if (curve.status === "withheld") expect(curve.message).toMatch(/fewer than \d farms have finished blocks/);
  });
});

describe("what keeps a farm's own blocks out of a figure", () => {
  it("counts the viewer's own blocks only, never another farm's", async () => {
    // One block of each farm loses its fruiting method; each farm is told of its own alone.
    const { rows: taken } = await inspector.query<{ id: string; fruiting_method_id: string | null }>(
      "select id, fruiting_method_id from blocks where id = any($1)",
      [[noted[0].id, noted[2].id]],
    );
    for (const row of taken) methodsTaken.push([row.id, row.fruiting_method_id]);
    await inspector.query("update blocks set fruiting_method_id = null where id = any($1)", [taken.map((row) => row.id)]);
    const expected = async (farmId: string) =>
      (
        await inspector.query<{ n: number }>("select count(*)::int as n from blocks where farm_id = $1 and fruiting_method_id is null", [
          farmId,
        ])
      ).rows[0].n;
    const total = (counts: Awaited<ReturnType<typeof countOwnLeftOut>>) => counts.reduce((sum, strain) => sum + strain.noFruitingMethod, 0);
    expect(total(await countOwnLeftOut(managerA, null))).toBe(await expected(farmA.id));
    expect(total(await countOwnLeftOut(managerB, null))).toBe(await expected(farmB.id));
    expect(await expected(farmA.id)).toBeGreaterThan(0);
  });
});
