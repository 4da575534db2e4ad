export { StatsInputError, type StatsInputErrorCode } from "./errors";
export { describe, type Description } from "./describe";
export { meanCI, meanCIFromSummary, welchTest, type MeanInterval, type WelchResult } from "./intervals";
export { oneWayAnova, type OneWayAnova } from "./anova";
export {
  blockedAnova,
  blockedAnovaFromCells,
  type AdjustedMean,
  type AnovaTerm,
  type BlockedAnova,
  type BlockedAnovaCell,
  type BlockedAnovaObservation,
  type PairwiseComparison,
} from "./blocked-anova";
export { factorialAnova, type CellMean, type FactorialAnova, type FactorialObservation } from "./factorial-anova";
export { tukeyFromGroupSummaries, tukeyHsd, type GroupSummary, type TukeyComparison } from "./tukey";
export { holm } from "./holm";
export { wilsonInterval, type ProportionInterval } from "./wilson";
export { metaAnalysis, type MetaAnalysis, type PooledEstimate } from "./meta-analysis";
export {
  sampleSizeTwoMeans,
  sampleSizePairwiseBlocked,
  powerTwoMeans,
  powerPairwiseBlocked,
  powerCrossedBlocked,
  sampleSizeCrossedBlocked,
  type CrossedDesign,
  type PairwiseDesign,
  type SampleSize,
} from "./sample-size";
export {
  designEffect,
  intraclassCorrelation,
  roomMeanAnalysis,
  roomsPerArm,
  type IntraclassCorrelation,
  type RoomBlock,
  type RoomMeanAnalysis,
  type RoomObservation,
  type RoomSampleSize,
} from "./room-trials";
export { biologicalEfficiency, dryMass, massLoss } from "./efficiency";
export {
  flushProfile,
  forecastRemaining,
  type FlushProfile,
  type FlushRecord,
  type FlushShare,
  type RemainingYield,
} from "./flush-profile";
