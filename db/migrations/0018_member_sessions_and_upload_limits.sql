CREATE TABLE "ended_sessions" (
	"session_id" text PRIMARY KEY NOT NULL,
	"user_id" uuid NOT NULL,
	"ended_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "upload_reservations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"farm_id" uuid NOT NULL,
	"reserved_at" timestamp with time zone DEFAULT now() NOT NULL,
	"expires_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD COLUMN "rejected_upload_retention_days" integer DEFAULT 30 NOT NULL;--> statement-breakpoint
ALTER TABLE "users" ADD COLUMN "session_version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "file_purged_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "ended_sessions" ADD CONSTRAINT "ended_sessions_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "upload_reservations" ADD CONSTRAINT "upload_reservations_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "ended_sessions_user_idx" ON "ended_sessions" USING btree ("user_id","expires_at");--> statement-breakpoint
CREATE INDEX "upload_reservations_farm_idx" ON "upload_reservations" USING btree ("farm_id","expires_at");--> statement-breakpoint
ALTER TABLE "cooperative_settings" ADD CONSTRAINT "rejected_upload_retention_range" CHECK ("cooperative_settings"."rejected_upload_retention_days" between 1 and 3650);