/**
 * One call for the build: calibrate the noise on the backtest year, report the track record
 * at the chosen factor, and forecast the next months with it.
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
  /**
   * Track record with the chosen factor. Its coverage is in-sample (the factor was chosen on the
   * same months); the coverage with the model's own interval (factor 1) is in
   * `calibration.coverageByFactor`.
   */
  trackRecord: TrackRecord;
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
  const record = trackRecord(portfolio, { ...trOptions, calibration: calibration.factor }, inputs);
  const forecast = forecastPortfolio(portfolio, { ...options, calibration: calibration.factor });
  return { forecast, calibration, trackRecord: record };
}
