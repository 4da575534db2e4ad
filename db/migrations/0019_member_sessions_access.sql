-- Sessions end for good. A session cookie names its id and the member's session version when
-- it was issued (lib/auth/sessions.ts); the guard refuses one signed out (ended_sessions) or
-- issued under an older version. tests/integration/adversarial/sessions.test.ts tries each way.

-- A member's own signed-out sessions: written at sign-out and read by the guard as that member.
ALTER TABLE ended_sessions ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE ended_sessions FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, DELETE ON ended_sessions TO rhizo_app;--> statement-breakpoint
CREATE POLICY self ON ended_sessions TO rhizo_app
  USING (user_id = app_current_user_id()) WITH CHECK (user_id = app_current_user_id());--> statement-breakpoint

-- Whoever writes the row (the app, the reset and invitation functions, psql), a new password,
-- role, farm or active flag ends every session issued before; the version never goes back, so
-- writing an old one back cannot revive a copied cookie.
CREATE FUNCTION app_end_sessions_on_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.password_hash IS DISTINCT FROM OLD.password_hash OR NEW.role IS DISTINCT FROM OLD.role
     OR NEW.farm_id IS DISTINCT FROM OLD.farm_id OR NEW.active IS DISTINCT FROM OLD.active THEN
    NEW.session_version := greatest(NEW.session_version, OLD.session_version + 1);
  ELSE
    NEW.session_version := greatest(NEW.session_version, OLD.session_version);
  END IF;
  RETURN NEW;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_end_sessions_on_change() FROM PUBLIC;--> statement-breakpoint
CREATE TRIGGER users_end_sessions BEFORE UPDATE ON users FOR EACH ROW EXECUTE FUNCTION app_end_sessions_on_change();--> statement-breakpoint

-- A farm suspended (or let back in) ends its people's sessions. Owner-run, with a fixed path:
-- the coordinator changes the farm, and the update must reach its people whatever policy applies.
CREATE FUNCTION app_end_farm_sessions() RETURNS trigger LANGUAGE plpgsql SECURITY DEFINER
  SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  UPDATE users SET session_version = session_version + 1 WHERE farm_id = NEW.id;
  RETURN NULL;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_end_farm_sessions() FROM PUBLIC;--> statement-breakpoint
CREATE TRIGGER farms_end_sessions AFTER UPDATE OF status ON farms FOR EACH ROW
  WHEN (NEW.status IS DISTINCT FROM OLD.status) EXECUTE FUNCTION app_end_farm_sessions();--> statement-breakpoint

-- The guard's kept copies (db/change-feed.ts) drop on "members": the notice now names the
-- password and the version too, and a sign-out.
DROP TRIGGER users_notify_members ON users;--> statement-breakpoint
CREATE TRIGGER users_notify_members AFTER INSERT OR DELETE OR TRUNCATE
  OR UPDATE OF email, name, role, farm_id, active, display_units, password_hash, session_version
  ON users FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change('members');--> statement-breakpoint
CREATE TRIGGER ended_sessions_notify_members AFTER INSERT OR DELETE OR TRUNCATE
  ON ended_sessions FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change('members');
