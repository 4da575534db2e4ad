CREATE TABLE "season_log_replaced_rows" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"farm_id" uuid NOT NULL,
	"upload_id" uuid NOT NULL,
	"row_kind" text NOT NULL,
	"row_id" uuid NOT NULL,
	"before" jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "kept_for_undo" boolean DEFAULT false NOT NULL;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "undone_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "undone_by" uuid;--> statement-breakpoint
ALTER TABLE "value_changes" ADD COLUMN "reason" text;--> statement-breakpoint
ALTER TABLE "season_log_replaced_rows" ADD CONSTRAINT "season_log_replaced_rows_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "season_log_replaced_rows" ADD CONSTRAINT "season_log_replaced_rows_upload_id_uploads_id_fk" FOREIGN KEY ("upload_id") REFERENCES "public"."uploads"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "season_log_replaced_rows_upload_idx" ON "season_log_replaced_rows" USING btree ("upload_id");--> statement-breakpoint
ALTER TABLE "uploads" ADD CONSTRAINT "uploads_undone_by_users_id_fk" FOREIGN KEY ("undone_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;