import type { Pool } from "pg";
import { loadMember } from "@/lib/data/members";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";
import { cutReleaseNow, type ReleaseAttempt } from "@/lib/data/pooled-releases";

/** Makes the farms' new rows count towards what the app publishes: their statistics, then a release as the coordinator cuts one. */
export async function publishPooledFigures(inspector: Pool, farmIds: string[]): Promise<ReleaseAttempt> {
  for (const farmId of farmIds) await refreshPooledStatistics(farmId);
  const { rows } = await inspector.query<{ id: string }>("select id from users where role = 'coordinator' and active limit 1");
  return cutReleaseNow((await loadMember(rows[0].id))!);
}
