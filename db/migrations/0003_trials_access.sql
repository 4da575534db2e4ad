-- Unsubscribing from trial reminders happens from a link in an e-mail, before anyone signs in.
-- The app checks the link's signature first; this owner-run function then turns off reminders
-- for that one enrolment and returns the trial's code, and can do nothing else. The owner is
-- subject to the forced row-level security too, so a policy lets it touch only the one row the
-- function names for the length of the call.
CREATE POLICY reminder_opt_out ON trial_enrolments TO rhizo_owner
  USING (id = nullif(current_setting('app.opt_out_enrolment_id', true), '')::uuid)
  WITH CHECK (id = nullif(current_setting('app.opt_out_enrolment_id', true), '')::uuid);--> statement-breakpoint
CREATE FUNCTION app_trial_reminders_opt_out(p_enrolment_id uuid)
RETURNS text
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = public AS $$
DECLARE
  v_trial uuid;
  v_code text;
BEGIN
  PERFORM set_config('app.opt_out_enrolment_id', p_enrolment_id::text, true);
  UPDATE trial_enrolments SET reminders_allowed = false WHERE id = p_enrolment_id RETURNING trial_id INTO v_trial;
  PERFORM set_config('app.opt_out_enrolment_id', '', true);
  IF v_trial IS NULL THEN
    RETURN NULL;
  END IF;
  SELECT code INTO v_code FROM trials WHERE id = v_trial;
  RETURN v_code;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_trial_reminders_opt_out(uuid) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_trial_reminders_opt_out(uuid) TO rhizo_app;
