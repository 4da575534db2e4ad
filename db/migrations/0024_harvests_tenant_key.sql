-- The tenant key: a harvest, and a value change, names its block together with its farm, and
-- (block_id, farm_id) must be a block's (id, farm_id). So the database itself refuses a harvest
-- of farm A on farm B's block, whoever writes it (the owner, a script, psql), where before only
-- row-level security's check on farm_id and the app's own planning stood in the way.
-- It makes two keys of each table redundant, dropped here: block_id → blocks (the composite key
-- checks the block exists) and farm_id → farms (the block's farm exists, by the block's own key
-- blocks.farm_id → farms, and a deleted farm still takes its harvests and history with it: farm →
-- blocks → harvests and value changes, each on delete cascade). One key checked per row instead
-- of two also makes a large commit cheaper (DEVELOPERS.md, "Benchmark").
-- The keys that stay, and why:
-- - blocks.farm_id → farms: the root of the chain above; a block's farm must exist.
-- - blocks.strain_id, substrate_recipe_id, fruiting_method_id → the co-op's registers, and
--   blocks.trial_arm_id → trial_arms: shared across farms, so there is no farm to pair them with.
-- - blocks.last_upload_id, harvests.upload_id, value_changes.upload_id → uploads (on delete set
--   null): which file wrote a row. Paired with farm_id, "set null" would clear farm_id too (not
--   null), so these stay single; a row's upload is read only through the farm's own policies.
-- - value_changes.changed_by → users (on delete set null): who changed it, kept when they leave.
ALTER TABLE "blocks" ADD CONSTRAINT "blocks_id_farm_unique" UNIQUE("id","farm_id");--> statement-breakpoint
ALTER TABLE "harvests" DROP CONSTRAINT "harvests_farm_id_farms_id_fk";--> statement-breakpoint
ALTER TABLE "harvests" DROP CONSTRAINT "harvests_block_id_blocks_id_fk";--> statement-breakpoint
ALTER TABLE "value_changes" DROP CONSTRAINT "value_changes_farm_id_farms_id_fk";--> statement-breakpoint
ALTER TABLE "value_changes" DROP CONSTRAINT "value_changes_block_id_blocks_id_fk";--> statement-breakpoint
ALTER TABLE "harvests" ADD CONSTRAINT "harvests_block_farm_fk" FOREIGN KEY ("block_id","farm_id") REFERENCES "public"."blocks"("id","farm_id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "value_changes" ADD CONSTRAINT "value_changes_block_farm_fk" FOREIGN KEY ("block_id","farm_id") REFERENCES "public"."blocks"("id","farm_id") ON DELETE cascade ON UPDATE no action;
