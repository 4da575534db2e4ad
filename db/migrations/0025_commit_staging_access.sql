-- A season-log commit stages its rows by COPY in temporary tables that drop at the end of its
-- transaction (lib/data/season-logs.ts, writePlan), so rhizo_app gets TEMPORARY on the database
-- again, and only rhizo_app: PUBLIC and rhizo_analyst stay without it (0016).
-- Why this is safe now, where 0016 took it away:
-- - Every SECURITY DEFINER function has search_path = pg_catalog, public, pg_temp (0016, and
--   tests/integration/adversarial/definer-functions.test.ts checks each one), so a temporary
--   table named like a real one is never what an owner-run function reads or writes: the attack
--   0016 was written against (a made-up reset token in a temporary access_tokens) still fails, and
--   the adversarial test replays it with this grant in place.
-- - Every farm transaction sets search_path = public, pg_temp for itself (db/client.ts,
--   farmContextStatement), so a temporary table left in a pooled connection under a real table's
--   name is not what the app's own queries read either; the commit names its tables pg_temp.….
-- - A temporary table is its session's alone: no other connection can see its rows.
-- Other ways considered: an UNLOGGED staging table shared by all farms would need row-level
-- security, and PostgreSQL refuses COPY FROM into a table with row-level security for any role
-- that does not bypass it; rows staged without it would rest on every commit deleting its own.
DO $$
BEGIN
  EXECUTE format('GRANT TEMPORARY ON DATABASE %I TO rhizo_app', current_database());
END $$;
