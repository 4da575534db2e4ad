import type { Pool } from "pg";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { closeDatabase } from "@/db/client";
import type { Member } from "@/lib/data/members";
import { getMyFarm } from "@/lib/data/my-farm";
import { withAnalystAccess } from "@/db/client";
import { getPooledResults } from "@/lib/data/pooled-results";
import { cutSetupRelease, latestRelease, releaseContents } from "@/lib/data/pooled-releases";
import { buildPooledResults, ownBlocksForChart, roundPooledResults, type OwnStrainBlocks, type PooledResults } from "@/lib/pooled";
import { seededRandom } from "@/lib/random";
import { blockedAnova, flushProfile, metaAnalysis, wilsonInterval } from "@/lib/stats";
import { removeAllReleases, superuserPool, twoDemoFarms, type DemoFarm } from "./support/database";

// Pooled figures must equal lib/stats run on the very rows they come from. The rows are read
// here by a superuser, which only a test may do; the app reaches them only as aggregates. The
// app publishes them from a release, rounded to what the page shows: the exact figures are
// computed here from the release's rows with lib/pooled and held to lib/stats, and the page to
// those exact figures rounded.

let inspector: Pool;
let farm: DemoFarm;
let oysterId: string;
let observer: Member;
let manager: Member;

interface RawBlock {
  id: string;
  farm_id: string;
  strain_id: string;
  contaminated: boolean;
  dry_g: number | null;
  finished: boolean;
  fresh_all: number | null;
  fresh_first_two: number | null;
  first_days: number | null;
}

let raw: RawBlock[];
let rawHarvests: { block_id: string; flush: number; fresh: number }[];

beforeAll(async () => {
  inspector = superuserPool();
  // Other test files change farms' rows and refresh in the background; start from settled figures
  // and a first release of exactly them.
  await inspector.query("select pooled_refresh_all()");
  await removeAllReleases(inspector);
  expect((await cutSetupRelease()).outcome).toBe("cut");
  [farm] = await twoDemoFarms(inspector);
  const { rows: species } = await inspector.query<{ id: string }>("select id from species where common_name ilike '%oyster%' limit 1");
  oysterId = species[0].id;
  const { rows: people } = await inspector.query<{ id: string; email: string; name: string; role: Member["role"]; farm_id: string | null }>(
    "select id, email, name, role, farm_id from users where role = 'observer' or id = $1",
    [farm.managerId],
  );
  const asMember = (person: (typeof people)[number]): Member => ({
    id: person.id,
    email: person.email,
    name: person.name,
    role: person.role,
    farmId: person.farm_id,
    farmName: person.farm_id ? farm.name : null,
    active: true,
    displayUnits: "metric",
    timeZone: null,
    dateStyle: "iso",
    sessionVersion: 1,
  });
  observer = asMember(people.find((person) => person.role === "observer")!);
  manager = asMember(people.find((person) => person.role === "farm_manager")!);
  ({ rows: raw } = await inspector.query<RawBlock>(
    `select b.id, b.farm_id, b.strain_id, b.contaminated, (b.wet_mass_g * (1 - b.moisture))::float8 as dry_g, b.spent_mass_g is not null as finished,
       (select sum(fresh_mass_g)::float8 from harvests h where h.block_id = b.id) as fresh_all,
       (select sum(fresh_mass_g)::float8 from harvests h where h.block_id = b.id and h.flush <= 2) as fresh_first_two,
       (select min(harvested_on) from harvests h where h.block_id = b.id) - b.inoculated_on as first_days
     from blocks b join strains s on s.id = b.strain_id where s.species_id = $1`,
    [oysterId],
  ));
  ({ rows: rawHarvests } = await inspector.query(
    "select h.block_id, h.flush, h.fresh_mass_g::float8 as fresh from harvests h join blocks b on b.id = h.block_id join strains s on s.id = b.strain_id where s.species_id = $1",
    [oysterId],
  ));
});

afterAll(async () => {
  await inspector.end();
  await closeDatabase();
});

const efficiencyOf = (block: RawBlock, fresh: number | null) =>
  !block.contaminated && block.dry_g && fresh !== null ? (100 * fresh) / block.dry_g : null;

/** The release's figures for a query, exact: lib/pooled on the release's rows, as the app computes them before rounding. */
async function exactFromRelease(speciesId: string, flushWindow: "all" | "1-2"): Promise<PooledResults> {
  return withAnalystAccess(async (tx) => {
    const release = (await latestRelease(tx))!;
    const contents = await releaseContents(tx, release.number, { speciesId, flushWindow });
    const { rows: strainList } = await inspector.query<{ id: string; name: string }>("select id, name from strains where species_id = $1", [
      speciesId,
    ]);
    return buildPooledResults({
      rows: contents.strainRows,
      flushRows: contents.flushRows,
      strains: strainList,
      filters: {},
      minimumFarms: 3,
      showPerFarmEstimates: false,
      viewerFarmId: null,
      random: seededRandom("unused: no per-farm rows for an observer"),
    });
  });
}

describe("pooled results on the demo co-op equal lib/stats on the same rows", () => {
  it("publishes exactly the release's figures, rounded to what the page shows", async () => {
    const page = await getPooledResults(observer, { speciesId: oysterId, flushWindow: "all" });
    expect(page.release?.number).toBe(1);
    expect(page.results).toEqual(roundPooledResults(await exactFromRelease(oysterId, "all")));
  });

  it("opens on the species with the most blocks in the release, not the first by name", async () => {
    const { rows } = await inspector.query<{ species_id: string }>(
      `select species_id from pooled_release_strain_rows where release_number = 1 and flush_window = 'all'
       group by species_id order by sum(blocks) desc limit 1`,
    );
    const { rows: first } = await inspector.query<{ id: string }>("select id from species order by common_name limit 1");
    // The demo co-op grows more oyster than lion's mane, which comes first by name: the check can fail.
    expect(rows[0].species_id).not.toBe(first[0].id);
    expect((await getPooledResults(observer, { flushWindow: "all" })).speciesId).toBe(rows[0].species_id);
  });

  it("matches blocks, contamination, adjusted means, farm-adjusted Tukey comparisons, heterogeneity and the flush profile", async () => {
    const results = await exactFromRelease(oysterId, "all");
    expect(results.strains.length).toBe(3);

    const observations = raw.flatMap((block) => {
      const y = efficiencyOf(block, block.fresh_all);
      return y === null ? [] : [{ treatment: block.strain_id, block: block.farm_id, y }];
    });
    const model = blockedAnova(observations);

    for (const strain of results.strains) {
      const blocks = raw.filter((block) => block.strain_id === strain.strainId);
      expect(strain.blocks).toEqual({ status: "published", value: blocks.length });
      expect(strain.farms).toEqual({ status: "published", value: new Set(blocks.map((block) => block.farm_id)).size });
      const wilson = wilsonInterval(blocks.filter((block) => block.contaminated).length, blocks.length);
      if (strain.contamination.status !== "published") throw new Error("contamination should be published");
      expect(strain.contamination.value.estimate).toBeCloseTo(100 * wilson.p, 9);
      expect(strain.contamination.value.lower).toBeCloseTo(100 * wilson.lower, 9);
      expect(strain.contamination.value.upper).toBeCloseTo(100 * wilson.upper, 9);

      const adjusted = model.means.find((mean) => mean.treatment === strain.strainId)!;
      if (strain.efficiency.status !== "published") throw new Error("BE should be published");
      expect(strain.efficiency.value.adjustedForFarm).toBe(true);
      expect(strain.efficiency.value.estimate).toBeCloseTo(adjusted.estimate, 6);
      expect(strain.efficiency.value.lower).toBeCloseTo(adjusted.lower, 6);
      expect(strain.efficiency.value.upper).toBeCloseTo(adjusted.upper, 6);

      const withDays = blocks.filter((block) => block.first_days !== null);
      if (strain.firstHarvestDays.status !== "published") throw new Error("days should be published");
      expect(strain.firstHarvestDays.value.mean).toBeCloseTo(
        withDays.reduce((sum, block) => sum + block.first_days!, 0) / withDays.length,
        9,
      );

      const finished = new Set(blocks.filter((block) => block.finished && !block.contaminated).map((block) => block.id));
      const profile = flushProfile(
        rawHarvests.filter((h) => finished.has(h.block_id)).map((h) => ({ blockId: h.block_id, flush: h.flush, freshG: h.fresh })),
      );
      if (strain.flushProfile.status !== "published") throw new Error("flush profile should be published");
      expect(strain.flushProfile.value.length).toBe(profile.length);
      strain.flushProfile.value.forEach((share, index) => {
        expect(share.meanShare).toBeCloseTo(profile[index].meanShare, 9);
        expect(share.lower).toBeCloseTo(profile[index].lower, 9);
        expect(share.cumulativeShare).toBeCloseTo(profile[index].cumulativeShare, 9);
      });
    }

    // The pairwise table comes from the same farm-blocked model as the adjusted means (no longer a
    // one-way Tukey on pooled blocks): strains in name order, each row "later name − earlier name".
    if (results.pairwise.status !== "published") throw new Error("pairwise should be published");
    const nameOrder = [...results.strains].sort((a, b) => a.strainName.localeCompare(b.strainName)).map((strain) => strain.strainId);
    const inNameOrder = blockedAnova([...observations].sort((a, b) => nameOrder.indexOf(a.treatment) - nameOrder.indexOf(b.treatment)));
    expect(results.pairwise.value).toHaveLength(inNameOrder.comparisons.length);
    results.pairwise.value.forEach((pair, index) => {
      const comparison = inNameOrder.comparisons[index];
      expect(pair.strainA).toBe(results.strains.find((strain) => strain.strainId === comparison.a)!.strainName);
      expect(pair.estimate).toBeCloseTo(-comparison.difference, 6);
      expect(pair.lower).toBeCloseTo(-comparison.upper, 6);
      expect(pair.upper).toBeCloseTo(-comparison.lower, 6);
      expect(pair.pAdjusted).toBeCloseTo(comparison.pAdjusted, 6);
    });

    if (results.heterogeneity.status !== "published") throw new Error("heterogeneity should be published");
    const reference = results.heterogeneity.value.referenceStrainId;
    for (const strain of results.heterogeneity.value.strains) {
      const studies = [...new Set(observations.map((o) => o.block))].flatMap((farmId) => {
        const a = observations.filter((o) => o.block === farmId && o.treatment === strain.strainId).map((o) => o.y);
        const b = observations.filter((o) => o.block === farmId && o.treatment === reference).map((o) => o.y);
        if (a.length < 2 || b.length < 2) return [];
        const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
        const variance = (xs: number[]) => xs.reduce((s, x) => s + (x - mean(xs)) ** 2, 0) / (xs.length - 1);
        return [{ y: mean(a) - mean(b), v: variance(a) / a.length + variance(b) / b.length }];
      });
      const pooled = metaAnalysis(studies);
      expect(strain.farms).toBe(studies.length);
      expect(strain.estimate).toBeCloseTo(pooled.random.estimate, 6);
      expect(strain.i2).toBeCloseTo(pooled.i2, 6);
      expect(strain.tau).toBeCloseTo(Math.sqrt(pooled.random.tau2), 6);
    }
  });

  it("counts only flushes 1–2 in that window", async () => {
    const page = await getPooledResults(observer, { speciesId: oysterId, flushWindow: "1-2" });
    const strain = page.results!.strains[0];
    const values = raw
      .filter((block) => block.strain_id === strain.strainId)
      .flatMap((block) => efficiencyOf(block, block.fresh_first_two) ?? []);
    if (strain.efficiency.status !== "published") throw new Error("BE should be published");
    expect(strain.efficiency.value.blocks).toBe(values.length);
  });

  it("gives an observer no own blocks and a farm manager only their farm's", async () => {
    expect((await getPooledResults(observer, { speciesId: oysterId, flushWindow: "all" })).ownBlocks).toEqual([]);
    const own = (await getPooledResults(manager, { speciesId: oysterId, flushWindow: "all" })).ownBlocks;
    const expected = raw.filter((block) => block.farm_id === farm.id && efficiencyOf(block, block.fresh_all) !== null);
    expect(own.reduce((sum, strain) => sum + strain.blocks, 0)).toBe(expected.length);
    // Which dots a strain with many blocks keeps is checked in lib/pooled/own-blocks.test.ts; here, that they come from exactly these blocks.
    const byStrain = (list: OwnStrainBlocks[]) => [...list].sort((a, b) => a.strainId.localeCompare(b.strainId));
    expect(byStrain(own)).toEqual(
      byStrain(
        ownBlocksForChart(expected.map((block) => ({ strainId: block.strain_id, efficiency: efficiencyOf(block, block.fresh_all)! }))),
      ),
    );
  });

  it("withholds every figure when the co-op raises the minimum above its farm count", async () => {
    await inspector.query("update cooperative_settings set minimum_farms = 6");
    try {
      // A change made outside this process is heard a few milliseconds after it commits (db/change-feed.ts).
      await vi.waitFor(
        async () => expect((await getPooledResults(manager, { speciesId: oysterId, flushWindow: "all" })).results?.minimumFarms).toBe(6),
        { timeout: 5_000, interval: 50 },
      );
      const page = await getPooledResults(manager, { speciesId: oysterId, flushWindow: "all" });
      for (const strain of page.results!.strains) {
        expect(strain.efficiency).toEqual({ status: "suppressed", message: "fewer than 6 farms" });
        expect(strain.contamination.status).toBe("suppressed");
        expect(strain.spread.status).toBe("suppressed");
      }
      expect(page.results!.pairwise.status).toBe("suppressed");
      const myFarm = await getMyFarm(manager);
      expect(myFarm.strains.every((strain) => strain.percentile.status === "suppressed" && strain.expectedRemaining === null)).toBe(true);
    } finally {
      await inspector.query("update cooperative_settings set minimum_farms = 3");
    }
  });

  it("places the farm in the co-op and forecasts its active blocks on My farm", async () => {
    const page = await getMyFarm(manager);
    expect(page.strains.length).toBeGreaterThan(0);
    expect(page.strains.some((strain) => strain.percentile.status === "published")).toBe(true);
    expect(page.strains.some((strain) => strain.expectedRemaining !== null)).toBe(true);
    const { rows } = await inspector.query<{ blocks: number }>("select count(*)::int as blocks from blocks where farm_id = $1", [farm.id]);
    expect(page.strains.reduce((sum, strain) => sum + strain.blocks, 0)).toBe(rows[0].blocks);
  });
});
