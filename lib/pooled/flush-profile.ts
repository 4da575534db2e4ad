import { studentTQuantile } from "@/lib/stats/distributions";
import type { FlushProfile } from "@/lib/stats";
import type { FlushStatisticsRow } from "./types";

/**
 * The pooled flush profile from per-farm sums of finished blocks' shares: the same figures
 * lib/stats flushProfile gives on the blocks themselves (mean share with a t interval; the
 * cumulative share with a prediction interval for one block). Null with fewer than 2 blocks.
 */
export function pooledFlushProfile(rows: readonly FlushStatisticsRow[], level = 0.95): FlushProfile | null {
  const byFlush = new Map<number, { n: number; fruiting: number; s: number; ss: number; c: number; cc: number }>();
  for (const row of rows) {
    const entry = byFlush.get(row.flush) ?? { n: 0, fruiting: 0, s: 0, ss: 0, c: 0, cc: 0 };
    byFlush.set(row.flush, {
      n: entry.n + row.finishedBlocks,
      fruiting: entry.fruiting + row.blocksFruiting,
      s: entry.s + row.shareSum,
      ss: entry.ss + row.shareSquares,
      c: entry.c + row.cumulativeSum,
      cc: entry.cc + row.cumulativeSquares,
    });
  }
  const flushes = [...byFlush.keys()].sort((a, b) => a - b);
  let last = 0;
  for (const flush of flushes) if (byFlush.get(flush)!.fruiting > 0) last = flush;
  const n = byFlush.get(1)?.n ?? 0;
  if (last === 0 || n < 2) return null;
  const t = studentTQuantile((1 + level) / 2, n - 1);
  const clamp = (x: number) => Math.min(1, Math.max(0, x));
  const variance = (sum: number, squares: number) => Math.max(0, squares - (sum * sum) / n) / (n - 1);
  const profile: FlushProfile = [];
  for (let flush = 1; flush <= last; flush++) {
    // The refresh writes every flush 1–8 for every finished block, so a gap means no data.
    const entry = byFlush.get(flush);
    if (!entry) break;
    const mean = entry.s / n;
    const half = t * Math.sqrt(variance(entry.s, entry.ss) / n);
    const cumulativeMean = entry.c / n;
    const cumulativeHalf = t * Math.sqrt(variance(entry.c, entry.cc) * (1 + 1 / n));
    profile.push({
      flush,
      meanShare: mean,
      lower: clamp(mean - half),
      upper: clamp(mean + half),
      n,
      blocksFruiting: entry.fruiting,
      cumulativeShare: cumulativeMean,
      cumulativeLower: clamp(cumulativeMean - cumulativeHalf),
      cumulativeUpper: clamp(cumulativeMean + cumulativeHalf),
    });
  }
  return profile;
}
