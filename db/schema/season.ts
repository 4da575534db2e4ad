import { sql } from "drizzle-orm";
import {
  bigint,
  bigserial,
  boolean,
  check,
  customType,
  date,
  foreignKey,
  index,
  integer,
  jsonb,
  numeric,
  pgTable,
  text,
  timestamp,
  unique,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { farms, users } from "./cooperative";
import { uploadOutcome } from "./enums";
import { strains, substrateRecipes, treatments } from "./registries";
import { trialArms } from "./trials";

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => "bytea" });

/** Every file a farm sends is kept, whatever became of it. */
export const uploads = pgTable(
  "uploads",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    uploadedBy: uuid("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull().defaultNow(),
    fileName: text("file_name").notNull(),
    content: bytea("content").notNull(),
    sha256: text("sha256").notNull(),
    sizeBytes: integer("size_bytes").notNull(),
    schemaVersion: integer("schema_version").notNull().default(1),
    outcome: uploadOutcome("outcome").notNull().default("received"),
    rowCount: integer("row_count").notNull().default(0),
    report: jsonb("report"),
    options: jsonb("options"),
    /**
     * The rows a commit would write, as planned at upload (lib/season-logs/commit-rows.ts, gzip), with
     * what they were planned against; written as they are when nothing changed since. Cleared once committed.
     */
    commitRows: bytea("commit_rows"),
    committedAt: timestamp("committed_at", { withTimezone: true }),
    /** When the stored file of a rejected upload was removed after the co-op's retention period (the record and report stay). */
    filePurgedAt: timestamp("file_purged_at", { withTimezone: true }),
    /** Set on commits that kept the rows they replaced (season_log_replaced_rows), so they can be undone exactly. */
    keptForUndo: boolean("kept_for_undo").notNull().default(false),
    undoneAt: timestamp("undone_at", { withTimezone: true }),
    undoneBy: uuid("undone_by").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [index("uploads_farm_sha_idx").on(t.farmId, t.sha256), index("uploads_farm_time_idx").on(t.farmId, t.uploadedAt)],
);

/**
 * A count that goes up with every statement that writes a farm's blocks or harvests (triggers,
 * migration 0031), whoever writes them: an upload's planned rows are still right while it stays put.
 */
export const farmDataVersions = pgTable("farm_data_versions", {
  farmId: uuid("farm_id")
    .primaryKey()
    .references(() => farms.id, { onDelete: "cascade" }),
  version: bigint("version", { mode: "number" }).notNull(),
});

/** A season log a farm is sending or re-reading right now; at most a few per farm at once, across app processes. */
export const uploadReservations = pgTable(
  "upload_reservations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    reservedAt: timestamp("reserved_at", { withTimezone: true }).notNull().defaultNow(),
    /** A process that died mid-upload leaves its reservation; it lapses at this time. */
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  },
  (t) => [index("upload_reservations_farm_idx").on(t.farmId, t.expiresAt)],
);

const massColumns = (prefix: string) => ({
  grams: numeric(`${prefix}_g`, { mode: "number" }),
  asWritten: text(`${prefix}_as_written`),
  unit: text(`${prefix}_unit`),
});

export const blocks = pgTable(
  "blocks",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    code: text("code").notNull(),
    strainId: uuid("strain_id")
      .notNull()
      .references(() => strains.id),
    substrateRecipeId: uuid("substrate_recipe_id").references(() => substrateRecipes.id),
    fruitingMethodId: uuid("fruiting_method_id").references(() => treatments.id),
    trialArmId: uuid("trial_arm_id").references(() => trialArms.id),
    inoculatedOn: date("inoculated_on"),
    /**
     * The season (its starting year) as the season log names it; null when the block follows its
     * inoculation date. The season shown and filtered on is block_season_year(inoculated_on,
     * season_year) in SQL (migration 0039), computed at read from the co-op's season start rather
     * than stored on write: a coordinator who moves the start day then moves every farm's blocks
     * at once, which a write could not do (row-level security keeps each farm's blocks to itself).
     */
    seasonYear: integer("season_year"),
    wetMassG: massColumns("wet_mass").grams,
    wetMassAsWritten: massColumns("wet_mass").asWritten,
    wetMassUnit: massColumns("wet_mass").unit,
    moisture: numeric("moisture", { mode: "number" }),
    contaminated: boolean("contaminated").notNull().default(false),
    contaminatedOn: date("contaminated_on"),
    spentMassG: massColumns("spent_mass").grams,
    spentMassAsWritten: massColumns("spent_mass").asWritten,
    spentMassUnit: massColumns("spent_mass").unit,
    notes: text("notes").notNull().default(""),
    lastUploadId: uuid("last_upload_id").references(() => uploads.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("blocks_farm_code_unique").on(t.farmId, t.code),
    // The target of the tenant keys below: a harvest or a value change names its block and its farm together.
    unique("blocks_id_farm_unique").on(t.id, t.farmId),
    index("blocks_strain_idx").on(t.strainId),
    check("blocks_wet_mass_not_negative", sql`${t.wetMassG} >= 0`),
    check("blocks_spent_mass_not_negative", sql`${t.spentMassG} >= 0`),
    check("blocks_moisture_range", sql`${t.moisture} >= 0 and ${t.moisture} < 1`),
    check("blocks_season_year_range", sql`${t.seasonYear} between 1970 and 2099`),
  ],
);

export const harvests = pgTable(
  "harvests",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    // Repeated from the block so row-level security needs no join; the tenant key below makes it the block's farm.
    farmId: uuid("farm_id").notNull(),
    blockId: uuid("block_id").notNull(),
    flush: integer("flush").notNull(),
    harvestedOn: date("harvested_on"),
    freshMassG: numeric("fresh_mass_g", { mode: "number" }).notNull(),
    freshMassAsWritten: text("fresh_mass_as_written"),
    freshMassUnit: text("fresh_mass_unit"),
    dryMassG: numeric("dry_mass_g", { mode: "number" }),
    dryMassAsWritten: text("dry_mass_as_written"),
    dryMassUnit: text("dry_mass_unit"),
    // The warnings a grower read and saved anyway ("Save anyway" on the quick form), one a line; null when there were none.
    acceptedWarnings: text("accepted_warnings"),
    uploadId: uuid("upload_id").references(() => uploads.id, { onDelete: "set null" }),
    // Made by the phone for each quick-form entry, so an entry sent again (offline queue, a lost answer) is stored once.
    clientKey: uuid("client_key"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // The tenant key: the block must be one of the harvest's own farm (it also stands for keys to blocks and farms alone).
    foreignKey({ name: "harvests_block_farm_fk", columns: [t.blockId, t.farmId], foreignColumns: [blocks.id, blocks.farmId] }).onDelete(
      "cascade",
    ),
    uniqueIndex("harvests_block_flush_unique").on(t.blockId, t.flush),
    uniqueIndex("harvests_farm_client_key_unique").on(t.farmId, t.clientKey),
    index("harvests_farm_idx").on(t.farmId),
    check("harvests_flush_positive", sql`${t.flush} >= 1`),
    check("harvests_fresh_mass_not_negative", sql`${t.freshMassG} >= 0`),
    check("harvests_dry_mass_not_negative", sql`${t.dryMassG} >= 0`),
  ],
);

/** Values that a later upload or correction replaced: who, when, old and new, from which upload. */
export const valueChanges = pgTable(
  "value_changes",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    farmId: uuid("farm_id").notNull(),
    blockId: uuid("block_id").notNull(),
    flush: integer("flush"),
    field: text("field").notNull(),
    oldValue: text("old_value"),
    newValue: text("new_value"),
    uploadId: uuid("upload_id").references(() => uploads.id, { onDelete: "set null" }),
    /** Why a person changed it in the app (an edit, a deletion, an undone commit); null for a file's change. */
    reason: text("reason"),
    changedBy: uuid("changed_by").references(() => users.id, { onDelete: "set null" }),
    changedAt: timestamp("changed_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // The same tenant key as a harvest's: history of a block is kept under the block's own farm.
    foreignKey({
      name: "value_changes_block_farm_fk",
      columns: [t.blockId, t.farmId],
      foreignColumns: [blocks.id, blocks.farmId],
    }).onDelete("cascade"),
    index("value_changes_block_idx").on(t.blockId, t.changedAt),
  ],
);

/**
 * A block or harvest row as it was just before a season-log commit updated or removed it, whole
 * (to_jsonb of the row), so undoing the commit puts back exactly what was stored. Rows the commit inserted
 * need no copy: they carry the upload's id, and undoing removes them.
 */
export const seasonLogReplacedRows = pgTable(
  "season_log_replaced_rows",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    uploadId: uuid("upload_id")
      .notNull()
      .references(() => uploads.id, { onDelete: "cascade" }),
    // "removed_harvest": a stored harvest the file did not have, removed as the grower chose.
    // "room_move": a block's move from the start of fruiting whose room the commit replaced (block_room_moves).
    rowKind: text("row_kind", { enum: ["block", "harvest", "removed_harvest", "room_move"] }).notNull(),
    rowId: uuid("row_id").notNull(),
    before: jsonb("before").$type<Record<string, unknown>>().notNull(),
  },
  (t) => [index("season_log_replaced_rows_upload_idx").on(t.uploadId)],
);

/** What a farm chose last time: its column mapping and default mass unit. */
export const farmImportPreferences = pgTable("farm_import_preferences", {
  farmId: uuid("farm_id")
    .primaryKey()
    .references(() => farms.id, { onDelete: "cascade" }),
  columnMapping: jsonb("column_mapping").$type<Record<string, string>>().notNull().default({}),
  defaultMassUnit: text("default_mass_unit"),
  updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
});
