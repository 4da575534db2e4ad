CREATE TABLE "trial_analyses" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trial_id" uuid NOT NULL,
	"run" integer NOT NULL,
	"ran_at" timestamp with time zone DEFAULT now() NOT NULL,
	"ran_by" uuid,
	"ran_by_name" text NOT NULL,
	"results" jsonb NOT NULL,
	"inputs" jsonb,
	"fingerprint" text,
	CONSTRAINT "trial_analyses_run_positive" CHECK ("trial_analyses"."run" >= 1)
);
--> statement-breakpoint
CREATE TABLE "trial_publications" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trial_id" uuid NOT NULL,
	"analysis_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"published_at" timestamp with time zone DEFAULT now() NOT NULL,
	"published_by" uuid,
	"published_by_name" text NOT NULL,
	"reason" text,
	CONSTRAINT "trial_publications_reason" CHECK (("trial_publications"."version" = 1 and "trial_publications"."reason" is null) or ("trial_publications"."version" > 1 and "trial_publications"."reason" is not null and length(btrim("trial_publications"."reason")) >= 10))
);
--> statement-breakpoint
ALTER TABLE "trial_analyses" ADD CONSTRAINT "trial_analyses_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_publications" ADD CONSTRAINT "trial_publications_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_publications" ADD CONSTRAINT "trial_publications_analysis_id_trial_analyses_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."trial_analyses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "trial_analyses_run_unique" ON "trial_analyses" USING btree ("trial_id","run");--> statement-breakpoint
CREATE UNIQUE INDEX "trial_publications_version_unique" ON "trial_publications" USING btree ("trial_id","version");--> statement-breakpoint
CREATE UNIQUE INDEX "trial_publications_analysis_unique" ON "trial_publications" USING btree ("analysis_id");--> statement-breakpoint
-- The one analysis a trial kept until now becomes its run 1 (its inputs were not recorded), and
-- version 1 where the trial was published; the pseudonyms it drew belong to that run.
INSERT INTO "trial_analyses" ("trial_id", "run", "ran_at", "ran_by_name", "results")
  SELECT "id", 1, coalesce(("published_results"->>'analysedAt')::timestamptz, "published_at", now()), 'the coordinator', "published_results"
  FROM "trials" WHERE "published_results" IS NOT NULL;--> statement-breakpoint
INSERT INTO "trial_publications" ("trial_id", "analysis_id", "version", "published_at", "published_by_name")
  SELECT a."trial_id", a."id", 1, coalesce(t."published_at", a."ran_at"), a."ran_by_name"
  FROM "trial_analyses" a JOIN "trials" t ON t."id" = a."trial_id" WHERE t."status" = 'published';--> statement-breakpoint
-- Forced row-level security hides the rows from the owner too; lifted for the length of the backfill.
ALTER TABLE "trial_report_farms" NO FORCE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "trial_report_farms" ADD COLUMN "analysis_id" uuid;--> statement-breakpoint
UPDATE "trial_report_farms" r SET "analysis_id" = a."id" FROM "trial_analyses" a WHERE a."trial_id" = r."trial_id";--> statement-breakpoint
DELETE FROM "trial_report_farms" WHERE "analysis_id" IS NULL;--> statement-breakpoint
ALTER TABLE "trial_report_farms" ALTER COLUMN "analysis_id" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "trial_report_farms" FORCE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE "trial_report_farms" DROP CONSTRAINT "trial_report_farms_trial_id_farm_id_pk";--> statement-breakpoint
ALTER TABLE "trial_report_farms" ADD CONSTRAINT "trial_report_farms_analysis_id_farm_id_pk" PRIMARY KEY("analysis_id","farm_id");--> statement-breakpoint
ALTER TABLE "trial_report_farms" ADD CONSTRAINT "trial_report_farms_analysis_id_trial_analyses_id_fk" FOREIGN KEY ("analysis_id") REFERENCES "public"."trial_analyses"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "trial_report_farms_trial_idx" ON "trial_report_farms" USING btree ("trial_id");--> statement-breakpoint
ALTER TABLE "trials" DROP COLUMN "published_results";
