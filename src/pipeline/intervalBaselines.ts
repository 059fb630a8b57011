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

/** One meter's hourly baseline, or why there is none (a meter's failure never stops the building). */
export interface IntervalBaselineOutcome {
  meterId: string;
  baseline: IntervalBaseline | null;
  problem: string | null;
}

export function fitBuildingIntervalBaselines(
  portfolio: Portfolio,
  building: Building,
  masks: ReadonlyMap<string, Uint8Array>,
): IntervalBaselineOutcome[] {
  const weather = portfolio.weather.get(building.weatherStation);
  const out: IntervalBaselineOutcome[] = [];
  for (const meter of portfolio.meters) {
    if (meter.buildingId !== building.buildingId || meter.commodity !== "electricity") continue;
    const series = portfolio.intervals.get(meter.meterId);
    if (!series || series.startMs.length === 0) continue;
    if (!weather) {
      out.push({ meterId: meter.meterId, baseline: null, problem: `no weather for station ${building.weatherStation}` });
      continue;
    }
    try {
      const baseline = fitIntervalBaseline({
        meterId: meter.meterId,
        series,
        mask: masks.get(meter.meterId) ?? null,
        weather,
        zone: building.timezone,
        floorAreaM2: building.floorAreaM2,
        options: { ...BUILD_INTERVAL_OPTIONS, frame: { multiplier: meter.multiplier } },
      });
      out.push({ meterId: meter.meterId, baseline, problem: null });
    } catch (error) {
      out.push({ meterId: meter.meterId, baseline: null, problem: error instanceof Error ? error.message : String(error) });
    }
  }
  return out;
}
