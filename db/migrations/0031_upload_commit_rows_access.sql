-- A farm's data version (farm_data_versions): one number per farm that goes up with every
-- statement writing the farm's blocks or harvests, by anyone, so a commit can tell that what an
-- upload planned against is still what is stored (lib/data/season-logs.ts, farmDataMarker).
-- Triggers, not the app's code, keep it: a new way of writing rows cannot forget to.
ALTER TABLE farm_data_versions ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE farm_data_versions FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE ON farm_data_versions TO rhizo_app;--> statement-breakpoint
-- How often a farm writes is the farm's own business: only its people read or move its number.
CREATE POLICY own_farm_version ON farm_data_versions TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'));--> statement-breakpoint
-- Maintenance as the owner (a repair, a restore) writes without a farm context: then every farm's
-- number moves, so no upload planned before it is written as planned.
CREATE POLICY owner_moves_every_version ON farm_data_versions FOR UPDATE TO rhizo_owner USING (true) WITH CHECK (true);--> statement-breakpoint
GRANT SELECT, UPDATE ON farm_data_versions TO rhizo_owner;--> statement-breakpoint
CREATE POLICY owner_reads_every_version ON farm_data_versions FOR SELECT TO rhizo_owner USING (true);--> statement-breakpoint
-- Statement-level, without transition tables: row-level security already holds every row an app
-- statement writes to the transaction's farm (app_current_farm_id()), so that is the farm whose
-- number moves, at the cost of one row per statement rather than a copy of every row written.
CREATE FUNCTION app_farm_data_changed() RETURNS trigger LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  IF app_current_farm_id() IS NULL THEN
    UPDATE farm_data_versions SET version = version + 1;
  ELSE
    INSERT INTO farm_data_versions AS v (farm_id, version) VALUES (app_current_farm_id(), 1)
      ON CONFLICT (farm_id) DO UPDATE SET version = v.version + 1;
  END IF;
  RETURN NULL;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_farm_data_changed() FROM PUBLIC;--> statement-breakpoint
CREATE TRIGGER blocks_changed AFTER INSERT OR UPDATE OR DELETE ON blocks
  FOR EACH STATEMENT EXECUTE FUNCTION app_farm_data_changed();--> statement-breakpoint
CREATE TRIGGER harvests_changed AFTER INSERT OR UPDATE OR DELETE ON harvests
  FOR EACH STATEMENT EXECUTE FUNCTION app_farm_data_changed();
