-- One-time links are used signed-out, before there is a member context. These owner-run
-- functions do exactly one thing each with a token hash, and nothing else is opened to the
-- anonymous context. Unknown, expired and used tokens change nothing.

-- What the accept/reset page may show about a link: its purpose, address, role, farm and state.
CREATE FUNCTION app_access_token_state(p_token_hash text)
RETURNS TABLE (purpose token_purpose, email text, role member_role, farm_name text, state text)
LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public AS $$
  SELECT t.purpose, t.email, t.role, f.name,
    CASE WHEN t.used_at IS NOT NULL THEN 'used' WHEN t.expires_at <= now() THEN 'expired' ELSE 'valid' END
  FROM access_tokens t LEFT JOIN farms f ON f.id = t.farm_id
  WHERE t.token_hash = p_token_hash
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_access_token_state(text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_access_token_state(text) TO rhizo_app;--> statement-breakpoint

-- A reset link for an active member of an active farm (or of the co-op); nothing for anyone
-- else, so the caller can give the same answer either way. Earlier unused reset links lapse.
CREATE FUNCTION app_create_password_reset(p_email text, p_token_hash text, p_expires_at timestamptz)
RETURNS TABLE (user_id uuid, name text)
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = public AS $$
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
  RETURN QUERY SELECT found_user.id, found_user.name;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_create_password_reset(text, text, timestamptz) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_create_password_reset(text, text, timestamptz) TO rhizo_app;--> statement-breakpoint

-- Uses a link once: an invitation makes (or re-admits) the member with the chosen password; a
-- reset sets a new password. The row lock makes two clicks on one link succeed at most once.
-- outcome: accepted | reset | used | expired | unknown | taken (the address already has an active member)
CREATE FUNCTION app_redeem_access_token(p_token_hash text, p_name text, p_password_hash text)
RETURNS TABLE (outcome text, user_id uuid, farm_id uuid, email text, role member_role)
LANGUAGE plpgsql VOLATILE SECURITY DEFINER SET search_path = public AS $$
#variable_conflict use_column
DECLARE
  token access_tokens%ROWTYPE;
  existing users%ROWTYPE;
  member_id uuid;
BEGIN
  SELECT * INTO token FROM access_tokens WHERE token_hash = p_token_hash FOR UPDATE;
  IF NOT FOUND THEN RETURN QUERY SELECT 'unknown', NULL::uuid, NULL::uuid, NULL::text, NULL::member_role; RETURN; END IF;
  IF token.used_at IS NOT NULL THEN RETURN QUERY SELECT 'used', NULL::uuid, token.farm_id, token.email, token.role; RETURN; END IF;
  IF token.expires_at <= now() THEN RETURN QUERY SELECT 'expired', NULL::uuid, token.farm_id, token.email, token.role; RETURN; END IF;

  IF token.purpose = 'password_reset' THEN
    UPDATE users SET password_hash = p_password_hash WHERE id = token.user_id AND active RETURNING id INTO member_id;
    IF member_id IS NULL THEN RETURN QUERY SELECT 'unknown', NULL::uuid, NULL::uuid, NULL::text, NULL::member_role; RETURN; END IF;
    UPDATE access_tokens SET used_at = now() WHERE id = token.id;
    RETURN QUERY SELECT 'reset', member_id, token.farm_id, token.email, token.role;
    RETURN;
  END IF;

  SELECT * INTO existing FROM users WHERE lower(users.email) = lower(token.email);
  IF FOUND AND existing.active THEN
    RETURN QUERY SELECT 'taken', NULL::uuid, token.farm_id, token.email, token.role; RETURN;
  ELSIF FOUND THEN
    UPDATE users SET name = p_name, password_hash = p_password_hash, role = token.role, farm_id = token.farm_id, active = true
    WHERE id = existing.id RETURNING id INTO member_id;
  ELSE
    INSERT INTO users (email, name, password_hash, role, farm_id)
    VALUES (token.email, p_name, p_password_hash, token.role, token.farm_id) RETURNING id INTO member_id;
  END IF;
  UPDATE access_tokens SET used_at = now(), user_id = member_id WHERE id = token.id;
  RETURN QUERY SELECT 'accepted', member_id, token.farm_id, token.email, token.role;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_redeem_access_token(text, text, text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_redeem_access_token(text, text, text) TO rhizo_app;
