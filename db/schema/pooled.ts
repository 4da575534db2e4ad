import { sql } from "drizzle-orm";
import { check, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { farms } from "./cooperative";

/** The cell a statistics row describes: farm × species × strain × recipe × fruiting method × trial arm. */
const cellColumns = () => ({
  farmId: uuid("farm_id")
    .notNull()
    .references(() => farms.id, { onDelete: "cascade" }),
  speciesId: uuid("species_id").notNull(),
  strainId: uuid("strain_id").notNull(),
  substrateRecipeId: uuid("substrate_recipe_id"),
  fruitingMethodId: uuid("fruiting_method_id"),
  trialArmId: uuid("trial_arm_id"),
});

/**
 * Per-farm sufficient statistics for the co-op's pooled results: one row per farm × species ×
 * strain × substrate recipe × fruiting method × trial arm × flush window. Written only by
 * rhizo_analyst (the SQL function pooled_refresh_farm); rhizo_app reads its own farm's rows.
 */
export const farmStrainStatistics = pgTable(
  "farm_strain_statistics",
  {
    ...cellColumns(),
    /** "all", "1-2" or "1": which flushes count towards biological efficiency. */
    flushWindow: text("flush_window").notNull(),
    blocks: integer("blocks").notNull(),
    blocksContaminated: integer("blocks_contaminated").notNull(),
    /** Blocks with a biological efficiency: not contaminated, substrate dry mass known, fruited. */
    efficiencyBlocks: integer("efficiency_blocks").notNull(),
    efficiencySum: doublePrecision("efficiency_sum").notNull(),
    efficiencySquares: doublePrecision("efficiency_squares").notNull(),
    /** Block counts by whole biological-efficiency point: {"87": 3, …}. */
    efficiencyBins: jsonb("efficiency_bins").$type<Record<string, number>>().notNull(),
    firstHarvestBlocks: integer("first_harvest_blocks").notNull(),
    firstHarvestDaysSum: doublePrecision("first_harvest_days_sum").notNull(),
    refreshedAt: timestamp("refreshed_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index("farm_strain_statistics_farm_idx").on(t.farmId),
    index("farm_strain_statistics_species_idx").on(t.speciesId, t.flushWindow),
    check("farm_strain_statistics_window", sql`${t.flushWindow} in ('all', '1-2', '1')`),
  ],
);

/** Per-farm sums of finished blocks' flush shares (flush 1 to 8), for the pooled flush profile. */
export const farmFlushStatistics = pgTable(
  "farm_flush_statistics",
  {
    ...cellColumns(),
    flush: integer("flush").notNull(),
    /** Finished blocks with fruit in this cell (the same for every flush of the cell). */
    finishedBlocks: integer("finished_blocks").notNull(),
    blocksFruiting: integer("blocks_fruiting").notNull(),
    shareSum: doublePrecision("share_sum").notNull(),
    shareSquares: doublePrecision("share_squares").notNull(),
    cumulativeSum: doublePrecision("cumulative_sum").notNull(),
    cumulativeSquares: doublePrecision("cumulative_squares").notNull(),
  },
  (t) => [index("farm_flush_statistics_farm_idx").on(t.farmId), index("farm_flush_statistics_species_idx").on(t.speciesId)],
);

/**
 * Per-farm sums of block BE by season, for "BE season by season": one row per farm × species ×
 * strain × recipe × fruiting method × season × flush window (trial arms together). Written by the
 * same refresh as farm_strain_statistics from the same blocks, so a cell's seasons add up to its
 * BE there. Season null: the block has neither a season nor an inoculation date.
 */
export const farmSeasonStatistics = pgTable(
  "farm_season_statistics",
  {
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    speciesId: uuid("species_id").notNull(),
    strainId: uuid("strain_id").notNull(),
    substrateRecipeId: uuid("substrate_recipe_id"),
    fruitingMethodId: uuid("fruiting_method_id"),
    seasonYear: integer("season_year"),
    flushWindow: text("flush_window").notNull(),
    efficiencyBlocks: integer("efficiency_blocks").notNull(),
    efficiencySum: doublePrecision("efficiency_sum").notNull(),
    efficiencySquares: doublePrecision("efficiency_squares").notNull(),
  },
  (t) => [
    index("farm_season_statistics_farm_idx").on(t.farmId),
    check("farm_season_statistics_window", sql`${t.flushWindow} in ('all', '1-2', '1')`),
  ],
);

/** Whether a farm's statistics are being recomputed: pending while requested > completed. */
export const pooledRefreshState = pgTable("pooled_refresh_state", {
  farmId: uuid("farm_id")
    .primaryKey()
    .references(() => farms.id, { onDelete: "cascade" }),
  requested: integer("requested").notNull().default(0),
  completed: integer("completed").notNull().default(0),
  requestedAt: timestamp("requested_at", { withTimezone: true }).notNull().defaultNow(),
  completedAt: timestamp("completed_at", { withTimezone: true }),
});
