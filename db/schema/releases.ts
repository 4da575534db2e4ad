import { sql } from "drizzle-orm";
import { check, doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from "drizzle-orm/pg-core";

/**
 * The co-op's pooled figures are published as numbered releases, never live (lib/pooled/releases.ts
 * decides what each holds). A release and its rows are written once, by rhizo_analyst, and never
 * changed: custom migration refuses UPDATE, DELETE and TRUNCATE even to the owner.
 */
export const pooledReleases = pgTable(
  "pooled_releases",
  {
    number: integer("number").primaryKey(),
    cutAt: timestamp("cut_at", { withTimezone: true }).notNull().defaultNow(),
    /** "schedule", "coordinator" or "setup" (the demo's first release). */
    cutBy: text("cut_by").notNull(),
    /** The co-op's minimum number of farms the release was cut under. */
    minimumFarms: integer("minimum_farms").notNull(),
    /** Farms whose data changed since the previous release (in figures published now or held back). */
    farmsChanged: integer("farms_changed").notNull(),
    figuresChanged: integer("figures_changed").notNull(),
    figuresHeldBack: integer("figures_held_back").notNull(),
  },
  (t) => [check("pooled_releases_cut_by", sql`${t.cutBy} in ('schedule', 'coordinator', 'setup')`)],
);

// A release's rows name farms only by id, with no foreign key: deleting a farm must not change a release.
const releaseCellColumns = () => ({
  releaseNumber: integer("release_number")
    .notNull()
    .references(() => pooledReleases.number),
  farmId: uuid("farm_id").notNull(),
  speciesId: uuid("species_id").notNull(),
  strainId: uuid("strain_id").notNull(),
  substrateRecipeId: uuid("substrate_recipe_id"),
  fruitingMethodId: uuid("fruiting_method_id"),
});

/** A release's copy of farm_strain_statistics, trial arms added together. */
export const pooledReleaseStrainRows = pgTable(
  "pooled_release_strain_rows",
  {
    ...releaseCellColumns(),
    flushWindow: text("flush_window").notNull(),
    blocks: integer("blocks").notNull(),
    blocksContaminated: integer("blocks_contaminated").notNull(),
    efficiencyBlocks: integer("efficiency_blocks").notNull(),
    efficiencySum: doublePrecision("efficiency_sum").notNull(),
    efficiencySquares: doublePrecision("efficiency_squares").notNull(),
    efficiencyBins: jsonb("efficiency_bins").$type<Record<string, number>>().notNull(),
    firstHarvestBlocks: integer("first_harvest_blocks").notNull(),
    firstHarvestDaysSum: doublePrecision("first_harvest_days_sum").notNull(),
  },
  (t) => [index("pooled_release_strain_rows_read_idx").on(t.releaseNumber, t.speciesId, t.flushWindow)],
);

/** A release's copy of farm_flush_statistics, trial arms added together. */
export const pooledReleaseFlushRows = pgTable(
  "pooled_release_flush_rows",
  {
    ...releaseCellColumns(),
    flush: integer("flush").notNull(),
    finishedBlocks: integer("finished_blocks").notNull(),
    blocksFruiting: integer("blocks_fruiting").notNull(),
    shareSum: doublePrecision("share_sum").notNull(),
    shareSquares: doublePrecision("share_squares").notNull(),
    cumulativeSum: doublePrecision("cumulative_sum").notNull(),
    cumulativeSquares: doublePrecision("cumulative_squares").notNull(),
  },
  (t) => [index("pooled_release_flush_rows_read_idx").on(t.releaseNumber, t.speciesId)],
);

/** A release's copy of farm_season_statistics: the per-season BE figures (lib/pooled/seasons.ts). */
export const pooledReleaseSeasonRows = pgTable(
  "pooled_release_season_rows",
  {
    ...releaseCellColumns(),
    seasonYear: integer("season_year"),
    flushWindow: text("flush_window").notNull(),
    efficiencyBlocks: integer("efficiency_blocks").notNull(),
    efficiencySum: doublePrecision("efficiency_sum").notNull(),
    efficiencySquares: doublePrecision("efficiency_squares").notNull(),
  },
  (t) => [index("pooled_release_season_rows_read_idx").on(t.releaseNumber, t.speciesId, t.flushWindow)],
);

/** The scheduled job's last attempt (one row, id 1), so it tries once per slot and the coordinator sees what happened. */
export const pooledReleaseSchedule = pgTable(
  "pooled_release_schedule",
  {
    id: integer("id").primaryKey().default(1),
    lastAttemptAt: timestamp("last_attempt_at", { withTimezone: true }),
    /** "cut", "waiting" or "unchanged". */
    lastOutcome: text("last_outcome"),
  },
  (t) => [check("pooled_release_schedule_single_row", sql`${t.id} = 1`)],
);

/**
 * A release's drying ratio sums per farm cell (species × strain × recipe × fruiting method): blocks
 * with a harvest weighed both fresh and dried, and Σ, Σ² of each block's dry ÷ fresh mass.
 */
export const pooledReleaseDryingRows = pgTable(
  "pooled_release_drying_rows",
  {
    ...releaseCellColumns(),
    driedBlocks: integer("dried_blocks").notNull(),
    ratioSum: doublePrecision("ratio_sum").notNull(),
    ratioSquares: doublePrecision("ratio_squares").notNull(),
  },
  (t) => [index("pooled_release_drying_rows_read_idx").on(t.releaseNumber, t.speciesId)],
);

/**
 * A release's figures by climate regime kind per farm and species, with the room as the unit (a room
 * while it ran that regime kind): rooms, blocks matched to them, and Σ, Σ² of the rooms' contamination
 * rates and mean BE. No room id leaves the refresh; no foreign key to the register, as for strains.
 */
export const pooledReleaseRegimeRows = pgTable(
  "pooled_release_regime_rows",
  {
    releaseNumber: integer("release_number")
      .notNull()
      .references(() => pooledReleases.number),
    farmId: uuid("farm_id").notNull(),
    speciesId: uuid("species_id").notNull(),
    regimeKindId: uuid("regime_kind_id").notNull(),
    rooms: integer("rooms").notNull(),
    blocks: integer("blocks").notNull(),
    blocksContaminated: integer("blocks_contaminated").notNull(),
    contaminationRoomSum: doublePrecision("contamination_room_sum").notNull(),
    contaminationRoomSquares: doublePrecision("contamination_room_squares").notNull(),
    efficiencyRooms: integer("efficiency_rooms").notNull(),
    efficiencyRoomSum: doublePrecision("efficiency_room_sum").notNull(),
    efficiencyRoomSquares: doublePrecision("efficiency_room_squares").notNull(),
    efficiencyBlocks: integer("efficiency_blocks").notNull(),
    /**
     * For the co-op's intraclass correlation (how alike blocks in one room are): over the BE blocks,
     * Σy and Σy²; over rooms, Σ nᵢȳᵢ² and Σ nᵢ² (nᵢ blocks with a BE in room i, ȳᵢ its mean).
     */
    blockEfficiencySum: doublePrecision("block_efficiency_sum").notNull(),
    blockEfficiencySquares: doublePrecision("block_efficiency_squares").notNull(),
    roomWeightedSquares: doublePrecision("room_weighted_squares").notNull(),
    roomSizeSquares: doublePrecision("room_size_squares").notNull(),
  },
  (t) => [index("pooled_release_regime_rows_read_idx").on(t.releaseNumber, t.speciesId)],
);
