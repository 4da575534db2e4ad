export {
  flushWindows,
  flushWindowLabels,
  type FlushWindow,
  type FlushStatisticsRow,
  type PooledFilters,
  type StrainStatisticsRow,
} from "./types";
export { addSummaries, summaryMean, summaryVariance, type Summary } from "./sufficient";
export { blockedModelFromCells, type ModelCell } from "./cell-models";
export { addBins, binQuantile, percentileOf, type EfficiencyBins } from "./bins";
export { differencingMessage, filterIsSafe, suppressedMessage } from "./privacy";
export { pooledFlushProfile } from "./flush-profile";
export { comparisonSentence } from "./sentences";
export {
  buildPooledResults,
  type ForestRow,
  type HeterogeneityResult,
  type Interval,
  type PairwiseDifference,
  type PooledResults,
  type Published,
  type StrainResult,
} from "./results";
export { summariseOwnFarm, type OwnBlock, type OwnStrainSummary } from "./my-farm";
export { ownBlocksForChart, type OwnStrainBlocks } from "./own-blocks";
