-- Who may see and change what. The app connects as rhizo_app (not the owner, no BYPASSRLS);
-- db/client.ts sets app.user_id, app.farm_id and app.role per transaction with set_config(…, true).
-- Every policy reads those through the functions below, which return NULL when a setting is
-- unset or empty, so a missing context matches nothing (fails closed).

CREATE FUNCTION app_current_user_id() RETURNS uuid LANGUAGE sql STABLE
  AS $$ SELECT nullif(current_setting('app.user_id', true), '')::uuid $$;--> statement-breakpoint
CREATE FUNCTION app_current_farm_id() RETURNS uuid LANGUAGE sql STABLE
  AS $$ SELECT nullif(current_setting('app.farm_id', true), '')::uuid $$;--> statement-breakpoint
CREATE FUNCTION app_current_role() RETURNS text LANGUAGE sql STABLE
  AS $$ SELECT nullif(current_setting('app.role', true), '') $$;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_current_user_id(), app_current_farm_id(), app_current_role() TO rhizo_app, rhizo_analyst;--> statement-breakpoint

-- A farm's own rows: only that farm's manager and growers, in every command.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['uploads', 'blocks', 'harvests', 'value_changes', 'farm_import_preferences'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT, UPDATE, DELETE ON %I TO rhizo_app', t);
    EXECUTE format($p$CREATE POLICY own_farm_rows ON %I TO rhizo_app
      USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
      WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

-- The pooled-analysis role reads blocks and harvests across farms; it never writes and
-- its code returns only aggregates.
GRANT SELECT ON blocks, harvests TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_analysis_reads ON blocks FOR SELECT TO rhizo_analyst USING (true);--> statement-breakpoint
CREATE POLICY pooled_analysis_reads ON harvests FOR SELECT TO rhizo_analyst USING (true);--> statement-breakpoint

-- Trial enrolments and randomised lists: the farm's own, and the coordinator who runs the trial.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['trial_enrolments', 'trial_block_assignments'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT, UPDATE, DELETE ON %I TO rhizo_app', t);
    EXECUTE format($p$CREATE POLICY coordinator_all ON %I TO rhizo_app
      USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator')$p$, t);
    EXECUTE format($p$CREATE POLICY own_farm_reads ON %I FOR SELECT TO rhizo_app
      USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))$p$, t);
    EXECUTE format($p$CREATE POLICY own_farm_manager_writes ON %I FOR INSERT TO rhizo_app
      WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager')$p$, t);
    EXECUTE format($p$CREATE POLICY own_farm_manager_updates ON %I FOR UPDATE TO rhizo_app
      USING (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager')
      WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager')$p$, t);
  END LOOP;
END $$;--> statement-breakpoint
GRANT SELECT (id, trial_id, farm_id, status) ON trial_enrolments TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_analysis_reads ON trial_enrolments FOR SELECT TO rhizo_analyst USING (true);--> statement-breakpoint

-- The audit log is append-only for the app: no UPDATE or DELETE grant at all.
ALTER TABLE audit_events ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE audit_events FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT ON audit_events TO rhizo_app;--> statement-breakpoint
GRANT USAGE ON SEQUENCE audit_events_id_seq TO rhizo_app;--> statement-breakpoint
CREATE POLICY read_own_events ON audit_events FOR SELECT TO rhizo_app USING (
  (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager')
  OR (farm_id IS NULL AND app_current_role() = 'coordinator')
);--> statement-breakpoint
CREATE POLICY append_events ON audit_events FOR INSERT TO rhizo_app WITH CHECK (
  app_current_role() IS NOT NULL AND (farm_id IS NULL OR farm_id = app_current_farm_id())
);--> statement-breakpoint

-- Farms: a farm's own people see their farm; the coordinator sees and manages all.
ALTER TABLE farms ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE, DELETE ON farms TO rhizo_app;--> statement-breakpoint
CREATE POLICY own_farm_reads ON farms FOR SELECT TO rhizo_app USING (id = app_current_farm_id());--> statement-breakpoint
CREATE POLICY coordinator_all ON farms TO rhizo_app
  USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator');--> statement-breakpoint
GRANT SELECT (id, status) ON farms TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_analysis_reads ON farms FOR SELECT TO rhizo_analyst USING (true);--> statement-breakpoint

-- People: yourself; your farm's people; the coordinator sees everyone.
ALTER TABLE users ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE ON users TO rhizo_app;--> statement-breakpoint
CREATE POLICY self ON users TO rhizo_app USING (id = app_current_user_id()) WITH CHECK (id = app_current_user_id());--> statement-breakpoint
CREATE POLICY same_farm ON users TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager');--> statement-breakpoint
CREATE POLICY coordinator_all ON users TO rhizo_app
  USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator');--> statement-breakpoint

-- One-time links: made by the coordinator or a farm manager for their own farm.
ALTER TABLE access_tokens ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE ON access_tokens TO rhizo_app;--> statement-breakpoint
CREATE POLICY coordinator_all ON access_tokens TO rhizo_app
  USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator');--> statement-breakpoint
CREATE POLICY own_farm_manager ON access_tokens TO rhizo_app
  USING (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager')
  WITH CHECK (farm_id = app_current_farm_id() AND app_current_role() = 'farm_manager');--> statement-breakpoint

-- Co-op settings, registries and trials: every signed-in context reads; the coordinator writes;
-- members may propose registry entries, which wait for approval.
ALTER TABLE cooperative_settings ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, UPDATE ON cooperative_settings TO rhizo_app;--> statement-breakpoint
GRANT SELECT ON cooperative_settings TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY signed_in_reads ON cooperative_settings FOR SELECT TO rhizo_app, rhizo_analyst USING (true);--> statement-breakpoint
CREATE POLICY coordinator_writes ON cooperative_settings FOR UPDATE TO rhizo_app
  USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator');--> statement-breakpoint

DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['species', 'strains', 'substrate_recipes', 'treatments'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT, UPDATE, DELETE ON %I TO rhizo_app', t);
    EXECUTE format('GRANT SELECT ON %I TO rhizo_analyst', t);
    EXECUTE format($p$CREATE POLICY signed_in_reads ON %I FOR SELECT TO rhizo_app USING (app_current_role() IS NOT NULL)$p$, t);
    EXECUTE format($p$CREATE POLICY pooled_analysis_reads ON %I FOR SELECT TO rhizo_analyst USING (true)$p$, t);
    EXECUTE format($p$CREATE POLICY coordinator_all ON %I TO rhizo_app
      USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator')$p$, t);
    EXECUTE format($p$CREATE POLICY member_proposals ON %I FOR INSERT TO rhizo_app
      WITH CHECK (status = 'proposed' AND app_current_role() IN ('farm_manager', 'grower'))$p$, t);
  END LOOP;
  FOREACH t IN ARRAY ARRAY['trials', 'trial_arms'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT, UPDATE, DELETE ON %I TO rhizo_app', t);
    EXECUTE format('GRANT SELECT ON %I TO rhizo_analyst', t);
    EXECUTE format($p$CREATE POLICY signed_in_reads ON %I FOR SELECT TO rhizo_app USING (app_current_role() IS NOT NULL)$p$, t);
    EXECUTE format($p$CREATE POLICY pooled_analysis_reads ON %I FOR SELECT TO rhizo_analyst USING (true)$p$, t);
    EXECUTE format($p$CREATE POLICY coordinator_all ON %I TO rhizo_app
      USING (app_current_role() = 'coordinator') WITH CHECK (app_current_role() = 'coordinator')$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

-- Caught mail is for the coordinator's "Outgoing mail" page only.
ALTER TABLE mail_messages ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT ON mail_messages TO rhizo_app;--> statement-breakpoint
CREATE POLICY coordinator_reads ON mail_messages FOR SELECT TO rhizo_app USING (app_current_role() = 'coordinator');--> statement-breakpoint

-- Sign-in attempts back the rate limit; they hold no farm data.
GRANT SELECT, INSERT ON sign_in_attempts TO rhizo_app;--> statement-breakpoint
GRANT USAGE ON SEQUENCE sign_in_attempts_id_seq, value_changes_id_seq TO rhizo_app;--> statement-breakpoint

-- Sign-in happens before there is a member context: this owner-run function returns the one
-- row needed to check a password, and nothing else.
CREATE FUNCTION app_sign_in_lookup(p_email text)
RETURNS TABLE (id uuid, name text, password_hash text, role member_role, farm_id uuid, active boolean, farm_active boolean)
LANGUAGE sql STABLE SECURITY DEFINER SET search_path = public AS $$
  SELECT u.id, u.name, u.password_hash, u.role, u.farm_id, u.active, coalesce(f.status = 'active', true)
  FROM users u LEFT JOIN farms f ON f.id = u.farm_id
  WHERE lower(u.email) = lower(p_email)
$$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_sign_in_lookup(text) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION app_sign_in_lookup(text) TO rhizo_app;
