-- The rows a season-log commit replaced are a farm's own, like the value history they back (0001).
-- Written by the commit and read by its undo; never changed afterwards.
ALTER TABLE season_log_replaced_rows ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE season_log_replaced_rows FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT ON season_log_replaced_rows TO rhizo_app;--> statement-breakpoint
GRANT USAGE ON SEQUENCE season_log_replaced_rows_id_seq TO rhizo_app;--> statement-breakpoint
CREATE POLICY own_farm_rows ON season_log_replaced_rows TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'));
