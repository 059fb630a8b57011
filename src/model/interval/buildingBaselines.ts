/**
 * Hourly baselines for every interval meter of a building (src/model/interval: TOWT regression,
 * gradient-boosted trees, time-series cross-validation, generalized-weighted-mean ensembles),
 * trained on the cleaned view: intervals flagged by the data-quality stage are left out.
 */
import type { Building, Portfolio } from "../../domain/types.ts";
import { fitIntervalBaseline, hourlyFrame, type IntervalBaseline, type IntervalBaselineOptions } from "./index.ts";
import type { PoolMember } from "./pooled.ts";
import { expectedProblem } from "../../core/errors.ts";

/** Below this many weeks of data a meter borrows strength from similar meters (the pooled model). */
export const SHORT_HISTORY_WEEKS = 8;
const WEEK_MS = 7 * 24 * 3_600_000;

/**
 * Settings used in a build: three 4-week folds and no log1p variant keep a meter-year to a few
 * seconds (the full search is available to callers of fitIntervalBaseline).
 */
const BUILD_INTERVAL_OPTIONS: IntervalBaselineOptions = { cv: { folds: 3 }, tryLog1p: false };

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
      const spanWeeks = (series.startMs[series.startMs.length - 1]! - series.startMs[0]!) / WEEK_MS;
      const pool = spanWeeks < SHORT_HISTORY_WEEKS ? poolFor(portfolio, meter.meterId, building, masks) : undefined;
      const baseline = fitIntervalBaseline({
        meterId: meter.meterId,
        series,
        mask: masks.get(meter.meterId) ?? null,
        weather,
        zone: building.timezone,
        floorAreaM2: building.floorAreaM2,
        options: { ...BUILD_INTERVAL_OPTIONS, frame: { multiplier: meter.multiplier }, pool, minHistoryWeeks: SHORT_HISTORY_WEEKS },
      });
      out.push({ meterId: meter.meterId, baseline, problem: null });
    } catch (error) {
      out.push({ meterId: meter.meterId, baseline: null, problem: expectedProblem(error) });
    }
  }
  return out;
}

/**
 * Hourly tables of the portfolio's other electricity interval meters for a short-history meter:
 * buildings of the same use type when there are any (similar schedules), else every other one.
 */
function poolFor(portfolio: Portfolio, meterId: string, building: Building, masks: ReadonlyMap<string, Uint8Array>): PoolMember[] {
  const buildings = new Map(portfolio.buildings.map((b) => [b.buildingId, b]));
  const candidates = portfolio.meters.filter((m) => m.meterId !== meterId && m.commodity === "electricity" && portfolio.intervals.has(m.meterId));
  const sameUse = candidates.filter((m) => building.useType !== null && buildings.get(m.buildingId)?.useType === building.useType);
  const chosen = sameUse.length > 0 ? sameUse : candidates;
  const pool: PoolMember[] = [];
  for (const m of chosen) {
    const b = buildings.get(m.buildingId);
    const weather = b ? portfolio.weather.get(b.weatherStation) : undefined;
    if (!b || !weather) continue;
    try {
      pool.push({ meterId: m.meterId, frame: hourlyFrame(portfolio.intervals.get(m.meterId)!, masks.get(m.meterId) ?? null, weather, b.timezone, { multiplier: m.multiplier }) });
    } catch (error) {
      expectedProblem(error); // a meter whose table cannot be built simply does not join the pool
    }
  }
  return pool;
}
