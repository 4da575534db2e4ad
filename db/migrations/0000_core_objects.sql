CREATE TYPE "public"."contaminated_handling" AS ENUM('exclude', 'count_as_zero');--> statement-breakpoint
CREATE TYPE "public"."display_units" AS ENUM('metric', 'imperial');--> statement-breakpoint
CREATE TYPE "public"."enrolment_status" AS ENUM('invited', 'accepted', 'declined', 'dropped');--> statement-breakpoint
CREATE TYPE "public"."farm_status" AS ENUM('active', 'suspended', 'removed');--> statement-breakpoint
CREATE TYPE "public"."member_role" AS ENUM('coordinator', 'farm_manager', 'grower', 'observer');--> statement-breakpoint
CREATE TYPE "public"."registry_status" AS ENUM('proposed', 'active', 'retired');--> statement-breakpoint
CREATE TYPE "public"."strain_source" AS ENUM('culture_bank', 'wild_clone', 'own_isolate');--> statement-breakpoint
CREATE TYPE "public"."substrate_treatment" AS ENUM('sterilised', 'pasteurised');--> statement-breakpoint
CREATE TYPE "public"."token_purpose" AS ENUM('invitation', 'password_reset');--> statement-breakpoint
CREATE TYPE "public"."treatment_kind" AS ENUM('fruiting_method', 'humidity', 'other');--> statement-breakpoint
CREATE TYPE "public"."trial_status" AS ENUM('draft', 'open', 'running', 'collecting', 'published', 'withdrawn');--> statement-breakpoint
CREATE TYPE "public"."upload_outcome" AS ENUM('received', 'rejected', 'committed', 'already_imported');--> statement-breakpoint
CREATE TABLE "access_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"purpose" "token_purpose" NOT NULL,
	"token_hash" text NOT NULL,
	"email" text NOT NULL,
	"user_id" uuid,
	"farm_id" uuid,
	"role" "member_role",
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "cooperative_settings" (
	"id" integer PRIMARY KEY DEFAULT 1 NOT NULL,
	"name" text NOT NULL,
	"region" text DEFAULT '' NOT NULL,
	"minimum_farms" integer DEFAULT 3 NOT NULL,
	"show_per_farm_estimates" boolean DEFAULT false NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "cooperative_settings_single_row" CHECK ("cooperative_settings"."id" = 1),
	CONSTRAINT "minimum_farms_at_least_two" CHECK ("cooperative_settings"."minimum_farms" >= 2)
);
--> statement-breakpoint
CREATE TABLE "farms" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"region" text DEFAULT '' NOT NULL,
	"contact_email" text,
	"status" "farm_status" DEFAULT 'active' NOT NULL,
	"joined_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "sign_in_attempts" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"email" text NOT NULL,
	"ip" text NOT NULL,
	"succeeded" boolean NOT NULL,
	"attempted_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "users" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"email" text NOT NULL,
	"name" text NOT NULL,
	"password_hash" text,
	"role" "member_role" NOT NULL,
	"farm_id" uuid,
	"active" boolean DEFAULT true NOT NULL,
	"display_units" "display_units" DEFAULT 'metric' NOT NULL,
	"notify_reminders" boolean DEFAULT true NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_sign_in_at" timestamp with time zone,
	CONSTRAINT "users_farm_matches_role" CHECK (("users"."role" in ('farm_manager', 'grower')) = ("users"."farm_id" is not null))
);
--> statement-breakpoint
CREATE TABLE "species" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"scientific_name" text NOT NULL,
	"common_name" text NOT NULL,
	"status" "registry_status" DEFAULT 'active' NOT NULL,
	"proposed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "strains" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"species_id" uuid NOT NULL,
	"name" text NOT NULL,
	"source" "strain_source" NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"status" "registry_status" DEFAULT 'active' NOT NULL,
	"proposed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "substrate_recipes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"base" text NOT NULL,
	"supplement" text DEFAULT '' NOT NULL,
	"supplement_percent" numeric DEFAULT 0 NOT NULL,
	"target_moisture" numeric NOT NULL,
	"treatment" "substrate_treatment" NOT NULL,
	"status" "registry_status" DEFAULT 'active' NOT NULL,
	"proposed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "supplement_percent_range" CHECK ("substrate_recipes"."supplement_percent" >= 0 and "substrate_recipes"."supplement_percent" <= 100),
	CONSTRAINT "target_moisture_range" CHECK ("substrate_recipes"."target_moisture" >= 0 and "substrate_recipes"."target_moisture" < 1)
);
--> statement-breakpoint
CREATE TABLE "treatments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"kind" "treatment_kind" DEFAULT 'fruiting_method' NOT NULL,
	"description" text DEFAULT '' NOT NULL,
	"status" "registry_status" DEFAULT 'active' NOT NULL,
	"proposed_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "trial_arms" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trial_id" uuid NOT NULL,
	"label" text NOT NULL,
	"strain_id" uuid NOT NULL,
	"treatment_id" uuid,
	"is_reference" boolean DEFAULT false NOT NULL,
	"position" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "trial_block_assignments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trial_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"enrolment_id" uuid NOT NULL,
	"arm_id" uuid NOT NULL,
	"block_code" text NOT NULL,
	"sequence" integer NOT NULL,
	"permuted_block" integer NOT NULL
);
--> statement-breakpoint
CREATE TABLE "trial_enrolments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trial_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"status" "enrolment_status" DEFAULT 'invited' NOT NULL,
	"blocks_per_arm" integer,
	"randomisation_seed" text,
	"reminders_allowed" boolean DEFAULT true NOT NULL,
	"invited_at" timestamp with time zone DEFAULT now() NOT NULL,
	"responded_at" timestamp with time zone,
	CONSTRAINT "blocks_per_arm_positive" CHECK ("trial_enrolments"."blocks_per_arm" is null or "trial_enrolments"."blocks_per_arm" >= 1)
);
--> statement-breakpoint
CREATE TABLE "trials" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"code" text NOT NULL,
	"title" text NOT NULL,
	"question" text DEFAULT '' NOT NULL,
	"species_id" uuid NOT NULL,
	"status" "trial_status" DEFAULT 'draft' NOT NULL,
	"outcome_flushes" integer DEFAULT 2 NOT NULL,
	"contaminated_handling" "contaminated_handling" DEFAULT 'exclude' NOT NULL,
	"protocol_notes" text DEFAULT '' NOT NULL,
	"enrolment_deadline" date,
	"smallest_difference" numeric,
	"expected_sd" numeric,
	"planned_farms" integer,
	"expected_loss" numeric,
	"published_results" jsonb,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"published_at" timestamp with time zone,
	CONSTRAINT "outcome_flushes_positive" CHECK ("trials"."outcome_flushes" >= 1),
	CONSTRAINT "expected_loss_range" CHECK ("trials"."expected_loss" is null or ("trials"."expected_loss" >= 0 and "trials"."expected_loss" < 1))
);
--> statement-breakpoint
CREATE TABLE "blocks" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"code" text NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"trial_arm_id" uuid,
	"inoculated_on" date,
	"wet_mass_g" numeric,
	"wet_mass_as_written" text,
	"wet_mass_unit" text,
	"moisture" numeric,
	"contaminated" boolean DEFAULT false NOT NULL,
	"contaminated_on" date,
	"spent_mass_g" numeric,
	"spent_mass_as_written" text,
	"spent_mass_unit" text,
	"notes" text DEFAULT '' NOT NULL,
	"last_upload_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "blocks_wet_mass_not_negative" CHECK ("blocks"."wet_mass_g" >= 0),
	CONSTRAINT "blocks_spent_mass_not_negative" CHECK ("blocks"."spent_mass_g" >= 0),
	CONSTRAINT "blocks_moisture_range" CHECK ("blocks"."moisture" >= 0 and "blocks"."moisture" < 1)
);
--> statement-breakpoint
CREATE TABLE "farm_import_preferences" (
	"farm_id" uuid PRIMARY KEY NOT NULL,
	"column_mapping" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"default_mass_unit" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "harvests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"block_id" uuid NOT NULL,
	"flush" integer NOT NULL,
	"harvested_on" date,
	"fresh_mass_g" numeric NOT NULL,
	"fresh_mass_as_written" text,
	"fresh_mass_unit" text,
	"dry_mass_g" numeric,
	"dry_mass_as_written" text,
	"dry_mass_unit" text,
	"upload_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "harvests_flush_positive" CHECK ("harvests"."flush" >= 1),
	CONSTRAINT "harvests_fresh_mass_not_negative" CHECK ("harvests"."fresh_mass_g" >= 0),
	CONSTRAINT "harvests_dry_mass_not_negative" CHECK ("harvests"."dry_mass_g" >= 0)
);
--> statement-breakpoint
CREATE TABLE "uploads" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"uploaded_by" uuid,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"file_name" text NOT NULL,
	"content" "bytea" NOT NULL,
	"sha256" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"schema_version" integer DEFAULT 1 NOT NULL,
	"outcome" "upload_outcome" DEFAULT 'received' NOT NULL,
	"row_count" integer DEFAULT 0 NOT NULL,
	"report" jsonb,
	"options" jsonb,
	"committed_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "value_changes" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"farm_id" uuid NOT NULL,
	"block_id" uuid NOT NULL,
	"flush" integer,
	"field" text NOT NULL,
	"old_value" text,
	"new_value" text,
	"upload_id" uuid,
	"changed_by" uuid,
	"changed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "audit_events" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"occurred_at" timestamp with time zone DEFAULT now() NOT NULL,
	"actor_user_id" uuid,
	"actor_label" text DEFAULT '' NOT NULL,
	"farm_id" uuid,
	"action" text NOT NULL,
	"subject" text DEFAULT '' NOT NULL,
	"details" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"ip" text
);
--> statement-breakpoint
CREATE TABLE "mail_messages" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"sender" text NOT NULL,
	"recipients" text[] NOT NULL,
	"subject" text DEFAULT '' NOT NULL,
	"text" text DEFAULT '' NOT NULL,
	"html" text DEFAULT '' NOT NULL
);
--> statement-breakpoint
ALTER TABLE "access_tokens" ADD CONSTRAINT "access_tokens_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "access_tokens" ADD CONSTRAINT "access_tokens_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "access_tokens" ADD CONSTRAINT "access_tokens_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "users" ADD CONSTRAINT "users_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "species" ADD CONSTRAINT "species_proposed_by_users_id_fk" FOREIGN KEY ("proposed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "strains" ADD CONSTRAINT "strains_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "strains" ADD CONSTRAINT "strains_proposed_by_users_id_fk" FOREIGN KEY ("proposed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "substrate_recipes" ADD CONSTRAINT "substrate_recipes_proposed_by_users_id_fk" FOREIGN KEY ("proposed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "treatments" ADD CONSTRAINT "treatments_proposed_by_users_id_fk" FOREIGN KEY ("proposed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_strain_id_strains_id_fk" FOREIGN KEY ("strain_id") REFERENCES "public"."strains"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_arms" ADD CONSTRAINT "trial_arms_treatment_id_treatments_id_fk" FOREIGN KEY ("treatment_id") REFERENCES "public"."treatments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_block_assignments" ADD CONSTRAINT "trial_block_assignments_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_block_assignments" ADD CONSTRAINT "trial_block_assignments_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_block_assignments" ADD CONSTRAINT "trial_block_assignments_enrolment_id_trial_enrolments_id_fk" FOREIGN KEY ("enrolment_id") REFERENCES "public"."trial_enrolments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_block_assignments" ADD CONSTRAINT "trial_block_assignments_arm_id_trial_arms_id_fk" FOREIGN KEY ("arm_id") REFERENCES "public"."trial_arms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_enrolments" ADD CONSTRAINT "trial_enrolments_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_enrolments" ADD CONSTRAINT "trial_enrolments_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "trials_species_id_species_id_fk" FOREIGN KEY ("species_id") REFERENCES "public"."species"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "trials_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_strain_id_strains_id_fk" FOREIGN KEY ("strain_id") REFERENCES "public"."strains"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_substrate_recipe_id_substrate_recipes_id_fk" FOREIGN KEY ("substrate_recipe_id") REFERENCES "public"."substrate_recipes"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_fruiting_method_id_treatments_id_fk" FOREIGN KEY ("fruiting_method_id") REFERENCES "public"."treatments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_trial_arm_id_trial_arms_id_fk" FOREIGN KEY ("trial_arm_id") REFERENCES "public"."trial_arms"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_last_upload_id_uploads_id_fk" FOREIGN KEY ("last_upload_id") REFERENCES "public"."uploads"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "farm_import_preferences" ADD CONSTRAINT "farm_import_preferences_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "harvests" ADD CONSTRAINT "harvests_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "harvests" ADD CONSTRAINT "harvests_block_id_blocks_id_fk" FOREIGN KEY ("block_id") REFERENCES "public"."blocks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "harvests" ADD CONSTRAINT "harvests_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "value_changes" ADD CONSTRAINT "value_changes_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "value_changes" ADD CONSTRAINT "value_changes_block_id_blocks_id_fk" FOREIGN KEY ("block_id") REFERENCES "public"."blocks"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "value_changes" ADD CONSTRAINT "value_changes_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "value_changes" ADD CONSTRAINT "value_changes_changed_by_users_id_fk" FOREIGN KEY ("changed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_actor_user_id_users_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "audit_events" ADD CONSTRAINT "audit_events_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "access_tokens_hash_unique" ON "access_tokens" USING btree ("token_hash");--> statement-breakpoint
CREATE UNIQUE INDEX "farms_name_unique" ON "farms" USING btree ("name");--> statement-breakpoint
CREATE INDEX "sign_in_attempts_email_idx" ON "sign_in_attempts" USING btree ("email","attempted_at");--> statement-breakpoint
CREATE INDEX "sign_in_attempts_ip_idx" ON "sign_in_attempts" USING btree ("ip","attempted_at");--> statement-breakpoint
CREATE UNIQUE INDEX "users_email_unique" ON "users" USING btree (lower("email"));--> statement-breakpoint
CREATE INDEX "users_farm_idx" ON "users" USING btree ("farm_id");--> statement-breakpoint
CREATE UNIQUE INDEX "species_scientific_name_unique" ON "species" USING btree ("scientific_name");--> statement-breakpoint
CREATE UNIQUE INDEX "strains_code_unique" ON "strains" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "substrate_recipes_code_unique" ON "substrate_recipes" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "treatments_code_unique" ON "treatments" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "trial_arms_label_unique" ON "trial_arms" USING btree ("trial_id","label");--> statement-breakpoint
CREATE UNIQUE INDEX "trial_block_assignments_code_unique" ON "trial_block_assignments" USING btree ("farm_id","block_code");--> statement-breakpoint
CREATE INDEX "trial_block_assignments_trial_idx" ON "trial_block_assignments" USING btree ("trial_id");--> statement-breakpoint
CREATE UNIQUE INDEX "trial_enrolments_farm_unique" ON "trial_enrolments" USING btree ("trial_id","farm_id");--> statement-breakpoint
CREATE INDEX "trial_enrolments_farm_idx" ON "trial_enrolments" USING btree ("farm_id");--> statement-breakpoint
CREATE UNIQUE INDEX "trials_code_unique" ON "trials" USING btree ("code");--> statement-breakpoint
CREATE UNIQUE INDEX "blocks_farm_code_unique" ON "blocks" USING btree ("farm_id","code");--> statement-breakpoint
CREATE INDEX "blocks_strain_idx" ON "blocks" USING btree ("strain_id");--> statement-breakpoint
CREATE UNIQUE INDEX "harvests_block_flush_unique" ON "harvests" USING btree ("block_id","flush");--> statement-breakpoint
CREATE INDEX "harvests_farm_idx" ON "harvests" USING btree ("farm_id");--> statement-breakpoint
CREATE INDEX "uploads_farm_sha_idx" ON "uploads" USING btree ("farm_id","sha256");--> statement-breakpoint
CREATE INDEX "uploads_farm_time_idx" ON "uploads" USING btree ("farm_id","uploaded_at");--> statement-breakpoint
CREATE INDEX "value_changes_block_idx" ON "value_changes" USING btree ("block_id","changed_at");--> statement-breakpoint
CREATE INDEX "audit_events_farm_time_idx" ON "audit_events" USING btree ("farm_id","occurred_at");--> statement-breakpoint
CREATE INDEX "audit_events_time_idx" ON "audit_events" USING btree ("occurred_at");