/** One strain's share of the viewer's own blocks, for the dots over the co-op's boxplot. */
export interface OwnStrainBlocks {
  strainId: string;
  /** How many of the viewer's blocks of this strain have a biological efficiency. */
  blocks: number;
  /** Their biological efficiency to the tenth of a point, lowest first: every block, or an evenly spread selection. */
  efficiencies: number[];
}

/** Dots per strain: enough to show where a farm's blocks lie, few enough to draw and send at once. */
const ownBlocksShownPerStrain = 100;

/**
 * Groups the viewer's blocks by strain. Where a strain has more than `limit`, keeps `limit`
 * evenly spaced by rank, from the lowest to the highest, so the dots keep the farm's spread.
 */
export function ownBlocksForChart(
  blocks: readonly { strainId: string; efficiency: number }[],
  limit = ownBlocksShownPerStrain,
): OwnStrainBlocks[] {
  const byStrain = new Map<string, number[]>();
  for (const block of blocks) {
    const values = byStrain.get(block.strainId);
    if (values) values.push(block.efficiency);
    else byStrain.set(block.strainId, [block.efficiency]);
  }
  return [...byStrain].map(([strainId, values]) => {
    values.sort((a, b) => a - b);
    const shown =
      values.length <= limit
        ? values
        : Array.from({ length: limit }, (_, rank) => values[Math.round((rank * (values.length - 1)) / (limit - 1))]);
    return { strainId, blocks: values.length, efficiencies: shown.map((value) => Math.round(value * 10) / 10) };
  });
}
