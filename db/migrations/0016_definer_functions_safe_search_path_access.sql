-- Owner-run (SECURITY DEFINER) functions search pg_temp first unless their search_path names it,
-- so a session that could make a temporary table called "access_tokens" or "users" would have
-- them read and write its table instead of the real one (PostgreSQL documentation, CREATE
-- FUNCTION, "Writing SECURITY DEFINER Functions Safely"). Every such function gets a fixed path
-- with pg_temp last, and the app's role can no longer make temporary tables at all.
-- tests/integration/adversarial/definer-functions.test.ts replays the attack and checks every
-- SECURITY DEFINER function, so one added later without the setting fails it.
DO $$
DECLARE f regprocedure;
BEGIN
  FOR f IN SELECT p.oid::regprocedure FROM pg_proc p JOIN pg_namespace n ON n.oid = p.pronamespace
           WHERE n.nspname = 'public' AND p.prosecdef LOOP
    EXECUTE format('ALTER FUNCTION %s SET search_path = pg_catalog, public, pg_temp', f);
  END LOOP;
END $$;--> statement-breakpoint

-- PUBLIC holds TEMPORARY on a new database by default, so revoking it from rhizo_app alone would
-- change nothing. No role the app or the pooled path connects as needs temporary tables (the
-- benchmark grants it to the analyst on its own scratch database). scripts/db.sh repeats this for
-- a database restored from a backup, since a dump does not carry database privileges.
DO $$
BEGIN
  EXECUTE format('REVOKE TEMPORARY ON DATABASE %I FROM PUBLIC', current_database());
END $$;
