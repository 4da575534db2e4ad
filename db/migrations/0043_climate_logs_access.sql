-- A room's climate logs and their readings are a farm's own rows, exactly as its blocks (0001) and
-- rooms (0041): only that farm's manager and growers, in every command, forced on the owner too.
-- Nothing pooled is made of them, so the pooled-analysis role gets no grant and no policy: the
-- coordinator and observers, and the analyst, read none of it.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['climate_logs', 'climate_readings'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format($p$CREATE POLICY own_farm_rows ON %I TO rhizo_app
      USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
      WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

-- Readings are written once with their log and go with it (cascade); they are never edited.
GRANT SELECT, INSERT, DELETE ON climate_logs TO rhizo_app;--> statement-breakpoint
GRANT SELECT, INSERT, DELETE ON climate_readings TO rhizo_app;
