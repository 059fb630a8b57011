/**
 * Rows of OUT/data/forecast.csv and the per-building next-12-month cost range.
 *
 * The building range is taken over scenario sums: scenario s of every meter of the building is
 * added before quantiles are taken. Scenario s uses the same calendar weather year for every
 * meter of the portfolio (forecastPortfolio.ts), so a cold year is cold for the gas and the
 * electricity meter alike and for every building (the prediction noise is drawn per meter,
 * independently).
 */
import type { MeterForecast } from "./forecastMeter.ts";
import { bandOf, type Band } from "./quantiles.ts";
import { valueAt } from "./scenarioMatrix.ts";

export interface ForecastRow {
  building_id: string;
  meter_id: string;
  /** `YYYY-MM`. */
  month: string;
  usage_p50: number;
  cost_p10: number;
  cost_p50: number;
  cost_p90: number;
}

/** One row per meter and forecast month, usage in the meter's unit, cost rounded to cents; meters without a priced forecast are left out. */
export function forecastRows(forecasts: readonly MeterForecast[]): ForecastRow[] {
  const rows: ForecastRow[] = [];
  for (const f of forecasts) {
    if (f.error !== null) continue;
    for (const m of f.months) {
      rows.push({
        building_id: f.buildingId,
        meter_id: f.meterId,
        month: m.month,
        usage_p50: round(m.usage.p50, 3),
        cost_p10: round(m.cost.p10, 2),
        cost_p50: round(m.cost.p50, 2),
        cost_p90: round(m.cost.p90, 2),
      });
    }
  }
  return rows;
}

/**
 * Next-`months` cost range of one building: quantiles of Σ over its priced meters of each
 * scenario's total (first `months` forecast months). Null when no meter was priced.
 * @throws nothing; meters with a different scenario count are summed over the common prefix.
 */
export function buildingCostBand(forecasts: readonly MeterForecast[], months = 12): Band | null {
  const priced = forecasts.filter((f) => f.error === null && f.scenarioCosts.scenarios > 0);
  if (priced.length === 0) return null;
  const n = Math.min(...priced.map((f) => f.scenarioCosts.scenarios));
  const sums = new Float64Array(n);
  for (const f of priced) {
    const costs = f.scenarioCosts;
    for (let s = 0; s < n; s++) {
      for (let k = 0; k < Math.min(months, costs.months); k++) sums[s] += valueAt(costs, s, k);
    }
  }
  return bandOf(sums);
}

/** Monthly cost range of one building (scenario sums per month), for the page's chart. */
export function buildingMonthlyCostBands(forecasts: readonly MeterForecast[]): { month: string; cost: Band }[] {
  const priced = forecasts.filter((f) => f.error === null && f.scenarioCosts.scenarios > 0);
  if (priced.length === 0) return [];
  const n = Math.min(...priced.map((f) => f.scenarioCosts.scenarios));
  return priced[0]!.months.map((m, k) => {
    const sums = new Float64Array(n);
    for (const f of priced) for (let s = 0; s < n; s++) sums[s] += k < f.scenarioCosts.months ? valueAt(f.scenarioCosts, s, k) : 0;
    return { month: m.month, cost: bandOf(sums) };
  });
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
