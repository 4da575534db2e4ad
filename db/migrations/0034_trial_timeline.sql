CREATE TABLE "trial_reminders" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"enrolment_id" uuid NOT NULL,
	"trial_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"reminded_on" date NOT NULL,
	"sent_at" timestamp with time zone DEFAULT now() NOT NULL,
	"kind" text NOT NULL,
	"sent_by" uuid,
	CONSTRAINT "trial_reminders_kind" CHECK ("trial_reminders"."kind" in ('before-due', 'behind', 'by-hand'))
);
--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "inoculation_from" date;--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "inoculation_to" date;--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "fruiting_from" date;--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "fruiting_to" date;--> statement-breakpoint
ALTER TABLE "trials" ADD COLUMN "data_due" date;--> statement-breakpoint
ALTER TABLE "trial_reminders" ADD CONSTRAINT "trial_reminders_enrolment_id_trial_enrolments_id_fk" FOREIGN KEY ("enrolment_id") REFERENCES "public"."trial_enrolments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_reminders" ADD CONSTRAINT "trial_reminders_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_reminders" ADD CONSTRAINT "trial_reminders_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "trial_reminders_one_a_day" ON "trial_reminders" USING btree ("enrolment_id","reminded_on");--> statement-breakpoint
CREATE INDEX "trial_reminders_trial_idx" ON "trial_reminders" USING btree ("trial_id");--> statement-breakpoint
ALTER TABLE "trials" ADD CONSTRAINT "trial_timeline_order" CHECK (("trials"."inoculation_from" is null or "trials"."inoculation_to" is null or "trials"."inoculation_from" <= "trials"."inoculation_to")
        and ("trials"."fruiting_from" is null or "trials"."fruiting_to" is null or "trials"."fruiting_from" <= "trials"."fruiting_to")
        and ("trials"."fruiting_from" is null or "trials"."data_due" is null or "trials"."fruiting_from" < "trials"."data_due"));