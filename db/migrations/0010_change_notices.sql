-- Change notices for the app's per-process copies (db/change-feed.ts). Whoever writes these
-- rows, the app or anyone with psql, PostgreSQL tells every listening process on commit which
-- copy to drop: "members" for what the guard reads about a member and their farm,
-- "pooled-statistics" for what the Co-op results are computed from, "blocks-and-harvests" for
-- a farm's own blocks drawn over them. Statement-level, and PostgreSQL folds identical notices
-- within a transaction into one, so a large write costs one notice.
CREATE FUNCTION app_notify_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_notify('rhizomorph_changes', TG_ARGV[0]);
  RETURN NULL;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_notify_change() FROM PUBLIC;--> statement-breakpoint
CREATE TRIGGER users_notify_members AFTER INSERT OR DELETE OR TRUNCATE OR UPDATE OF email, name, role, farm_id, active, display_units
  ON users FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change('members');--> statement-breakpoint
CREATE TRIGGER farms_notify_members AFTER DELETE OR TRUNCATE OR UPDATE OF name, status
  ON farms FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change('members');--> statement-breakpoint
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['farm_strain_statistics', 'farm_flush_statistics', 'pooled_refresh_state', 'cooperative_settings',
                           'species', 'strains', 'substrate_recipes', 'treatments'] LOOP
    EXECUTE format('CREATE TRIGGER %I AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON %I
      FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change(%L)', t || '_notify', t, 'pooled-statistics');
  END LOOP;
  FOREACH t IN ARRAY ARRAY['blocks', 'harvests'] LOOP
    EXECUTE format('CREATE TRIGGER %I AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON %I
      FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change(%L)', t || '_notify', t, 'blocks-and-harvests');
  END LOOP;
END $$;
