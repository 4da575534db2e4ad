-- The drying ratio and the comparison by climate regime are computed on the release path
-- (lib/data/pooled-releases.ts) as the analyst, so the analyst reads the few more columns they are
-- made of: a harvest's dry mass (never its mass as written or its unit) and the day a block was
-- found contaminated (to place a block that never fruited in its room on that day). Rooms, regimes
-- and moves it already reads column by column (0041).
GRANT SELECT (dry_mass_g) ON harvests TO rhizo_analyst;--> statement-breakpoint
GRANT SELECT (contaminated_on) ON blocks TO rhizo_analyst;--> statement-breakpoint

-- Their release rows are kept exactly as the other release rows (0013): the analyst inserts and
-- reads, rhizo_app has no grant, and nobody changes or removes a row once written.
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['pooled_release_drying_rows', 'pooled_release_regime_rows'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT, INSERT ON %I TO rhizo_analyst', t);
    EXECUTE format($p$CREATE POLICY pooled_release_reads ON %I FOR SELECT TO rhizo_analyst USING (true)$p$, t);
    EXECUTE format($p$CREATE POLICY pooled_release_writes ON %I FOR INSERT TO rhizo_analyst WITH CHECK (true)$p$, t);
    EXECUTE format('CREATE TRIGGER %I BEFORE UPDATE OR DELETE ON %I FOR EACH ROW EXECUTE FUNCTION pooled_release_immutable()',
      t || '_immutable', t);
    EXECUTE format('CREATE TRIGGER %I BEFORE TRUNCATE ON %I FOR EACH STATEMENT EXECUTE FUNCTION pooled_release_immutable()',
      t || '_not_truncated', t);
  END LOOP;
END $$;
