import { cholesky, choleskySolve } from "./linear-algebra";

/**
 * The data of a model "outcome ~ treatment terms + block", reduced to what its least-squares
 * fit depends on: per treatment × block cell, the count, the mean and the centred sum of
 * squares. Row values and one-pass sums (n, Σy, Σy²) both reduce to this, so the trial report
 * (block values) and Co-op results (per-farm sums) share one fit.
 */
export interface CellTable {
  levels: number;
  blocks: number;
  /** Cells with at least one value, in any order. */
  level: Int32Array;
  block: Int32Array;
  n: Float64Array;
  mean: Float64Array;
  sumOfSquares: Float64Array;
  /** Per block: number of values and their mean. */
  blockSize: Float64Array;
  blockMean: Float64Array;
  /** Σ of the cells' sums of squares: what no treatment or block term can explain. */
  withinCells: number;
  total: number;
  /** An upper bound on |y|, for telling an exact fit from rounding. */
  largest: number;
}

/**
 * Builds the table from cells listed in any order, merging repeats of a level × block cell with
 * the parallel-axis rule (Chan, Golub & LeVeque 1979), so the sums of squares stay centred.
 */
export function cellTable(
  levels: number,
  blocks: number,
  cells: Iterable<{ level: number; block: number; n: number; mean: number; sumOfSquares: number }>,
): CellTable {
  const count = new Float64Array(levels * blocks);
  const mean = new Float64Array(levels * blocks);
  const squares = new Float64Array(levels * blocks);
  let largest = 0;
  for (const cell of cells) {
    if (cell.n === 0) continue;
    const key = cell.level * blocks + cell.block;
    const before = count[key];
    const after = before + cell.n;
    const gap = cell.mean - mean[key];
    squares[key] += cell.sumOfSquares + (before === 0 ? 0 : (gap * gap * before * cell.n) / after);
    mean[key] += (gap * cell.n) / after;
    count[key] = after;
    largest = Math.max(largest, Math.abs(cell.mean) + Math.sqrt(cell.sumOfSquares));
  }
  return denseToTable(levels, blocks, count, mean, squares, largest);
}

/**
 * Builds the table from row values with level and block indices, by two passes: cell means
 * (with the rounding of the first pass added back), then squared deviations from them.
 */
export function cellTableFromRows(levels: number, blocks: number, level: Int32Array, block: Int32Array, y: ArrayLike<number>): CellTable {
  const count = new Float64Array(levels * blocks);
  const sum = new Float64Array(levels * blocks);
  const rows = y.length;
  const key = new Int32Array(rows);
  let largest = 0;
  for (let i = 0; i < rows; i++) {
    const k = level[i] * blocks + block[i];
    key[i] = k;
    count[k]++;
    sum[k] += y[i];
    largest = Math.max(largest, Math.abs(y[i]));
  }
  const mean = new Float64Array(levels * blocks);
  for (let k = 0; k < mean.length; k++) if (count[k] > 0) mean[k] = sum[k] / count[k];
  const correction = new Float64Array(levels * blocks);
  for (let i = 0; i < rows; i++) correction[key[i]] += y[i] - mean[key[i]];
  for (let k = 0; k < mean.length; k++) if (count[k] > 0) mean[k] += correction[k] / count[k];
  const squares = new Float64Array(levels * blocks);
  for (let i = 0; i < rows; i++) {
    const d = y[i] - mean[key[i]];
    squares[key[i]] += d * d;
  }
  return denseToTable(levels, blocks, count, mean, squares, largest);
}

function denseToTable(
  levels: number,
  blocks: number,
  count: Float64Array,
  mean: Float64Array,
  squares: Float64Array,
  largest: number,
): CellTable {
  let used = 0;
  for (let k = 0; k < count.length; k++) if (count[k] > 0) used++;
  const table: CellTable = {
    levels,
    blocks,
    level: new Int32Array(used),
    block: new Int32Array(used),
    n: new Float64Array(used),
    mean: new Float64Array(used),
    sumOfSquares: new Float64Array(used),
    blockSize: new Float64Array(blocks),
    blockMean: new Float64Array(blocks),
    withinCells: 0,
    total: 0,
    largest,
  };
  let c = 0;
  for (let t = 0; t < levels; t++) {
    for (let b = 0; b < blocks; b++) {
      const k = t * blocks + b;
      if (count[k] === 0) continue;
      table.level[c] = t;
      table.block[c] = b;
      table.n[c] = count[k];
      table.mean[c] = mean[k];
      table.sumOfSquares[c] = squares[k];
      table.blockSize[b] += count[k];
      table.blockMean[b] += count[k] * mean[k];
      table.withinCells += squares[k];
      table.total += count[k];
      c++;
    }
  }
  for (let b = 0; b < blocks; b++) if (table.blockSize[b] > 0) table.blockMean[b] /= table.blockSize[b];
  return table;
}

/** Residual sum of squares of the model with one mean per level and no blocks. */
export function levelsOnlyResidual(table: CellTable): number {
  const size = new Float64Array(table.levels);
  const mean = new Float64Array(table.levels);
  for (let c = 0; c < table.n.length; c++) {
    size[table.level[c]] += table.n[c];
    mean[table.level[c]] += table.n[c] * table.mean[c];
  }
  for (let t = 0; t < table.levels; t++) mean[t] /= size[t];
  let rss = table.withinCells;
  for (let c = 0; c < table.n.length; c++) {
    const gap = table.mean[c] - mean[table.level[c]];
    rss += table.n[c] * gap * gap;
  }
  return rss;
}

/** Residual sum of squares of the blocks-only model: each value against its block's mean. */
export function blocksOnlyResidual(table: CellTable): number {
  let rss = table.withinCells;
  for (let c = 0; c < table.n.length; c++) {
    const gap = table.mean[c] - table.blockMean[table.block[c]];
    rss += table.n[c] * gap * gap;
  }
  return rss;
}

export interface WithinBlockFit {
  /** Number of coded columns. */
  size: number;
  coefficients: Float64Array;
  /** Cholesky factor of the reduced normal matrix C = Xᵀ(I − P_block)X. */
  factor: Float64Array;
  rss: number;
  /** (1/B)·Σ over blocks of (block mean − block's mean of Xβ): the level the least-squares means sit on. */
  averageBlockLevel: number;
  /** (1/B²)·Σ 1/N_b: the variance, in units of σ², of the equally weighted average of block means. */
  blockMeanVariance: number;
  /** (1/B)·Σ over blocks of the block's mean row of X. */
  averageRow: Float64Array;
}

/**
 * Least-squares fit of y = block + Xβ + error, X constant within a level (`coding` holds one
 * row of `size` columns per level, row-major). The block effects are absorbed: each cell is
 * taken relative to its block, which leaves the size × size system C β = Q, solved by Cholesky.
 * Its cost grows with cells × size², never with the number of values. Throws `not_estimable`
 * (from `cholesky`) when the coded effects are not all estimable, e.g. levels that never share
 * a block with the others.
 */
export function fitWithinBlocks(table: CellTable, coding: Float64Array, size: number): WithinBlockFit {
  const { blocks } = table;
  const cells = table.n.length;
  // Each block's mean row of X.
  const blockRow = new Float64Array(blocks * size);
  for (let c = 0; c < cells; c++) {
    const b = table.block[c];
    const t = table.level[c];
    const weight = table.n[c] / table.blockSize[b];
    for (let j = 0; j < size; j++) blockRow[b * size + j] += weight * coding[t * size + j];
  }
  const c = new Float64Array(size * size);
  const q = new Float64Array(size);
  const centred = new Float64Array(size);
  for (let cell = 0; cell < cells; cell++) {
    const b = table.block[cell];
    const t = table.level[cell];
    const n = table.n[cell];
    for (let j = 0; j < size; j++) centred[j] = coding[t * size + j] - blockRow[b * size + j];
    const gap = table.mean[cell] - table.blockMean[b];
    for (let j = 0; j < size; j++) {
      const nx = n * centred[j];
      if (nx === 0) continue;
      q[j] += nx * gap;
      for (let k = 0; k <= j; k++) c[j * size + k] += nx * centred[k];
    }
  }
  for (let j = 0; j < size; j++) for (let k = 0; k < j; k++) c[k * size + j] = c[j * size + k];
  const factor = cholesky(c, size);
  const coefficients = choleskySolve(factor, size, q);

  // Residuals per cell: cell mean − (block mean + (x − block's mean x)·β).
  const blockFitted = new Float64Array(blocks);
  for (let b = 0; b < blocks; b++) {
    let sum = 0;
    for (let j = 0; j < size; j++) sum += blockRow[b * size + j] * coefficients[j];
    blockFitted[b] = sum;
  }
  let rss = table.withinCells;
  for (let cell = 0; cell < cells; cell++) {
    const b = table.block[cell];
    const t = table.level[cell];
    let fitted = table.blockMean[b] - blockFitted[b];
    for (let j = 0; j < size; j++) fitted += coding[t * size + j] * coefficients[j];
    const gap = table.mean[cell] - fitted;
    rss += table.n[cell] * gap * gap;
  }

  let averageBlockLevel = 0;
  let blockMeanVariance = 0;
  const averageRow = new Float64Array(size);
  for (let b = 0; b < blocks; b++) {
    averageBlockLevel += table.blockMean[b] - blockFitted[b];
    blockMeanVariance += 1 / table.blockSize[b];
    for (let j = 0; j < size; j++) averageRow[j] += blockRow[b * size + j];
  }
  averageBlockLevel /= blocks;
  blockMeanVariance /= blocks * blocks;
  for (let j = 0; j < size; j++) averageRow[j] /= blocks;
  return { size, coefficients, factor, rss, averageBlockLevel, blockMeanVariance, averageRow };
}

/** wᵀ C⁻¹ w: the variance of wᵀβ in units of σ². */
export function quadraticForm(fit: WithinBlockFit, w: ArrayLike<number>): number {
  const x = choleskySolve(fit.factor, fit.size, w);
  let sum = 0;
  for (let j = 0; j < fit.size; j++) sum += w[j] * x[j];
  return sum;
}

/** Treatment (dummy) coding of `levels` levels with the last as the baseline: level t < last → e_t. */
export function indicatorCoding(levels: number): Float64Array {
  const size = levels - 1;
  const coding = new Float64Array(levels * size);
  for (let t = 0; t < size; t++) coding[t * size + t] = 1;
  return coding;
}

/** Level s's row of `indicatorCoding(levels)` (all zeros for the last level). */
export function indicatorRow(levels: number, s: number): Float64Array {
  const row = new Float64Array(levels - 1);
  if (s < levels - 1) row[s] = 1;
  return row;
}
