ALTER TABLE "harvests" ADD COLUMN "client_key" uuid;--> statement-breakpoint
CREATE UNIQUE INDEX "harvests_farm_client_key_unique" ON "harvests" USING btree ("farm_id","client_key");