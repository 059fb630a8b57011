/**
 * The portfolio's input rows and series hashed once per build (core/contentHash.ts hashedOnce):
 * every bill, printed bill line, tariff, weather series and normals file carries its content
 * hash, so the cache keys that contain them (each building's analysis, each meter's forecast at
 * every backtest origin, each building's pages) hash a digest instead of walking them again.
 * Nothing changes these values after reading (stages copy what they correct).
 */
import type { Portfolio } from "../domain/types.ts";
import { hashedOnce } from "../core/contentHash.ts";

/**
 * Records the content digest of every bill, bill line, tariff, weather series and normals of
 * `portfolio`, and returns it.
 * @example const portfolio = withInputDigests(screened)
 */
export function withInputDigests<P extends Pick<Portfolio<object>, "bills" | "billLines" | "tariffs" | "weather" | "normals">>(portfolio: P): P {
  for (const bill of portfolio.bills) hashedOnce(bill);
  for (const line of portfolio.billLines) hashedOnce(line);
  for (const tariff of portfolio.tariffs.values()) hashedOnce(tariff);
  for (const series of portfolio.weather.values()) hashedOnce(series);
  for (const normals of portfolio.normals.values()) hashedOnce(normals);
  return portfolio;
}
