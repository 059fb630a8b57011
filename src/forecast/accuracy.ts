/**
 * Accuracy of a forecast against what happened, in the terms the track record reports.
 *
 *   annual cost error  = 100 · (Σ forecast − Σ actual) / Σ actual          (positive = forecast too high)
 *   monthly CV(RMSE)   = 100 · sqrt( Σ (actual − forecast)² / n ) / mean(actual)
 *   coverage           = share of months with P10 ≤ actual ≤ P90
 *
 * CV(RMSE) divides by n, not n − p as ASHRAE Guideline 14 does for a fitted model: a forecast
 * has no parameters fitted to the months it is judged on: it is src/model/stats.ts's
 * `cvRmsePct` with p = 0 ({@link forecastCvRmsePct}).
 */
import { ForecastInputError } from "./errors.ts";
import { cvRmsePct } from "../model/index.ts";

/**
 * CV(RMSE) in percent over paired months, divisor n (no parameters fitted to these months).
 * @throws ForecastInputError on empty or unequal inputs or a non-positive mean.
 * @example forecastCvRmsePct([100, 200], [110, 190]) // 100 · sqrt((100 + 100)/2) / 150 = 6.667
 */
export function forecastCvRmsePct(actual: readonly number[], forecast: readonly number[]): number {
  if (actual.length === 0 || actual.length !== forecast.length) throw new ForecastInputError("CV(RMSE) needs equally many actual and forecast months, at least one");
  if (!(actual.reduce((a, b) => a + b, 0) > 0)) throw new ForecastInputError("mean actual must be positive");
  return cvRmsePct(actual, forecast, 0);
}

/**
 * Annual error in percent. @throws ForecastInputError when the actual total is not positive.
 * @example annualErrorPct(110, 100) // 10
 */
export function annualErrorPct(forecastTotal: number, actualTotal: number): number {
  if (!(actualTotal > 0)) throw new ForecastInputError(`actual total must be positive, got ${actualTotal}`);
  return (100 * (forecastTotal - actualTotal)) / actualTotal;
}

/**
 * Share (0–1) of months whose actual lies inside [p10, p90], bounds included.
 * @example coverageShare([5, 9, 20], [{ p10: 4, p90: 6 }, { p10: 1, p90: 8 }, { p10: 10, p90: 20 }]) // 2/3
 */
export function coverageShare(actual: readonly number[], bands: readonly { p10: number; p90: number }[]): number {
  if (actual.length === 0 || actual.length !== bands.length) throw new ForecastInputError("coverage needs equally many actual months and bands, at least one");
  let inside = 0;
  actual.forEach((a, i) => {
    if (a >= bands[i]!.p10 && a <= bands[i]!.p90) inside++;
  });
  return inside / actual.length;
}
