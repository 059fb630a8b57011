/**
 * Next year's cost: usage scenarios from the weather baselines and historical weather years,
 * each priced through the tariff, with P10/P50/P90, a track record and its calibration.
 * Pure computation: no file access, no clock (as-of and data are passed in).
 */
export { forecastMeter, DEFAULT_SCENARIOS, DEFAULT_SEED, type MeterForecastInput, type MeterForecast, type MonthForecast } from "./forecastMeter.ts";
export { forecastPortfolio, type PortfolioForecast, type BuildingForecast } from "./forecastPortfolio.ts";
export { analysedPricing, buildingForecastInputs, billsKnownAt, type AnalysedPricing, type ForecastRunOptions } from "./portfolioInputs.ts";
export { forecastRows, buildingCostBand, buildingMonthlyCostBands, type ForecastRow } from "./rollup.ts";
export { trackRecord, trackRecordFromBacktest, backtestInputs, backtestAsOf, compareWithActuals, actualMonthlyCost, naiveSameMonthLastYear, pooledAccuracy,
  type TrackRecord, type MeterTrackRecord, type AccuracySummary, type MonthComparison, type TrackRecordOptions } from "./trackRecord.ts";
export { rollingBacktest, rollingOrigins, monthsOfBills, accuracyOf, CALIBRATION_GRID, TARGET_COVERAGE, MIN_TRACK_RECORD_MONTHS, MIN_FIT_MONTHS,
  type RollingBacktest, type AdjustmentScore, type OriginSummary, type BasisScore, type Accuracy, type BacktestMeter } from "./backtest.ts";
export { weatherBasisCandidates, typicalForBasis, basisYears, WEATHER_BASES, WEATHER_BASIS_LABEL, type WeatherBasisId } from "./weatherBasis.ts";
export { correctBills, type CorrectedBillSet, type MoneyFindingLike } from "./correctedBills.ts";
export { buildingChangeDrivers, meterChangeDrivers, type BuildingDrivers, type MeterDrivers, type ChangeDrivers } from "./drivers.ts";
export { forecastWithTrackRecord, type ForecastBundle, type CalibrationResult } from "./run.ts";
export { annualErrorPct, forecastCvRmsePct, coverageShare } from "./accuracy.ts";
export { escalationFactorForDays, escalationFactorForMonth, escalationBase } from "./escalation.ts";
export { bandOf, type Band } from "./quantiles.ts";
export { scenarioMatrix, scenarioTotals, monthColumn, valueAt, fromRows, type ScenarioMatrix } from "./scenarioMatrix.ts";
export { weatherYears, scenarioTemperatures, type WeatherYear } from "./weatherYears.ts";
export { spreadBillsByMonth } from "./months.ts";
export { ForecastInputError } from "./errors.ts";
export { residualByCalendarMonth, MONTH_ADJUSTMENTS, MONTH_ADJUSTMENT_LABEL, type MonthAdjustment } from "./residual.ts";
