CREATE TABLE "farm_flush_statistics" (
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"trial_arm_id" uuid,
	"flush" integer NOT NULL,
	"finished_blocks" integer NOT NULL,
	"blocks_fruiting" integer NOT NULL,
	"share_sum" double precision NOT NULL,
	"share_squares" double precision NOT NULL,
	"cumulative_sum" double precision NOT NULL,
	"cumulative_squares" double precision NOT NULL
);
--> statement-breakpoint
CREATE TABLE "farm_strain_statistics" (
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"trial_arm_id" uuid,
	"flush_window" text NOT NULL,
	"blocks" integer NOT NULL,
	"blocks_contaminated" integer NOT NULL,
	"efficiency_blocks" integer NOT NULL,
	"efficiency_sum" double precision NOT NULL,
	"efficiency_squares" double precision NOT NULL,
	"efficiency_bins" jsonb NOT NULL,
	"first_harvest_blocks" integer NOT NULL,
	"first_harvest_days_sum" double precision NOT NULL,
	"refreshed_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "farm_strain_statistics_window" CHECK ("farm_strain_statistics"."flush_window" in ('all', '1-2', '1'))
);
--> statement-breakpoint
CREATE TABLE "pooled_refresh_state" (
	"farm_id" uuid PRIMARY KEY NOT NULL,
	"requested" integer DEFAULT 0 NOT NULL,
	"completed" integer DEFAULT 0 NOT NULL,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"completed_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "farm_flush_statistics" ADD CONSTRAINT "farm_flush_statistics_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "farm_strain_statistics" ADD CONSTRAINT "farm_strain_statistics_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pooled_refresh_state" ADD CONSTRAINT "pooled_refresh_state_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "farm_flush_statistics_farm_idx" ON "farm_flush_statistics" USING btree ("farm_id");--> statement-breakpoint
CREATE INDEX "farm_flush_statistics_species_idx" ON "farm_flush_statistics" USING btree ("species_id");--> statement-breakpoint
CREATE INDEX "farm_strain_statistics_farm_idx" ON "farm_strain_statistics" USING btree ("farm_id");--> statement-breakpoint
CREATE INDEX "farm_strain_statistics_species_idx" ON "farm_strain_statistics" USING btree ("species_id","flush_window");