// Distribution functions accurate to about 1e-14. jstat's incomplete beta stops at a
// relative tolerance of 3e-7 and its log-gamma is good to ~2e-10, which is not enough to
// reproduce R's printed digits, so the t, F, chi-square and noncentral t tails used by
// lib/stats are computed here. Normal quantiles and the studentized range come from jstat,
// whose implementations are accurate (see docs/references.md).
import jStat from "jstat";
import { brentRoot } from "./root-finding";

const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905,
  -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** log Γ(x) for x > 0 (Lanczos, g = 7, n = 9). */
export function logGamma(x: number): number {
  if (x < 0.5) {
    return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

const TINY = 1e-300;
const EPSILON = 1e-16;
const MAX_ITERATIONS = 100_000;

// Continued fraction for the incomplete beta (modified Lentz), run to full precision.
function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPSILON) return h;
  }
  return h;
}

/** Regularized incomplete beta I_x(a, b). */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const logFront = logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log1p(-x);
  if (x < (a + 1) / (a + b + 2)) {
    return (Math.exp(logFront) * betaContinuedFraction(x, a, b)) / a;
  }
  return 1 - (Math.exp(logFront) * betaContinuedFraction(1 - x, b, a)) / b;
}

/** Upper regularized gamma Q(a, x) = 1 − P(a, x). */
export function upperRegularizedGamma(a: number, x: number): number {
  if (x <= 0) return 1;
  const logFront = -x + a * Math.log(x) - logGamma(a);
  if (x < a + 1) {
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n <= MAX_ITERATIONS; n++) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * EPSILON) break;
    }
    return 1 - sum * Math.exp(logFront);
  }
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i <= MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPSILON) break;
  }
  return Math.exp(logFront) * h;
}

/** P(|T| > |t|) for Student's t with df degrees of freedom (df may be fractional). */
export function studentTTwoSidedP(t: number, df: number): number {
  return regularizedBeta(df / (df + t * t), df / 2, 0.5);
}

/** P(T ≤ t) for Student's t. */
export function studentTLowerTail(t: number, df: number): number {
  const t2 = t * t;
  if (t2 < df) {
    // Near the centre, from P(|T| < |t|) = I_{t²/(t²+df)}(1/2, df/2), which has no cancellation there.
    const central = 0.5 * regularizedBeta(t2 / (t2 + df), 0.5, df / 2);
    return t < 0 ? 0.5 - central : 0.5 + central;
  }
  const tail = 0.5 * studentTTwoSidedP(t, df);
  return t < 0 ? tail : 1 - tail;
}

/** The p-quantile of Student's t: jstat's estimate polished by Newton steps on our CDF. */
export function studentTQuantile(p: number, df: number): number {
  if (p === 0.5) return 0;
  let t = jStat.studentt.inv(p, df);
  if (!Number.isFinite(t)) t = jStat.normal.inv(p, 0, 1);
  for (let i = 0; i < 50; i++) {
    const step = (studentTLowerTail(t, df) - p) / jStat.studentt.pdf(t, df);
    t -= step;
    if (Math.abs(step) <= 1e-15 * Math.max(1, Math.abs(t))) break;
  }
  return t;
}

/** P(F > f) for Fisher's F(d1, d2), via the incomplete beta so small tails do not underflow. */
export function fUpperTail(f: number, d1: number, d2: number): number {
  return regularizedBeta(d2 / (d2 + d1 * f), d2 / 2, d1 / 2);
}

/** P(X > x) for chi-square with df degrees of freedom. */
export function chiSquareUpperTail(x: number, df: number): number {
  return upperRegularizedGamma(df / 2, x / 2);
}

/** The p-quantile of the standard normal. */
export function normalQuantile(p: number): number {
  return jStat.normal.inv(p, 0, 1);
}

/** Φ(x), the standard normal lower tail. */
export function normalLowerTail(x: number): number {
  return jStat.normal.cdf(x, 0, 1);
}

/**
 * P(T ≤ t) for the noncentral t with df degrees of freedom and noncentrality ncp.
 * Series of Lenth (1989, AS 243) as in R's pnt: a Poisson mixture of incomplete betas,
 * summed from j = 0 until the Poisson weights are spent (weights from logs, so large
 * ncp does not underflow the first term).
 */
export function noncentralTLowerTail(t: number, df: number, ncp: number): number {
  if (t < 0) return 1 - noncentralTLowerTail(-t, df, -ncp);
  const lambda = (ncp * ncp) / 2;
  const y = (t * t) / (t * t + df);
  const sign = ncp < 0 ? -1 : 1;
  const logLambda = lambda > 0 ? Math.log(lambda) : -Infinity;
  const last = Math.ceil(lambda + 12 * Math.sqrt(lambda) + 40);
  let sum = 0;
  for (let j = 0; j <= last; j++) {
    const poisson = lambda > 0 ? Math.exp(-lambda + j * logLambda - logGamma(j + 1)) : j === 0 ? 1 : 0;
    const halfPoisson = lambda > 0 ? Math.exp(-lambda + (j + 0.5) * logLambda - logGamma(j + 1.5)) : 0;
    if (poisson === 0 && halfPoisson === 0) continue;
    sum += poisson * regularizedBeta(y, j + 0.5, df / 2) + sign * halfPoisson * regularizedBeta(y, j + 1, df / 2);
  }
  return Math.min(1, Math.max(0, normalLowerTail(-ncp) + 0.5 * sum));
}

/**
 * P(Q ≤ q) for the studentized range of `groups` means with df residual degrees of freedom.
 * For two means Q/√2 is |t|, so the exact t tail is used; otherwise jstat's port of R's ptukey,
 * accurate to about 1e-12 from 3 degrees of freedom up (at 2 it is off by ~1e-4, at 1 it fails,
 * as R's is: callers refuse fewer than 3).
 */
export function studentizedRangeLowerTail(q: number, groups: number, df: number): number {
  if (groups === 2) return q <= 0 ? 0 : 1 - studentTTwoSidedP(q / Math.SQRT2, df);
  return jStat.tukey.cdf(q, groups, df);
}

/** P(Q > q): exact for two means (the two-sided t tail); 1 − P(Q ≤ q) otherwise, as R's ptukey(lower.tail = FALSE). */
export function studentizedRangeUpperTail(q: number, groups: number, df: number): number {
  if (groups === 2) return q <= 0 ? 1 : studentTTwoSidedP(q / Math.SQRT2, df);
  return Math.min(1, Math.max(0, 1 - jStat.tukey.cdf(q, groups, df)));
}

/**
 * The p-quantile of the studentized range. jstat's (and R's) qtukey stops its secant steps at a
 * tolerance of 1e-4 and is off by up to ~1e-7 relative; the estimate is polished here by secant
 * steps on the distribution function, to ~1e-13. `near`, a quantile at nearby degrees of freedom,
 * replaces jstat's estimate as the starting point (a search over sample sizes saves most of the work).
 */
export function studentizedRangeQuantile(p: number, groups: number, df: number, near?: number): number {
  if (groups === 2) return Math.SQRT2 * studentTQuantile((1 + p) / 2, df);
  const key = `${p} ${groups} ${df}`;
  const known = rangeQuantiles.get(key);
  if (known !== undefined) return known;
  const quantile = polishedRangeQuantile(p, groups, df, near);
  if (rangeQuantiles.size >= 256) rangeQuantiles.clear();
  rangeQuantiles.set(key, quantile);
  return quantile;
}

// Each evaluation of the distribution function integrates numerically (about 1 ms at 20 df), and a
// report asks for the same quantile once per family, so quantiles are remembered.
const rangeQuantiles = new Map<string, number>();

function polishedRangeQuantile(p: number, groups: number, df: number, near?: number): number {
  const start = near ?? jStat.tukey.inv(p, groups, df);
  const gap = (q: number) => studentizedRangeLowerTail(q, groups, df) - p;
  const tolerance = 1e-13 * start;
  // Secant steps from the estimate, which is already within ~1e-7: two or three steps suffice.
  let x0 = start;
  let f0 = gap(x0);
  if (f0 === 0) return x0;
  let x1 = start * (f0 < 0 ? 1 + 1e-5 : 1 - 1e-5);
  let f1 = gap(x1);
  for (let step = 0; step < 8 && f1 !== 0 && f1 !== f0; step++) {
    const x2 = x1 - (f1 * (x1 - x0)) / (f1 - f0);
    x0 = x1;
    f0 = f1;
    x1 = x2;
    f1 = gap(x1);
    if (Math.abs(x1 - x0) <= tolerance) return x1;
  }
  if (f1 === 0) return x1;
  // Not settled (it has not happened in testing): bracket the root and use Brent's method.
  let lower = start * (1 - 1e-4);
  let upper = start * (1 + 1e-4);
  while (gap(lower) > 0) lower *= 0.9;
  while (gap(upper) < 0) upper *= 1.1;
  return brentRoot(gap, lower, upper, tolerance);
}
