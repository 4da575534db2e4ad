import { sql } from "drizzle-orm";
import {
  check,
  foreignKey,
  index,
  integer,
  numeric,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import type { TemperatureUnit } from "../../lib/climate/parse";
import { users } from "./cooperative";
import { fruitingRooms } from "./rooms";

/** One file a room's temperature / humidity logger exported, as the farm uploaded it. */
export const climateLogs = pgTable(
  "climate_logs",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    farmId: uuid("farm_id").notNull(),
    roomId: uuid("room_id").notNull(),
    fileName: text("file_name").notNull(),
    sha256: text("sha256").notNull(),
    uploadedBy: uuid("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploadedAt: timestamp("uploaded_at", { withTimezone: true }).notNull().defaultNow(),
    /** Which logger layout was read, in words (lib/climate/parse.ts `detected.shape`). */
    shape: text("shape").notNull(),
    /** The unit the file wrote temperatures in; readings are stored in °C. */
    temperatureUnit: text("temperature_unit").$type<TemperatureUnit>().notNull(),
    /** The zone the logger's clock was in (IANA name, or a fixed offset such as Etc/GMT-1). */
    timeZone: text("time_zone").notNull(),
    readingCount: integer("reading_count").notNull(),
    firstAt: timestamp("first_at", { withTimezone: true }).notNull(),
    lastAt: timestamp("last_at", { withTimezone: true }).notNull(),
  },
  (t) => [
    foreignKey({
      name: "climate_logs_room_farm_fk",
      columns: [t.roomId, t.farmId],
      foreignColumns: [fruitingRooms.id, fruitingRooms.farmId],
    }).onDelete("cascade"),
    // The same file twice is refused by name, not stored twice.
    uniqueIndex("climate_logs_farm_sha_unique").on(t.farmId, t.sha256),
    // The target of the readings' tenant key: a reading names its log, room and farm together.
    unique("climate_logs_id_room_farm_unique").on(t.id, t.roomId, t.farmId),
    index("climate_logs_room_idx").on(t.roomId, t.firstAt),
    check("climate_logs_temperature_unit", sql`${t.temperatureUnit} in ('C', 'F')`),
    check("climate_logs_span", sql`${t.firstAt} <= ${t.lastAt} and ${t.readingCount} >= 1`),
  ],
);

/** One reading of a log, in °C, % RH and ppm. */
export const climateReadings = pgTable(
  "climate_readings",
  {
    logId: uuid("log_id").notNull(),
    farmId: uuid("farm_id").notNull(),
    roomId: uuid("room_id").notNull(),
    takenAt: timestamp("taken_at", { withTimezone: true }).notNull(),
    temperatureC: numeric("temperature_c", { mode: "number" }),
    relativeHumidity: numeric("relative_humidity", { mode: "number" }),
    co2Ppm: numeric("co2_ppm", { mode: "number" }),
  },
  (t) => [
    primaryKey({ name: "climate_readings_pk", columns: [t.logId, t.takenAt] }),
    foreignKey({
      name: "climate_readings_log_room_farm_fk",
      columns: [t.logId, t.roomId, t.farmId],
      foreignColumns: [climateLogs.id, climateLogs.roomId, climateLogs.farmId],
    }).onDelete("cascade"),
    index("climate_readings_room_time_idx").on(t.roomId, t.takenAt),
    check("climate_readings_humidity_range", sql`${t.relativeHumidity} between 0 and 100`),
    check("climate_readings_co2_not_negative", sql`${t.co2Ppm} >= 0`),
  ],
);
