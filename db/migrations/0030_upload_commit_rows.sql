CREATE TABLE "farm_data_versions" (
	"farm_id" uuid PRIMARY KEY NOT NULL,
	"version" bigint NOT NULL
);
--> statement-breakpoint
ALTER TABLE "uploads" ADD COLUMN "commit_rows" "bytea";--> statement-breakpoint
ALTER TABLE "farm_data_versions" ADD CONSTRAINT "farm_data_versions_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "uploads" DROP COLUMN "staged_parse";--> statement-breakpoint
-- The kept rows are gzip already (lib/season-logs/commit-rows.ts): stored without a second compression.
ALTER TABLE "uploads" ALTER COLUMN "commit_rows" SET STORAGE EXTERNAL;