import { anovaTerm, leastSquaresMean, tukeyPairs, type AnovaTerm, type PairwiseComparison } from "./blocked-anova";
import { isRoundingNoiseAt } from "./describe";
import { studentTQuantile } from "./distributions";
import { StatsInputError, requireFinite, requireLevel } from "./errors";
import {
  cellTableFromRows,
  fitWithinBlocks,
  indicatorCoding,
  indicatorRow,
  levelsOnlyResidual,
  type CellTable,
  type WithinBlockFit,
} from "./within-block-fit";

export type FactorialObservation = {
  /** Level of the first factor, e.g. the strain. */
  a: string;
  /** Level of the second factor, e.g. the fruiting method. */
  b: string;
  /** The blocking factor: for the co-op, the farm. */
  block: string;
  /** The outcome, e.g. a block's biological efficiency in percent. */
  y: number;
};

/** Least-squares mean of one a × b combination, averaged over blocks with equal weight, with its t interval. */
export type CellMean = { a: string; b: string; estimate: number; lower: number; upper: number };

export type FactorialAnova = {
  /** First factor, adjusted for the second and the blocks (type II). */
  a: AnovaTerm;
  /** Second factor, adjusted for the first and the blocks (type II). */
  b: AnovaTerm;
  /** a × b, adjusted for both main effects and the blocks. */
  interaction: AnovaTerm;
  /** Blocks, adjusted for a, b and a × b. */
  block: AnovaTerm;
  residual: { df: number; ss: number; ms: number };
  /** Every a × b combination, a's levels outer, b's inner, each in first-seen order. */
  cellMeans: CellMean[];
  /**
   * a's levels compared, each averaged over b's levels with equal weight (emmeans(fit, "a")),
   * Tukey over a's levels. Names are a's levels.
   */
  aComparisons: PairwiseComparison[];
  /** b's levels compared, averaged over a's levels (emmeans(fit, "b")), Tukey over b's levels. */
  bComparisons: PairwiseComparison[];
  /** Simple effects: a's levels compared within each level of b (emmeans(fit, ~ a | b)), Tukey within each. */
  aWithinB: { b: string; comparisons: PairwiseComparison[] }[];
  /** b's levels compared within each level of a (emmeans(fit, ~ b | a)), Tukey within each. */
  bWithinA: { a: string; comparisons: PairwiseComparison[] }[];
};

/**
 * Two crossed factors with blocks, y = μ + a + b + a×b + block + error, fitted by least squares
 * (right for unequal numbers per cell and for blocks that lack some combinations). Sums of squares
 * are type II, as R's car::Anova(type = 2) and statsmodels' anova_lm(typ = 2): each term adjusted
 * for every term that does not contain it. Comparisons are of least-squares means of the full model
 * with Tukey's adjustment, as emmeans. Every combination of a and b must occur somewhere; all
 * results are in the outcome's unit (e.g. BE percent, or BE points for differences).
 */
export function factorialAnova(observations: FactorialObservation[], level = 0.95): FactorialAnova {
  requireLevel(level);
  const aIndex = new Map<string, number>();
  const bIndex = new Map<string, number>();
  const blockIndex = new Map<string, number>();
  const rows = observations.length;
  const aOf = new Int32Array(rows);
  const bOf = new Int32Array(rows);
  const blockOf = new Int32Array(rows);
  const y = new Float64Array(rows);
  observations.forEach((o, i) => {
    requireFinite(o.y, `Observation ${i + 1} (${o.a} × ${o.b}, block "${o.block}")`);
    aOf[i] = indexOf(aIndex, o.a);
    bOf[i] = indexOf(bIndex, o.b);
    blockOf[i] = indexOf(blockIndex, o.block);
    y[i] = o.y;
  });
  const aLevels = aIndex.size;
  const bLevels = bIndex.size;
  const blocks = blockIndex.size;
  if (aLevels < 2 || bLevels < 2) {
    throw new StatsInputError(
      "too_few_values",
      `A factorial analysis needs two or more levels of each factor; got ${aLevels} and ${bLevels}.`,
    );
  }
  if (blocks < 2) {
    throw new StatsInputError("too_few_values", "Only one block (farm) is present; a factorial trial across farms needs two or more.");
  }
  const combinations = aLevels * bLevels;
  const combination = new Int32Array(rows);
  for (let i = 0; i < rows; i++) combination[i] = aOf[i] * bLevels + bOf[i];
  const table = cellTableFromRows(combinations, blocks, combination, blockOf, y);
  const aNames = [...aIndex.keys()];
  const bNames = [...bIndex.keys()];
  requireEveryCombination(table, aNames, bNames);

  const dfResidual = rows - combinations - blocks + 1;
  if (dfResidual < 1) {
    throw new StatsInputError(
      "too_few_values",
      "There are too few observations to estimate the error after fitting both factors, their interaction and blocks; add repeat blocks.",
    );
  }
  const full = fitOrExplain(table, indicatorCoding(combinations), combinations - 1);
  if (isRoundingNoiseAt(full.rss, rows, table.largest)) {
    throw new StatsInputError(
      "no_variation",
      "The model fits every value exactly, so there is no error left to test against; check for duplicated rows.",
    );
  }
  const mainEffects = fitOrExplain(table, mainEffectCoding(aLevels, bLevels, true, true), aLevels + bLevels - 2);
  const aOnly = fitOrExplain(table, mainEffectCoding(aLevels, bLevels, true, false), aLevels - 1);
  const bOnly = fitOrExplain(table, mainEffectCoding(aLevels, bLevels, false, true), bLevels - 1);
  const msResidual = full.rss / dfResidual;

  const tCritical = studentTQuantile((1 + level) / 2, dfResidual);
  const cellMeans: CellMean[] = [];
  for (let i = 0; i < aLevels; i++) {
    for (let j = 0; j < bLevels; j++) {
      const { estimate, variance } = leastSquaresMean(full, indicatorRow(combinations, i * bLevels + j));
      const half = tCritical * Math.sqrt(msResidual * variance);
      cellMeans.push({ a: aNames[i], b: bNames[j], estimate, lower: estimate - half, upper: estimate + half });
    }
  }

  // Contrasts of combinations' least-squares means, written on the full model's coded rows.
  const row = (i: number, j: number) => indicatorRow(combinations, i * bLevels + j);
  const pairs = (levels: number, contrast: (first: number, second: number) => Float64Array) => {
    const list: { a: number; b: number; w: Float64Array }[] = [];
    for (let first = 0; first < levels; first++) {
      for (let second = first + 1; second < levels; second++) list.push({ a: first, b: second, w: contrast(first, second) });
    }
    return list;
  };
  const named = (names: string[], found: ReturnType<typeof tukeyPairs<{ a: number; b: number; w: Float64Array }>>) =>
    found.map((pair) => ({ a: names[pair.a], b: names[pair.b], ...pair.figures }));
  const compare = (names: string[], contrasts: { a: number; b: number; w: Float64Array }[]) =>
    named(names, tukeyPairs(full, contrasts, msResidual, dfResidual, names.length, level));

  const averagedOverB = (first: number, second: number) => {
    const w = new Float64Array(combinations - 1);
    for (let j = 0; j < bLevels; j++) addScaled(w, row(first, j), row(second, j), 1 / bLevels);
    return w;
  };
  const averagedOverA = (first: number, second: number) => {
    const w = new Float64Array(combinations - 1);
    for (let i = 0; i < aLevels; i++) addScaled(w, row(i, first), row(i, second), 1 / aLevels);
    return w;
  };

  return {
    a: anovaTerm(bOnly.rss - mainEffects.rss, aLevels - 1, msResidual, dfResidual),
    b: anovaTerm(aOnly.rss - mainEffects.rss, bLevels - 1, msResidual, dfResidual),
    interaction: anovaTerm(mainEffects.rss - full.rss, (aLevels - 1) * (bLevels - 1), msResidual, dfResidual),
    block: anovaTerm(levelsOnlyResidual(table) - full.rss, blocks - 1, msResidual, dfResidual),
    residual: { df: dfResidual, ss: full.rss, ms: msResidual },
    cellMeans,
    aComparisons: compare(aNames, pairs(aLevels, averagedOverB)),
    bComparisons: compare(bNames, pairs(bLevels, averagedOverA)),
    aWithinB: bNames.map((name, j) => ({
      b: name,
      comparisons: compare(
        aNames,
        pairs(aLevels, (first, second) => difference(row(first, j), row(second, j))),
      ),
    })),
    bWithinA: aNames.map((name, i) => ({
      a: name,
      comparisons: compare(
        bNames,
        pairs(bLevels, (first, second) => difference(row(i, first), row(i, second))),
      ),
    })),
  };
}

function indexOf(index: Map<string, number>, key: string): number {
  let value = index.get(key);
  if (value === undefined) index.set(key, (value = index.size));
  return value;
}

function requireEveryCombination(table: CellTable, aNames: string[], bNames: string[]): void {
  const seen = new Uint8Array(table.levels);
  for (let c = 0; c < table.level.length; c++) seen[table.level[c]] = 1;
  for (let k = 0; k < seen.length; k++) {
    if (seen[k]) continue;
    const a = aNames[Math.floor(k / bNames.length)];
    const b = bNames[k % bNames.length];
    throw new StatsInputError(
      "not_estimable",
      `No block has ${a} with ${b}, so the interaction cannot be estimated; a factorial trial needs every combination on at least one farm.`,
    );
  }
}

function fitOrExplain(table: CellTable, coding: Float64Array, size: number): WithinBlockFit {
  try {
    return fitWithinBlocks(table, coding, size);
  } catch (error) {
    if (error instanceof StatsInputError && error.code === "not_estimable") {
      throw new StatsInputError(
        "not_estimable",
        "Some combinations of the two factors never share a block (farm) with the others, so they cannot be compared with blocks taken into account; make sure each farm runs several combinations and the farms' combinations overlap.",
      );
    }
    throw error;
  }
}

/** Main-effect dummy columns (last level of each factor as baseline) for each a × b combination, a outer. */
function mainEffectCoding(aLevels: number, bLevels: number, withA: boolean, withB: boolean): Float64Array {
  const size = (withA ? aLevels - 1 : 0) + (withB ? bLevels - 1 : 0);
  const coding = new Float64Array(aLevels * bLevels * size);
  for (let i = 0; i < aLevels; i++) {
    for (let j = 0; j < bLevels; j++) {
      const at = (i * bLevels + j) * size;
      if (withA && i < aLevels - 1) coding[at + i] = 1;
      if (withB && j < bLevels - 1) coding[at + (withA ? aLevels - 1 : 0) + j] = 1;
    }
  }
  return coding;
}

function difference(x: Float64Array, y: Float64Array): Float64Array {
  const out = new Float64Array(x.length);
  for (let k = 0; k < x.length; k++) out[k] = x[k] - y[k];
  return out;
}

function addScaled(into: Float64Array, x: Float64Array, y: Float64Array, scale: number): void {
  for (let k = 0; k < into.length; k++) into[k] += scale * (x[k] - y[k]);
}
