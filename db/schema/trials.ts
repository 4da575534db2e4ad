import { sql } from "drizzle-orm";
import {
  boolean,
  check,
  date,
  foreignKey,
  index,
  integer,
  jsonb,
  numeric,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { farms, users } from "./cooperative";
import { contaminatedHandling, enrolmentStatus, trialDesignKind, trialStatus } from "./enums";
import { species, strains, treatments } from "./registries";
import { fruitingRooms } from "./rooms";

export const trials = pgTable(
  "trials",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    code: text("code").notNull(),
    title: text("title").notNull(),
    question: text("question").notNull().default(""),
    speciesId: uuid("species_id")
      .notNull()
      .references(() => species.id),
    status: trialStatus("status").notNull().default("draft"),
    /** One factor, or strains crossed with fruiting methods: each arm's levels are its strain and its treatment. */
    designKind: trialDesignKind("design_kind").notNull().default("one_factor"),
    outcomeFlushes: integer("outcome_flushes").notNull().default(2),
    contaminatedHandling: contaminatedHandling("contaminated_handling").notNull().default("exclude"),
    protocolNotes: text("protocol_notes").notNull().default(""),
    enrolmentDeadline: date("enrolment_deadline"),
    // The timeline farms are followed against (lib/trials/timeline.ts): dates, inclusive.
    inoculationFrom: date("inoculation_from"),
    inoculationTo: date("inoculation_to"),
    fruitingFrom: date("fruiting_from"),
    fruitingTo: date("fruiting_to"),
    dataDue: date("data_due"),
    smallestDifference: numeric("smallest_difference", { mode: "number" }),
    expectedSd: numeric("expected_sd", { mode: "number" }),
    plannedFarms: integer("planned_farms"),
    expectedLoss: numeric("expected_loss", { mode: "number" }),
    /** A room-level trial: the blocks each room holds, and the intraclass correlation the size was planned with. */
    blocksPerRoom: integer("blocks_per_room"),
    roomIcc: numeric("room_icc", { mode: "number" }),
    // Farms that withdrew their data after publication: the report keeps its figures and says so.
    withdrawalsAfterPublication: integer("withdrawals_after_publication").notNull().default(0),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    /** When the first version was published; each version's own date is in trial_publications. */
    publishedAt: timestamp("published_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("trials_code_unique").on(t.code),
    check("outcome_flushes_positive", sql`${t.outcomeFlushes} >= 1`),
    check(
      "trial_timeline_order",
      sql`(${t.inoculationFrom} is null or ${t.inoculationTo} is null or ${t.inoculationFrom} <= ${t.inoculationTo})
        and (${t.fruitingFrom} is null or ${t.fruitingTo} is null or ${t.fruitingFrom} <= ${t.fruitingTo})
        and (${t.fruitingFrom} is null or ${t.dataDue} is null or ${t.fruitingFrom} < ${t.dataDue})`,
    ),
    check("expected_loss_range", sql`${t.expectedLoss} is null or (${t.expectedLoss} >= 0 and ${t.expectedLoss} < 1)`),
    check("blocks_per_room_positive", sql`${t.blocksPerRoom} is null or ${t.blocksPerRoom} >= 1`),
    check("room_icc_range", sql`${t.roomIcc} is null or (${t.roomIcc} >= 0 and ${t.roomIcc} < 1)`),
  ],
);

export const trialArms = pgTable(
  "trial_arms",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    label: text("label").notNull(),
    strainId: uuid("strain_id")
      .notNull()
      .references(() => strains.id),
    treatmentId: uuid("treatment_id").references(() => treatments.id),
    isReference: boolean("is_reference").notNull().default(false),
    position: integer("position").notNull(),
  },
  (t) => [uniqueIndex("trial_arms_label_unique").on(t.trialId, t.label)],
);

export const trialEnrolments = pgTable(
  "trial_enrolments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    status: enrolmentStatus("status").notNull().default("invited"),
    blocksPerArm: integer("blocks_per_arm"),
    randomisationSeed: text("randomisation_seed"),
    remindersAllowed: boolean("reminders_allowed").notNull().default(true),
    invitedAt: timestamp("invited_at", { withTimezone: true }).notNull().defaultNow(),
    respondedAt: timestamp("responded_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("trial_enrolments_farm_unique").on(t.trialId, t.farmId),
    index("trial_enrolments_farm_idx").on(t.farmId),
    check("blocks_per_arm_positive", sql`${t.blocksPerArm} is null or ${t.blocksPerArm} >= 1`),
  ],
);

/**
 * Every reminder a farm got about a trial, by the daily sweep or by the coordinator's hand: one a
 * day per enrolment at most, which the unique key enforces even when two sweeps run at once.
 */
export const trialReminders = pgTable(
  "trial_reminders",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    enrolmentId: uuid("enrolment_id")
      .notNull()
      .references(() => trialEnrolments.id, { onDelete: "cascade" }),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    /** The day (UTC) it went out: the key that allows one a day. */
    remindedOn: date("reminded_on").notNull(),
    sentAt: timestamp("sent_at", { withTimezone: true }).notNull().defaultNow(),
    /** "before-due" and "behind" from the sweep, "by-hand" from the coordinator. */
    kind: text("kind").notNull(),
    // Who sent one by hand; no foreign key, as the audit log keeps an actor.
    sentBy: uuid("sent_by"),
  },
  (t) => [
    uniqueIndex("trial_reminders_one_a_day").on(t.enrolmentId, t.remindedOn),
    index("trial_reminders_trial_idx").on(t.trialId),
    check("trial_reminders_kind", sql`${t.kind} in ('before-due', 'behind', 'by-hand')`),
  ],
);

/** The randomised list: which block code of a farm runs which arm. */
export const trialBlockAssignments = pgTable(
  "trial_block_assignments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    enrolmentId: uuid("enrolment_id")
      .notNull()
      .references(() => trialEnrolments.id, { onDelete: "cascade" }),
    armId: uuid("arm_id")
      .notNull()
      .references(() => trialArms.id, { onDelete: "cascade" }),
    blockCode: text("block_code").notNull(),
    sequence: integer("sequence").notNull(),
    permutedBlock: integer("permuted_block").notNull(),
    /** A room-level trial: the farm's room the block goes in, which was drawn to the block's arm (trial_room_assignments). */
    roomId: uuid("room_id"),
  },
  (t) => [
    uniqueIndex("trial_block_assignments_code_unique").on(t.farmId, t.blockCode),
    index("trial_block_assignments_trial_idx").on(t.trialId),
    // The tenant key: a listed block goes only in a room of its own farm.
    foreignKey({ columns: [t.roomId, t.farmId], foreignColumns: [fruitingRooms.id, fruitingRooms.farmId] }).onDelete("cascade"),
  ],
);

/**
 * A room-level trial's draw of one farm's rooms to the arms (lib/trials/room-draw.ts), made when the
 * farm accepts with the seed stored on its enrolment: the farm's own rows, as its rooms are.
 */
export const trialRoomAssignments = pgTable(
  "trial_room_assignments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    enrolmentId: uuid("enrolment_id")
      .notNull()
      .references(() => trialEnrolments.id, { onDelete: "cascade" }),
    roomId: uuid("room_id").notNull(),
    armId: uuid("arm_id")
      .notNull()
      .references(() => trialArms.id, { onDelete: "cascade" }),
    /** Position in the draw (1 …), so the list reads in the order drawn. */
    sequence: integer("sequence").notNull(),
  },
  (t) => [
    uniqueIndex("trial_room_assignments_room_unique").on(t.trialId, t.roomId),
    index("trial_room_assignments_farm_idx").on(t.farmId),
    foreignKey({ columns: [t.roomId, t.farmId], foreignColumns: [fruitingRooms.id, fruitingRooms.farmId] }).onDelete("cascade"),
  ],
);

/**
 * Every run of a trial's analysis, kept: closing runs it first, the coordinator runs it again as
 * records arrive. A run holds only what the report may show (StoredTrialResults), what it read
 * (counts) and a fingerprint of the values it analysed. Nobody updates or deletes a run (0025):
 * members and observers read only runs that were published (trial_publications).
 */
export const trialAnalyses = pgTable(
  "trial_analyses",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    /** 1, 2, … per trial, in the order the runs were made. */
    run: integer("run").notNull(),
    ranAt: timestamp("ran_at", { withTimezone: true }).notNull().defaultNow(),
    // Who ran it, as the audit log keeps an actor: no foreign key, so removing a user never rewrites a run.
    ranBy: uuid("ran_by"),
    ranByName: text("ran_by_name").notNull(),
    results: jsonb("results").notNull(),
    /** Null for the one analysis a trial kept before runs were (see the migration). */
    inputs: jsonb("inputs"),
    fingerprint: text("fingerprint"),
  },
  (t) => [uniqueIndex("trial_analyses_run_unique").on(t.trialId, t.run), check("trial_analyses_run_positive", sql`${t.run} >= 1`)],
);

/**
 * A published version of a trial's report: version 1 is the original; each later one is an
 * amendment with its reason, shown above the versions before it, which stay readable. Insert-only.
 */
export const trialPublications = pgTable(
  "trial_publications",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => trialAnalyses.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    publishedAt: timestamp("published_at", { withTimezone: true }).notNull().defaultNow(),
    publishedBy: uuid("published_by"),
    publishedByName: text("published_by_name").notNull(),
    /** Why the version before was amended; none for the original. */
    reason: text("reason"),
  },
  (t) => [
    uniqueIndex("trial_publications_version_unique").on(t.trialId, t.version),
    uniqueIndex("trial_publications_analysis_unique").on(t.analysisId),
    check(
      "trial_publications_reason",
      sql`(${t.version} = 1 and ${t.reason} is null) or (${t.version} > 1 and ${t.reason} is not null and length(btrim(${t.reason})) >= 10)`,
    ),
  ],
);

/**
 * Which pseudonym a run of a trial's analysis gave each farm ("Farm C"), drawn at random per run,
 * and the farm's own estimates: row-level security lets only that farm's people read its row, and
 * only for a published run, so a farm finds itself in the report and nobody else can tell which
 * row is whose. Written with the run by the coordinator, who cannot read it.
 */
export const trialReportFarms = pgTable(
  "trial_report_farms",
  {
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    analysisId: uuid("analysis_id")
      .notNull()
      .references(() => trialAnalyses.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    pseudonym: text("pseudonym").notNull(),
    /** The farm's own difference against the reference arm, per arm (BE points, 95 % interval). */
    ownEstimates: jsonb("own_estimates").$type<{ arm: string; estimate: number; lower: number; upper: number }[]>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.analysisId, t.farmId] }), index("trial_report_farms_trial_idx").on(t.trialId)],
);
