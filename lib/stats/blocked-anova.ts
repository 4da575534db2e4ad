import { isRoundingNoiseAt } from "./describe";
import { fUpperTail, studentTQuantile, studentizedRangeQuantile, studentizedRangeUpperTail } from "./distributions";
import { StatsInputError, requireFinite, requireLevel } from "./errors";
import {
  blocksOnlyResidual,
  cellTable,
  cellTableFromRows,
  fitWithinBlocks,
  indicatorCoding,
  indicatorRow,
  levelsOnlyResidual,
  quadraticForm,
  type CellTable,
  type WithinBlockFit,
} from "./within-block-fit";

export type BlockedAnovaObservation = {
  /** The thing compared, e.g. a strain, substrate recipe or fruiting method. */
  treatment: string;
  /** The blocking factor: for the co-op, the farm (not a substrate block). */
  block: string;
  /** The outcome, e.g. a block's biological efficiency in percent. */
  y: number;
};

/** One treatment × block cell summarised: count, mean and sum of squared deviations from that mean. */
export type BlockedAnovaCell = {
  treatment: string;
  block: string;
  n: number;
  /** In the outcome's unit (e.g. BE percent). */
  mean: number;
  /** Σ (y − mean)², in the outcome's unit squared. */
  sumOfSquares: number;
};

export type AnovaTerm = { df: number; ss: number; ms: number; f: number; p: number };

export type AdjustedMean = { treatment: string; estimate: number; lower: number; upper: number };

/**
 * One pair of least-squares means, as R's `pairs(emmeans(fit, "treatment"))` gives it with its
 * default Tukey adjustment. All figures are in the outcome's unit (e.g. BE points).
 */
export type PairwiseComparison = {
  a: string;
  b: string;
  /** Least-squares mean of a − that of b. */
  difference: number;
  /** Standard error of the difference, from the model's residual variance. */
  se: number;
  /** difference ∓ q(level; k, df)/√2 · se: simultaneous over all k(k − 1)/2 pairs. */
  lower: number;
  upper: number;
  /** P(Q(k, df) > |difference / se| · √2). */
  pAdjusted: number;
};

export type BlockedAnova = {
  /** Treatments adjusted for blocks (type II). */
  treatment: AnovaTerm;
  /** Blocks adjusted for treatments (type II). */
  block: AnovaTerm;
  residual: { df: number; ss: number; ms: number };
  /** Least-squares treatment means (averaged over blocks with equal weight), in first-seen order. */
  means: AdjustedMean[];
  /**
   * Every pair of treatments, in emmeans' order: for treatments [x, y, z] the pairs are x − y,
   * x − z, y − z. Tukey-adjusted over the k treatments with the residual degrees of freedom.
   */
  comparisons: PairwiseComparison[];
};

/**
 * Additive two-way analysis, y = μ + treatment + block + error, fitted by least squares,
 * so it stays right when farms run different numbers of blocks per strain or skip a
 * strain. The block effects are absorbed (each value is taken relative to its block's
 * mean), which leaves a small treatments × treatments system solved by Cholesky; its
 * size does not grow with the number of observations or farms.
 *
 * `level` sets the intervals of the least-squares means (t with the residual degrees of
 * freedom) and of the pairwise comparisons (Tukey), default 95 %.
 */
export function blockedAnova(obs: BlockedAnovaObservation[], level = 0.95): BlockedAnova {
  requireLevel(level);
  const treatmentIndex = new Map<string, number>();
  const blockIndex = new Map<string, number>();
  const t = new Int32Array(obs.length);
  const b = new Int32Array(obs.length);
  const y = new Float64Array(obs.length);
  obs.forEach((o, i) => {
    requireFinite(o.y, `Observation ${i + 1} (treatment "${o.treatment}", block "${o.block}")`);
    let ti = treatmentIndex.get(o.treatment);
    if (ti === undefined) treatmentIndex.set(o.treatment, (ti = treatmentIndex.size));
    let bi = blockIndex.get(o.block);
    if (bi === undefined) blockIndex.set(o.block, (bi = blockIndex.size));
    t[i] = ti;
    b[i] = bi;
    y[i] = o.y;
  });
  const table = cellTableFromRows(treatmentIndex.size, blockIndex.size, t, b, y);
  return blockedAnovaOfTable(table, [...treatmentIndex.keys()], level);
}

/**
 * blockedAnova from each treatment × block cell's count, mean and centred sum of squares: the
 * same fit, for data that may not leave a farm as rows (Co-op results pools per-farm sums).
 * Cells with n = 0 are ignored; repeated cells are merged.
 */
export function blockedAnovaFromCells(cells: readonly BlockedAnovaCell[], level = 0.95): BlockedAnova {
  requireLevel(level);
  const treatmentIndex = new Map<string, number>();
  const blockIndex = new Map<string, number>();
  const indexed = cells.flatMap((cell, i) => {
    const what = `Cell ${i + 1} (treatment "${cell.treatment}", block "${cell.block}")`;
    if (!(Number.isInteger(cell.n) && cell.n >= 0)) {
      throw new StatsInputError("invalid_argument", `${what} has a count of ${cell.n}; a count is a whole number, 0 or more.`);
    }
    if (cell.n === 0) return [];
    requireFinite(cell.mean, `${what}'s mean`);
    requireFinite(cell.sumOfSquares, `${what}'s sum of squares`);
    if (cell.sumOfSquares < 0) {
      throw new StatsInputError("invalid_argument", `${what} has a negative sum of squares (${cell.sumOfSquares}); it cannot be below 0.`);
    }
    let ti = treatmentIndex.get(cell.treatment);
    if (ti === undefined) treatmentIndex.set(cell.treatment, (ti = treatmentIndex.size));
    let bi = blockIndex.get(cell.block);
    if (bi === undefined) blockIndex.set(cell.block, (bi = blockIndex.size));
    return [{ level: ti, block: bi, n: cell.n, mean: cell.mean, sumOfSquares: cell.sumOfSquares }];
  });
  const table = cellTable(treatmentIndex.size, blockIndex.size, indexed);
  return blockedAnovaOfTable(table, [...treatmentIndex.keys()], level);
}

function blockedAnovaOfTable(table: CellTable, names: string[], level: number): BlockedAnova {
  const treatments = table.levels;
  const blocks = table.blocks;
  if (treatments < 2) {
    throw new StatsInputError("too_few_values", `Comparing treatments needs at least 2; got ${treatments}.`);
  }
  if (blocks < 2) {
    throw new StatsInputError("too_few_values", "Only one block (farm) is present; use oneWayAnova for a single farm, or add farms.");
  }
  const dfResidual = table.total - treatments - blocks + 1;
  if (dfResidual < 1) {
    throw new StatsInputError(
      "too_few_values",
      "There are too few observations to estimate the error after fitting treatments and blocks; add repeat blocks.",
    );
  }
  const fit = fitWithinBlocks(table, indicatorCoding(treatments), treatments - 1);
  const rssFull = fit.rss;
  if (isRoundingNoiseAt(rssFull, table.total, table.largest)) {
    throw new StatsInputError(
      "no_variation",
      "The model fits every value exactly, so there is no error left to test against; check for duplicated rows.",
    );
  }
  const msResidual = rssFull / dfResidual;
  const treatmentTerm = anovaTerm(blocksOnlyResidual(table) - rssFull, treatments - 1, msResidual, dfResidual);
  const blockTerm = anovaTerm(levelsOnlyResidual(table) - rssFull, blocks - 1, msResidual, dfResidual);

  const tCritical = studentTQuantile((1 + level) / 2, dfResidual);
  const means: AdjustedMean[] = names.map((name, s) => {
    const { estimate, variance } = leastSquaresMean(fit, indicatorRow(treatments, s));
    const half = tCritical * Math.sqrt(msResidual * variance);
    return { treatment: name, estimate, lower: estimate - half, upper: estimate + half };
  });

  const comparisons: PairwiseComparison[] = [];
  const contrasts: { a: number; b: number; w: Float64Array }[] = [];
  for (let i = 0; i < treatments; i++) {
    for (let j = i + 1; j < treatments; j++) {
      const w = indicatorRow(treatments, i);
      const other = indicatorRow(treatments, j);
      for (let r = 0; r < w.length; r++) w[r] -= other[r];
      contrasts.push({ a: i, b: j, w });
    }
  }
  for (const pair of tukeyPairs(fit, contrasts, msResidual, dfResidual, treatments, level)) {
    comparisons.push({ a: names[pair.a], b: names[pair.b], ...pair.figures });
  }

  return {
    treatment: treatmentTerm,
    block: blockTerm,
    residual: { df: dfResidual, ss: rssFull, ms: msResidual },
    means,
    comparisons,
  };
}

/**
 * The least-squares mean of the level whose row of X is `row`, averaged over blocks with equal
 * weight, and its variance in units of σ²: the contrast part and the average of the block means,
 * which are independent of the within-block deviations.
 */
export function leastSquaresMean(fit: WithinBlockFit, row: ArrayLike<number>): { estimate: number; variance: number } {
  let estimate = fit.averageBlockLevel;
  const w = new Float64Array(fit.size);
  for (let j = 0; j < fit.size; j++) {
    estimate += row[j] * fit.coefficients[j];
    w[j] = row[j] - fit.averageRow[j];
  }
  return { estimate, variance: quadraticForm(fit, w) + fit.blockMeanVariance };
}

/**
 * Differences wᵀβ of least-squares means (w a contrast of coded rows) with Tukey's adjustment
 * for a family of k means, as emmeans: p = P(Q(k, df) > |d/se|·√2), d ± q(level; k, df)/√2 · se.
 */
export function tukeyPairs<T extends { w: ArrayLike<number> }>(
  fit: WithinBlockFit,
  contrasts: readonly T[],
  msResidual: number,
  dfResidual: number,
  familySize: number,
  level: number,
): (Omit<T, "w"> & { figures: Omit<PairwiseComparison, "a" | "b"> })[] {
  if (familySize > 2 && dfResidual < 3) {
    throw new StatsInputError(
      "too_few_values",
      `Comparing ${familySize} treatments pair by pair needs at least 3 degrees of freedom for the error; there are ${dfResidual}. Add repeat blocks.`,
    );
  }
  const critical = studentizedRangeQuantile(level, familySize, dfResidual) / Math.SQRT2;
  return contrasts.map(({ w, ...rest }) => {
    let difference = 0;
    for (let j = 0; j < fit.size; j++) difference += w[j] * fit.coefficients[j];
    const se = Math.sqrt(msResidual * quadraticForm(fit, w));
    return {
      ...rest,
      figures: {
        difference,
        se,
        lower: difference - critical * se,
        upper: difference + critical * se,
        pAdjusted: studentizedRangeUpperTail((Math.abs(difference) / se) * Math.SQRT2, familySize, dfResidual),
      },
    };
  });
}

export function anovaTerm(ss: number, df: number, msResidual: number, dfResidual: number): AnovaTerm {
  const clamped = Math.max(0, ss);
  const ms = clamped / df;
  const f = ms / msResidual;
  return { df, ss: clamped, ms, f, p: fUpperTail(f, df, dfResidual) };
}
