-- A password-reset e-mail says until when its link works in the member's own zone and date style
-- (users.time_zone, users.date_style; lib/time/display.ts), so the function that finds the member
-- also returns those. The body is 0002's, the search_path 0016's (pg_temp last); only the returned columns grew.
DROP FUNCTION app_create_password_reset(text, text, timestamptz);--> statement-breakpoint
CREATE FUNCTION app_create_password_reset(p_email text, p_token_hash text, p_expires_at timestamptz)
RETURNS TABLE (user_id uuid, name text, time_zone text, date_style date_style)
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
#variable_conflict use_column
DECLARE found_user users%ROWTYPE;
BEGIN
  SELECT u.* INTO found_user FROM users u LEFT JOIN farms f ON f.id = u.farm_id
  WHERE lower(u.email) = lower(p_email) AND u.active AND coalesce(f.status = 'active', true);
  IF NOT FOUND THEN RETURN; END IF;
  -- At most three links an hour per member, so the form cannot be used to flood a mailbox.
  IF (SELECT count(*) FROM access_tokens a WHERE a.user_id = found_user.id AND a.purpose = 'password_reset'
      AND a.created_at > now() - interval '1 hour') >= 3 THEN RETURN; END IF;
  UPDATE access_tokens SET used_at = now()
  WHERE access_tokens.user_id = found_user.id AND access_tokens.purpose = 'password_reset' AND access_tokens.used_at IS NULL;
  INSERT INTO access_tokens (purpose, token_hash, email, user_id, farm_id, role, expires_at)
  VALUES ('password_reset', p_token_hash, found_user.email, found_user.id, found_user.farm_id, found_user.role, p_expires_at);
  RETURN QUERY SELECT found_user.id, found_user.name, found_user.time_zone, found_user.date_style;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_create_password_reset(text, text, timestamptz) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_create_password_reset(text, text, timestamptz) TO rhizo_app;
