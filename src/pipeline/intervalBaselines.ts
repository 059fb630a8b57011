/**
 * Hourly baselines for every interval meter of a building (src/model/interval: TOWT regression,
 * gradient-boosted trees, time-series cross-validation, generalized-weighted-mean ensembles),
 * trained on the cleaned view: intervals flagged by the data-quality stage are left out.
 */
import type { Building, Portfolio } from "../domain/types.ts";
import { fitIntervalBaseline, type IntervalBaseline, type IntervalBaselineOptions } from "../model/interval/index.ts";

/**
 * Settings used in a build: three 4-week folds and no log1p variant keep a meter-year to a few
 * seconds (the full search is available to callers of fitIntervalBaseline).
 */
export const BUILD_INTERVAL_OPTIONS: IntervalBaselineOptions = { cv: { folds: 3 }, tryLog1p: false };

export function fitBuildingIntervalBaselines(
  portfolio: Portfolio,
  building: Building,
  masks: ReadonlyMap<string, Uint8Array>,
): IntervalBaseline[] {
  const weather = portfolio.weather.get(building.weatherStation);
  if (!weather) return [];
  const out: IntervalBaseline[] = [];
  for (const meter of portfolio.meters) {
    if (meter.buildingId !== building.buildingId || meter.commodity !== "electricity") continue;
    const series = portfolio.intervals.get(meter.meterId);
    if (!series || series.startMs.length === 0) continue;
    out.push(
      fitIntervalBaseline({
        meterId: meter.meterId,
        series,
        mask: masks.get(meter.meterId) ?? null,
        weather,
        zone: building.timezone,
        floorAreaM2: building.floorAreaM2,
        options: { ...BUILD_INTERVAL_OPTIONS, frame: { multiplier: meter.multiplier } },
      }),
    );
  }
  return out;
}
