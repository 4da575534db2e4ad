import { sql } from "drizzle-orm";
import { check, numeric, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { users } from "./cooperative";
import { registryStatus, strainSource, substrateTreatment, treatmentKind } from "./enums";

const proposedBy = () => uuid("proposed_by").references(() => users.id, { onDelete: "set null" });
const createdAt = () => timestamp("created_at", { withTimezone: true }).notNull().defaultNow();

export const species = pgTable(
  "species",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    scientificName: text("scientific_name").notNull(),
    commonName: text("common_name").notNull(),
    status: registryStatus("status").notNull().default("active"),
    proposedBy: proposedBy(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("species_scientific_name_unique").on(t.scientificName)],
);

export const strains = pgTable(
  "strains",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    code: text("code").notNull(),
    speciesId: uuid("species_id")
      .notNull()
      .references(() => species.id),
    name: text("name").notNull(),
    source: strainSource("source").notNull(),
    notes: text("notes").notNull().default(""),
    status: registryStatus("status").notNull().default("active"),
    proposedBy: proposedBy(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("strains_code_unique").on(t.code)],
);

export const substrateRecipes = pgTable(
  "substrate_recipes",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    code: text("code").notNull(),
    name: text("name").notNull(),
    base: text("base").notNull(),
    supplement: text("supplement").notNull().default(""),
    supplementPercent: numeric("supplement_percent", { mode: "number" }).notNull().default(0),
    targetMoisture: numeric("target_moisture", { mode: "number" }).notNull(),
    treatment: substrateTreatment("treatment").notNull(),
    status: registryStatus("status").notNull().default("active"),
    proposedBy: proposedBy(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("substrate_recipes_code_unique").on(t.code),
    check("supplement_percent_range", sql`${t.supplementPercent} >= 0 and ${t.supplementPercent} <= 100`),
    check("target_moisture_range", sql`${t.targetMoisture} >= 0 and ${t.targetMoisture} < 1`),
  ],
);

/** Fruiting methods and other treatments a trial may compare (humidity regimes …). */
export const treatments = pgTable(
  "treatments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    code: text("code").notNull(),
    name: text("name").notNull(),
    kind: treatmentKind("kind").notNull().default("fruiting_method"),
    description: text("description").notNull().default(""),
    status: registryStatus("status").notNull().default("active"),
    proposedBy: proposedBy(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("treatments_code_unique").on(t.code)],
);
