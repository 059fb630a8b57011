/** Interval (hourly) baseline models: features, TOWT, gradient-boosted trees, CV, ensembles, pooling. */
export { fitIntervalBaseline } from "./fitIntervalBaseline.ts";
export type {
  IntervalBaseline,
  IntervalBaselineInput,
  IntervalBaselineOptions,
  IntervalBaselineSummary,
  ModelReport,
  ChosenModel,
  HourlyPrediction,
  StatsBlock,
  FoldStatsBlock,
} from "./fitIntervalBaseline.ts";
export { hourlyFrame, selectFrameRows } from "./hourlyFrame.ts";
export type { HourlyFrameOptions } from "./hourlyFrame.ts";
export { hourlyFeaturesAt, hourGrid, selectFeatureRows, DEFAULT_FEATURE_OPTIONS } from "./hourlyFeatures.ts";
export type { HourlyFeatureOptions, FeatureTable } from "./hourlyFeatures.ts";
export { fitTowt, towtSpec, selectKnots, occupancyFromResiduals, DEFAULT_TOWT_KNOTS_C } from "./towt.ts";
export type { TowtModel, TowtOptions, TowtData } from "./towt.ts";
export { fitTowtMonthly, towtMonthlySpec, segmentWeight } from "./towtMonthly.ts";
export type { TowtMonthlyModel, TowtMonthlyOptions } from "./towtMonthly.ts";
export { fitGbdt } from "./gbdt.ts";
export type { GbdtModel, GbdtOptions, GbdtTree } from "./gbdt.ts";
export { gbdtSpec, gbdtFeatureColumns, spreadHoldoutOrder, GBDT_FEATURE_NAMES } from "./gbdtHourly.ts";
export type { GbdtHourlyOptions, GbdtHourlyModel } from "./gbdtHourly.ts";
export { withLog1pTarget, withPerAreaTarget } from "./targetTransform.ts";
export { crossValidate, timeSeriesFolds } from "./timeSeriesCv.ts";
export type { CvResult, FoldResult, FoldDefinition, TimeSeriesCvOptions } from "./timeSeriesCv.ts";
export { generalizedWeightedMean } from "./generalizedMean.ts";
export { searchEnsemble, combinePredictions, simplexGrid } from "./ensemble.ts";
export type { EnsembleChoice, EnsembleSearchOptions } from "./ensemble.ts";
export { pooledGbdtSpec } from "./pooled.ts";
export type { PoolMember, PooledModel } from "./pooled.ts";
export { residualBand, quantileSorted } from "./residualBand.ts";
export type { ResidualBand } from "./residualBand.ts";
export type { HourlyFeatures, HourlyFrame, HourlyAccounting, HourlyExclusions, FittedHourlyModel, HourlyModelSpec } from "./types.ts";
