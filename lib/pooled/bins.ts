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
