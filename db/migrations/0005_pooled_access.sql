-- Pooled results. Per-farm sufficient statistics are written only by rhizo_analyst (through
-- pooled_refresh_farm below) and read by rhizo_app for the caller's own farm alone; what
-- leaves the analyst path are pooled aggregates. Policies fail closed as in 0001.

DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['farm_strain_statistics', 'farm_flush_statistics'] LOOP
    EXECUTE format('ALTER TABLE %I ENABLE ROW LEVEL SECURITY', t);
    EXECUTE format('ALTER TABLE %I FORCE ROW LEVEL SECURITY', t);
    EXECUTE format('GRANT SELECT ON %I TO rhizo_app', t);
    EXECUTE format($p$CREATE POLICY own_farm_reads ON %I FOR SELECT TO rhizo_app
      USING (farm_id = app_current_farm_id() AND app_current_role() IN ('farm_manager', 'grower'))$p$, t);
    EXECUTE format('GRANT SELECT, INSERT, DELETE ON %I TO rhizo_analyst', t);
    EXECUTE format($p$CREATE POLICY pooled_analysis_writes ON %I TO rhizo_analyst USING (true) WITH CHECK (true)$p$, t);
  END LOOP;
END $$;--> statement-breakpoint

-- Refresh bookkeeping says which farm uploaded lately, so only the analyst path sees it.
ALTER TABLE pooled_refresh_state ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE pooled_refresh_state FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT, UPDATE ON pooled_refresh_state TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_analysis_writes ON pooled_refresh_state TO rhizo_analyst USING (true) WITH CHECK (true);--> statement-breakpoint

-- Recomputes the statistics of the given farms from their blocks and harvests: one scan of
-- each table into a per-block temp table, then one aggregate per statistics table. A farm with
-- no rows (withdrawn) ends with no statistics. Runs as the caller (rhizo_analyst); advisory
-- locks keep two refreshes of one farm from interleaving.
CREATE FUNCTION pooled_refresh(p_farms uuid[]) RETURNS void LANGUAGE plpgsql AS $$
BEGIN
  PERFORM pg_advisory_xact_lock(hashtext('pooled_refresh:' || f::text)) FROM unnest(p_farms) AS f ORDER BY f;
  DELETE FROM farm_strain_statistics WHERE farm_id = ANY (p_farms);
  DELETE FROM farm_flush_statistics WHERE farm_id = ANY (p_farms);
  DROP TABLE IF EXISTS pooled_block_rows;
  CREATE TEMP TABLE pooled_block_rows ON COMMIT DROP AS
    SELECT b.id, b.farm_id, s.species_id, b.strain_id, b.substrate_recipe_id, b.fruiting_method_id, b.trial_arm_id,
      b.contaminated, b.spent_mass_g IS NOT NULL AS finished,
      CASE WHEN b.wet_mass_g > 0 AND b.moisture IS NOT NULL THEN (b.wet_mass_g * (1 - b.moisture))::float8 END AS dry_g,
      h.fresh_all, h.f1 + h.f2 AS fresh_first_two, h.f1 AS fresh_first, h.first_on - b.inoculated_on AS first_days,
      h.f1, h.f2, h.f3, h.f4, h.f5, h.f6, h.f7, h.f8, h.flushes_fruited
    FROM blocks b
    JOIN strains s ON s.id = b.strain_id
    LEFT JOIN (
      SELECT block_id, sum(fresh_mass_g)::float8 AS fresh_all, min(harvested_on) AS first_on,
        coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 1), 0)::float8 AS f1, coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 2), 0)::float8 AS f2,
        coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 3), 0)::float8 AS f3, coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 4), 0)::float8 AS f4,
        coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 5), 0)::float8 AS f5, coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 6), 0)::float8 AS f6,
        coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 7), 0)::float8 AS f7, coalesce(sum(fresh_mass_g) FILTER (WHERE flush = 8), 0)::float8 AS f8,
        array_agg(flush) AS flushes_fruited
      FROM harvests WHERE farm_id = ANY (p_farms) GROUP BY block_id
    ) h ON h.block_id = b.id
    WHERE b.farm_id = ANY (p_farms);

  -- BE of a window counts only blocks that gave a harvest inside it.
  INSERT INTO farm_strain_statistics (farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id,
    flush_window, blocks, blocks_contaminated, efficiency_blocks, efficiency_sum, efficiency_squares, efficiency_bins,
    first_harvest_blocks, first_harvest_days_sum)
  SELECT farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, flush_window,
    sum(blocks), sum(contaminated), sum(efficiency_blocks), sum(efficiency_sum), sum(efficiency_squares),
    coalesce(jsonb_object_agg(bin::text, efficiency_blocks) FILTER (WHERE bin IS NOT NULL), '{}'::jsonb),
    sum(first_harvest_blocks), sum(first_harvest_days_sum)
  FROM (
    SELECT farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, flush_window,
      floor(efficiency)::int AS bin, count(*) AS blocks, count(*) FILTER (WHERE contaminated) AS contaminated,
      count(efficiency) AS efficiency_blocks, coalesce(sum(efficiency), 0) AS efficiency_sum,
      coalesce(sum(efficiency * efficiency), 0) AS efficiency_squares,
      count(first_days) AS first_harvest_blocks, coalesce(sum(first_days), 0) AS first_harvest_days_sum
    FROM (
      SELECT r.farm_id, r.species_id, r.strain_id, r.substrate_recipe_id, r.fruiting_method_id, r.trial_arm_id, r.contaminated, r.first_days,
        w.flush_window,
        CASE WHEN NOT r.contaminated AND r.dry_g > 0 AND w.fruited THEN 100 * w.fresh / r.dry_g END AS efficiency
      FROM pooled_block_rows r
      CROSS JOIN LATERAL (VALUES
        ('all', r.fresh_all, r.fresh_all IS NOT NULL),
        ('1-2', r.fresh_first_two, r.flushes_fruited && ARRAY[1, 2]),
        ('1', r.fresh_first, r.flushes_fruited && ARRAY[1])) AS w(flush_window, fresh, fruited)
    ) windowed
    GROUP BY farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, flush_window, floor(efficiency)::int
  ) binned
  GROUP BY farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, flush_window;

  -- Finished blocks (spent mass weighed), not contaminated, with fruit: each flush's share of
  -- the block's total and the share picked up to that flush, for flushes 1 to 8.
  INSERT INTO farm_flush_statistics (farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id,
    flush, finished_blocks, blocks_fruiting, share_sum, share_squares, cumulative_sum, cumulative_squares)
  SELECT r.farm_id, r.species_id, r.strain_id, r.substrate_recipe_id, r.fruiting_method_id, r.trial_arm_id, k.flush,
    count(*), count(*) FILTER (WHERE k.picked > 0),
    sum(k.picked / r.fresh_all), sum((k.picked / r.fresh_all) ^ 2),
    sum(k.so_far / r.fresh_all), sum((k.so_far / r.fresh_all) ^ 2)
  FROM pooled_block_rows r
  CROSS JOIN LATERAL (VALUES
    (1, r.f1, r.f1), (2, r.f2, r.f1 + r.f2), (3, r.f3, r.f1 + r.f2 + r.f3), (4, r.f4, r.f1 + r.f2 + r.f3 + r.f4),
    (5, r.f5, r.f1 + r.f2 + r.f3 + r.f4 + r.f5), (6, r.f6, r.f1 + r.f2 + r.f3 + r.f4 + r.f5 + r.f6),
    (7, r.f7, r.f1 + r.f2 + r.f3 + r.f4 + r.f5 + r.f6 + r.f7), (8, r.f8, r.f1 + r.f2 + r.f3 + r.f4 + r.f5 + r.f6 + r.f7 + r.f8)
  ) AS k(flush, picked, so_far)
  WHERE r.finished AND NOT r.contaminated AND r.fresh_all > 0
  GROUP BY r.farm_id, r.species_id, r.strain_id, r.substrate_recipe_id, r.fruiting_method_id, r.trial_arm_id, k.flush;
  DROP TABLE pooled_block_rows;
END $$;--> statement-breakpoint
CREATE FUNCTION pooled_refresh_farm(p_farm uuid) RETURNS void LANGUAGE sql AS $$ SELECT pooled_refresh(ARRAY[p_farm]) $$;--> statement-breakpoint
CREATE FUNCTION pooled_refresh_all() RETURNS void LANGUAGE sql AS $$ SELECT pooled_refresh(array(SELECT id FROM farms)) $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION pooled_refresh(uuid[]), pooled_refresh_all() FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION pooled_refresh(uuid[]), pooled_refresh_all() TO rhizo_analyst;--> statement-breakpoint
REVOKE ALL ON FUNCTION pooled_refresh_farm(uuid) FROM PUBLIC;--> statement-breakpoint
GRANT EXECUTE ON FUNCTION pooled_refresh_farm(uuid) TO rhizo_analyst;
