-- Mail scanners open links: the unsubscribe page only reads, a click stops the reminders and
-- another brings them back. Both owner-run functions reach only the one enrolment the signed
-- link names, through the reminder_opt_out policy (0003), and return nothing else.
CREATE FUNCTION app_trial_reminders_state(p_enrolment_id uuid)
RETURNS TABLE (trial_code text, reminders_allowed boolean)
LANGUAGE plpgsql STABLE SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  PERFORM set_config('app.opt_out_enrolment_id', p_enrolment_id::text, true);
  RETURN QUERY SELECT t.code::text, e.reminders_allowed FROM trial_enrolments e JOIN trials t ON t.id = e.trial_id
    WHERE e.id = p_enrolment_id;
  PERFORM set_config('app.opt_out_enrolment_id', '', true);
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_trial_reminders_state(uuid) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_trial_reminders_state(uuid) TO rhizo_app;--> statement-breakpoint

CREATE FUNCTION app_trial_reminders_opt_in(p_enrolment_id uuid)
RETURNS text
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
DECLARE
  v_trial uuid;
  v_code text;
BEGIN
  PERFORM set_config('app.opt_out_enrolment_id', p_enrolment_id::text, true);
  UPDATE trial_enrolments SET reminders_allowed = true WHERE id = p_enrolment_id RETURNING trial_id INTO v_trial;
  PERFORM set_config('app.opt_out_enrolment_id', '', true);
  IF v_trial IS NULL THEN
    RETURN NULL;
  END IF;
  SELECT code INTO v_code FROM trials WHERE id = v_trial;
  RETURN v_code;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_trial_reminders_opt_in(uuid) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_trial_reminders_opt_in(uuid) TO rhizo_app;
