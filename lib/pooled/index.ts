export {
  flushWindows,
  flushWindowLabels,
  type FlushWindow,
  type FlushStatisticsRow,
  type DryingStatisticsRow,
  type PooledFilters,
  type SeasonStatisticsRow,
  type RegimeStatisticsRow,
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
export { publishedSteps, roundPooledResults, roundRegimeComparison, roundTo } from "./rounding";
export { buildRegimeComparison, pooledRoomIcc, type RegimeComparison, type RegimeDifference, type RegimeResult } from "./regime-results";
export { matchingDay, regimeStatisticsRows, type RegimeBlock, type RegimeMove, type RoomRegime } from "./regimes";
export {
  addTrialArms,
  emptyReleaseContents,
  planRelease,
  releaseFigureKinds,
  releaseFigureLabels,
  type HeldBackFigure,
  type ReleaseContents,
  type ReleaseDryingRow,
  type ReleaseFigureKind,
  type ReleaseFlushRow,
  type ReleasePlan,
  type ReleaseSeasonRow,
  type ReleaseStrainRow,
} from "./releases";
export {
  seasonBySeason,
  seasonsAreSafe,
  seasonsWithheldMessage,
  seasonTableRow,
  type SeasonBreakdown,
  type SeasonEfficiency,
  type StrainSeasons,
} from "./seasons";
export {
  describeReleaseSchedule,
  latestReleaseSlot,
  nextReleaseSlot,
  releaseHourIn,
  releaseScheduleLabels,
  releaseSchedules,
  type ReleaseSchedule,
  type ReleaseTime,
} from "./release-schedule";
export { withinFarmSpread } from "./within-farm";
export { summariseOwnFarm, type OwnBlock, type OwnStrainSummary } from "./my-farm";
export { ownBlocksForChart, type OwnStrainBlocks } from "./own-blocks";
export { cooperativeSettingsSchema, lowestMinimumFarms, type CooperativeSettingsInput } from "./settings-schema";
export { resultsInBrief } from "./in-brief";
export { dryingPercent, strainTableRow, type StrainTableRow } from "./strain-row";
export { ownLeftOutNotes, type OwnLeftOutCounts, type OwnLeftOutNote } from "./own-left-out";
