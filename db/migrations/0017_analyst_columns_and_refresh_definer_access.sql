-- The pooled-analysis role reads across farms, so it reads only what pooled figures are made of:
-- no block codes, notes, masses as written, units, upload links or timestamps. It can change
-- the statistics only by calling the refresh, which runs as rhizo_statistics (a role nobody
-- signs in as, made by scripts/db.sh): that role alone reads the same columns for the refresh
-- and writes the statistics tables. tests/integration/adversarial/database-roles.test.ts
-- checks both and fails if a grant comes back.

-- What pooled figures are made of (the refresh's inputs, which the trial analysis, the
-- coordinator's counts and the strain usage counts also read).
REVOKE SELECT ON blocks, harvests FROM rhizo_analyst;--> statement-breakpoint
GRANT SELECT (id, farm_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, inoculated_on, wet_mass_g, moisture,
  contaminated, spent_mass_g) ON blocks TO rhizo_analyst, rhizo_statistics;--> statement-breakpoint
GRANT SELECT (id, farm_id, block_id, flush, harvested_on, fresh_mass_g) ON harvests TO rhizo_analyst, rhizo_statistics;--> statement-breakpoint
GRANT SELECT (id) ON farms TO rhizo_statistics;--> statement-breakpoint
GRANT SELECT (id, species_id) ON strains TO rhizo_statistics;--> statement-breakpoint

-- rhizo_owner is a member of rhizo_statistics (it must be, to hand the function over), and a
-- policy names a role together with its members; current_user keeps these policies to the
-- refresh itself, so no function the owner runs gains a view across farms.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['blocks', 'harvests', 'farms', 'strains'] LOOP
    EXECUTE format($p$CREATE POLICY statistics_refresh_reads ON %I FOR SELECT TO rhizo_statistics
      USING (current_user = 'rhizo_statistics')$p$, t);
  END LOOP;
  FOREACH t IN ARRAY ARRAY['farm_strain_statistics', 'farm_flush_statistics'] LOOP
    EXECUTE format('REVOKE INSERT, UPDATE, DELETE ON %I FROM rhizo_analyst', t);
    EXECUTE format('DROP POLICY pooled_analysis_writes ON %I', t);
    EXECUTE format($p$CREATE POLICY pooled_analysis_reads ON %I FOR SELECT TO rhizo_analyst USING (true)$p$, t);
    EXECUTE format('GRANT SELECT, INSERT, DELETE ON %I TO rhizo_statistics', t);
    EXECUTE format($p$CREATE POLICY statistics_refresh_writes ON %I TO rhizo_statistics
      USING (current_user = 'rhizo_statistics') WITH CHECK (current_user = 'rhizo_statistics')$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

-- The refresh (0009) runs as rhizo_statistics with a fixed search_path. pooled_refresh_farm and
-- pooled_refresh_all stay the analyst's own wrappers around it. A later CREATE OR REPLACE of
-- pooled_refresh must repeat SECURITY DEFINER and the search_path, or the refresh fails.
-- Handing a function to a role needs that role to hold CREATE on the schema, for that moment only.
GRANT CREATE ON SCHEMA public TO rhizo_statistics;--> statement-breakpoint
ALTER FUNCTION pooled_refresh(uuid[]) OWNER TO rhizo_statistics;--> statement-breakpoint
REVOKE CREATE ON SCHEMA public FROM rhizo_statistics;--> statement-breakpoint
GRANT USAGE ON SCHEMA public TO rhizo_statistics;--> statement-breakpoint
ALTER FUNCTION pooled_refresh(uuid[]) SECURITY DEFINER;--> statement-breakpoint
ALTER FUNCTION pooled_refresh(uuid[]) SET search_path = pg_catalog, public, pg_temp;--> statement-breakpoint
REVOKE ALL ON FUNCTION pooled_refresh(uuid[]) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION pooled_refresh(uuid[]) TO rhizo_analyst;
