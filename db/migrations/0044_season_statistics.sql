CREATE TABLE "farm_season_statistics" (
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"season_year" integer,
	"flush_window" text NOT NULL,
	"efficiency_blocks" integer NOT NULL,
	"efficiency_sum" double precision NOT NULL,
	"efficiency_squares" double precision NOT NULL,
	CONSTRAINT "farm_season_statistics_window" CHECK ("farm_season_statistics"."flush_window" in ('all', '1-2', '1'))
);
--> statement-breakpoint
CREATE TABLE "pooled_release_season_rows" (
	"release_number" integer NOT NULL,
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"season_year" integer,
	"flush_window" text NOT NULL,
	"efficiency_blocks" integer NOT NULL,
	"efficiency_sum" double precision NOT NULL,
	"efficiency_squares" double precision NOT NULL
);
--> statement-breakpoint
ALTER TABLE "farm_season_statistics" ADD CONSTRAINT "farm_season_statistics_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pooled_release_season_rows" ADD CONSTRAINT "pooled_release_season_rows_release_number_pooled_releases_number_fk" FOREIGN KEY ("release_number") REFERENCES "public"."pooled_releases"("number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "farm_season_statistics_farm_idx" ON "farm_season_statistics" USING btree ("farm_id");--> statement-breakpoint
CREATE INDEX "pooled_release_season_rows_read_idx" ON "pooled_release_season_rows" USING btree ("release_number","species_id","flush_window");