import "server-only";

/**
 * Recomputes the co-op's pooled statistics for what one farm's committed upload touched.
 * Called without waiting by the season-log commit. (Placeholder until co-op results land.)
 */
export async function refreshPooledStatistics(farmId: string): Promise<void> {
  void farmId;
}
