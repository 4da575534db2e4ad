-- A block's season, computed where it is read rather than stored on write: a coordinator who moves
-- the co-op's season start moves every farm's blocks at once, which a write could not do (each
-- farm's blocks are its own under row-level security). The season a season log names
-- (blocks.season_year) wins; otherwise the inoculation date's season, the start day itself
-- belonging to the new season (lib/seasons.ts seasonOfDate is the same arithmetic, tested).
-- Not SECURITY DEFINER: it reads cooperative_settings as its caller, which every role that reads
-- blocks may (0001).
CREATE FUNCTION block_season_year(inoculated_on date, season_year integer) RETURNS integer
LANGUAGE sql STABLE PARALLEL SAFE AS $$
  SELECT coalesce(
    season_year,
    extract(year FROM inoculated_on)::integer - CASE
      WHEN (extract(month FROM inoculated_on)::integer, extract(day FROM inoculated_on)::integer)
        < (SELECT s.season_start_month, s.season_start_day FROM public.cooperative_settings s WHERE s.id = 1)
      THEN 1 ELSE 0 END
  )
$$;
