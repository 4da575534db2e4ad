import { isRoundingNoise } from "./describe";
import { fUpperTail, studentTQuantile } from "./distributions";
import { StatsInputError, requireFinite, requireLevel } from "./errors";
import { cholesky, choleskySolve } from "./linear-algebra";

export type BlockedAnovaObservation = {
  /** The thing compared, e.g. a strain, substrate recipe or fruiting method. */
  treatment: string;
  /** The blocking factor: for the co-op, the farm (not a substrate block). */
  block: string;
  /** The outcome, e.g. a block's biological efficiency in percent. */
  y: number;
};

export type AnovaTerm = { df: number; ss: number; ms: number; f: number; p: number };

export type AdjustedMean = { treatment: string; estimate: number; lower: number; upper: number };

export type BlockedAnova = {
  /** Treatments adjusted for blocks (type II). */
  treatment: AnovaTerm;
  /** Blocks adjusted for treatments (type II). */
  block: AnovaTerm;
  residual: { df: number; ss: number; ms: number };
  /** Least-squares treatment means (averaged over blocks with equal weight), in first-seen order. */
  means: AdjustedMean[];
};

/**
 * Additive two-way analysis, y = μ + treatment + block + error, fitted by least squares,
 * so it stays right when farms run different numbers of blocks per strain or skip a
 * strain. The block effects are absorbed (each value is taken relative to its block's
 * mean), which leaves a small treatments × treatments system solved by Cholesky; its
 * size does not grow with the number of observations or farms.
 *
 * `level` sets the interval of the least-squares means (default 95 %), using the
 * residual variance and t with the residual degrees of freedom.
 */
export function blockedAnova(obs: BlockedAnovaObservation[], level = 0.95): BlockedAnova {
  requireLevel(level);
  const treatmentIndex = new Map<string, number>();
  const blockIndex = new Map<string, number>();
  const t = new Int32Array(obs.length);
  const b = new Int32Array(obs.length);
  obs.forEach((o, i) => {
    requireFinite(o.y, `Observation ${i + 1} (treatment "${o.treatment}", block "${o.block}")`);
    let ti = treatmentIndex.get(o.treatment);
    if (ti === undefined) treatmentIndex.set(o.treatment, (ti = treatmentIndex.size));
    let bi = blockIndex.get(o.block);
    if (bi === undefined) blockIndex.set(o.block, (bi = blockIndex.size));
    t[i] = ti;
    b[i] = bi;
  });
  const treatments = treatmentIndex.size;
  const blocks = blockIndex.size;
  if (treatments < 2) {
    throw new StatsInputError("too_few_values", `Comparing treatments needs at least 2; got ${treatments}.`);
  }
  if (blocks < 2) {
    throw new StatsInputError("too_few_values", "Only one block (farm) is present; use oneWayAnova for a single farm, or add farms.");
  }
  const n = obs.length;
  const dfResidual = n - treatments - blocks + 1;
  if (dfResidual < 1) {
    throw new StatsInputError(
      "too_few_values",
      "There are too few observations to estimate the error after fitting treatments and blocks; add repeat blocks.",
    );
  }

  const counts = new Float64Array(treatments * blocks);
  const blockSize = new Float64Array(blocks);
  const treatmentSize = new Float64Array(treatments);
  for (let i = 0; i < n; i++) {
    counts[t[i] * blocks + b[i]]++;
    blockSize[b[i]]++;
    treatmentSize[t[i]]++;
  }
  const blockMean = groupMeans(obs, b, blocks, blockSize);
  const treatmentMean = groupMeans(obs, t, treatments, treatmentSize);

  // Deviations from block means: their treatment totals are the adjusted totals Q.
  const adjustedTotal = new Float64Array(treatments);
  let rssBlocksOnly = 0;
  let rssTreatmentsOnly = 0;
  for (let i = 0; i < n; i++) {
    const e = obs[i].y - blockMean[b[i]];
    adjustedTotal[t[i]] += e;
    rssBlocksOnly += e * e;
    const d = obs[i].y - treatmentMean[t[i]];
    rssTreatmentsOnly += d * d;
  }

  // Reduced normal equations C τ = Q, with the last treatment's effect fixed at 0.
  const size = treatments - 1;
  const c = new Float64Array(size * size);
  for (let bl = 0; bl < blocks; bl++) {
    for (let s = 0; s < size; s++) {
      const ns = counts[s * blocks + bl];
      if (ns === 0) continue;
      c[s * size + s] += ns;
      for (let r = 0; r < size; r++) {
        c[s * size + r] -= (ns * counts[r * blocks + bl]) / blockSize[bl];
      }
    }
  }
  const factor = cholesky(c, size);
  const reduced = choleskySolve(factor, size, adjustedTotal);
  const effect = new Float64Array(treatments);
  effect.set(reduced);

  // Each block's mean treatment effect, so fitted = block mean + effect − that mean.
  const blockEffectMean = new Float64Array(blocks);
  for (let bl = 0; bl < blocks; bl++) {
    let sum = 0;
    for (let s = 0; s < treatments; s++) sum += counts[s * blocks + bl] * effect[s];
    blockEffectMean[bl] = sum / blockSize[bl];
  }
  let rssFull = 0;
  for (let i = 0; i < n; i++) {
    const r = obs[i].y - blockMean[b[i]] - effect[t[i]] + blockEffectMean[b[i]];
    rssFull += r * r;
  }

  const msResidual = rssFull / dfResidual;
  if (
    isRoundingNoise(
      rssFull,
      obs.map((o) => o.y),
    )
  ) {
    throw new StatsInputError(
      "no_variation",
      "The model fits every value exactly, so there is no error left to test against; check for duplicated rows.",
    );
  }
  const treatmentTerm = term(rssBlocksOnly - rssFull, treatments - 1, msResidual, dfResidual);
  const blockTerm = term(rssTreatmentsOnly - rssFull, blocks - 1, msResidual, dfResidual);

  // Least-squares mean of treatment s: effect_s + average over blocks of (block mean −
  // block's mean effect). Its variance splits into the contrast part (w' C⁻¹ w) and the
  // average of block means (independent of the within-block deviations).
  let averageBlockLevel = 0;
  let blockMeanVariance = 0;
  for (let bl = 0; bl < blocks; bl++) {
    averageBlockLevel += blockMean[bl] - blockEffectMean[bl];
    blockMeanVariance += 1 / blockSize[bl];
  }
  averageBlockLevel /= blocks;
  blockMeanVariance /= blocks * blocks;
  const averageShare = new Float64Array(treatments);
  for (let s = 0; s < treatments; s++) {
    let sum = 0;
    for (let bl = 0; bl < blocks; bl++) sum += counts[s * blocks + bl] / blockSize[bl];
    averageShare[s] = sum / blocks;
  }
  const tCritical = studentTQuantile((1 + level) / 2, dfResidual);
  const means: AdjustedMean[] = [...treatmentIndex.keys()].map((name, s) => {
    const w = new Float64Array(size);
    for (let r = 0; r < size; r++) w[r] = (r === s ? 1 : 0) - averageShare[r];
    const x = choleskySolve(factor, size, w);
    let contrastVariance = 0;
    for (let r = 0; r < size; r++) contrastVariance += w[r] * x[r];
    const estimate = effect[s] + averageBlockLevel;
    const half = tCritical * Math.sqrt(msResidual * (contrastVariance + blockMeanVariance));
    return { treatment: name, estimate, lower: estimate - half, upper: estimate + half };
  });

  return {
    treatment: treatmentTerm,
    block: blockTerm,
    residual: { df: dfResidual, ss: rssFull, ms: msResidual },
    means,
  };
}

function term(ss: number, df: number, msResidual: number, dfResidual: number): AnovaTerm {
  const clamped = Math.max(0, ss);
  const ms = clamped / df;
  const f = ms / msResidual;
  return { df, ss: clamped, ms, f, p: fUpperTail(f, df, dfResidual) };
}

function groupMeans(obs: readonly BlockedAnovaObservation[], group: Int32Array, groups: number, size: Float64Array): Float64Array {
  const mean = new Float64Array(groups);
  for (let i = 0; i < obs.length; i++) mean[group[i]] += obs[i].y;
  for (let g = 0; g < groups; g++) mean[g] /= size[g];
  const correction = new Float64Array(groups);
  for (let i = 0; i < obs.length; i++) correction[group[i]] += obs[i].y - mean[group[i]];
  for (let g = 0; g < groups; g++) mean[g] += correction[g] / size[g];
  return mean;
}
