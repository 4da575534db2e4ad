-- BE season by season (lib/pooled/seasons.ts): per-farm sums of block BE by season, written by the
-- refresh beside farm_strain_statistics from the same blocks, and their copy in each release.
-- Like the other statistics: only the refresh (rhizo_statistics) writes them, the analyst reads
-- them, rhizo_app gets no grant; a release's rows are never changed, not even by the owner.
ALTER TABLE farm_season_statistics ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE farm_season_statistics FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT ON farm_season_statistics TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_analysis_reads ON farm_season_statistics FOR SELECT TO rhizo_analyst USING (true);--> statement-breakpoint
GRANT SELECT, INSERT, DELETE ON farm_season_statistics TO rhizo_statistics;--> statement-breakpoint
CREATE POLICY statistics_refresh_writes ON farm_season_statistics TO rhizo_statistics
  USING (current_user = 'rhizo_statistics') WITH CHECK (current_user = 'rhizo_statistics');--> statement-breakpoint
CREATE TRIGGER farm_season_statistics_notify AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON farm_season_statistics
  FOR EACH STATEMENT EXECUTE FUNCTION app_notify_change('pooled-statistics');--> statement-breakpoint

ALTER TABLE pooled_release_season_rows ENABLE ROW LEVEL SECURITY;--> statement-breakpoint
ALTER TABLE pooled_release_season_rows FORCE ROW LEVEL SECURITY;--> statement-breakpoint
GRANT SELECT, INSERT ON pooled_release_season_rows TO rhizo_analyst;--> statement-breakpoint
CREATE POLICY pooled_release_reads ON pooled_release_season_rows FOR SELECT TO rhizo_analyst USING (true);--> statement-breakpoint
CREATE POLICY pooled_release_writes ON pooled_release_season_rows FOR INSERT TO rhizo_analyst WITH CHECK (true);--> statement-breakpoint
CREATE TRIGGER pooled_release_season_rows_immutable BEFORE UPDATE OR DELETE ON pooled_release_season_rows
  FOR EACH ROW EXECUTE FUNCTION pooled_release_immutable();--> statement-breakpoint
CREATE TRIGGER pooled_release_season_rows_not_truncated BEFORE TRUNCATE ON pooled_release_season_rows
  FOR EACH STATEMENT EXECUTE FUNCTION pooled_release_immutable();--> statement-breakpoint

-- The refresh reads a block's season as block_season_year (0039) does: the season its log names,
-- else its inoculation date's under the co-op's season start.
GRANT SELECT (season_year) ON blocks TO rhizo_statistics;--> statement-breakpoint
GRANT SELECT (id, season_start_month, season_start_day) ON cooperative_settings TO rhizo_statistics;--> statement-breakpoint
CREATE POLICY statistics_refresh_reads ON cooperative_settings FOR SELECT TO rhizo_statistics
  USING (current_user = 'rhizo_statistics');--> statement-breakpoint

-- 0009's refresh, now also writing farm_season_statistics (the season_rows step); the rest as it was.
CREATE OR REPLACE FUNCTION pooled_refresh(p_farms uuid[]) RETURNS void LANGUAGE plpgsql
  SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp SET enable_nestloop = off SET jit = off AS $$
DECLARE
  block_filter text := CASE WHEN p_farms IS NULL THEN 'true' ELSE 'b.farm_id = ANY ($1)' END;
  harvest_filter text := CASE WHEN p_farms IS NULL THEN 'true' ELSE 'farm_id = ANY ($1)' END;
BEGIN
  PERFORM pg_advisory_xact_lock(hashtext('pooled_refresh:' || f::text))
    FROM unnest(coalesce(p_farms, array(SELECT id FROM farms))) AS f ORDER BY f;
  DELETE FROM farm_strain_statistics WHERE p_farms IS NULL OR farm_id = ANY (p_farms);
  DELETE FROM farm_flush_statistics WHERE p_farms IS NULL OR farm_id = ANY (p_farms);
  DELETE FROM farm_season_statistics WHERE p_farms IS NULL OR farm_id = ANY (p_farms);
  EXECUTE format($statement$
    WITH block_rows AS MATERIALIZED (
      SELECT b.farm_id, b.strain_id, b.substrate_recipe_id, b.fruiting_method_id, b.trial_arm_id, b.contaminated,
        block_season_year(b.inoculated_on, b.season_year) AS season_year,
        b.spent_mass_g IS NOT NULL AND NOT b.contaminated AND h.fresh_all > 0 AS finished,
        h.first_on - b.inoculated_on AS first_days,
        CASE WHEN NOT b.contaminated AND b.wet_mass_g > 0 AND b.moisture < 1 THEN (b.wet_mass_g * (1 - b.moisture))::float8 END AS dry_g,
        h.fresh_all, h.in_first, h.in_first_two, h.f1, h.f2, h.f3, h.f4, h.f5, h.f6, h.f7, h.f8
      FROM blocks b
      LEFT JOIN (
        SELECT block_id, sum(fresh) AS fresh_all, min(harvested_on) AS first_on,
          bool_or(flush = 1) AS in_first, bool_or(flush <= 2) AS in_first_two,
          coalesce(sum(fresh) FILTER (WHERE flush = 1), 0) AS f1, coalesce(sum(fresh) FILTER (WHERE flush = 2), 0) AS f2,
          coalesce(sum(fresh) FILTER (WHERE flush = 3), 0) AS f3, coalesce(sum(fresh) FILTER (WHERE flush = 4), 0) AS f4,
          coalesce(sum(fresh) FILTER (WHERE flush = 5), 0) AS f5, coalesce(sum(fresh) FILTER (WHERE flush = 6), 0) AS f6,
          coalesce(sum(fresh) FILTER (WHERE flush = 7), 0) AS f7, coalesce(sum(fresh) FILTER (WHERE flush = 8), 0) AS f8
        FROM (SELECT block_id, flush, harvested_on, fresh_mass_g::float8 AS fresh FROM harvests WHERE %2$s) AS harvest
        GROUP BY block_id
      ) h ON h.block_id = b.id
      WHERE %1$s
    ),
    -- BE of a window counts only blocks that gave a harvest inside it.
    windowed AS (
      SELECT r.farm_id, r.strain_id, r.substrate_recipe_id, r.fruiting_method_id, r.trial_arm_id, r.contaminated, r.first_days, r.season_year, 'all' AS flush_window, 100 * r.fresh_all / r.dry_g AS efficiency FROM block_rows r
      UNION ALL
      SELECT r.farm_id, r.strain_id, r.substrate_recipe_id, r.fruiting_method_id, r.trial_arm_id, r.contaminated, r.first_days, r.season_year, '1-2', CASE WHEN r.in_first_two THEN 100 * (r.f1 + r.f2) / r.dry_g END FROM block_rows r
      UNION ALL
      SELECT r.farm_id, r.strain_id, r.substrate_recipe_id, r.fruiting_method_id, r.trial_arm_id, r.contaminated, r.first_days, r.season_year, '1', CASE WHEN r.in_first THEN 100 * r.f1 / r.dry_g END FROM block_rows r
    ),
    binned AS (
      SELECT farm_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, flush_window,
        floor(efficiency)::int AS bin, count(*) AS blocks, count(*) FILTER (WHERE contaminated) AS contaminated,
        count(efficiency) AS efficiency_blocks, coalesce(sum(efficiency), 0) AS efficiency_sum,
        coalesce(sum(efficiency * efficiency), 0) AS efficiency_squares,
        count(first_days) AS first_harvest_blocks, coalesce(sum(first_days), 0) AS first_harvest_days_sum
      FROM windowed
      GROUP BY 1, 2, 3, 4, 5, 6, 7
    ),
    -- The same blocks' BE by season (trial arms together), so a cell's seasons add up to its BE above.
    season_rows AS (
      INSERT INTO farm_season_statistics (farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, season_year,
        flush_window, efficiency_blocks, efficiency_sum, efficiency_squares)
      SELECT w.farm_id, strain.species_id, w.strain_id, w.substrate_recipe_id, w.fruiting_method_id, w.season_year, w.flush_window,
        count(*), sum(w.efficiency), sum(w.efficiency * w.efficiency)
      FROM windowed w JOIN strains strain ON strain.id = w.strain_id
      WHERE w.efficiency IS NOT NULL
      GROUP BY 1, 2, 3, 4, 5, 6, 7
    ),
    strain_rows AS (
      INSERT INTO farm_strain_statistics (farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id,
        flush_window, blocks, blocks_contaminated, efficiency_blocks, efficiency_sum, efficiency_squares, efficiency_bins,
        first_harvest_blocks, first_harvest_days_sum)
      SELECT binned.farm_id, strain.species_id, binned.strain_id, binned.substrate_recipe_id, binned.fruiting_method_id, binned.trial_arm_id,
        binned.flush_window, sum(blocks), sum(contaminated), sum(efficiency_blocks), sum(efficiency_sum), sum(efficiency_squares),
        coalesce(jsonb_object_agg(bin::text, efficiency_blocks) FILTER (WHERE bin IS NOT NULL), '{}'::jsonb),
        sum(first_harvest_blocks), sum(first_harvest_days_sum)
      FROM binned JOIN strains strain ON strain.id = binned.strain_id
      GROUP BY 1, 2, 3, 4, 5, 6, 7
    )
    -- Finished blocks (spent mass weighed), not contaminated, with fruit: each flush's share of
    -- the block's total and the share picked up to that flush, for flushes 1 to 8, summed per
    -- cell in one pass and then turned into one row per flush.
    INSERT INTO farm_flush_statistics (farm_id, species_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id,
      flush, finished_blocks, blocks_fruiting, share_sum, share_squares, cumulative_sum, cumulative_squares)
    SELECT cell.farm_id, strain.species_id, cell.strain_id, cell.substrate_recipe_id, cell.fruiting_method_id, cell.trial_arm_id,
      k.flush, cell.finished, k.fruiting, k.share_sum, k.share_squares, k.cumulative_sum, k.cumulative_squares
    FROM (
      SELECT farm_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, count(*) AS finished,
        count(*) FILTER (WHERE share_1 > 0), sum(share_1), sum(share_1 ^ 2), sum(so_far_1), sum(so_far_1 ^ 2),
        count(*) FILTER (WHERE share_2 > 0), sum(share_2), sum(share_2 ^ 2), sum(so_far_2), sum(so_far_2 ^ 2),
        count(*) FILTER (WHERE share_3 > 0), sum(share_3), sum(share_3 ^ 2), sum(so_far_3), sum(so_far_3 ^ 2),
        count(*) FILTER (WHERE share_4 > 0), sum(share_4), sum(share_4 ^ 2), sum(so_far_4), sum(so_far_4 ^ 2),
        count(*) FILTER (WHERE share_5 > 0), sum(share_5), sum(share_5 ^ 2), sum(so_far_5), sum(so_far_5 ^ 2),
        count(*) FILTER (WHERE share_6 > 0), sum(share_6), sum(share_6 ^ 2), sum(so_far_6), sum(so_far_6 ^ 2),
        count(*) FILTER (WHERE share_7 > 0), sum(share_7), sum(share_7 ^ 2), sum(so_far_7), sum(so_far_7 ^ 2),
        count(*) FILTER (WHERE share_8 > 0), sum(share_8), sum(share_8 ^ 2), sum(so_far_8), sum(so_far_8 ^ 2)
      FROM (
        SELECT farm_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id,
          f1 / fresh_all AS share_1, f1 / fresh_all AS so_far_1,
          f2 / fresh_all AS share_2, (f1 + f2) / fresh_all AS so_far_2,
          f3 / fresh_all AS share_3, (f1 + f2 + f3) / fresh_all AS so_far_3,
          f4 / fresh_all AS share_4, (f1 + f2 + f3 + f4) / fresh_all AS so_far_4,
          f5 / fresh_all AS share_5, (f1 + f2 + f3 + f4 + f5) / fresh_all AS so_far_5,
          f6 / fresh_all AS share_6, (f1 + f2 + f3 + f4 + f5 + f6) / fresh_all AS so_far_6,
          f7 / fresh_all AS share_7, (f1 + f2 + f3 + f4 + f5 + f6 + f7) / fresh_all AS so_far_7,
          f8 / fresh_all AS share_8, (f1 + f2 + f3 + f4 + f5 + f6 + f7 + f8) / fresh_all AS so_far_8
        FROM block_rows WHERE finished
      ) AS shares
      GROUP BY 1, 2, 3, 4, 5
    ) AS cell (farm_id, strain_id, substrate_recipe_id, fruiting_method_id, trial_arm_id, finished, n1, s1, q1, c1, cq1, n2, s2, q2, c2, cq2, n3, s3, q3, c3, cq3, n4, s4, q4, c4, cq4, n5, s5, q5, c5, cq5, n6, s6, q6, c6, cq6, n7, s7, q7, c7, cq7, n8, s8, q8, c8, cq8)
    JOIN strains strain ON strain.id = cell.strain_id
    CROSS JOIN LATERAL (VALUES
      (1, n1, s1, q1, c1, cq1),
      (2, n2, s2, q2, c2, cq2),
      (3, n3, s3, q3, c3, cq3),
      (4, n4, s4, q4, c4, cq4),
      (5, n5, s5, q5, c5, cq5),
      (6, n6, s6, q6, c6, cq6),
      (7, n7, s7, q7, c7, cq7),
      (8, n8, s8, q8, c8, cq8)
    ) AS k(flush, fruiting, share_sum, share_squares, cumulative_sum, cumulative_squares)
  $statement$, block_filter, harvest_filter) USING p_farms;
END $$;--> statement-breakpoint

-- Moving the season start moves blocks between seasons, so every farm's season sums are stale:
-- mark every farm as waiting, and the workers' minute sweep queues the refreshes (lib/jobs).
-- The owner is subject to pooled_refresh_state's forced row-level security; this policy lets it
-- in only while the function below has set its flag, for the length of the call.
CREATE POLICY season_start_moved ON pooled_refresh_state TO rhizo_owner
  USING (current_setting('app.season_start_moved', true) = 'on')
  WITH CHECK (current_setting('app.season_start_moved', true) = 'on');--> statement-breakpoint
CREATE FUNCTION app_season_start_moved() RETURNS trigger LANGUAGE plpgsql
  SECURITY DEFINER SET search_path = pg_catalog, public, pg_temp AS $$
BEGIN
  PERFORM set_config('app.season_start_moved', 'on', true);
  INSERT INTO pooled_refresh_state (farm_id, requested, requested_at)
  SELECT f.id, 1, now() FROM farms f
  ON CONFLICT (farm_id) DO UPDATE SET requested = pooled_refresh_state.requested + 1, requested_at = now();
  PERFORM set_config('app.season_start_moved', '', true);
  RETURN NULL;
END $$;--> statement-breakpoint
REVOKE ALL ON FUNCTION app_season_start_moved() FROM PUBLIC;--> statement-breakpoint
CREATE TRIGGER cooperative_settings_season_start_moved AFTER UPDATE OF season_start_month, season_start_day ON cooperative_settings
  FOR EACH ROW WHEN ((OLD.season_start_month, OLD.season_start_day) IS DISTINCT FROM (NEW.season_start_month, NEW.season_start_day))
  EXECUTE FUNCTION app_season_start_moved();
