ALTER TABLE "cooperative_settings" ADD COLUMN "release_time_zone" text DEFAULT 'UTC' NOT NULL;--> statement-breakpoint

-- Access, beside the column it goes with. The pooled-analysis role read
-- whole registers and trials (0001): a strain's notes and who proposed it, a treatment's
-- description, a trial's question and protocol notes, and farms' and enrolments' ids it never
-- uses. It keeps only the columns a pooled page names: ids and names, a strain's species, a
-- treatment's kind. tests/integration/adversarial/database-roles.test.ts fails if a grant comes back.
REVOKE SELECT ON species, strains, substrate_recipes, treatments, trials, trial_arms, trial_enrolments, farms FROM rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, common_name) ON species TO rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, species_id, name) ON strains TO rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, name) ON substrate_recipes TO rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, name, kind) ON treatments TO rhizo_analyst;
