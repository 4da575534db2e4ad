import type { Pool } from "pg";
import { refreshPooledStatistics } from "@/lib/data/pooled-refresh";

/** Makes the farms' new rows count towards what the app publishes. */
export async function publishPooledFigures(_inspector: Pool, farmIds: string[]): Promise<void> {
  for (const farmId of farmIds) await refreshPooledStatistics(farmId);
}
