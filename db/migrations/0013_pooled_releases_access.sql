-- Releases of the pooled figures (lib/data/pooled-releases.ts). Only the analyst path writes and
-- reads them: each row names a farm by id beside its sufficient statistics, so rhizo_app gets no
-- grant at all. A release, once written, is never changed, not even by the owner.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['pooled_releases', 'pooled_release_strain_rows', 'pooled_release_flush_rows'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT ON %I TO rhizo_analyst', t);
    EXECUTE format($p$CREATE POLICY pooled_release_reads ON %I FOR SELECT TO rhizo_analyst USING (true)$p$, t);
    EXECUTE format($p$CREATE POLICY pooled_release_writes ON %I FOR INSERT TO rhizo_analyst WITH CHECK (true)$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

CREATE FUNCTION pooled_release_immutable() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'A release of the pooled figures cannot be changed or removed: cut a new one instead'
    USING ERRCODE = 'insufficient_privilege';
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION pooled_release_immutable() FROM PUBLIC;--> statement-breakpoint
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['pooled_releases', 'pooled_release_strain_rows', 'pooled_release_flush_rows'] LOOP
    EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW EXECUTE FUNCTION pooled_release_immutable()',
      t || '_immutable', t);
    EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %I FOR EACH STATEMENT EXECUTE FUNCTION pooled_release_immutable()',
      t || '_not_truncated', t);
  END LOOP;
END $$;--> statement-breakpoint

-- A new release changes what the Co-op results show: drop the per-process copies (0010).
CREATE TRIGGER pooled_releases_notify AFTER INSERT ON pooled_releases
  FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change('pooled-statistics');--> statement-breakpoint

-- The scheduled job's last attempt: analyst only, like pooled_refresh_state.
ALTER TABLE pooled_release_schedule ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE pooled_release_schedule FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE ON pooled_release_schedule TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_release_schedule_writes ON pooled_release_schedule TO rhizo_analyst USING (true) WITH CHECK (true);--> statement-breakpoint

-- A trial report's pseudonyms: each farm's people read their own farm's row and nothing else;
-- nobody else (not the coordinator) can tell which pseudonym is which farm. The analysis writes
-- them through the analyst role.
ALTER TABLE trial_report_farms ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE trial_report_farms FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT ON trial_report_farms TO rhizo_app;--> statement-breakpoint
CREATE POLICY own_farm_reads ON trial_report_farms FOR SELECT TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'));--> statement-breakpoint
GRANT SELECT, INSERT, DELETE ON trial_report_farms TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY trial_analysis_writes ON trial_report_farms TO rhizo_analyst USING (true) WITH CHECK (true);
