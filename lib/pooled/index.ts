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
export {
  addBins,
  binQuantile,
  binsOf,
  blocksBeyondPercentile,
  percentileOf,
  publishablePercentile,
  publishableSpread,
  type EfficiencyBins,
  type Spread,
} from "./bins";
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
export { publishedSteps, roundPooledResults, roundTo } from "./rounding";
export {
  addTrialArms,
  planRelease,
  releaseFigureKinds,
  releaseFigureLabels,
  type HeldBackFigure,
  type ReleaseContents,
  type ReleaseFigureKind,
  type ReleaseFlushRow,
  type ReleasePlan,
  type ReleaseStrainRow,
} from "./releases";
export {
  describeReleaseSchedule,
  latestReleaseSlot,
  nextReleaseSlot,
  releaseScheduleLabels,
  releaseSchedules,
  type ReleaseSchedule,
} from "./release-schedule";
export { withinFarmSpread } from "./within-farm";
export { summariseOwnFarm, type OwnBlock, type OwnStrainSummary } from "./my-farm";
export { ownBlocksForChart, type OwnStrainBlocks } from "./own-blocks";
export { cooperativeSettingsSchema, lowestMinimumFarms, type CooperativeSettingsInput } from "./settings-schema";
export { resultsInBrief } from "./in-brief";
export { strainTableRow, type StrainTableRow } from "./strain-row";
export { ownLeftOutNotes, type OwnLeftOutCounts, type OwnLeftOutNote } from "./own-left-out";
