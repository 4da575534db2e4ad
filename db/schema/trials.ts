import { sql } from "drizzle-orm";
import {
  boolean,
  check,
  date,
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
import { contaminatedHandling, enrolmentStatus, trialStatus } from "./enums";
import { species, strains, treatments } from "./registries";

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
    outcomeFlushes: integer("outcome_flushes").notNull().default(2),
    contaminatedHandling: contaminatedHandling("contaminated_handling").notNull().default("exclude"),
    protocolNotes: text("protocol_notes").notNull().default(""),
    enrolmentDeadline: date("enrolment_deadline"),
    smallestDifference: numeric("smallest_difference", { mode: "number" }),
    expectedSd: numeric("expected_sd", { mode: "number" }),
    plannedFarms: integer("planned_farms"),
    expectedLoss: numeric("expected_loss", { mode: "number" }),
    publishedResults: jsonb("published_results"),
    // Farms that withdrew their data after publication: the report keeps its figures and says so.
    withdrawalsAfterPublication: integer("withdrawals_after_publication").notNull().default(0),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    publishedAt: timestamp("published_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("trials_code_unique").on(t.code),
    check("outcome_flushes_positive", sql`${t.outcomeFlushes} >= 1`),
    check("expected_loss_range", sql`${t.expectedLoss} is null or (${t.expectedLoss} >= 0 and ${t.expectedLoss} < 1)`),
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
  },
  (t) => [
    uniqueIndex("trial_block_assignments_code_unique").on(t.farmId, t.blockCode),
    index("trial_block_assignments_trial_idx").on(t.trialId),
  ],
);

/**
 * Which pseudonym a trial report gave each farm ("Farm C"), drawn at random when the trial is
 * analysed, and the farm's own estimates: row-level security lets only that farm's people read
 * its row, so a farm finds itself in the report and nobody else can tell which row is whose.
 * Written by rhizo_analyst with the analysis.
 */
export const trialReportFarms = pgTable(
  "trial_report_farms",
  {
    trialId: uuid("trial_id")
      .notNull()
      .references(() => trials.id, { onDelete: "cascade" }),
    farmId: uuid("farm_id")
      .notNull()
      .references(() => farms.id, { onDelete: "cascade" }),
    pseudonym: text("pseudonym").notNull(),
    /** The farm's own difference against the reference arm, per arm (BE points, 95 % interval). */
    ownEstimates: jsonb("own_estimates").$type<{ arm: string; estimate: number; lower: number; upper: number }[]>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.trialId, t.farmId] })],
);
