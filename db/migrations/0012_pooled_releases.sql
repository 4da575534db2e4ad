CREATE TABLE "trial_report_farms" (
	"trial_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"pseudonym" text NOT NULL,
	"own_estimates" jsonb NOT NULL,
	CONSTRAINT "trial_report_farms_trial_id_farm_id_pk" PRIMARY KEY("trial_id","farm_id")
);
--> statement-breakpoint
CREATE TABLE "pooled_release_flush_rows" (
	"release_number" integer NOT NULL,
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"flush" integer NOT NULL,
	"finished_blocks" integer NOT NULL,
	"blocks_fruiting" integer NOT NULL,
	"share_sum" double precision NOT NULL,
	"share_squares" double precision NOT NULL,
	"cumulative_sum" double precision NOT NULL,
	"cumulative_squares" double precision NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pooled_release_schedule" (
	"id" integer PRIMARY KEY DEFAULT 1 NOT NULL,
	"last_attempt_at" timestamp with time zone,
	"last_outcome" text,
	CONSTRAINT "pooled_release_schedule_single_row" CHECK ("pooled_release_schedule"."id" = 1)
);
--> statement-breakpoint
CREATE TABLE "pooled_release_strain_rows" (
	"release_number" integer NOT NULL,
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"flush_window" text NOT NULL,
	"blocks" integer NOT NULL,
	"blocks_contaminated" integer NOT NULL,
	"efficiency_blocks" integer NOT NULL,
	"efficiency_sum" double precision NOT NULL,
	"efficiency_squares" double precision NOT NULL,
	"efficiency_bins" jsonb NOT NULL,
	"first_harvest_blocks" integer NOT NULL,
	"first_harvest_days_sum" double precision NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pooled_releases" (
	"number" integer PRIMARY KEY NOT NULL,
	"cut_at" timestamp with time zone DEFAULT now() NOT NULL,
	"cut_by" text NOT NULL,
	"minimum_farms" integer NOT NULL,
	"farms_changed" integer NOT NULL,
	"figures_changed" integer NOT NULL,
	"figures_held_back" integer NOT NULL,
	CONSTRAINT "pooled_releases_cut_by" CHECK ("pooled_releases"."cut_by" in ('schedule', 'coordinator', 'setup'))
);
--> statement-breakpoint
ALTER TABLE "cooperative_settings" DROP CONSTRAINT "minimum_farms_at_least_two";--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD COLUMN "release_schedule" text DEFAULT 'daily' NOT NULL;--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD COLUMN "release_hour" integer DEFAULT 2 NOT NULL;--> statement-breakpoint
ALTER TABLE "trial_report_farms" ADD CONSTRAINT "trial_report_farms_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_report_farms" ADD CONSTRAINT "trial_report_farms_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pooled_release_flush_rows" ADD CONSTRAINT "pooled_release_flush_rows_release_number_pooled_releases_number_fk" FOREIGN KEY ("release_number") REFERENCES "public"."pooled_releases"("number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pooled_release_strain_rows" ADD CONSTRAINT "pooled_release_strain_rows_release_number_pooled_releases_number_fk" FOREIGN KEY ("release_number") REFERENCES "public"."pooled_releases"("number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "pooled_release_flush_rows_read_idx" ON "pooled_release_flush_rows" USING btree ("release_number","species_id");--> statement-breakpoint
CREATE INDEX "pooled_release_strain_rows_read_idx" ON "pooled_release_strain_rows" USING btree ("release_number","species_id","flush_window");--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD CONSTRAINT "minimum_farms_at_least_three" CHECK ("cooperative_settings"."minimum_farms" >= 3);--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD CONSTRAINT "release_schedule_known" CHECK ("cooperative_settings"."release_schedule" in ('daily', 'weekly', 'manual'));--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD CONSTRAINT "release_hour_of_day" CHECK ("cooperative_settings"."release_hour" between 0 and 23);