-- Season logs on their way in: a farm's own reservations, like its uploads (0001).
ALTER TABLE upload_reservations ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE upload_reservations FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, DELETE ON upload_reservations TO rhizo_app;--> statement-breakpoint
CREATE POLICY own_farm_rows ON upload_reservations TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'));--> statement-breakpoint

-- The files of rejected uploads older than the co-op's retention period are emptied; the rows,
-- reports and hashes stay. The owner is subject to the forced row-level security on uploads, so
-- a policy for the owner alone opens them for the length of the call: the app's role setting
-- the same switch gains nothing (tests/integration/adversarial/uploads.test.ts).
CREATE POLICY purge_rejected_upload_files ON uploads TO rhizo_owner
  USING (current_setting('app.purging_rejected_upload_files', true) = 'on')
  WITH CHECK (current_setting('app.purging_rejected_upload_files', true) = 'on');--> statement-breakpoint
CREATE FUNCTION app_purge_rejected_upload_files()
RETURNS TABLE (files integer, bytes bigint)
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
DECLARE
  v_days integer;
BEGIN
  SELECT rejected_upload_retention_days INTO v_days FROM cooperative_settings WHERE id = 1;
  PERFORM set_config('app.purging_rejected_upload_files', 'on', true);
  RETURN QUERY
    WITH purged AS (
      UPDATE uploads SET content = ''::bytea, file_purged_at = now()
      WHERE outcome = 'rejected' AND file_purged_at IS NULL
        AND uploaded_at < now() - make_interval(days => coalesce(v_days, 30))
      RETURNING size_bytes
    )
    SELECT count(*)::integer, coalesce(sum(size_bytes), 0)::bigint FROM purged;
  PERFORM set_config('app.purging_rejected_upload_files', '', true);
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_purge_rejected_upload_files() FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_purge_rejected_upload_files() TO rhizo_app;
