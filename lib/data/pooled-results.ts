import "server-only";
import { randomUUID } from "node:crypto";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { keptUntilChanged } from "@/db/change-feed";
import { withAnalystAccess } from "@/db/client";
import { cooperativeSettings, pooledReleaseStrainRows, species, strains, substrateRecipes, treatments } from "@/db/schema";
import { type Member } from "@/lib/data/members";
import { latestRelease, releaseContents, type ReleaseInfo } from "@/lib/data/pooled-releases";
import { AppError } from "@/lib/errors";
import {
  addBins,
  buildPooledResults,
  buildRegimeComparison,
  ownBlocksForChart,
  pooledFlushProfile,
  publishedSteps,
  roundPooledResults,
  roundRegimeComparison,
  roundTo,
  seasonBySeason,
  type FlushWindow,
  type OwnStrainBlocks,
  ownLeftOutNotes,
  type OwnLeftOutCounts,
  type OwnLeftOutNote,
  type PooledFilters,
  type PooledResults,
  type SeasonBreakdown,
  type RegimeComparison,
  type ReleaseSchedule,
  type ReleaseTime,
} from "@/lib/pooled";
import { calendarYear, type SeasonStart } from "@/lib/seasons";
import type { ResultsSelection } from "@/lib/pooled/results-address";
import type { FlushProfile } from "@/lib/stats";
import { seededRandom } from "@/lib/random";
import { asMember } from "./context";

export interface PooledResultsQuery {
  speciesId?: string;
  substrateRecipeId?: string;
  fruitingMethodId?: string;
  flushWindow: FlushWindow;
  /** A season's starting year: the page then leads with that season's BE (the other figures cover every season). */
  season?: number;
}

/** The data layer's query for a view read from its address. */
export function toResultsQuery(selection: ResultsSelection): PooledResultsQuery {
  return {
    speciesId: selection.species,
    substrateRecipeId: selection.recipe,
    fruitingMethodId: selection.method,
    flushWindow: selection.window,
    season: selection.season,
  };
}

export interface PooledResultsPage {
  options: {
    species: { id: string; name: string }[];
    recipes: { id: string; name: string }[];
    fruitingMethods: { id: string; name: string }[];
  };
  speciesId: string | null;
  flushWindow: FlushWindow;
  substrateRecipeId: string | null;
  fruitingMethodId: string | null;
  season: number | null;
  /** The co-op's season start, to name seasons ("2026/27"). */
  seasonStart: SeasonStart;
  /** Each strain's BE season by season, every recipe and fruiting method together (its own figure kind in a release). */
  seasons: SeasonBreakdown | null;
  /** The release the figures come from (null before the first), and when the next one may come. */
  release: ReleaseInfo | null;
  /** When releases come: the page says it on the reader's clocks (describeReleaseSchedule). */
  releaseSchedule: { schedule: ReleaseSchedule; at: ReleaseTime };
  results: PooledResults | null;
  /**
   * Contamination and BE by climate regime for the species, with the room as the unit: whatever
   * recipe, fruiting method or flush window is chosen (BE over all flushes).
   */
  regimes: RegimeComparison | null;
  /** The viewer's own blocks' biological efficiency by strain, for the boxplot overlay (farm people only). */
  ownBlocks: OwnStrainBlocks[];
  /** What keeps the viewer's own blocks out of these figures and how to fix it (farm people only; their own counts). */
  ownLeftOut: OwnLeftOutNote[];
}

/**
 * The Co-op results for one species and flush window, from the newest release (never the live
 * statistics) and rounded to what the page shows. Per-farm rows are read through the analyst
 * role and leave this function only as lib/pooled aggregates; the viewer's own blocks come live
 * through their own farm context.
 */
export async function getPooledResults(member: Member, query: PooledResultsQuery): Promise<PooledResultsPage> {
  const page = await keptPooledResults(member, query);
  const filters: PooledFilters = {
    ...(query.substrateRecipeId ? { substrateRecipeId: query.substrateRecipeId } : {}),
    ...(query.fruitingMethodId ? { fruitingMethodId: query.fruitingMethodId } : {}),
  };
  const ownBlocks = member.farmId && page.speciesId ? await keptOwnBlocks(member, page.speciesId, query.flushWindow, filters) : [];
  const ownLeftOut =
    member.farmId && page.speciesId
      ? ownLeftOutNotes(await countOwnLeftOut(member, page.speciesId), {
          byFruitingMethod: Boolean(filters.fruitingMethodId),
          byRecipe: Boolean(filters.substrateRecipeId),
        })
      : [];
  return { ...page, ownBlocks, ownLeftOut };
}

/**
 * The viewer's own blocks of a species, by strain, that lack what a pooled figure needs (through
 * their own farm's context, so row-level security holds them to it). Strains with no gap are left out.
 */
export async function countOwnLeftOut(member: Member, speciesId: string | null): Promise<OwnLeftOutCounts[]> {
  if (!member.farmId) return [];
  return asMember(member, async (tx) => {
    const result = await tx.execute<{ strain_name: string; no_dry_mass: number; no_fruiting_method: number; no_recipe: number }>(sql`
      select s.name as strain_name,
        count(*) filter (where not b.contaminated and (b.wet_mass_g is null or b.wet_mass_g <= 0 or b.moisture is null or b.moisture >= 1)
          and exists (select 1 from harvests h where h.block_id = b.id))::int as no_dry_mass,
        count(*) filter (where b.fruiting_method_id is null)::int as no_fruiting_method,
        count(*) filter (where b.substrate_recipe_id is null)::int as no_recipe
      from blocks b
      join strains s on s.id = b.strain_id
      where b.farm_id = ${member.farmId} and (${speciesId}::uuid is null or s.species_id = ${speciesId}::uuid)
      group by s.id, s.name
      order by s.name`);
    return result.rows
      .map((row) => ({
        strainName: row.strain_name,
        noDryMass: Number(row.no_dry_mass),
        noFruitingMethod: Number(row.no_fruiting_method),
        noRecipe: Number(row.no_recipe),
      }))
      .filter((row) => row.noDryMass + row.noFruitingMethod + row.noRecipe > 0);
  });
}

/**
 * The same page as JSON, for GET /api/results: built once until the statistics or the viewer's
 * farm's blocks change, as the same few queries are asked for again and again.
 */
export const getPooledResultsJson = keptUntilChanged(
  "results JSON",
  ["pooled-statistics", "blocks-and-harvests"],
  async (member: Member, query: PooledResultsQuery) => JSON.stringify(await getPooledResults(member, query)),
  resultsKey,
  500,
);

/**
 * Pooled results change only when PostgreSQL says a release was cut or the co-op's settings or
 * registers changed (db/change-feed.ts), so each process keeps the last computation per query
 * and viewer (the forest chart labels the viewer's own farm).
 */
const keptPooledResults = keptUntilChanged("results page", "pooled-statistics", computePooledResults, resultsKey, 500);

/** What a results page depends on besides the database and the viewer (who is part of every key). */
function resultsKey(query: PooledResultsQuery): string {
  return JSON.stringify([
    query.speciesId ?? null,
    query.substrateRecipeId ?? null,
    query.fruitingMethodId ?? null,
    query.flushWindow,
    query.season ?? null,
  ]);
}

async function computePooledResults(
  member: Member,
  query: PooledResultsQuery,
): Promise<Omit<PooledResultsPage, "ownBlocks" | "ownLeftOut">> {
  const analysed = await withAnalystAccess(async (tx) => {
    const [settings] = await tx.select().from(cooperativeSettings);
    const speciesList = await tx.select({ id: species.id, name: species.commonName }).from(species).orderBy(asc(species.commonName));
    const release = await latestRelease(tx);
    // The page opens on the species with the most blocks in the release, not the first by name.
    const mostBlocks = release
      ? await tx
          .select({ speciesId: pooledReleaseStrainRows.speciesId })
          .from(pooledReleaseStrainRows)
          .where(and(eq(pooledReleaseStrainRows.releaseNumber, release.number), eq(pooledReleaseStrainRows.flushWindow, "all")))
          .groupBy(pooledReleaseStrainRows.speciesId)
          .orderBy(desc(sql`sum(${pooledReleaseStrainRows.blocks})`))
          .limit(1)
      : [];
    const speciesId = query.speciesId ?? mostBlocks[0]?.speciesId ?? speciesList[0]?.id ?? null;
    if (query.speciesId && !speciesList.some((entry) => entry.id === query.speciesId)) {
      throw new AppError("not_found", "That species is not in the co-op's list. Choose one from the list.");
    }
    const recipes = await tx
      .select({ id: substrateRecipes.id, name: substrateRecipes.name })
      .from(substrateRecipes)
      .orderBy(asc(substrateRecipes.name));
    const methods = await tx
      .select({ id: treatments.id, name: treatments.name })
      .from(treatments)
      .where(eq(treatments.kind, "fruiting_method"))
      .orderBy(asc(treatments.name));
    const regimeKinds = await tx
      .select({ id: treatments.id, name: treatments.name })
      .from(treatments)
      .where(eq(treatments.kind, "humidity"))
      .orderBy(asc(treatments.name));
    if (query.substrateRecipeId && !recipes.some((entry) => entry.id === query.substrateRecipeId)) {
      throw new AppError("not_found", "That substrate recipe is not in the co-op's register. Choose one from the list.");
    }
    if (query.fruitingMethodId && !methods.some((entry) => entry.id === query.fruitingMethodId)) {
      throw new AppError("not_found", "That fruiting method is not in the co-op's register. Choose one from the list.");
    }
    if (!speciesId || !release)
      return {
        settings,
        speciesList,
        recipes,
        methods,
        speciesId,
        release,
        rows: [],
        flushRows: [],
        seasonRows: [],
        dryingRows: [],
        regimeRows: [],
        regimeKinds,
        strainList: [],
      };
    const strainList = await tx.select({ id: strains.id, name: strains.name }).from(strains).where(eq(strains.speciesId, speciesId));
    const contents = await releaseContents(tx, release.number, { speciesId, flushWindow: query.flushWindow });
    return {
      dryingRows: contents.dryingRows,
      regimeRows: contents.regimeRows,
      regimeKinds,
      settings,
      speciesList,
      recipes,
      methods,
      speciesId,
      release,
      rows: contents.strainRows,
      flushRows: contents.flushRows,
      seasonRows: contents.seasonRows,
      strainList,
    };
  });

  const filters: PooledFilters = {
    ...(query.substrateRecipeId ? { substrateRecipeId: query.substrateRecipeId } : {}),
    ...(query.fruitingMethodId ? { fruitingMethodId: query.fruitingMethodId } : {}),
  };
  const results =
    analysed.speciesId && analysed.release
      ? roundPooledResults(
          buildPooledResults({
            rows: analysed.rows,
            flushRows: analysed.flushRows,
            dryingRows: analysed.dryingRows,
            strains: analysed.strainList,
            filters,
            minimumFarms: analysed.settings?.minimumFarms ?? 3,
            showPerFarmEstimates: analysed.settings?.showPerFarmEstimates ?? false,
            viewerFarmId: member.farmId,
            // A fresh order on every computation, so a row's place says nothing about which farm it is.
            random: seededRandom(randomUUID()),
          }),
        )
      : null;
  const minimumFarms = analysed.settings?.minimumFarms ?? 3;
  const regimes =
    analysed.speciesId && analysed.release && analysed.regimeRows.length > 0
      ? roundRegimeComparison(buildRegimeComparison({ rows: analysed.regimeRows, regimes: analysed.regimeKinds, minimumFarms }))
      : null;

  return {
    options: { species: analysed.speciesList, recipes: analysed.recipes, fruitingMethods: analysed.methods },
    speciesId: analysed.speciesId,
    flushWindow: query.flushWindow,
    substrateRecipeId: query.substrateRecipeId ?? null,
    fruitingMethodId: query.fruitingMethodId ?? null,
    season: query.season ?? null,
    seasonStart: analysed.settings ? { month: analysed.settings.seasonStartMonth, day: analysed.settings.seasonStartDay } : calendarYear,
    seasons:
      analysed.speciesId && analysed.release
        ? seasonBySeason({
            rows: analysed.seasonRows,
            strains: analysed.strainList,
            minimumFarms: analysed.settings?.minimumFarms ?? 3,
          })
        : null,
    release: analysed.release,
    releaseSchedule: {
      schedule: analysed.settings?.releaseSchedule ?? "daily",
      at: { hour: analysed.settings?.releaseHour ?? 2, timeZone: analysed.settings?.releaseTimeZone ?? "UTC" },
    },
    results,
    regimes,
  };
}

const windowLastFlush: Record<FlushWindow, number> = { all: 1_000_000, "1-2": 2, "1": 1 };

/** The viewer's own blocks' BE under the same definition as the pooled statistics (row-level security limits it to their farm). */
async function listOwnBlocks(member: Member, speciesId: string, window: FlushWindow, filters: PooledFilters): Promise<OwnStrainBlocks[]> {
  return asMember(member, async (tx) => {
    const result = await tx.execute<{ strain_id: string; efficiency: number }>(sql`
      select b.strain_id, 100 * sum(h.fresh_mass_g)::float8 / (b.wet_mass_g * (1 - b.moisture))::float8 as efficiency
      from blocks b
      join strains s on s.id = b.strain_id
      join harvests h on h.block_id = b.id and h.flush <= ${windowLastFlush[window]}
      where s.species_id = ${speciesId} and not b.contaminated and b.wet_mass_g > 0 and b.moisture is not null
        and (${filters.substrateRecipeId ?? null}::uuid is null or b.substrate_recipe_id = ${filters.substrateRecipeId ?? null}::uuid)
        and (${filters.fruitingMethodId ?? null}::uuid is null or b.fruiting_method_id = ${filters.fruitingMethodId ?? null}::uuid)
      group by b.id, b.strain_id, b.wet_mass_g, b.moisture`);
    return ownBlocksForChart(result.rows.map((row) => ({ strainId: row.strain_id, efficiency: Number(row.efficiency) })));
  });
}

/** Kept per farm until blocks or harvests change: for a farm of 10 000 blocks the query takes 0.2 s warm, 0.5 s cold. */
const keptOwnBlocks = keptUntilChanged(
  "own blocks",
  "blocks-and-harvests",
  listOwnBlocks,
  (speciesId, window, filters) => JSON.stringify([speciesId, window, filters.substrateRecipeId ?? null, filters.fruitingMethodId ?? null]),
  200,
);

export interface CoopStrainBenchmark {
  /** Block BE bins over at least the minimum number of farms, or null when suppressed. */
  bins: Record<string, number> | null;
  /** The pooled flush profile over at least the minimum number of farms, at the published step, or null. */
  profile: FlushProfile | null;
}

/**
 * Per strain, the co-op's unfiltered block-BE distribution and flush profile (all flushes) from
 * the newest release, each only where at least the minimum number of farms contributed. For My
 * farm's percentile and forecast; the bins never leave the server, only figures computed from them.
 */
export async function getCoopStrainBenchmarks(
  strainIds: string[],
): Promise<{ minimumFarms: number; byStrain: Map<string, CoopStrainBenchmark> }> {
  return withAnalystAccess(async (tx) => {
    const [settings] = await tx.select({ minimumFarms: cooperativeSettings.minimumFarms }).from(cooperativeSettings);
    const minimumFarms = settings?.minimumFarms ?? 3;
    const release = await latestRelease(tx);
    if (strainIds.length === 0 || !release) return { minimumFarms, byStrain: new Map() };
    const wanted = new Set(strainIds);
    const contents = await releaseContents(tx, release.number, { flushWindow: "all" });
    const rows = contents.strainRows.filter((row) => wanted.has(row.strainId));
    const flushRows = contents.flushRows.filter((row) => wanted.has(row.strainId));
    const byStrain = new Map<string, CoopStrainBenchmark>();
    for (const strainId of strainIds) {
      const strainRows = rows.filter((row) => row.strainId === strainId && row.efficiencyBlocks > 0);
      const binFarms = new Set(strainRows.map((row) => row.farmId)).size;
      const strainFlushRows = flushRows.filter((row) => row.strainId === strainId && row.finishedBlocks > 0);
      const flushFarms = new Set(strainFlushRows.map((row) => row.farmId)).size;
      const profile = flushFarms >= minimumFarms ? pooledFlushProfile(strainFlushRows) : null;
      byStrain.set(strainId, {
        bins:
          binFarms >= minimumFarms ? strainRows.reduce<Record<string, number>>((sum, row) => addBins(sum, row.efficiencyBins), {}) : null,
        // At the step the Co-op results publish, so a forecast cannot be turned back into finer shares.
        profile:
          profile?.map((share) => ({
            ...share,
            meanShare: roundTo(share.meanShare, publishedSteps.flushShare),
            lower: roundTo(share.lower, publishedSteps.flushShare),
            upper: roundTo(share.upper, publishedSteps.flushShare),
            cumulativeShare: roundTo(share.cumulativeShare, publishedSteps.flushShare),
            cumulativeLower: roundTo(share.cumulativeLower, publishedSteps.flushShare),
            cumulativeUpper: roundTo(share.cumulativeUpper, publishedSteps.flushShare),
          })) ?? null,
      });
    }
    return { minimumFarms, byStrain };
  });
}

/** The co-op's share of yield by flush for one strain, as Co-op results publish it, or why it is withheld. */
export type StrainFlushCurve =
  { status: "published"; releaseNumber: number; shares: { flush: number; meanShare: number }[] } | { status: "withheld"; message: string };

/**
 * One strain's pooled flush profile (any recipe, any fruiting method, all flushes) from the newest
 * release, under the same rule and at the same step as "Strains side by side": published only where
 * at least the co-op's minimum number of farms have finished blocks of it. Never computed live.
 */
export async function getStrainFlushCurve(strainId: string): Promise<StrainFlushCurve> {
  return withAnalystAccess(async (tx) => {
    const [settings] = await tx.select({ minimumFarms: cooperativeSettings.minimumFarms }).from(cooperativeSettings);
    const minimumFarms = settings?.minimumFarms ?? 3;
    const release = await latestRelease(tx);
    if (!release) return { status: "withheld", message: "The co-op has published no release of its pooled figures yet." };
    const [strain] = await tx.select({ speciesId: strains.speciesId }).from(strains).where(eq(strains.id, strainId));
    if (!strain) return { status: "withheld", message: "This strain is not in the co-op's register." };
    const contents = await releaseContents(tx, release.number, { speciesId: strain.speciesId });
    const flushRows = contents.flushRows.filter((row) => row.strainId === strainId);
    const farms = new Set(flushRows.filter((row) => row.finishedBlocks > 0).map((row) => row.farmId)).size;
    const why = `withheld in release ${release.number}`;
    if (farms < minimumFarms)
      return {
        status: "withheld",
        message: `The co-op's curve for this strain is ${why}: fewer than ${minimumFarms} farms have finished blocks of it (spent mass weighed), and a curve from fewer could show one farm's harvests.`,
      };
    const profile = pooledFlushProfile(flushRows);
    if (!profile) return { status: "withheld", message: `The co-op's curve for this strain is ${why}: not enough finished blocks yet.` };
    return {
      status: "published",
      releaseNumber: release.number,
      shares: profile.map((share) => ({ flush: share.flush, meanShare: roundTo(share.meanShare, publishedSteps.flushShare) })),
    };
  });
}
