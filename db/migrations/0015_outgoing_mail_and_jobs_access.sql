-- Mail goes out from a job after the commit that caused it (lib/data/mail.ts). The app keeps
-- a record of each message for the coordinator, without its body; a one-time link is made by the
-- job just before sending, so its token exists only in the e-mail and, hashed, in access_tokens.
-- Every function below is owner-run, does one thing, and sets a search_path with pg_temp last.

-- The record: any signed-in or signed-out context may add one (the reset request is signed out);
-- only the coordinator reads them; the outcome is written through app_record_mail_outcome alone.
ALTER TABLE outgoing_mail ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT ON outgoing_mail TO rhizo_app;--> statement-breakpoint
CREATE POLICY coordinator_reads ON outgoing_mail FOR SELECT TO rhizo_app USING (app_current_role() = 'coordinator');--> statement-breakpoint
CREATE POLICY any_context_queues ON outgoing_mail FOR INSERT TO rhizo_app
  WITH CHECK (app_current_role() IS NOT NULL AND outcome = 'queued' AND attempts = 0);--> statement-breakpoint

-- After each attempt: sent, retrying or failed (one more attempt), or cancelled (the link it was
-- to carry was withdrawn first, so nothing was sent). p_problem is a short reason, never the message.
CREATE FUNCTION app_record_mail_outcome(p_mail_id uuid, p_outcome mail_outcome, p_problem text)
RETURNS void
LANGUAGE sql VOLATILE SECURITY DEFINER SET search_path = public, pg_temp AS $$
  UPDATE outgoing_mail
  SET outcome = p_outcome,
    attempts = attempts + CASE WHEN p_outcome = 'cancelled' THEN 0 ELSE 1 END,
    last_attempt_at = CASE WHEN p_outcome = 'cancelled' THEN last_attempt_at ELSE now() END,
    problem = p_problem
  WHERE id = p_mail_id AND p_outcome <> 'queued'
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_record_mail_outcome(uuid, mail_outcome, text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_record_mail_outcome(uuid, mail_outcome, text) TO rhizo_app;--> statement-breakpoint

-- The mail job gives an open invitation (not used, not expired; cancelling one expires it) the hash of the
-- token it is about to send, replacing any earlier one, so only the newest e-mailed link works.
-- Returns the address the link is for and when it lapses; nothing when the invitation is closed.
CREATE FUNCTION app_issue_invitation_link(p_token_id uuid, p_token_hash text)
RETURNS TABLE (email text, expires_at timestamptz)
LANGUAGE sql VOLATILE SECURITY DEFINER SET search_path = public, pg_temp AS $$
  UPDATE access_tokens t SET token_hash = p_token_hash
  WHERE t.id = p_token_id AND t.purpose = 'invitation' AND t.used_at IS NULL AND t.expires_at > now()
  RETURNING t.email, t.expires_at
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_issue_invitation_link(uuid, text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_issue_invitation_link(uuid, text) TO rhizo_app;--> statement-breakpoint

-- The same for the member's one open password reset (app_create_password_reset voids older ones).
CREATE FUNCTION app_issue_password_reset_link(p_user_id uuid, p_token_hash text)
RETURNS TABLE (email text, expires_at timestamptz)
LANGUAGE sql VOLATILE SECURITY DEFINER SET search_path = public, pg_temp AS $$
  UPDATE access_tokens t SET token_hash = p_token_hash
  WHERE t.id = (
    SELECT o.id FROM access_tokens o
    WHERE o.user_id = p_user_id AND o.purpose = 'password_reset' AND o.used_at IS NULL AND o.expires_at > now()
    ORDER BY o.created_at DESC LIMIT 1
  )
  RETURNING t.email, t.expires_at
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_issue_password_reset_link(uuid, text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_issue_password_reset_link(uuid, text) TO rhizo_app;--> statement-breakpoint

-- A commit or withdrawal marks its own farm's pooled statistics as waiting for a refresh, in its
-- own transaction, so "results updating" shows from the commit until the refresh job has run.
-- The refresh state stays unreadable to rhizo_app; the owner is subject to its forced row-level
-- security too, so a policy lets it touch only the row of the farm in the caller's context.
CREATE POLICY refresh_requests ON pooled_refresh_state TO rhizo_owner
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'));--> statement-breakpoint
CREATE FUNCTION app_request_pooled_refresh()
RETURNS void
LANGUAGE sql VOLATILE SECURITY DEFINER SET search_path = public, pg_temp AS $$
  INSERT INTO pooled_refresh_state (farm_id, requested, requested_at)
  SELECT app_current_farm_id(), 1, now()
  WHERE app_current_farm_id() IS NOT NULL AND app_current_role() IN ('farm_manager', 'grower')
  ON CONFLICT (farm_id) DO UPDATE SET requested = pooled_refresh_state.requested + 1, requested_at = now()
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_request_pooled_refresh() FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_request_pooled_refresh() TO rhizo_app;
