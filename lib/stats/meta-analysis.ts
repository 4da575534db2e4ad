import { chiSquareUpperTail, normalQuantile } from "./distributions";
import { StatsInputError, requireFinite, requireLevel } from "./errors";

export type PooledEstimate = { estimate: number; se: number; lower: number; upper: number };

export type MetaAnalysis = {
  /** Inverse-variance (common effect) estimate. */
  fixed: PooledEstimate;
  /** DerSimonian–Laird random-effects estimate; tau2 is the between-study (between-farm) variance. */
  random: PooledEstimate & { tau2: number };
  /** Cochran's Q heterogeneity statistic. */
  q: number;
  /** Degrees of freedom of Q: number of studies − 1. */
  df: number;
  /** P(χ²(df) > q). */
  pQ: number;
  /** I² in percent (0–100), as metafor prints it: the share of total variation due to heterogeneity. */
  i2: number;
};

/**
 * Pools per-study effects y with sampling variances v: in the co-op each study is one
 * farm's strain difference, so farms share only (y, v) and never their rows.
 * I² uses metafor's form τ²/(τ² + s²) with s² the typical within-study variance; for
 * DerSimonian–Laird it equals max(0, (Q − df)/Q).
 */
export function metaAnalysis(studies: { y: number; v: number }[], level = 0.95): MetaAnalysis {
  requireLevel(level);
  if (studies.length < 2) {
    throw new StatsInputError("too_few_values", `Pooling needs at least 2 studies (farms); got ${studies.length}.`);
  }
  studies.forEach((s, i) => {
    requireFinite(s.y, `Study ${i + 1}'s effect`);
    requireFinite(s.v, `Study ${i + 1}'s variance`);
    if (!(s.v > 0)) {
      throw new StatsInputError(
        "invalid_argument",
        `Study ${i + 1} has variance ${s.v}; each farm's difference needs a positive sampling variance (at least two blocks per arm).`,
      );
    }
  });
  const k = studies.length;
  const z = normalQuantile((1 + level) / 2);

  let sumW = 0;
  let sumW2 = 0;
  let sumWY = 0;
  for (const { y, v } of studies) {
    const w = 1 / v;
    sumW += w;
    sumW2 += w * w;
    sumWY += w * y;
  }
  const fixedEstimate = sumWY / sumW;
  let q = 0;
  for (const { y, v } of studies) q += ((y - fixedEstimate) * (y - fixedEstimate)) / v;
  const df = k - 1;
  const c = sumW - sumW2 / sumW;
  const tau2 = Math.max(0, (q - df) / c);

  let sumWr = 0;
  let sumWrY = 0;
  for (const { y, v } of studies) {
    const w = 1 / (v + tau2);
    sumWr += w;
    sumWrY += w * y;
  }
  const randomEstimate = sumWrY / sumWr;
  const fixedSe = Math.sqrt(1 / sumW);
  const randomSe = Math.sqrt(1 / sumWr);
  const typicalVariance = df / c;

  return {
    fixed: {
      estimate: fixedEstimate,
      se: fixedSe,
      lower: fixedEstimate - z * fixedSe,
      upper: fixedEstimate + z * fixedSe,
    },
    random: {
      estimate: randomEstimate,
      se: randomSe,
      lower: randomEstimate - z * randomSe,
      upper: randomEstimate + z * randomSe,
      tau2,
    },
    q,
    df,
    pQ: chiSquareUpperTail(q, df),
    i2: (100 * tau2) / (tau2 + typicalVariance),
  };
}
