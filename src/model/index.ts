/** Modelling primitives: statistics, least squares, change-point models, degree-days. */
export { ModelInputError } from "./errors.ts";
export {
  compensatedSum,
  mean,
  sumSquaredErrors,
  cvRmsePct,
  nmbePct,
  rSquared,
  guideline14Stats,
  GUIDELINE14_LIMITS,
} from "./stats.ts";
export type { Guideline14Stats, Guideline14Resolution } from "./stats.ts";
export { studentTCdf, studentTQuantile, studentTTwoSidedP } from "./studentT.ts";
export { fitOls } from "./ols.ts";
export type { OlsFit, OlsOptions, IntervalPrediction } from "./ols.ts";
export {
  fitChangePoint,
  fitChangePointAt,
  selectChangePointModel,
  CHANGE_POINT_KINDS,
  CHANGE_POINT_PARAMETER_COUNT,
} from "./changePoint.ts";
export type {
  ChangePointKind,
  ChangePointPoint,
  ChangePointFit,
  ChangePointFitOptions,
  ChangePointSelection,
  ChangePointSelectionOptions,
  ChangePointCandidate,
  SlopeTerm,
} from "./changePoint.ts";
export {
  degreeDaysFromHourly,
  degreeDaysForPeriod,
  degreeDaysMeanMethod,
  heatingDegreeDaysUkMaxMin,
  coolingDegreeDaysUkMaxMin,
  degreeDaysCToF,
  degreeDaysFToC,
  DEGREE_DAY_BASES,
} from "./degreeDays.ts";
export type { DegreeDays, HourlyTemps, PeriodDegreeDays } from "./degreeDays.ts";

// Used by other folders (see test/architecture/layers.test.ts).
export { buildingDegreeDayBands, expectedUsageForStretch, fitBuildingBaselines, fitForecastBaseline, fitMeterBaseline, typicalMonthlyTempC } from "./billBaselines.ts";
export type { MeterBaseline, ModelSummary } from "./billBaselines.ts";
export { fitBuildingIntervalBaselines, SHORT_HISTORY_WEEKS } from "./interval/buildingBaselines.ts";
export type { IntervalBaselineOutcome } from "./interval/buildingBaselines.ts";
export type { IntervalBaselineSummary } from "./interval/index.ts";
export { meetsGuideline14 } from "./stats.ts";
