-- A farm that withdraws its data after a trial was published leaves the report's figures as
-- they were, and the report says that a farm withdrew. The farm's manager cannot write to
-- trials, so this owner-run function counts the withdrawal on every published trial the farm
-- (the one in the current context) ran, and does nothing else. The owner is subject to the
-- forced row-level security on enrolments, so a policy lets it read only that farm's rows.
CREATE POLICY withdrawal_note_reads ON trial_enrolments FOR SELECT TO rhizo_owner
  USING (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager');--> statement-breakpoint
CREATE FUNCTION app_note_withdrawal_on_published_trials()
RETURNS integer
LANGUAGE sql VOLATILE SECURITY DEFINER SET search_path = public AS $$
  WITH noted AS (
    UPDATE trials t SET withdrawals_after_publication = t.withdrawals_after_publication + 1
    WHERE t.status = 'published'
      AND EXISTS (
        SELECT 1 FROM trial_enrolments e
        WHERE e.trial_id = t.id AND e.farm_id = app_current_farm_id() AND e.status = 'accepted'
      )
    RETURNING t.id
  )
  SELECT count(*)::int FROM noted
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_note_withdrawal_on_published_trials() FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_note_withdrawal_on_published_trials() TO rhizo_app;
