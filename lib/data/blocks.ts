import "server-only";
import { and, asc, desc, eq, ilike, or, sql } from "drizzle-orm";
import { blockRoomMoves, blocks, harvests, strains, substrateRecipes, trialArms, trials, uploads, users, valueChanges } from "@/db/schema";
import { actor, recordAudit } from "@/lib/data/audit";
import { queuePooledRefresh } from "@/lib/data/pooled-refresh";
import { AppError } from "@/lib/errors";
import { blockFigures, blockState, nextFlush, type BlockState } from "@/lib/season-logs/block-figures";
import { containsPattern } from "@/lib/season-logs/block-search";
import {
  checkQuickHarvest,
  latestToday,
  warningsNotAccepted,
  type HarvestProblem,
  type QuickHarvestEntry,
} from "@/lib/season-logs/quick-harvest";
import type { Member } from "./members";
import { asMember, farmOf } from "./context";
import { recordRoomAtHarvest } from "./rooms";
import { blockSeasonYear } from "./seasons";

export interface BlockRow {
  id: string;
  code: string;
  strainCode: string;
  strainName: string;
  recipeCode: string | null;
  inoculatedOn: string | null;
  /** The season (its starting year): the one its season log named, else its inoculation date's; null with neither. */
  season: number | null;
  wetMassG: number | null;
  moisture: number | null;
  flushes: number;
  totalFreshG: number;
  biologicalEfficiency: number | null;
  contaminated: boolean;
  massLoss: number | null;
  trial: string | null;
  /** Contaminated, spent, fruiting or not harvested yet (see blockState). */
  state: BlockState;
  /** The highest flush recorded and the day it was picked (null with no harvest, or no date given). */
  lastFlush: { flush: number; harvestedOn: string | null } | null;
}

export interface BlockDetail extends BlockRow {
  strainId: string;
  spentMassG: number | null;
  contaminatedOn: string | null;
  notes: string;
  harvests: {
    id: string;
    flush: number;
    harvestedOn: string | null;
    freshMassG: number;
    dryMassG: number | null;
    freshMassAsWritten: string | null;
    freshMassUnit: string | null;
    acceptedWarnings: string | null;
  }[];
  history: {
    id: number;
    flush: number | null;
    field: string;
    oldValue: string | null;
    newValue: string | null;
    changedAt: string;
    changedBy: string | null;
    fileName: string | null;
    reason: string | null;
  }[];
  /** The stored values as a correction form starts from them. */
  recorded: {
    wetMassAsWritten: string | null;
    wetMassUnit: string | null;
    spentMassAsWritten: string | null;
    spentMassUnit: string | null;
  };
}

export interface HarvestTarget {
  code: string;
  nextFlush: number;
  /** The block's moves between rooms, so the form can show its room on the day picked (lib/rooms/regimes.ts roomOn). */
  moves: { roomId: string; movedOn: string | null }[];
}

const blockColumns = {
  id: blocks.id,
  code: blocks.code,
  strainId: blocks.strainId,
  strainCode: strains.code,
  strainName: strains.name,
  recipeCode: substrateRecipes.code,
  inoculatedOn: blocks.inoculatedOn,
  season: blockSeasonYear,
  wetMassG: blocks.wetMassG,
  moisture: blocks.moisture,
  contaminated: blocks.contaminated,
  contaminatedOn: blocks.contaminatedOn,
  spentMassG: blocks.spentMassG,
  notes: blocks.notes,
  trial: sql<string | null>`case when ${trials.code} is null then null else ${trials.code} || ' · arm ' || ${trialArms.label} end`,
  flushes: sql<number>`(select count(*)::int from ${harvests} h where h.block_id = ${blocks.id})`,
  totalFreshG: sql<number>`(select coalesce(sum(h.fresh_mass_g), 0)::float8 from ${harvests} h where h.block_id = ${blocks.id})`,
  lastFlush: sql<{
    flush: number;
    harvestedOn: string | null;
  } | null>`(select json_build_object('flush', h.flush, 'harvestedOn', h.harvested_on) from ${harvests} h where h.block_id = ${blocks.id} order by h.flush desc limit 1)`,
};

type BlockSelection = {
  id: string;
  code: string;
  strainId: string;
  strainCode: string;
  strainName: string;
  recipeCode: string | null;
  inoculatedOn: string | null;
  season: number | null;
  wetMassG: number | null;
  moisture: number | null;
  contaminated: boolean;
  contaminatedOn: string | null;
  spentMassG: number | null;
  notes: string;
  trial: string | null;
  flushes: number;
  totalFreshG: number;
  lastFlush: { flush: number; harvestedOn: string | null } | null;
};

function withFigures(
  row: BlockSelection,
): BlockRow & { strainId: string; spentMassG: number | null; contaminatedOn: string | null; notes: string } {
  const totalFreshG = Number(row.totalFreshG);
  return {
    ...row,
    state: blockState({ contaminated: row.contaminated, spentMassG: row.spentMassG, flushes: Number(row.flushes) }),
    season: row.season === null ? null : Number(row.season),
    flushes: Number(row.flushes),
    totalFreshG,
    ...blockFigures({
      flushes: Number(row.flushes),
      wetMassG: row.wetMassG,
      moisture: row.moisture,
      totalFreshG,
      spentMassG: row.spentMassG,
    }),
  };
}

/**
 * The farm's blocks with flush count, total fresh weight, biological efficiency and mass loss; of one
 * season when asked, and those whose code or note holds the search (any capitals) when one is given.
 */
export async function listBlocks(member: Member, filter: { season?: number | null; search?: string | null } = {}): Promise<BlockRow[]> {
  const farm = farmOf(member, "see its blocks");
  const rows = await asMember(member, (tx) =>
    tx
      .select(blockColumns)
      .from(blocks)
      .innerJoin(strains, eq(strains.id, blocks.strainId))
      .leftJoin(substrateRecipes, eq(substrateRecipes.id, blocks.substrateRecipeId))
      .leftJoin(trialArms, eq(trialArms.id, blocks.trialArmId))
      .leftJoin(trials, eq(trials.id, trialArms.trialId))
      .where(
        and(
          eq(blocks.farmId, farm.farmId),
          filter.season == null ? undefined : eq(blockSeasonYear, filter.season),
          filter.search
            ? or(ilike(blocks.code, containsPattern(filter.search)), ilike(blocks.notes, containsPattern(filter.search)))
            : undefined,
        ),
      )
      .orderBy(asc(blocks.code)),
  );
  return rows.map((row) => {
    const full = withFigures(row);
    return {
      id: full.id,
      code: full.code,
      strainCode: full.strainCode,
      strainName: full.strainName,
      recipeCode: full.recipeCode,
      inoculatedOn: full.inoculatedOn,
      season: full.season,
      wetMassG: full.wetMassG,
      moisture: full.moisture,
      flushes: full.flushes,
      totalFreshG: full.totalFreshG,
      biologicalEfficiency: full.biologicalEfficiency,
      contaminated: full.contaminated,
      massLoss: full.massLoss,
      trial: full.trial,
      state: full.state,
      lastFlush: full.lastFlush,
    };
  });
}

/** The same words for a block of another farm as for one that does not exist. */
export const noSuchBlock = "There is no such block on your farm. Pick it from Blocks & harvests.";

/** One block of the farm with its flushes and every value an upload or correction replaced. */
export async function getBlock(member: Member, blockId: string): Promise<BlockDetail> {
  const farm = farmOf(member, "see its blocks");
  if (!/^[0-9a-f-]{36}$/i.test(blockId)) throw new AppError("not_found", noSuchBlock);
  return asMember(member, async (tx) => {
    const [row] = await tx
      .select(blockColumns)
      .from(blocks)
      .innerJoin(strains, eq(strains.id, blocks.strainId))
      .leftJoin(substrateRecipes, eq(substrateRecipes.id, blocks.substrateRecipeId))
      .leftJoin(trialArms, eq(trialArms.id, blocks.trialArmId))
      .leftJoin(trials, eq(trials.id, trialArms.trialId))
      .where(and(eq(blocks.farmId, farm.farmId), eq(blocks.id, blockId)));
    if (!row) throw new AppError("not_found", noSuchBlock);
    const flushes = await tx
      .select({
        id: harvests.id,
        flush: harvests.flush,
        harvestedOn: harvests.harvestedOn,
        freshMassG: harvests.freshMassG,
        dryMassG: harvests.dryMassG,
        freshMassAsWritten: harvests.freshMassAsWritten,
        freshMassUnit: harvests.freshMassUnit,
        acceptedWarnings: harvests.acceptedWarnings,
      })
      .from(harvests)
      .where(eq(harvests.blockId, blockId))
      .orderBy(asc(harvests.flush));
    const history = await tx
      .select({
        id: valueChanges.id,
        flush: valueChanges.flush,
        field: valueChanges.field,
        oldValue: valueChanges.oldValue,
        newValue: valueChanges.newValue,
        changedAt: valueChanges.changedAt,
        changedBy: users.name,
        fileName: uploads.fileName,
        reason: valueChanges.reason,
      })
      .from(valueChanges)
      .leftJoin(users, eq(users.id, valueChanges.changedBy))
      .leftJoin(uploads, eq(uploads.id, valueChanges.uploadId))
      .where(eq(valueChanges.blockId, blockId))
      .orderBy(desc(valueChanges.changedAt), desc(valueChanges.id));
    const [written] = await tx
      .select({
        wetMassAsWritten: blocks.wetMassAsWritten,
        wetMassUnit: blocks.wetMassUnit,
        spentMassAsWritten: blocks.spentMassAsWritten,
        spentMassUnit: blocks.spentMassUnit,
      })
      .from(blocks)
      .where(eq(blocks.id, blockId));
    return {
      ...withFigures(row),
      recorded: written,
      harvests: flushes,
      history: history.map((change) => ({ ...change, changedAt: change.changedAt.toISOString() })),
    };
  });
}

/** Block codes for the quick harvest form, each with the flush to suggest next. */
export async function listHarvestTargets(member: Member): Promise<HarvestTarget[]> {
  const farm = farmOf(member, "see its blocks");
  const rows = await asMember(member, (tx) =>
    tx
      .select({
        code: blocks.code,
        flushes: sql<number[]>`coalesce(array_agg(${harvests.flush}) filter (where ${harvests.flush} is not null), '{}')`,
        moves: sql<
          { roomId: string; movedOn: string | null }[]
        >`(select coalesce(json_agg(json_build_object('roomId', m.room_id, 'movedOn', m.moved_on)), '[]') from ${blockRoomMoves} m where m.block_id = ${blocks.id})`,
      })
      .from(blocks)
      .leftJoin(harvests, eq(harvests.blockId, blocks.id))
      .where(and(eq(blocks.farmId, farm.farmId), eq(blocks.contaminated, false)))
      .groupBy(blocks.code, blocks.id)
      .orderBy(asc(blocks.code)),
  );
  return rows.map((row) => ({ code: row.code, nextFlush: nextFlush(row.flushes), moves: row.moves }));
}

export type RecordHarvestResult =
  | { status: "saved"; blockId: string; blockCode: string; flush: number; freshGrams: number; asWritten: string; again: boolean }
  | { status: "warnings"; warnings: HarvestProblem[] };

/**
 * Records one flush from the quick form, checked by the import's rules against the stored block
 * (`checkQuickHarvest`). An error refuses it (`invalid_input`, a problem per field); warnings not
 * yet accepted return without saving, for the grower to correct or "save anyway", and the
 * warnings accepted are kept with the harvest. The block code matches whatever its capitals.
 * An entry whose `clientKey` is stored already returns that harvest (`again`) and stores nothing:
 * the phone sends it again whenever it did not hear the first answer.
 */
export async function recordHarvest(
  member: Member,
  entry: QuickHarvestEntry & { acceptWarnings: readonly string[] },
  today: string = latestToday(),
): Promise<RecordHarvestResult> {
  const farm = farmOf(member, "see its blocks");
  return asMember(member, async (tx) => {
    // The same per-farm lock as a season-log commit, so a commit never plans around a flush recorded meanwhile.
    // Under it, an entry sent again with its key finds the harvest the first sending stored.
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`season-log:${farm.farmId}`}, 0))`);
    if (entry.clientKey) {
      const [already] = await tx
        .select({
          blockId: harvests.blockId,
          blockCode: blocks.code,
          flush: harvests.flush,
          freshGrams: harvests.freshMassG,
          asWritten: harvests.freshMassAsWritten,
        })
        .from(harvests)
        .innerJoin(blocks, eq(blocks.id, harvests.blockId))
        .where(and(eq(harvests.farmId, farm.farmId), eq(harvests.clientKey, entry.clientKey)));
      if (already) return { status: "saved", ...already, asWritten: already.asWritten ?? entry.weight, again: true };
    }
    const typed = entry.blockCode.trim();
    const candidates = await tx
      .select({
        id: blocks.id,
        code: blocks.code,
        inoculatedOn: blocks.inoculatedOn,
        wetMassG: blocks.wetMassG,
        moisture: blocks.moisture,
        contaminated: blocks.contaminated,
        contaminatedOn: blocks.contaminatedOn,
      })
      .from(blocks)
      .where(and(eq(blocks.farmId, farm.farmId), sql`lower(${blocks.code}) = lower(${typed})`));
    const block = candidates.length === 1 ? candidates[0] : candidates.find((candidate) => candidate.code === typed);
    if (!block) {
      throw new AppError("invalid_input", "No block with that code.", [
        {
          field: "blockCode",
          message:
            candidates.length > 1
              ? `Your farm has blocks ${candidates.map((candidate) => `"${candidate.code}"`).join(" and ")}, which differ only in capitals. Type the code exactly as the block has it.`
              : `Your farm has no block "${typed}". Pick a code from the list, or upload the block in a season log first.`,
        },
      ]);
    }
    const stored = await tx
      .select({ flush: harvests.flush, freshMassG: harvests.freshMassG })
      .from(harvests)
      .where(eq(harvests.blockId, block.id));
    const check = checkQuickHarvest(entry, { ...block, harvests: stored }, today);
    if (check.errors.length > 0) throw new AppError("invalid_input", "Not saved: correct what is marked.", check.errors);
    const standing = warningsNotAccepted(check.warnings, entry.acceptWarnings);
    if (standing.length > 0) return { status: "warnings", warnings: check.warnings };
    const freshGrams = check.freshGrams as number;
    const asWritten = check.asWritten as string;
    await tx.insert(harvests).values({
      farmId: farm.farmId,
      blockId: block.id,
      flush: entry.flush,
      harvestedOn: entry.harvestedOn,
      freshMassG: freshGrams,
      freshMassAsWritten: asWritten,
      freshMassUnit: check.unit,
      acceptedWarnings: check.warnings.length > 0 ? check.warnings.map((warning) => warning.message).join("\n") : null,
      clientKey: entry.clientKey ?? null,
    });
    if (entry.roomId) await recordRoomAtHarvest(tx, member, farm.farmId, block, entry.roomId, entry.harvestedOn);
    await recordAudit(tx, {
      action: "harvest.recorded",
      subject: `${block.code} flush ${entry.flush}`,
      farmId: farm.farmId,
      ...actor(member),
      details: { blockId: block.id, flush: entry.flush, freshGrams, savedAnyway: check.warnings.map((warning) => warning.code) },
    });
    await queuePooledRefresh(tx, farm.farmId);
    return { status: "saved", blockId: block.id, blockCode: block.code, flush: entry.flush, freshGrams, asWritten, again: false };
  });
}
