import "server-only";
import { sql } from "drizzle-orm";
import { keptUntilChanged } from "@/db/change-feed";
import { readAsAnalyst, withAnalystAccess } from "@/db/client";

/**
 * Recomputes the co-op's per-farm sufficient statistics for one farm (all of its cells: a
 * committed upload may touch any strain it grows). Called without waiting by the season-log
 * commit and after a farm withdraws; a farm with no rows left drops out of the statistics.
 * While it runs, pooled_refresh_state marks the farm pending, so the coordinator's release panel can
 * say that a farm's new data is not in the statistics yet.
 * Never throws: a failure is logged and the farm stays pending until the next refresh.
 */
export async function refreshPooledStatistics(farmId: string): Promise<void> {
  try {
    const generation = await withAnalystAccess(async (tx) => {
      const result = await tx.execute<{ requested: number }>(sql`
        insert into pooled_refresh_state (farm_id, requested, requested_at)
        select id, 1, now() from farms where id = ${farmId}
        on conflict (farm_id) do update set requested = pooled_refresh_state.requested + 1, requested_at = now()
        returning requested`);
      return result.rows[0]?.requested ?? null;
    });
    await withAnalystAccess(async (tx) => {
      await tx.execute(sql`select pooled_refresh_farm(${farmId}::uuid)`);
      if (generation !== null) {
        await tx.execute(sql`
          update pooled_refresh_state set completed = greatest(completed, ${generation}), completed_at = now()
          where farm_id = ${farmId}`);
      }
    });
  } catch (error) {
    console.error(`Pooled statistics for farm ${farmId} could not be refreshed`, error);
  }
}

/** Recomputes every farm's statistics (after seeding, or to repair). */
export async function refreshAllPooledStatistics(): Promise<void> {
  await withAnalystAccess(async (tx) => {
    await tx.execute(sql`select pooled_refresh_all()`);
  });
}

/** True while any farm's statistics are still being recomputed after an upload. */
export const getPooledUpdating = keptUntilChanged(
  "pooled-statistics",
  async (): Promise<boolean> => {
    const [row] = await readAsAnalyst<{ pending: boolean }>(
      sql`select exists (select 1 from pooled_refresh_state where requested > completed) as pending`,
    );
    return Boolean(row?.pending);
  },
  () => "",
);
