import { sql } from "drizzle-orm";
import {
  check,
  date,
  foreignKey,
  index,
  integer,
  numeric,
  pgTable,
  text,
  time,
  timestamp,
  unique,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { farms, users } from "./cooperative";
import { humidityMode, roomFreshAir, roomKind } from "./enums";
import { treatments } from "./registries";
import { blocks, uploads } from "./season";

/** A tub, tent or room a farm fruits its blocks in. */
export const fruitingRooms = pgTable(
  "fruiting_rooms",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: roomKind("kind").notNull(),
    /** Inside volume; the form takes litres or m³ and stores m³. */
    volumeM3: numeric("volume_m3", { mode: "number" }),
    freshAir: roomFreshAir("fresh_air").notNull(),
    notes: text("notes").notNull().default(""),
    /** The day the room stopped being used; its history stays. */
    retiredOn: date("retired_on"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex("fruiting_rooms_farm_name_unique").on(t.farmId, t.name),
    // The target of the tenant keys below: a regime or a move names its room and its farm together.
    unique("fruiting_rooms_id_farm_unique").on(t.id, t.farmId),
    check("fruiting_rooms_volume_positive", sql`${t.volumeM3} > 0`),
  ],
);

/** How a room was run from starts_on until the next row's starts_on. */
export const roomRegimes = pgTable(
  "room_regimes",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    // The room's farm, repeated so row-level security needs no join; the tenant key makes it the room's.
    farmId: uuid("farm_id").notNull(),
    roomId: uuid("room_id").notNull(),
    startsOn: date("starts_on").notNull(),
    /** The co-op's climate regime kind: a treatments row of kind "humidity". */
    regimeKindId: uuid("regime_kind_id").references(() => treatments.id),
    humidityMode: humidityMode("humidity_mode").notNull(),
    cycleOnMinutes: integer("cycle_on_minutes"),
    cycleOffMinutes: integer("cycle_off_minutes"),
    /** Wall-clock time of the farm's day the soak starts. */
    floodStartsAt: time("flood_starts_at"),
    floodHours: numeric("flood_hours", { mode: "number" }),
    airChangesPerHour: numeric("air_changes_per_hour", { mode: "number" }),
    temperatureSetC: numeric("temperature_set_c", { mode: "number" }),
    cleaningEveryDays: integer("cleaning_every_days"),
    notes: text("notes").notNull().default(""),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    foreignKey({
      name: "room_regimes_room_farm_fk",
      columns: [t.roomId, t.farmId],
      foreignColumns: [fruitingRooms.id, fruitingRooms.farmId],
    }).onDelete("cascade"),
    uniqueIndex("room_regimes_room_starts_unique").on(t.roomId, t.startsOn),
    index("room_regimes_farm_idx").on(t.farmId),
    // Each mode fills its own columns and leaves the other's empty, so a reading never has to guess.
    check(
      "room_regimes_mode_columns",
      sql`(${t.humidityMode} = 'cycling' and ${t.cycleOnMinutes} is not null and ${t.cycleOffMinutes} is not null
        and ${t.floodStartsAt} is null and ${t.floodHours} is null)
      or (${t.humidityMode} = 'flooding' and ${t.floodStartsAt} is not null and ${t.floodHours} is not null
        and ${t.cycleOnMinutes} is null and ${t.cycleOffMinutes} is null)`,
    ),
    check("room_regimes_cycle_range", sql`${t.cycleOnMinutes} between 1 and 1440 and ${t.cycleOffMinutes} between 0 and 1440`),
    check("room_regimes_flood_hours_range", sql`${t.floodHours} > 0 and ${t.floodHours} <= 24`),
    check("room_regimes_air_changes_not_negative", sql`${t.airChangesPerHour} >= 0`),
    check("room_regimes_temperature_range", sql`${t.temperatureSetC} between -10 and 50`),
    check("room_regimes_cleaning_positive", sql`${t.cleaningEveryDays} >= 1`),
  ],
);

/** A block carried into a room on a day; moved_on null means "from the start of fruiting". */
export const blockRoomMoves = pgTable(
  "block_room_moves",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    farmId: uuid("farm_id").notNull(),
    blockId: uuid("block_id").notNull(),
    roomId: uuid("room_id").notNull(),
    movedOn: date("moved_on"),
    /** The season log that said so; null for a move recorded in the app. */
    uploadId: uuid("upload_id").references(() => uploads.id, { onDelete: "set null" }),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    // Both tenant keys: the block and the room must be of the move's own farm.
    foreignKey({
      name: "block_room_moves_block_farm_fk",
      columns: [t.blockId, t.farmId],
      foreignColumns: [blocks.id, blocks.farmId],
    }).onDelete("cascade"),
    foreignKey({
      name: "block_room_moves_room_farm_fk",
      columns: [t.roomId, t.farmId],
      foreignColumns: [fruitingRooms.id, fruitingRooms.farmId],
    }).onDelete("cascade"),
    // One move a day per block, and one "from the start" move.
    unique("block_room_moves_block_day_unique").on(t.blockId, t.movedOn).nullsNotDistinct(),
    index("block_room_moves_room_idx").on(t.roomId),
    index("block_room_moves_farm_idx").on(t.farmId),
  ],
);
