import "server-only";
import { sql } from "drizzle-orm";
import { keptForEveryone } from "@/db/change-feed";
import { readAsAnalyst, withAnalystAccess, type Transaction } from "@/db/client";
import { enqueue } from "@/lib/jobs/queue";

/**
 * Called inside the transaction that changed a farm's blocks or harvests (a season-log commit, a
 * quick harvest, a withdrawal), in that farm's context: marks the farm's pooled statistics as
 * waiting (pooled_refresh_state.requested, so the coordinator's release panel can say that the farm's
 * new data is not in the statistics yet)
 * and adds the "pooled-refresh" job. Both commit with the change or not at all.
 */
export async function queuePooledRefresh(tx: Transaction, farmId: string): Promise<void> {
  await tx.execute(sql`select app_request_pooled_refresh()`);
  await enqueue(tx, "pooled-refresh", { farmId });
}

/**
 * Recomputes the co-op's per-farm sufficient statistics for one farm (all of its cells: a
 * committed upload may touch any strain it grows); a farm with no rows left drops out of the
 * statistics. Marks done every request made before it started, so a commit that lands while it
 * runs keeps the farm waiting for the next refresh. The "pooled-refresh" job calls it with
 * `onlyIfPending`, which skips a farm whose requests a refresh has already covered (several
 * commits in a row, or a refresh queued again after a restart). Throws on failure, so the job
 * is retried; until then the farm stays waiting.
 */
export async function refreshPooledStatistics(farmId: string, { onlyIfPending = false } = {}): Promise<void> {
  const [state] = await readAsAnalyst<{ requested: number; completed: number }>(
    sql`select requested, completed from pooled_refresh_state where farm_id = ${farmId}`,
  );
  if (onlyIfPending && state && state.requested <= state.completed) return;
  await withAnalystAccess(async (tx) => {
    await tx.execute(sql`select pooled_refresh_farm(${farmId}::uuid)`);
    if (state) {
      await tx.execute(sql`
        update pooled_refresh_state set completed = greatest(completed, ${state.requested}), completed_at = now()
        where farm_id = ${farmId}`);
    }
  });
}

/** Farms still waiting for a refresh: a worker queues them again when it starts, in case the job that should have run was lost. */
export async function farmsAwaitingRefresh(): Promise<string[]> {
  const rows = await readAsAnalyst<{ farm_id: string }>(sql`select farm_id from pooled_refresh_state where requested > completed`);
  return rows.map((row) => row.farm_id);
}

/** Recomputes every farm's statistics (after seeding, or to repair). */
export async function refreshAllPooledStatistics(): Promise<void> {
  await withAnalystAccess(async (tx) => {
    await tx.execute(sql`select pooled_refresh_all()`);
  });
}

/** True while any farm's statistics are still being recomputed after an upload. */
export const getPooledUpdating = keptForEveryone("results updating", "pooled-statistics", async (): Promise<boolean> => {
  const [row] = await readAsAnalyst<{ pending: boolean }>(
    sql`select exists (select 1 from pooled_refresh_state where requested > completed) as pending`,
  );
  return Boolean(row?.pending);
});
