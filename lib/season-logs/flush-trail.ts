import { biologicalEfficiency } from "../stats";

export interface FlushPoint {
  flush: number;
  harvestedOn: string | null;
  /** Days from inoculation to this harvest; null without either date. */
  day: number | null;
  freshG: number;
  /** Fresh mass picked up to and including this flush. */
  cumulativeFreshG: number;
  /** Biological efficiency (%) of the flushes so far; null without a wet mass and moisture. */
  cumulativeEfficiency: number | null;
  /** This flush's part of everything the block has given (0–1); null when nothing weighed anything. */
  share: number | null;
}

/**
 * A block's flushes in order with what it had given after each: the points of its chart over time
 * and of its share of yield by flush (the same share the co-op's flush profile averages).
 */
export function flushTrail(
  block: { wetMassG: number | null; moisture: number | null; inoculatedOn: string | null },
  harvests: readonly { flush: number; harvestedOn: string | null; freshMassG: number }[],
): FlushPoint[] {
  const ordered = [...harvests].sort((a, b) => a.flush - b.flush);
  const total = ordered.reduce((sum, harvest) => sum + harvest.freshMassG, 0);
  const { wetMassG, moisture } = block;
  const weighed = wetMassG !== null && wetMassG > 0 && moisture !== null && moisture < 1;
  let picked = 0;
  return ordered.map((harvest) => {
    picked += harvest.freshMassG;
    return {
      flush: harvest.flush,
      harvestedOn: harvest.harvestedOn,
      day: block.inoculatedOn && harvest.harvestedOn ? daysBetween(block.inoculatedOn, harvest.harvestedOn) : null,
      freshG: harvest.freshMassG,
      cumulativeFreshG: picked,
      cumulativeEfficiency: weighed ? biologicalEfficiency({ freshG: picked, wetBlockG: wetMassG, moisture }) : null,
      share: total > 0 ? harvest.freshMassG / total : null,
    };
  });
}

/** Whole days from one YYYY-MM-DD date to another, counted on the calendar (no time zone, no daylight saving). */
export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000);
}
