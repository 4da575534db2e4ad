CREATE TYPE "public"."humidity_mode" AS ENUM('cycling', 'flooding');--> statement-breakpoint
CREATE TYPE "public"."room_fresh_air" AS ENUM('filter_holes', 'fan_timer', 'fan_always', 'opened_by_hand');--> statement-breakpoint
CREATE TYPE "public"."room_kind" AS ENUM('tub', 'tent', 'room', 'other');--> statement-breakpoint
CREATE TABLE "block_room_moves" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"block_id" uuid NOT NULL,
	"room_id" uuid NOT NULL,
	"moved_on" date,
	"upload_id" uuid,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "block_room_moves_block_day_unique" UNIQUE NULLS NOT DISTINCT("block_id","moved_on")
);
--> statement-breakpoint
CREATE TABLE "fruiting_rooms" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"name" text NOT NULL,
	"kind" "room_kind" NOT NULL,
	"volume_m3" numeric,
	"fresh_air" "room_fresh_air" NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"retired_on" date,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "fruiting_rooms_id_farm_unique" UNIQUE("id","farm_id"),
	CONSTRAINT "fruiting_rooms_volume_positive" CHECK ("fruiting_rooms"."volume_m3" > 0)
);
--> statement-breakpoint
CREATE TABLE "room_regimes" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"room_id" uuid NOT NULL,
	"starts_on" date NOT NULL,
	"regime_kind_id" uuid,
	"humidity_mode" "humidity_mode" NOT NULL,
	"cycle_on_minutes" integer,
	"cycle_off_minutes" integer,
	"flood_starts_at" time,
	"flood_hours" numeric,
	"air_changes_per_hour" numeric,
	"temperature_set_c" numeric,
	"cleaning_every_days" integer,
	"notes" text DEFAULT '' NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "room_regimes_mode_columns" CHECK (("room_regimes"."humidity_mode" = 'cycling' and "room_regimes"."cycle_on_minutes" is not null and "room_regimes"."cycle_off_minutes" is not null
        and "room_regimes"."flood_starts_at" is null and "room_regimes"."flood_hours" is null)
      or ("room_regimes"."humidity_mode" = 'flooding' and "room_regimes"."flood_starts_at" is not null and "room_regimes"."flood_hours" is not null
        and "room_regimes"."cycle_on_minutes" is null and "room_regimes"."cycle_off_minutes" is null)),
	CONSTRAINT "room_regimes_cycle_range" CHECK ("room_regimes"."cycle_on_minutes" between 1 and 1440 and "room_regimes"."cycle_off_minutes" between 0 and 1440),
	CONSTRAINT "room_regimes_flood_hours_range" CHECK ("room_regimes"."flood_hours" > 0 and "room_regimes"."flood_hours" <= 24),
	CONSTRAINT "room_regimes_air_changes_not_negative" CHECK ("room_regimes"."air_changes_per_hour" >= 0),
	CONSTRAINT "room_regimes_temperature_range" CHECK ("room_regimes"."temperature_set_c" between -10 and 50),
	CONSTRAINT "room_regimes_cleaning_positive" CHECK ("room_regimes"."cleaning_every_days" >= 1)
);
--> statement-breakpoint
ALTER TABLE "block_room_moves" ADD CONSTRAINT "block_room_moves_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "block_room_moves" ADD CONSTRAINT "block_room_moves_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "block_room_moves" ADD CONSTRAINT "block_room_moves_block_farm_fk" FOREIGN KEY ("block_id","farm_id") REFERENCES "public"."blocks"("id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "block_room_moves" ADD CONSTRAINT "block_room_moves_room_farm_fk" FOREIGN KEY ("room_id","farm_id") REFERENCES "public"."fruiting_rooms"("id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "fruiting_rooms" ADD CONSTRAINT "fruiting_rooms_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "room_regimes" ADD CONSTRAINT "room_regimes_regime_kind_id_treatments_id_fk" FOREIGN KEY ("regime_kind_id") REFERENCES "public"."treatments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "room_regimes" ADD CONSTRAINT "room_regimes_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "room_regimes" ADD CONSTRAINT "room_regimes_room_farm_fk" FOREIGN KEY ("room_id","farm_id") REFERENCES "public"."fruiting_rooms"("id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "block_room_moves_room_idx" ON "block_room_moves" USING btree ("room_id");--> statement-breakpoint
CREATE INDEX "block_room_moves_farm_idx" ON "block_room_moves" USING btree ("farm_id");--> statement-breakpoint
CREATE UNIQUE INDEX "fruiting_rooms_farm_name_unique" ON "fruiting_rooms" USING btree ("farm_id","name");--> statement-breakpoint
CREATE UNIQUE INDEX "room_regimes_room_starts_unique" ON "room_regimes" USING btree ("room_id","starts_on");--> statement-breakpoint
CREATE INDEX "room_regimes_farm_idx" ON "room_regimes" USING btree ("farm_id");