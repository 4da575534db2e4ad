import { sql } from "drizzle-orm";
import { bigserial, boolean, check, index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import type { ReleaseSchedule } from "../../lib/pooled/release-schedule";
import { dateStyle, displayUnits, farmStatus, memberRole, tokenPurpose } from "./enums";

/** The single row of co-op-wide settings (id is always 1). */
export const cooperativeSettings = pgTable(
  "cooperative_settings",
  {
    id: integer("id").primaryKey().default(1),
    name: text("name").notNull(),
    region: text("region").notNull().default(""),
    minimumFarms: integer("minimum_farms").notNull().default(3),
    showPerFarmEstimates: boolean("show_per_farm_estimates").notNull().default(false),
    /** When the scheduled job cuts a release of the pooled figures: "daily", "weekly" (Mondays) or "manual" (coordinator only). */
    releaseSchedule: text("release_schedule").$type<ReleaseSchedule>().notNull().default("daily"),
    /** The hour (0–23) at which a scheduled release is due, on the clocks of `releaseTimeZone`. */
    releaseHour: integer("release_hour").notNull().default(2),
    /** The zone of that hour (an IANA name, or UTC): the zone of the coordinator who last saved the settings. */
    releaseTimeZone: text("release_time_zone").notNull().default("UTC"),
    /** Days the file of a rejected season-log upload is kept before it is removed (the record and report stay). */
    rejectedUploadRetentionDays: integer("rejected_upload_retention_days").notNull().default(30),
    /** The day the co-op's season starts (lib/seasons.ts); a block inoculated before it belongs to the season before. */
    seasonStartMonth: integer("season_start_month").notNull().default(1),
    seasonStartDay: integer("season_start_day").notNull().default(1),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check("cooperative_settings_single_row", sql`${t.id} = 1`),
    // With two farms, each learns the other's figures by subtracting its own.
    check("minimum_farms_at_least_three", sql`${t.minimumFarms} >= 3`),
    check("release_schedule_known", sql`${t.releaseSchedule} in ('daily', 'weekly', 'manual')`),
    check("release_hour_of_day", sql`${t.releaseHour} between 0 and 23`),
    check("rejected_upload_retention_range", sql`${t.rejectedUploadRetentionDays} between 1 and 3650`),
    // A day every year has: 29 February is refused, or the season would have no first day in most years.
    check(
      "season_start_every_year",
      sql`${t.seasonStartMonth} between 1 and 12 and ${t.seasonStartDay} >= 1 and ${t.seasonStartDay} <= (case ${t.seasonStartMonth} when 2 then 28 when 4 then 30 when 6 then 30 when 9 then 30 when 11 then 30 else 31 end)`,
    ),
  ],
);

export const farms = pgTable(
  "farms",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    name: text("name").notNull(),
    region: text("region").notNull().default(""),
    contactEmail: text("contact_email"),
    status: farmStatus("status").notNull().default("active"),
    joinedAt: timestamp("joined_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("farms_name_unique").on(t.name)],
);

export const users = pgTable(
  "users",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    email: text("email").notNull(),
    name: text("name").notNull(),
    passwordHash: text("password_hash"),
    role: memberRole("role").notNull(),
    farmId: uuid("farm_id").references(() => farms.id, { onDelete: "cascade" }),
    active: boolean("active").notNull().default(true),
    displayUnits: displayUnits("display_units").notNull().default("metric"),
    notifyReminders: boolean("notify_reminders").notNull().default(true),
    /** An IANA zone name the member chose (lib/time/display.ts checks it); until then pages use the browser's zone. */
    timeZone: text("time_zone"),
    dateStyle: dateStyle("date_style").notNull().default("iso"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    lastSignInAt: timestamp("last_sign_in_at", { withTimezone: true }),
    /** Every session cookie carries the version it was issued under; raising it ends them all (a trigger raises it on a change of password, role, farm or active flag). */
    sessionVersion: integer("session_version").notNull().default(1),
  },
  (t) => [
    uniqueIndex("users_email_unique").on(sql`lower(${t.email})`),
    index("users_farm_idx").on(t.farmId),
    // Farm people belong to a farm; the coordinator and observers belong to the co-op.
    check("users_farm_matches_role", sql`(${t.role} in ('farm_manager', 'grower')) = (${t.farmId} is not null)`),
  ],
);

/** Sessions signed out one by one (the cookie names its id), kept until the cookie would have expired anyway. */
export const endedSessions = pgTable(
  "ended_sessions",
  {
    sessionId: text("session_id").primaryKey(),
    userId: uuid("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    endedAt: timestamp("ended_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  },
  (t) => [index("ended_sessions_user_idx").on(t.userId, t.expiresAt)],
);

/** Every sign-in attempt, kept so that rate limits hold across restarts. */
export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    email: text("email").notNull(),
    ip: text("ip").notNull(),
    succeeded: boolean("succeeded").notNull(),
    attemptedAt: timestamp("attempted_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("sign_in_attempts_email_idx").on(t.email, t.attemptedAt), index("sign_in_attempts_ip_idx").on(t.ip, t.attemptedAt)],
);

/**
 * One-time links for invitations and password resets; only a hash of the token is stored. The
 * hash is null until the mail job makes the token, just before sending it (lib/data/mail.ts).
 */
export const accessTokens = pgTable(
  "access_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    purpose: tokenPurpose("purpose").notNull(),
    tokenHash: text("token_hash"),
    email: text("email").notNull(),
    userId: uuid("user_id").references(() => users.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id").references(() => farms.id, { onDelete: "cascade" }),
    role: memberRole("role"),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    usedAt: timestamp("used_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("access_tokens_hash_unique").on(t.tokenHash)],
);
