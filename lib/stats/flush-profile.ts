import { accurateMean, sumOfSquares } from "./describe";
import { studentTQuantile } from "./distributions";
import { StatsInputError, requireLevel, requireMass } from "./errors";

export type FlushRecord = {
  blockId: string;
  /** Flush number, 1 for the first wave. */
  flush: number;
  /** Fresh mass picked in that flush, grams. */
  freshG: number;
};

export type FlushShare = {
  flush: number;
  /** Mean share of a block's total fresh yield picked in this flush (0–1). */
  meanShare: number;
  /** Confidence interval for that mean share (default 95 %), within [0, 1]. */
  lower: number;
  upper: number;
  /** Finished blocks averaged (blocks without this flush count as a share of 0). */
  n: number;
  /** How many of those blocks gave this flush at all. */
  blocksFruiting: number;
  /** Mean share picked in flushes 1 up to this one. */
  cumulativeShare: number;
  /** Prediction interval (default 95 %) for one block's cumulative share, within [0, 1]. */
  cumulativeLower: number;
  cumulativeUpper: number;
};

/** The co-op's pooled flush profile: one entry per flush number from 1 to the last seen. */
export type FlushProfile = FlushShare[];

/**
 * How a block's yield is spread over its flushes, pooled over finished blocks.
 *
 * Pass only blocks that are finished (spent or discarded after their last flush): a block
 * still fruiting would count its missing later flushes as zero and pull the late shares
 * down. Several records for the same block and flush are added together. Blocks that
 * gave no fruit at all have no shares and are left out. Needs at least two blocks with
 * fruit, since intervals need a spread.
 */
export function flushProfile(records: FlushRecord[], level = 0.95): FlushProfile {
  requireLevel(level);
  const perBlock = new Map<string, Map<number, number>>();
  let lastFlush = 0;
  records.forEach((r, i) => {
    if (!Number.isInteger(r.flush) || r.flush < 1) {
      throw new StatsInputError(
        "invalid_argument",
        `Record ${i + 1} (block "${r.blockId}") has flush number ${r.flush}; flushes are numbered 1, 2, 3 …`,
      );
    }
    requireMass(r.freshG, `Record ${i + 1} (block "${r.blockId}", flush ${r.flush}) fresh mass`);
    let flushes = perBlock.get(r.blockId);
    if (!flushes) perBlock.set(r.blockId, (flushes = new Map<number, number>()));
    flushes.set(r.flush, (flushes.get(r.flush) ?? 0) + r.freshG);
    lastFlush = Math.max(lastFlush, r.flush);
  });

  const shares: number[][] = [];
  for (const flushes of perBlock.values()) {
    let total = 0;
    for (const g of flushes.values()) total += g;
    if (total === 0) continue;
    const row = new Array<number>(lastFlush).fill(0);
    for (const [flush, g] of flushes) row[flush - 1] = g / total;
    shares.push(row);
  }
  const n = shares.length;
  if (n < 2) {
    throw new StatsInputError("too_few_values", `A flush profile needs at least 2 finished blocks that gave fruit; got ${n}.`);
  }

  const tCritical = studentTQuantile((1 + level) / 2, n - 1);
  const clamp = (x: number) => Math.min(1, Math.max(0, x));
  const cumulative = new Array<number>(n).fill(0);
  const profile: FlushProfile = [];
  for (let f = 0; f < lastFlush; f++) {
    const column = shares.map((row) => row[f]);
    shares.forEach((row, i) => (cumulative[i] += row[f]));
    const mean = accurateMean(column);
    const half = tCritical * Math.sqrt(sumOfSquares(column, mean) / (n - 1) / n);
    const cumulativeMean = accurateMean(cumulative);
    // One new block scatters around the mean by sd·√(1 + 1/n): a prediction interval.
    const cumulativeHalf = tCritical * Math.sqrt((sumOfSquares(cumulative, cumulativeMean) / (n - 1)) * (1 + 1 / n));
    profile.push({
      flush: f + 1,
      meanShare: mean,
      lower: clamp(mean - half),
      upper: clamp(mean + half),
      n,
      blocksFruiting: column.filter((s) => s > 0).length,
      cumulativeShare: cumulativeMean,
      cumulativeLower: clamp(cumulativeMean - cumulativeHalf),
      cumulativeUpper: clamp(cumulativeMean + cumulativeHalf),
    });
  }
  return profile;
}

export type RemainingYield = {
  /** Expected fresh grams still to come from the block. */
  expectedRemainingG: number;
  /** Prediction bounds for that block (the profile's level, 95 % by default). */
  lower: number;
  upper: number;
};

/**
 * Expected fresh yield still to come from one block, given what it has given so far.
 *
 * Method: if the profile says flushes 1…k give a share c of a block's total on average,
 * a block that gave P grams in those flushes is expected to total P / c, so P·(1 − c)/c
 * is still to come. The bounds put the profile's prediction bounds for one block's
 * cumulative share into the same formula (a larger share means less to come), so they
 * cover block-to-block variation, not only the uncertainty of the co-op mean.
 * A block already past the profile's last flush is expected to give nothing more.
 */
export function forecastRemaining(block: { flushesSoFar: { flush: number; freshG: number }[] }, profile: FlushProfile): RemainingYield {
  if (profile.length === 0) {
    throw new StatsInputError("empty_group", "The flush profile is empty; build it with flushProfile from finished blocks.");
  }
  if (block.flushesSoFar.length === 0) {
    throw new StatsInputError("empty_group", "The block has no flushes recorded yet; forecast after its first flush is weighed.");
  }
  let picked = 0;
  let lastSeen = 0;
  block.flushesSoFar.forEach((f, i) => {
    if (!Number.isInteger(f.flush) || f.flush < 1) {
      throw new StatsInputError("invalid_argument", `Flush ${i + 1} has number ${f.flush}; flushes are numbered 1, 2, 3 …`);
    }
    requireMass(f.freshG, `Flush ${f.flush} fresh mass`);
    picked += f.freshG;
    lastSeen = Math.max(lastSeen, f.flush);
  });
  if (picked === 0) {
    throw new StatsInputError(
      "not_estimable",
      "The block has given 0 g so far, so there is nothing to scale by the flush profile; forecast after it has fruited.",
    );
  }
  if (lastSeen >= profile.length) return { expectedRemainingG: 0, lower: 0, upper: 0 };

  const through = profile[lastSeen - 1];
  const toCome = (share: number) => (picked * (1 - share)) / share;
  if (!(through.cumulativeShare > 0) || !(through.cumulativeLower > 0)) {
    throw new StatsInputError(
      "not_estimable",
      `Finished blocks vary too much in what flushes 1–${lastSeen} give to bound the rest; pool more finished blocks or wait for the next flush.`,
    );
  }
  return {
    expectedRemainingG: toCome(through.cumulativeShare),
    lower: toCome(through.cumulativeUpper),
    upper: toCome(through.cumulativeLower),
  };
}
