CREATE TABLE "climate_logs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"room_id" uuid NOT NULL,
	"file_name" text NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by" uuid,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"shape" text NOT NULL,
	"temperature_unit" text NOT NULL,
	"time_zone" text NOT NULL,
	"reading_count" integer NOT NULL,
	"first_at" timestamp with time zone NOT NULL,
	"last_at" timestamp with time zone NOT NULL,
	CONSTRAINT "climate_logs_id_room_farm_unique" UNIQUE("id","room_id","farm_id"),
	CONSTRAINT "climate_logs_temperature_unit" CHECK ("climate_logs"."temperature_unit" in ('C', 'F')),
	CONSTRAINT "climate_logs_span" CHECK ("climate_logs"."first_at" <= "climate_logs"."last_at" and "climate_logs"."reading_count" >= 1)
);
--> statement-breakpoint
CREATE TABLE "climate_readings" (
	"log_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"room_id" uuid NOT NULL,
	"taken_at" timestamp with time zone NOT NULL,
	"temperature_c" numeric,
	"relative_humidity" numeric,
	"co2_ppm" numeric,
	CONSTRAINT "climate_readings_pk" PRIMARY KEY("log_id","taken_at"),
	CONSTRAINT "climate_readings_humidity_range" CHECK ("climate_readings"."relative_humidity" between 0 and 100),
	CONSTRAINT "climate_readings_co2_not_negative" CHECK ("climate_readings"."co2_ppm" >= 0)
);
--> statement-breakpoint
ALTER TABLE "climate_logs" ADD CONSTRAINT "climate_logs_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "climate_logs" ADD CONSTRAINT "climate_logs_room_farm_fk" FOREIGN KEY ("room_id","farm_id") REFERENCES "public"."fruiting_rooms"("id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "climate_readings" ADD CONSTRAINT "climate_readings_log_room_farm_fk" FOREIGN KEY ("log_id","room_id","farm_id") REFERENCES "public"."climate_logs"("id","room_id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "climate_logs_farm_sha_unique" ON "climate_logs" USING btree ("farm_id","sha256");--> statement-breakpoint
CREATE INDEX "climate_logs_room_idx" ON "climate_logs" USING btree ("room_id","first_at");--> statement-breakpoint
CREATE INDEX "climate_readings_room_time_idx" ON "climate_readings" USING btree ("room_id","taken_at");