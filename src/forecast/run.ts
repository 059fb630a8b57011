/**
 * One call for the build: calibrate the noise on the backtest year, report the track record
 * (uncalibrated and calibrated), and forecast the next months with the chosen factor.
 */
import type { Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/model.ts";
import type { MeterBaseline } from "../pipeline/baselines.ts";
import { calibrateNoise, type CalibrationResult } from "./calibrate.ts";
import { forecastPortfolio, type PortfolioForecast } from "./forecastPortfolio.ts";
import { backtestInputs, trackRecord, type TrackRecord } from "./trackRecord.ts";

export interface ForecastBundle {
  forecast: PortfolioForecast;
  calibration: CalibrationResult;
  /** Track record with the chosen factor (its coverage is in-sample: the factor was chosen on it). */
  trackRecord: TrackRecord;
  /** Track record with factor 1 (the model's own interval): the out-of-sample coverage. */
  trackRecordUncalibrated: TrackRecord;
}

/**
 * Backtest, calibration and forecast.
 * @param options.asOf last day of data; options.months the horizon (forecast_months)
 * @example const { forecast, trackRecord } = forecastWithTrackRecord(portfolio, { asOf: "2025-12-31", months: 12 })
 */
export function forecastWithTrackRecord(
  portfolio: Portfolio<Tariff>,
  options: { asOf: string; months: number; scenarios?: number; seed?: number; baselines?: ReadonlyMap<string, Pick<MeterBaseline, "fit" | "typicalMonthlyTemp">> },
): ForecastBundle {
  const trOptions = { asOf: options.asOf, months: 12, scenarios: options.scenarios, seed: options.seed };
  const inputs = backtestInputs(portfolio, trOptions);
  const billsByMeter = new Map<string, typeof portfolio.bills>();
  for (const b of portfolio.bills) billsByMeter.set(b.meterId, [...(billsByMeter.get(b.meterId) ?? []), b]);
  const calibration = calibrateNoise(inputs, billsByMeter, options.asOf);
  const trackRecordUncalibrated = trackRecord(portfolio, { ...trOptions, calibration: 1 }, inputs);
  const calibrated = calibration.factor === 1 ? trackRecordUncalibrated : trackRecord(portfolio, { ...trOptions, calibration: calibration.factor }, inputs);
  const forecast = forecastPortfolio(portfolio, { ...options, calibration: calibration.factor });
  return { forecast, calibration, trackRecord: calibrated, trackRecordUncalibrated };
}
