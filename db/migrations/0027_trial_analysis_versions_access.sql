-- Runs of a trial's analysis, and the versions of its report that were published. The coordinator
-- makes runs and publishes them; every other signed-in member reads a run only once it is
-- published, never a run still being looked at. Nothing changes either afterwards: the app role may
-- only read and insert, and a trigger refuses UPDATE and DELETE to every role, the owner included,
-- except when the trial itself goes (a cleanup by the owner; the app role may no longer delete a
-- trial, which it never did). A published result is corrected by publishing an amendment.
ALTER TABLE trial_analyses ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE trial_analyses FORCE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE trial_publications ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE trial_publications FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT ON trial_analyses, trial_publications TO rhizo_app;--> statement-breakpoint
CREATE POLICY coordinator_reads ON trial_analyses FOR SELECT TO rhizo_app USING (app_current_role() = 'coordinator');--> statement-breakpoint
CREATE POLICY published_reads ON trial_analyses FOR SELECT TO rhizo_app
  USING (app_current_role() IS NOT NULL AND EXISTS (SELECT 1 FROM trial_publications p WHERE p.analysis_id = trial_analyses.id));--> statement-breakpoint
CREATE POLICY coordinator_runs ON trial_analyses FOR INSERT TO rhizo_app WITH CHECK (app_current_role() = 'coordinator');--> statement-breakpoint
CREATE POLICY signed_in_reads ON trial_publications FOR SELECT TO rhizo_app USING (app_current_role() IS NOT NULL);--> statement-breakpoint
CREATE POLICY coordinator_publishes ON trial_publications FOR INSERT TO rhizo_app WITH CHECK (app_current_role() = 'coordinator');--> statement-breakpoint

CREATE FUNCTION app_trial_versions_kept() RETURNS trigger
LANGUAGE plpgsql SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  IF TG_OP = 'DELETE' AND NOT EXISTS (SELECT 1 FROM trials WHERE id = OLD.trial_id) THEN
    RETURN OLD;
  END IF;
  RAISE EXCEPTION 'A run of a trial''s analysis and a published version stay as they were made; correct a published result with an amendment'
    USING ERRCODE = '42501';
END $$;--> statement-breakpoint
CREATE TRIGGER kept_as_made BEFORE UPDATE OR DELETE ON trial_analyses FOR EACH ROW EXECUTE FUNCTION app_trial_versions_kept();--> statement-breakpoint
CREATE TRIGGER kept_as_made BEFORE UPDATE OR DELETE ON trial_publications FOR EACH ROW EXECUTE FUNCTION app_trial_versions_kept();--> statement-breakpoint
REVOKE DELETE ON trials FROM rhizo_app;--> statement-breakpoint

-- Each run draws its own pseudonyms. The coordinator writes them with the run, in the same
-- transaction, and cannot read them back; a farm's people read their own farm's row of a
-- published run only. Nobody adds a row to a run once it is published.
DROP POLICY own_farm_reads ON trial_report_farms;--> statement-breakpoint
CREATE POLICY own_farm_reads ON trial_report_farms FOR SELECT TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower')
    AND EXISTS (SELECT 1 FROM trial_publications p WHERE p.analysis_id = trial_report_farms.analysis_id));--> statement-breakpoint
GRANT INSERT ON trial_report_farms TO rhizo_app;--> statement-breakpoint
CREATE POLICY coordinator_writes_with_run ON trial_report_farms FOR INSERT TO rhizo_app
  WITH CHECK (app_current_role() = 'coordinator'
    AND NOT EXISTS (SELECT 1 FROM trial_publications p WHERE p.analysis_id = trial_report_farms.analysis_id));--> statement-breakpoint
DROP POLICY trial_analysis_writes ON trial_report_farms;--> statement-breakpoint
REVOKE ALL ON trial_report_farms FROM rhizo_analyst;
