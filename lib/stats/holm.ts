import { StatsInputError } from "./errors";

/**
 * Holm's step-down adjustment of p-values, returned in the input order (as R's
 * p.adjust(p, "holm")): sort ascending, multiply the i-th smallest by (n − i + 1),
 * carry the running maximum so the order is kept, cap at 1.
 */
export function holm(p: number[]): number[] {
  p.forEach((value, i) => {
    if (!(value >= 0 && value <= 1)) {
      throw new StatsInputError(
        "invalid_argument",
        `p-value ${value} at position ${i + 1} is not between 0 and 1; pass the raw p-values of the tests.`,
      );
    }
  });
  const n = p.length;
  const order = p.map((_, i) => i).sort((i, j) => p[i] - p[j]);
  const adjusted = new Array<number>(n);
  let runningMax = 0;
  order.forEach((index, rank) => {
    runningMax = Math.max(runningMax, Math.min(1, (n - rank) * p[index]));
    adjusted[index] = runningMax;
  });
  return adjusted;
}
