/** Block counts by whole biological-efficiency point, e.g. {"87": 3} = three blocks in [87, 88). */
export type EfficiencyBins = Record<string, number>;

export function addBins(a: EfficiencyBins, b: EfficiencyBins): EfficiencyBins {
  const out: EfficiencyBins = { ...a };
  for (const [bin, count] of Object.entries(b)) out[bin] = (out[bin] ?? 0) + count;
  return out;
}

function sortedBins(bins: EfficiencyBins): [number, number][] {
  return Object.entries(bins)
    .map(([bin, count]) => [Number(bin), count] as [number, number])
    .filter(([, count]) => count > 0)
    .sort((x, y) => x[0] - y[0]);
}

/**
 * The p-quantile (0–1) of the blocks in the bins, reading each block as the middle of its
 * one-point bin; accurate to half a BE point, which is finer than any grower reads a chart.
 */
export function binQuantile(bins: EfficiencyBins, p: number): number {
  const entries = sortedBins(bins);
  const total = entries.reduce((sum, [, count]) => sum + count, 0);
  if (total === 0) throw new RangeError("No blocks in the bins");
  const rank = p * (total - 1);
  let seen = 0;
  for (const [bin, count] of entries) {
    if (rank < seen + count) return bin + 0.5;
    seen += count;
  }
  return entries[entries.length - 1][0] + 0.5;
}

/**
 * Percent of the co-op's blocks with a lower biological efficiency than `value` (blocks in the
 * same one-point bin count half): where a farm's mean sits in the co-op distribution.
 */
export function percentileOf(bins: EfficiencyBins, value: number): number {
  let below = 0;
  let total = 0;
  const bin = Math.floor(value);
  for (const [key, count] of sortedBins(bins)) {
    total += count;
    if (key < bin) below += count;
    else if (key === bin) below += count / 2;
  }
  if (total === 0) throw new RangeError("No blocks in the bins");
  return (100 * below) / total;
}

/**
 * Blocks that must lie at or below, and at or above, a published percentile. With three, no
 * drawn percentile is a strain's or an arm's highest or lowest block, or next to it.
 */
export const blocksBeyondPercentile = 3;

/** The p-quantile of the bins, or null where fewer than `blocksBeyondPercentile` blocks lie on either side of it. */
export function publishablePercentile(bins: EfficiencyBins, p: number): number | null {
  const total = Object.values(bins).reduce((sum, count) => sum + Math.max(0, count), 0);
  if (total === 0) return null;
  // binQuantile reads the block at rank ⌊p(n − 1)⌋ (from 0), so that many + 1 lie at or below it.
  const rank = Math.floor(p * (total - 1));
  return rank + 1 >= blocksBeyondPercentile && total - rank >= blocksBeyondPercentile ? binQuantile(bins, p) : null;
}

/** A box-and-whisker spread: 10th, 25th, 50th, 75th and 90th percentiles; whiskers null until there are enough blocks. */
export type Spread = [number | null, number, number, number, number | null];

/** The spread to publish, or null while even the quartiles would come too close to single blocks (fewer than 9 blocks). */
export function publishableSpread(bins: EfficiencyBins): Spread | null {
  const [p10, p25, p50, p75, p90] = [0.1, 0.25, 0.5, 0.75, 0.9].map((p) => publishablePercentile(bins, p));
  if (p25 === null || p50 === null || p75 === null) return null;
  return [p10, p25, p50, p75, p90];
}

/** Whole-point bins of a list of BE values, as the statistics tables keep them. */
export function binsOf(values: readonly number[]): EfficiencyBins {
  const bins: EfficiencyBins = {};
  for (const value of values) bins[Math.floor(value)] = (bins[Math.floor(value)] ?? 0) + 1;
  return bins;
}
