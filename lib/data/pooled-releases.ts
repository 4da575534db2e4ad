import "server-only";
import { desc, eq, sql } from "drizzle-orm";
import { withAnalystAccess, type Transaction } from "@/db/client";
import {
  cooperativeSettings,
  pooledReleaseDryingRows,
  pooledReleaseFlushRows,
  pooledReleaseRegimeRows,
  pooledReleases,
  pooledReleaseSchedule,
  pooledReleaseSeasonRows,
  pooledReleaseStrainRows,
  strains,
  treatments,
} from "@/db/schema";
import { actor, recordAudit } from "@/lib/data/audit";
import { type Member } from "@/lib/data/members";
import { getPooledUpdating } from "@/lib/data/pooled-refresh";
import { AppError } from "@/lib/errors";
import {
  addTrialArms,
  emptyReleaseContents,
  latestReleaseSlot,
  nextReleaseSlot,
  planRelease,
  regimeStatisticsRows,
  releaseFigureLabels,
  type RegimeBlock,
  type RegimeMove,
  type RegimeStatisticsRow,
  type ReleaseContents,
  type ReleaseDryingRow,
  type ReleaseFigureKind,
  type ReleaseFlushRow,
  type ReleasePlan,
  type ReleaseSchedule,
  type ReleaseSeasonRow,
  type ReleaseTime,
  type ReleaseStrainRow,
  type RoomRegime,
} from "@/lib/pooled";
import { asMember } from "./context";

/** A release as the pages name it. */
export interface ReleaseInfo {
  number: number;
  cutAt: string;
}

/** Strains whose figures wait, and for what: no farm ids, no cells, only how far the count is from the minimum. */
export interface WaitingFigures {
  strainName: string;
  figures: string[];
  /** The most farms that changed any one of them since the last release. */
  farmsChanged: number;
}

export type ReleaseAttempt =
  | { outcome: "cut"; release: ReleaseInfo; figuresChanged: number; waiting: WaitingFigures[]; farmsChanged: number; minimumFarms: number }
  | { outcome: "waiting"; farmsChanged: number; minimumFarms: number; waiting: WaitingFigures[] }
  | { outcome: "unchanged"; minimumFarms: number }
  | { outcome: "not_due"; nextDueAt: string | null };

// Every cut, scheduled or by hand, in every process, waits for this lock: one at a time, and the
// second sees the first's release.
const releaseLock = sql`select pg_advisory_xact_lock(hashtextextended('pooled-release', 0))`;

/** The newest release, or null before the first. */
export async function latestRelease(tx: Transaction): Promise<ReleaseInfo | null> {
  const [row] = await tx
    .select({ number: pooledReleases.number, cutAt: pooledReleases.cutAt })
    .from(pooledReleases)
    .orderBy(desc(pooledReleases.number))
    .limit(1);
  return row ? { number: row.number, cutAt: row.cutAt.toISOString() } : null;
}

/**
 * Every farm's live statistics, trial arms added together, read in one statement so one snapshot
 * sees all of them. The drying ratio and the figures by climate regime have no statistics table:
 * they are made here, on the release path, from the columns the analyst may read (0041, 0047), the
 * regimes' in lib/pooled (rooms and regimes matched by date there, with lib/rooms).
 */
async function liveContents(tx: Transaction): Promise<ReleaseContents> {
  const result = await tx.execute<{
    strain_rows: ReleaseStrainRow[];
    flush_rows: ReleaseFlushRow[];
    season_rows: ReleaseSeasonRow[];
    drying_rows: ReleaseDryingRow[];
    regime_blocks: RegimeBlock[];
    moves: RegimeMove[];
    regimes: RoomRegime[];
  }>(sql`
    select
      (select coalesce(json_agg(s), '[]') from (
        select farm_id as "farmId", species_id as "speciesId", strain_id as "strainId", substrate_recipe_id as "substrateRecipeId",
          fruiting_method_id as "fruitingMethodId", flush_window as "flushWindow", blocks, blocks_contaminated as "blocksContaminated",
          efficiency_blocks as "efficiencyBlocks", efficiency_sum as "efficiencySum", efficiency_squares as "efficiencySquares",
          efficiency_bins as "efficiencyBins", first_harvest_blocks as "firstHarvestBlocks", first_harvest_days_sum as "firstHarvestDaysSum"
        from farm_strain_statistics) s) as strain_rows,
      (select coalesce(json_agg(f), '[]') from (
        select farm_id as "farmId", species_id as "speciesId", strain_id as "strainId", substrate_recipe_id as "substrateRecipeId",
          fruiting_method_id as "fruitingMethodId", flush, sum(finished_blocks)::int as "finishedBlocks",
          sum(blocks_fruiting)::int as "blocksFruiting", sum(share_sum) as "shareSum", sum(share_squares) as "shareSquares",
          sum(cumulative_sum) as "cumulativeSum", sum(cumulative_squares) as "cumulativeSquares"
        from farm_flush_statistics
        group by farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, flush) f) as flush_rows,
      (select coalesce(json_agg(z), '[]') from (
        select farm_id as "farmId", species_id as "speciesId", strain_id as "strainId", substrate_recipe_id as "substrateRecipeId",
          fruiting_method_id as "fruitingMethodId", season_year as "seasonYear", flush_window as "flushWindow",
          efficiency_blocks as "efficiencyBlocks", efficiency_sum as "efficiencySum", efficiency_squares as "efficiencySquares"
        from farm_season_statistics) z) as season_rows,
      -- A block's drying ratio is its dried harvests' dry mass over their fresh mass; a harvest whose
      -- dry mass exceeds its fresh mass cannot be right and is left out.
      (select coalesce(json_agg(d), '[]') from (
        select b.farm_id as "farmId", strain.species_id as "speciesId", b.strain_id as "strainId",
          b.substrate_recipe_id as "substrateRecipeId", b.fruiting_method_id as "fruitingMethodId",
          count(*)::int as "driedBlocks", sum(r.ratio) as "ratioSum", sum(r.ratio * r.ratio) as "ratioSquares"
        from (
          select block_id, sum(dry_mass_g)::float8 / sum(fresh_mass_g)::float8 as ratio from harvests
          where dry_mass_g is not null and fresh_mass_g > 0 and dry_mass_g <= fresh_mass_g
          group by block_id
        ) r
        join blocks b on b.id = r.block_id
        join strains strain on strain.id = b.strain_id
        group by 1, 2, 3, 4, 5) d) as drying_rows,
      (select coalesce(json_agg(rb), '[]') from (
        select b.id, b.farm_id as "farmId", strain.species_id as "speciesId", b.contaminated, b.contaminated_on::text as "contaminatedOn",
          case when not b.contaminated and b.wet_mass_g > 0 and b.moisture < 1 then (b.wet_mass_g * (1 - b.moisture))::float8 end as "dryG",
          h.fresh as "freshG", h.first_on::text as "firstHarvestOn"
        from blocks b
        join strains strain on strain.id = b.strain_id
        left join (
          select block_id, sum(fresh_mass_g)::float8 as fresh, min(harvested_on) as first_on from harvests
          where block_id in (select block_id from block_room_moves)
          group by block_id
        ) h on h.block_id = b.id
        where b.id in (select block_id from block_room_moves)) rb) as regime_blocks,
      (select coalesce(json_agg(m), '[]') from (
        select block_id as "blockId", room_id as "roomId", moved_on::text as "movedOn" from block_room_moves) m) as moves,
      (select coalesce(json_agg(g), '[]') from (
        select room_id as "roomId", starts_on::text as "startsOn", regime_kind_id as "regimeKindId" from room_regimes) g) as regimes`);
  const [row] = result.rows;
  return {
    strainRows: addTrialArms(row.strain_rows),
    flushRows: row.flush_rows,
    seasonRows: row.season_rows,
    dryingRows: row.drying_rows,
    regimeRows: regimeStatisticsRows(row.regime_blocks, row.moves, row.regimes),
  };
}

const strainColumns = {
  farmId: pooledReleaseStrainRows.farmId,
  speciesId: pooledReleaseStrainRows.speciesId,
  strainId: pooledReleaseStrainRows.strainId,
  substrateRecipeId: pooledReleaseStrainRows.substrateRecipeId,
  fruitingMethodId: pooledReleaseStrainRows.fruitingMethodId,
  flushWindow: pooledReleaseStrainRows.flushWindow,
  blocks: pooledReleaseStrainRows.blocks,
  blocksContaminated: pooledReleaseStrainRows.blocksContaminated,
  efficiencyBlocks: pooledReleaseStrainRows.efficiencyBlocks,
  efficiencySum: pooledReleaseStrainRows.efficiencySum,
  efficiencySquares: pooledReleaseStrainRows.efficiencySquares,
  efficiencyBins: pooledReleaseStrainRows.efficiencyBins,
  firstHarvestBlocks: pooledReleaseStrainRows.firstHarvestBlocks,
  firstHarvestDaysSum: pooledReleaseStrainRows.firstHarvestDaysSum,
};

const flushColumns = {
  farmId: pooledReleaseFlushRows.farmId,
  speciesId: pooledReleaseFlushRows.speciesId,
  strainId: pooledReleaseFlushRows.strainId,
  substrateRecipeId: pooledReleaseFlushRows.substrateRecipeId,
  fruitingMethodId: pooledReleaseFlushRows.fruitingMethodId,
  flush: pooledReleaseFlushRows.flush,
  finishedBlocks: pooledReleaseFlushRows.finishedBlocks,
  blocksFruiting: pooledReleaseFlushRows.blocksFruiting,
  shareSum: pooledReleaseFlushRows.shareSum,
  shareSquares: pooledReleaseFlushRows.shareSquares,
  cumulativeSum: pooledReleaseFlushRows.cumulativeSum,
  cumulativeSquares: pooledReleaseFlushRows.cumulativeSquares,
};

const seasonColumns = {
  farmId: pooledReleaseSeasonRows.farmId,
  speciesId: pooledReleaseSeasonRows.speciesId,
  strainId: pooledReleaseSeasonRows.strainId,
  substrateRecipeId: pooledReleaseSeasonRows.substrateRecipeId,
  fruitingMethodId: pooledReleaseSeasonRows.fruitingMethodId,
  seasonYear: pooledReleaseSeasonRows.seasonYear,
  flushWindow: pooledReleaseSeasonRows.flushWindow,
  efficiencyBlocks: pooledReleaseSeasonRows.efficiencyBlocks,
  efficiencySum: pooledReleaseSeasonRows.efficiencySum,
  efficiencySquares: pooledReleaseSeasonRows.efficiencySquares,
};

const dryingColumns = {
  farmId: pooledReleaseDryingRows.farmId,
  speciesId: pooledReleaseDryingRows.speciesId,
  strainId: pooledReleaseDryingRows.strainId,
  substrateRecipeId: pooledReleaseDryingRows.substrateRecipeId,
  fruitingMethodId: pooledReleaseDryingRows.fruitingMethodId,
  driedBlocks: pooledReleaseDryingRows.driedBlocks,
  ratioSum: pooledReleaseDryingRows.ratioSum,
  ratioSquares: pooledReleaseDryingRows.ratioSquares,
};

const regimeColumns = {
  farmId: pooledReleaseRegimeRows.farmId,
  speciesId: pooledReleaseRegimeRows.speciesId,
  regimeKindId: pooledReleaseRegimeRows.regimeKindId,
  rooms: pooledReleaseRegimeRows.rooms,
  blocks: pooledReleaseRegimeRows.blocks,
  blocksContaminated: pooledReleaseRegimeRows.blocksContaminated,
  contaminationRoomSum: pooledReleaseRegimeRows.contaminationRoomSum,
  contaminationRoomSquares: pooledReleaseRegimeRows.contaminationRoomSquares,
  efficiencyRooms: pooledReleaseRegimeRows.efficiencyRooms,
  efficiencyRoomSum: pooledReleaseRegimeRows.efficiencyRoomSum,
  efficiencyRoomSquares: pooledReleaseRegimeRows.efficiencyRoomSquares,
  efficiencyBlocks: pooledReleaseRegimeRows.efficiencyBlocks,
  blockEfficiencySum: pooledReleaseRegimeRows.blockEfficiencySum,
  blockEfficiencySquares: pooledReleaseRegimeRows.blockEfficiencySquares,
  roomWeightedSquares: pooledReleaseRegimeRows.roomWeightedSquares,
  roomSizeSquares: pooledReleaseRegimeRows.roomSizeSquares,
};

/** A release's rows; `speciesId` and `flushWindow` narrow them to what one results page needs. */
export async function releaseContents(
  tx: Transaction,
  releaseNumber: number,
  only: { speciesId?: string; flushWindow?: ReleaseStrainRow["flushWindow"] } = {},
): Promise<ReleaseContents> {
  const strainFilter = [
    sql`${pooledReleaseStrainRows.releaseNumber} = ${releaseNumber}`,
    ...(only.speciesId ? [sql`${pooledReleaseStrainRows.speciesId} = ${only.speciesId}`] : []),
    ...(only.flushWindow ? [sql`${pooledReleaseStrainRows.flushWindow} = ${only.flushWindow}`] : []),
  ];
  const flushFilter = [
    sql`${pooledReleaseFlushRows.releaseNumber} = ${releaseNumber}`,
    ...(only.speciesId ? [sql`${pooledReleaseFlushRows.speciesId} = ${only.speciesId}`] : []),
  ];
  const strainRows = (await tx
    .select(strainColumns)
    .from(pooledReleaseStrainRows)
    .where(sql.join(strainFilter, sql` and `))) as ReleaseStrainRow[];
  const flushRows = await tx
    .select(flushColumns)
    .from(pooledReleaseFlushRows)
    .where(sql.join(flushFilter, sql` and `));
  const seasonFilter = [
    sql`${pooledReleaseSeasonRows.releaseNumber} = ${releaseNumber}`,
    ...(only.speciesId ? [sql`${pooledReleaseSeasonRows.speciesId} = ${only.speciesId}`] : []),
    ...(only.flushWindow ? [sql`${pooledReleaseSeasonRows.flushWindow} = ${only.flushWindow}`] : []),
  ];
  const seasonRows = (await tx
    .select(seasonColumns)
    .from(pooledReleaseSeasonRows)
    .where(sql.join(seasonFilter, sql` and `))) as ReleaseSeasonRow[];
  const bySpecies = <T extends typeof pooledReleaseDryingRows | typeof pooledReleaseRegimeRows>(table: T) =>
    sql.join(
      [sql`${table.releaseNumber} = ${releaseNumber}`, ...(only.speciesId ? [sql`${table.speciesId} = ${only.speciesId}`] : [])],
      sql` and `,
    );
  const dryingRows = await tx.select(dryingColumns).from(pooledReleaseDryingRows).where(bySpecies(pooledReleaseDryingRows));
  const regimeRows: RegimeStatisticsRow[] = await tx
    .select(regimeColumns)
    .from(pooledReleaseRegimeRows)
    .where(bySpecies(pooledReleaseRegimeRows));
  return { strainRows, flushRows, seasonRows, dryingRows, regimeRows };
}

const insertSlice = 5000;

async function writeRelease(
  tx: Transaction,
  number: number,
  plan: ReleasePlan,
  cutBy: "schedule" | "coordinator" | "setup",
  minimumFarms: number,
) {
  const [release] = await tx
    .insert(pooledReleases)
    .values({
      number,
      cutBy,
      minimumFarms,
      farmsChanged: plan.farmsChanged,
      figuresChanged: plan.figuresChanged,
      figuresHeldBack: plan.heldBack.length,
    })
    .returning({ number: pooledReleases.number, cutAt: pooledReleases.cutAt });
  // Sent as JSON and unpacked by PostgreSQL: one parameter per slice instead of fifteen per row.
  for (let start = 0; start < plan.next.strainRows.length; start += insertSlice) {
    const slice = plan.next.strainRows.slice(start, start + insertSlice);
    await tx.execute(sql`
      insert into pooled_release_strain_rows (release_number, farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id,
        flush_window, blocks, blocks_contaminated, efficiency_blocks, efficiency_sum, efficiency_squares, efficiency_bins,
        first_harvest_blocks, first_harvest_days_sum)
      select ${number}, r."farmId", r."speciesId", r."strainId", r."substrateRecipeId", r."fruitingMethodId", r."flushWindow", r.blocks,
        r."blocksContaminated", r."efficiencyBlocks", r."efficiencySum", r."efficiencySquares", r."efficiencyBins", r."firstHarvestBlocks",
        r."firstHarvestDaysSum"
      from json_to_recordset(${JSON.stringify(slice)}::json) as r("farmId" uuid, "speciesId" uuid, "strainId" uuid, "substrateRecipeId" uuid,
        "fruitingMethodId" uuid, "flushWindow" text, blocks int, "blocksContaminated" int, "efficiencyBlocks" int, "efficiencySum" float8,
        "efficiencySquares" float8, "efficiencyBins" jsonb, "firstHarvestBlocks" int, "firstHarvestDaysSum" float8)`);
  }
  for (let start = 0; start < plan.next.flushRows.length; start += insertSlice) {
    const slice = plan.next.flushRows.slice(start, start + insertSlice);
    await tx.execute(sql`
      insert into pooled_release_flush_rows (release_number, farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id,
        flush, finished_blocks, blocks_fruiting, share_sum, share_squares, cumulative_sum, cumulative_squares)
      select ${number}, r."farmId", r."speciesId", r."strainId", r."substrateRecipeId", r."fruitingMethodId", r.flush, r."finishedBlocks",
        r."blocksFruiting", r."shareSum", r."shareSquares", r."cumulativeSum", r."cumulativeSquares"
      from json_to_recordset(${JSON.stringify(slice)}::json) as r("farmId" uuid, "speciesId" uuid, "strainId" uuid, "substrateRecipeId" uuid,
        "fruitingMethodId" uuid, flush int, "finishedBlocks" int, "blocksFruiting" int, "shareSum" float8, "shareSquares" float8,
        "cumulativeSum" float8, "cumulativeSquares" float8)`);
  }
  for (let start = 0; start < plan.next.seasonRows.length; start += insertSlice) {
    const slice = plan.next.seasonRows.slice(start, start + insertSlice);
    await tx.execute(sql`
      insert into pooled_release_season_rows (release_number, farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id,
        season_year, flush_window, efficiency_blocks, efficiency_sum, efficiency_squares)
      select ${number}, r."farmId", r."speciesId", r."strainId", r."substrateRecipeId", r."fruitingMethodId", r."seasonYear",
        r."flushWindow", r."efficiencyBlocks", r."efficiencySum", r."efficiencySquares"
      from json_to_recordset(${JSON.stringify(slice)}::json) as r("farmId" uuid, "speciesId" uuid, "strainId" uuid, "substrateRecipeId" uuid,
        "fruitingMethodId" uuid, "seasonYear" int, "flushWindow" text, "efficiencyBlocks" int, "efficiencySum" float8,
        "efficiencySquares" float8)`);
  }
  for (let start = 0; start < plan.next.dryingRows.length; start += insertSlice) {
    const slice = plan.next.dryingRows.slice(start, start + insertSlice);
    await tx.execute(sql`
      insert into pooled_release_drying_rows (release_number, farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id,
        dried_blocks, ratio_sum, ratio_squares)
      select ${number}, r."farmId", r."speciesId", r."strainId", r."substrateRecipeId", r."fruitingMethodId", r."driedBlocks", r."ratioSum",
        r."ratioSquares"
      from json_to_recordset(${JSON.stringify(slice)}::json) as r("farmId" uuid, "speciesId" uuid, "strainId" uuid, "substrateRecipeId" uuid,
        "fruitingMethodId" uuid, "driedBlocks" int, "ratioSum" float8, "ratioSquares" float8)`);
  }
  for (let start = 0; start < plan.next.regimeRows.length; start += insertSlice) {
    const slice = plan.next.regimeRows.slice(start, start + insertSlice);
    await tx.execute(sql`
      insert into pooled_release_regime_rows (release_number, farm_id, species_id, regime_kind_id, rooms, blocks, blocks_contaminated,
        contamination_room_sum, contamination_room_squares, efficiency_rooms, efficiency_room_sum, efficiency_room_squares, efficiency_blocks,
        block_efficiency_sum, block_efficiency_squares, room_weighted_squares, room_size_squares)
      select ${number}, r."farmId", r."speciesId", r."regimeKindId", r.rooms, r.blocks, r."blocksContaminated", r."contaminationRoomSum",
        r."contaminationRoomSquares", r."efficiencyRooms", r."efficiencyRoomSum", r."efficiencyRoomSquares", r."efficiencyBlocks",
        r."blockEfficiencySum", r."blockEfficiencySquares", r."roomWeightedSquares", r."roomSizeSquares"
      from json_to_recordset(${JSON.stringify(slice)}::json) as r("farmId" uuid, "speciesId" uuid, "regimeKindId" uuid, rooms int,
        blocks int, "blocksContaminated" int, "contaminationRoomSum" float8, "contaminationRoomSquares" float8, "efficiencyRooms" int,
        "efficiencyRoomSum" float8, "efficiencyRoomSquares" float8, "efficiencyBlocks" int, "blockEfficiencySum" float8,
        "blockEfficiencySquares" float8, "roomWeightedSquares" float8, "roomSizeSquares" float8)`);
  }
  return { number: release.number, cutAt: release.cutAt.toISOString() };
}

/**
 * What waits, by strain name (or climate regime, for the figures by regime): the coordinator sees
 * which strains and how many farms are still needed, never which farms or cells.
 */
async function waitingByStrain(tx: Transaction, plan: ReleasePlan): Promise<WaitingFigures[]> {
  if (plan.heldBack.length === 0) return [];
  const names = new Map((await tx.select({ id: strains.id, name: strains.name }).from(strains)).map((row) => [row.id, row.name]));
  const regimeNames = new Map(
    (await tx.select({ id: treatments.id, name: treatments.name }).from(treatments)).map((row) => [row.id, `Climate regime ${row.name}`]),
  );
  const byStrain = new Map<string, { kinds: Set<ReleaseFigureKind>; farmsChanged: number }>();
  for (const figure of plan.heldBack) {
    const key = figure.regimeKindId ?? figure.strainId;
    const entry = byStrain.get(key) ?? { kinds: new Set(), farmsChanged: 0 };
    entry.kinds.add(figure.kind);
    entry.farmsChanged = Math.max(entry.farmsChanged, figure.farmsChanged);
    byStrain.set(key, entry);
  }
  return [...byStrain]
    .map(([strainId, entry]) => ({
      strainName: names.get(strainId) ?? regimeNames.get(strainId) ?? "A strain no longer in the registry",
      figures: [...entry.kinds].map((kind) => releaseFigureLabels[kind]),
      farmsChanged: entry.farmsChanged,
    }))
    .sort((a, b) => a.strainName.localeCompare(b.strainName));
}

async function minimumFarmsNow(tx: Transaction): Promise<number> {
  const [settings] = await tx.select({ minimumFarms: cooperativeSettings.minimumFarms }).from(cooperativeSettings);
  return settings?.minimumFarms ?? 3;
}

/** The next release as it would be now, against the newest one. */
async function planNext(tx: Transaction) {
  const minimumFarms = await minimumFarmsNow(tx);
  const previous = await latestRelease(tx);
  const before = previous ? await releaseContents(tx, previous.number) : emptyReleaseContents;
  const plan = planRelease(before, await liveContents(tx), minimumFarms);
  return { plan, previous, minimumFarms, waiting: await waitingByStrain(tx, plan) };
}

/** What a plan comes to: a release (with its number and time), a release that waits, or nothing new. */
function outcomeOf(
  { plan, minimumFarms, waiting }: Awaited<ReturnType<typeof planNext>>,
  release: ReleaseInfo,
): Exclude<ReleaseAttempt, { outcome: "not_due" }> {
  if (plan.figuresChanged > 0)
    return { outcome: "cut", release, figuresChanged: plan.figuresChanged, waiting, farmsChanged: plan.farmsChanged, minimumFarms };
  return plan.heldBack.length
    ? { outcome: "waiting", farmsChanged: plan.farmsChanged, minimumFarms, waiting }
    : { outcome: "unchanged", minimumFarms };
}

/** Plans against the newest release and, if any figure may change, writes the next one. Call with the release lock held. */
async function cutInTransaction(tx: Transaction, cutBy: "schedule" | "coordinator" | "setup"): Promise<ReleaseAttempt> {
  const next = await planNext(tx);
  if (next.plan.figuresChanged === 0) return outcomeOf(next, { number: next.previous?.number ?? 0, cutAt: "" });
  return outcomeOf(next, await writeRelease(tx, (next.previous?.number ?? 0) + 1, next.plan, cutBy, next.minimumFarms));
}

/**
 * The scheduled job's one call (pg-boss, every few minutes or hourly): cuts a release if the
 * co-op's schedule says one is due and this slot has not been tried yet; otherwise does nothing.
 * Safe to run twice at once, in two processes: the release lock makes the second wait and then
 * find the slot tried. A slot is tried once: if too few farms changed, the release waits for the
 * next slot (or the coordinator).
 */
export async function cutReleaseIfDue(now: Date = new Date()): Promise<ReleaseAttempt> {
  return withAnalystAccess(async (tx) => {
    await tx.execute(releaseLock);
    const [settings] = await tx
      .select({
        schedule: cooperativeSettings.releaseSchedule,
        hour: cooperativeSettings.releaseHour,
        timeZone: cooperativeSettings.releaseTimeZone,
      })
      .from(cooperativeSettings);
    const schedule = settings?.schedule ?? "daily";
    const at: ReleaseTime = { hour: settings?.hour ?? 2, timeZone: settings?.timeZone ?? "UTC" };
    const slot = latestReleaseSlot(now, schedule, at);
    const [state] = await tx.select({ lastAttemptAt: pooledReleaseSchedule.lastAttemptAt }).from(pooledReleaseSchedule);
    if (!slot || (state?.lastAttemptAt && state.lastAttemptAt >= slot)) {
      return { outcome: "not_due", nextDueAt: nextReleaseSlot(now, schedule, at)?.toISOString() ?? null };
    }
    const attempt = await cutInTransaction(tx, "schedule");
    await tx
      .insert(pooledReleaseSchedule)
      .values({ id: 1, lastAttemptAt: now, lastOutcome: attempt.outcome })
      .onConflictDoUpdate({ target: pooledReleaseSchedule.id, set: { lastAttemptAt: now, lastOutcome: attempt.outcome } });
    return attempt;
  });
}

/** The demo's and the benchmark's first release, right after their statistics are computed. */
export async function cutSetupRelease(): Promise<ReleaseAttempt> {
  return withAnalystAccess(async (tx) => {
    await tx.execute(releaseLock);
    return cutInTransaction(tx, "setup");
  });
}

/** The coordinator's "Cut a release now": the same rule as the schedule's, and recorded in the activity log. */
export async function cutReleaseNow(member: Member): Promise<ReleaseAttempt> {
  if (member.role !== "coordinator") throw new AppError("forbidden", "Only the co-op coordinator cuts a release of the pooled figures.");
  const attempt = await withAnalystAccess(async (tx) => {
    await tx.execute(releaseLock);
    return cutInTransaction(tx, "coordinator");
  });
  await asMember(member, (tx) =>
    recordAudit(tx, {
      action: attempt.outcome === "cut" ? "pooled-release.cut" : "pooled-release.checked",
      subject: attempt.outcome === "cut" ? `Release ${attempt.release.number}` : "Co-op results",
      farmId: null,
      ...actor(member),
      details:
        attempt.outcome === "cut"
          ? { release: attempt.release.number, figuresChanged: attempt.figuresChanged }
          : { outcome: attempt.outcome },
    }),
  );
  return attempt;
}

export interface ReleaseStatus {
  latest: ReleaseInfo | null;
  schedule: ReleaseSchedule;
  /** The hour releases are cut and the zone whose clocks it is read on. */
  at: ReleaseTime;
  nextDueAt: string | null;
  lastAttempt: { at: string; outcome: string } | null;
  /** What cutting now would do: the coordinator sees why a release waits and what it needs. */
  now: Exclude<ReleaseAttempt, { outcome: "not_due" }>;
  /** Farms whose statistics are still being recomputed after an upload: their new data joins a later release. */
  refreshesPending: boolean;
}

/** The coordinator's release panel: plans a release without writing one. */
export async function getReleaseStatus(member: Member, now: Date = new Date()): Promise<ReleaseStatus> {
  if (member.role !== "coordinator") throw new AppError("forbidden", "Only the co-op coordinator manages releases of the pooled figures.");
  const refreshesPending = await getPooledUpdating();
  return withAnalystAccess(async (tx) => {
    const [settings] = await tx
      .select({
        schedule: cooperativeSettings.releaseSchedule,
        hour: cooperativeSettings.releaseHour,
        timeZone: cooperativeSettings.releaseTimeZone,
      })
      .from(cooperativeSettings);
    const schedule = settings?.schedule ?? "daily";
    const at: ReleaseTime = { hour: settings?.hour ?? 2, timeZone: settings?.timeZone ?? "UTC" };
    const [state] = await tx.select().from(pooledReleaseSchedule).where(eq(pooledReleaseSchedule.id, 1));
    const next = await planNext(tx);
    return {
      latest: next.previous,
      schedule,
      at,
      nextDueAt: nextReleaseSlot(now, schedule, at)?.toISOString() ?? null,
      lastAttempt: state?.lastAttemptAt ? { at: state.lastAttemptAt.toISOString(), outcome: state.lastOutcome ?? "" } : null,
      now: outcomeOf(next, { number: (next.previous?.number ?? 0) + 1, cutAt: now.toISOString() }),
      refreshesPending,
    };
  });
}
