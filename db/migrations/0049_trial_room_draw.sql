CREATE TABLE "trial_room_assignments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"trial_id" uuid NOT NULL,
	"farm_id" uuid NOT NULL,
	"enrolment_id" uuid NOT NULL,
	"room_id" uuid NOT NULL,
	"arm_id" uuid NOT NULL,
	"sequence" integer NOT NULL
);
--> statement-breakpoint
ALTER TABLE "trial_block_assignments" ADD COLUMN "room_id" uuid;--> statement-breakpoint
ALTER TABLE "trial_room_assignments" ADD CONSTRAINT "trial_room_assignments_trial_id_trials_id_fk" FOREIGN KEY ("trial_id") REFERENCES "public"."trials"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_room_assignments" ADD CONSTRAINT "trial_room_assignments_farm_id_farms_id_fk" FOREIGN KEY ("farm_id") REFERENCES "public"."farms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_room_assignments" ADD CONSTRAINT "trial_room_assignments_enrolment_id_trial_enrolments_id_fk" FOREIGN KEY ("enrolment_id") REFERENCES "public"."trial_enrolments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_room_assignments" ADD CONSTRAINT "trial_room_assignments_arm_id_trial_arms_id_fk" FOREIGN KEY ("arm_id") REFERENCES "public"."trial_arms"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "trial_room_assignments" ADD CONSTRAINT "trial_room_assignments_room_id_farm_id_fruiting_rooms_id_farm_id_fk" FOREIGN KEY ("room_id","farm_id") REFERENCES "public"."fruiting_rooms"("id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "trial_room_assignments_room_unique" ON "trial_room_assignments" USING btree ("trial_id","room_id");--> statement-breakpoint
CREATE INDEX "trial_room_assignments_farm_idx" ON "trial_room_assignments" USING btree ("farm_id");--> statement-breakpoint
ALTER TABLE "trial_block_assignments" ADD CONSTRAINT "trial_block_assignments_room_id_farm_id_fruiting_rooms_id_farm_id_fk" FOREIGN KEY ("room_id","farm_id") REFERENCES "public"."fruiting_rooms"("id","farm_id") ON DELETE cascade ON UPDATE no action;