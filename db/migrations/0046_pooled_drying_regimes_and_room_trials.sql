ALTER TYPE "public"."trial_design_kind" ADD VALUE 'rooms';--> statement-breakpoint
CREATE TABLE "pooled_release_drying_rows" (
	"release_number" integer NOT NULL,
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"strain_id" uuid NOT NULL,
	"substrate_recipe_id" uuid,
	"fruiting_method_id" uuid,
	"dried_blocks" integer NOT NULL,
	"ratio_sum" double precision NOT NULL,
	"ratio_squares" double precision NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pooled_release_regime_rows" (
	"release_number" integer NOT NULL,
	"farm_id" uuid NOT NULL,
	"species_id" uuid NOT NULL,
	"regime_kind_id" uuid NOT NULL,
	"rooms" integer NOT NULL,
	"blocks" integer NOT NULL,
	"blocks_contaminated" integer NOT NULL,
	"contamination_room_sum" double precision NOT NULL,
	"contamination_room_squares" double precision NOT NULL,
	"efficiency_rooms" integer NOT NULL,
	"efficiency_room_sum" double precision NOT NULL,
	"efficiency_room_squares" double precision NOT NULL,
	"efficiency_blocks" integer NOT NULL,
	"block_efficiency_sum" double precision NOT NULL,
	"block_efficiency_squares" double precision NOT NULL,
	"room_weighted_squares" double precision NOT NULL,
	"room_size_squares" double precision NOT NULL
);
--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "blocks_per_room" integer;--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "room_icc" numeric;--> statement-breakpoint
ALTER TABLE "pooled_release_drying_rows" ADD CONSTRAINT "pooled_release_drying_rows_release_number_pooled_releases_number_fk" FOREIGN KEY ("release_number") REFERENCES "public"."pooled_releases"("number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pooled_release_regime_rows" ADD CONSTRAINT "pooled_release_regime_rows_release_number_pooled_releases_number_fk" FOREIGN KEY ("release_number") REFERENCES "public"."pooled_releases"("number") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "pooled_release_drying_rows_read_idx" ON "pooled_release_drying_rows" USING btree ("release_number","species_id");--> statement-breakpoint
CREATE INDEX "pooled_release_regime_rows_read_idx" ON "pooled_release_regime_rows" USING btree ("release_number","species_id");--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "blocks_per_room_positive" CHECK ("trials"."blocks_per_room" is null or "trials"."blocks_per_room" >= 1);--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "room_icc_range" CHECK ("trials"."room_icc" is null or ("trials"."room_icc" >= 0 and "trials"."room_icc" < 1));