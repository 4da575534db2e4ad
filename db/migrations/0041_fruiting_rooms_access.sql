-- Rooms, their regimes and the moves of blocks between them are a farm's own rows, exactly as its
-- blocks (0001): only that farm's manager and growers, in every command, forced on the owner too.
-- Who may edit or retire (the manager) and who may record (both) is decided by the app's
-- permissions (lib/auth/permissions.ts), as for blocks.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['fruiting_rooms', 'room_regimes', 'block_room_moves'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT, UPDATE, DELETE ON %I TO rhizo_app', t);
    EXECUTE format($p$CREATE POLICY own_farm_rows ON %I TO rhizo_app
      USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
      WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))$p$, t);
    EXECUTE format($p$CREATE POLICY pooled_analysis_reads ON %I FOR SELECT TO rhizo_analyst USING (true)$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

-- The pooled-analysis role reads across farms, so only what a comparison by regime with the room
-- as the unit is made of (0017): which room, whose, its kind, size and fresh air, the regime's kind,
-- dates and settings, and which block was in which room from when. Never a room's name, a note,
-- who recorded it, or which upload said so.
GRANT SELECT (id, farm_id, kind, volume_m3, fresh_air, retired_on) ON fruiting_rooms TO rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, farm_id, room_id, starts_on, regime_kind_id, humidity_mode, cycle_on_minutes, cycle_off_minutes, flood_starts_at,
  flood_hours, air_changes_per_hour, temperature_set_c, cleaning_every_days) ON room_regimes TO rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, farm_id, block_id, room_id, moved_on) ON block_room_moves TO rhizo_analyst;
