import type { AdjustedMean, TukeyComparison } from "@/lib/stats";
import { StatsInputError, tukeyFromGroupSummaries } from "@/lib/stats";
import { studentTQuantile } from "@/lib/stats/distributions";
import { cholesky, choleskySolve } from "@/lib/stats/linear-algebra";
import { summaryMean, summarySumOfSquares, type Summary } from "./sufficient";

/** One farm × strain cell of block BE: the farm is the statistical block, the strain the treatment. */
export interface ModelCell extends Summary {
  treatment: string;
  block: string;
}

/**
 * Strain means adjusted for farm (least-squares means of the additive model strain + farm)
 * with t intervals, from cell summaries: the same algebra as lib/stats blockedAnova, which it
 * equals (unit-tested), but in time proportional to the number of cells, not of blocks.
 */
export function adjustedMeansFromCells(cells: readonly ModelCell[], level = 0.95): AdjustedMean[] {
  const treatmentIndex = new Map<string, number>();
  const blockIndex = new Map<string, number>();
  for (const cell of cells) {
    if (cell.n === 0) continue;
    if (!treatmentIndex.has(cell.treatment)) treatmentIndex.set(cell.treatment, treatmentIndex.size);
    if (!blockIndex.has(cell.block)) blockIndex.set(cell.block, blockIndex.size);
  }
  const treatments = treatmentIndex.size;
  const blocks = blockIndex.size;
  if (treatments < 2 || blocks < 2) throw new StatsInputError("too_few_values", "Needs at least two strains and two farms.");
  const used = cells.filter((cell) => cell.n > 0);
  const n = used.reduce((sum, cell) => sum + cell.n, 0);
  const dfResidual = n - treatments - blocks + 1;
  if (dfResidual < 1) throw new StatsInputError("too_few_values", "Too few blocks to estimate the error after fitting strains and farms.");

  const counts = new Float64Array(treatments * blocks);
  const sums = new Float64Array(treatments * blocks);
  const blockSize = new Float64Array(blocks);
  const blockSum = new Float64Array(blocks);
  let withinCells = 0;
  for (const cell of used) {
    const t = treatmentIndex.get(cell.treatment)!;
    const b = blockIndex.get(cell.block)!;
    counts[t * blocks + b] += cell.n;
    sums[t * blocks + b] += cell.sum;
    blockSize[b] += cell.n;
    blockSum[b] += cell.sum;
    withinCells += summarySumOfSquares(cell);
  }
  const blockMean = blockSum.map((sum, b) => sum / blockSize[b]);
  const adjustedTotal = new Float64Array(treatments);
  for (let t = 0; t < treatments; t++) {
    for (let b = 0; b < blocks; b++) adjustedTotal[t] += sums[t * blocks + b] - counts[t * blocks + b] * blockMean[b];
  }

  const size = treatments - 1;
  const c = new Float64Array(size * size);
  for (let b = 0; b < blocks; b++) {
    for (let s = 0; s < size; s++) {
      const ns = counts[s * blocks + b];
      if (ns === 0) continue;
      c[s * size + s] += ns;
      for (let r = 0; r < size; r++) c[s * size + r] -= (ns * counts[r * blocks + b]) / blockSize[b];
    }
  }
  const factor = cholesky(c, size);
  const effect = new Float64Array(treatments);
  effect.set(choleskySolve(factor, size, adjustedTotal));

  const blockEffectMean = new Float64Array(blocks);
  for (let b = 0; b < blocks; b++) {
    let sum = 0;
    for (let t = 0; t < treatments; t++) sum += counts[t * blocks + b] * effect[t];
    blockEffectMean[b] = sum / blockSize[b];
  }
  // Residual SS = within-cell SS + each cell's n × (cell mean − fitted)².
  let rssFull = withinCells;
  for (let t = 0; t < treatments; t++) {
    for (let b = 0; b < blocks; b++) {
      const count = counts[t * blocks + b];
      if (count === 0) continue;
      const gap = sums[t * blocks + b] / count - (blockMean[b] + effect[t] - blockEffectMean[b]);
      rssFull += count * gap * gap;
    }
  }
  const msResidual = rssFull / dfResidual;
  if (!(msResidual > 0))
    throw new StatsInputError("no_variation", "Every block has the same BE; there is no error to build intervals from.");

  let averageBlockLevel = 0;
  let blockMeanVariance = 0;
  for (let b = 0; b < blocks; b++) {
    averageBlockLevel += blockMean[b] - blockEffectMean[b];
    blockMeanVariance += 1 / blockSize[b];
  }
  averageBlockLevel /= blocks;
  blockMeanVariance /= blocks * blocks;
  const averageShare = new Float64Array(treatments);
  for (let t = 0; t < treatments; t++) {
    let sum = 0;
    for (let b = 0; b < blocks; b++) sum += counts[t * blocks + b] / blockSize[b];
    averageShare[t] = sum / blocks;
  }
  const tCritical = studentTQuantile((1 + level) / 2, dfResidual);
  return [...treatmentIndex.keys()].map((name, s) => {
    const w = new Float64Array(size);
    for (let r = 0; r < size; r++) w[r] = (r === s ? 1 : 0) - averageShare[r];
    const x = choleskySolve(factor, size, w);
    let contrastVariance = 0;
    for (let r = 0; r < size; r++) contrastVariance += w[r] * x[r];
    const estimate = effect[s] + averageBlockLevel;
    const half = tCritical * Math.sqrt(msResidual * (contrastVariance + blockMeanVariance));
    return { treatment: name, estimate, lower: estimate - half, upper: estimate + half };
  });
}

/** Tukey–Kramer pairwise differences from Σx / Σx² summaries, through lib/stats (pairs in key order: y−x). */
export function tukeyFromSummaries(groups: Record<string, Summary>, level = 0.95): TukeyComparison[] {
  const described = Object.fromEntries(
    Object.entries(groups).map(([name, summary]) => [
      name,
      { n: summary.n, mean: summaryMean(summary), sumOfSquares: summarySumOfSquares(summary) },
    ]),
  );
  return tukeyFromGroupSummaries(described, level);
}
