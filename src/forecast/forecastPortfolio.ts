/**
 * The whole portfolio's forecast as of a date: every meter's forecast, the CSV rows, each
 * building's cost range and the drivers of its change vs last year. Pure: the portfolio and
 * the as-of date come in, plain data goes out.
 */
import type { Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { forecastMeter, type MeterForecast } from "./forecastMeter.ts";
import { buildingForecastInputs, type ForecastRunOptions } from "./portfolioInputs.ts";
import { buildingCostBand, buildingMonthlyCostBands, forecastRows, type ForecastRow } from "./rollup.ts";
import { buildingChangeDrivers, type BuildingDrivers } from "./drivers.ts";
import { bandOf, type Band } from "./quantiles.ts";
import type { WeatherBasisId } from "./weatherBasis.ts";
import type { MonthAdjustment } from "./residual.ts";
import { scenarioYears } from "./weatherYears.ts";
import { noMemo } from "../core/memo.ts";
import { garbageBudget } from "../core/collectGarbage.ts";
import { contentHash } from "../core/contentHash.ts";
import { scenarioTotals } from "./scenarioMatrix.ts";

export interface BuildingForecast {
  buildingId: string;
  meters: MeterForecast[];
  /** Next-12-month cost range (scenario sums across the building's meters); null when nothing was priced. */
  costNext12m: Band | null;
  /** Building cost range per forecast month (scenario sums per month). */
  monthly: { month: string; cost: Band }[];
  drivers: BuildingDrivers;
}

export interface PortfolioForecast {
  asOf: string;
  calibration: number;
  /** Weather basis of the typical year (null: each baseline's own, normals or history average). */
  basis: WeatherBasisId | null;
  /** Calendar-month adjustment used (residual.ts). */
  adjustment: MonthAdjustment;
  buildings: BuildingForecast[];
  rows: ForecastRow[];
  /**
   * Portfolio next-12-month range: scenario s summed over every priced meter. Scenario s is the
   * same calendar weather year for every meter on every station that has it (scenarioYearOrder).
   */
  costNext12m: Band | null;
}

/**
 * Forecasts every meter of every building.
 * @example forecastPortfolio(portfolio, { asOf: "2025-12-31", months: 12, calibration: 3 }).rows // forecast.csv rows
 */
export function forecastPortfolio(portfolio: Portfolio<Tariff>, options: ForecastRunOptions): PortfolioForecast {
  const memo = options.memo ?? noMemo;
  const inputsByBuilding = portfolio.buildings.map((building) => buildingForecastInputs(portfolio, building, options));
  // One calendar year per scenario for the whole portfolio, so totals keep the weather's correlation across stations.
  const scenarioYearOrder = [...new Set(inputsByBuilding.flat().flatMap((i) => scenarioYears(i.weatherYears).map((y) => y.year)))].sort((a, b) => a - b);
  const budget = garbageBudget();
  const buildings = portfolio.buildings.map((building, b) => {
    budget.check();
    const inputs = inputsByBuilding[b]!.map((i) => ({ ...i, scenarioYearOrder }));
    // Each input hashed once for the memo (not at all without one).
    const keys = inputs.map((input) => (memo === noMemo ? "" : contentHash(input)));
    const meters = inputs.map((input, i) => memo("forecast-meter", { input: keys[i] }, () => forecastMeter(input)));
    return {
      buildingId: building.buildingId,
      meters,
      costNext12m: buildingCostBand(meters, 12),
      monthly: buildingMonthlyCostBands(meters),
      drivers: buildingChangeDrivers(building.buildingId, inputs, meters, (i, compute) => memo("meter-drivers", { input: keys[i], forecast: meters[i] }, compute)),
    };
  });
  const all = buildings.flatMap((b) => b.meters);
  return {
    asOf: options.asOf,
    calibration: options.calibration ?? 1,
    basis: options.basis ?? null,
    adjustment: options.adjustment ?? "none",
    buildings,
    rows: forecastRows(all),
    costNext12m: portfolioBand(all),
  };
}

function portfolioBand(meters: readonly MeterForecast[]): Band | null {
  const priced = meters.filter((m) => m.error === null && m.scenarioCosts.scenarios > 0);
  if (priced.length === 0) return null;
  const n = Math.min(...priced.map((m) => m.scenarioCosts.scenarios));
  const sums = new Float64Array(n);
  for (const m of priced) {
    const totals = scenarioTotals(m.scenarioCosts, 12);
    for (let s = 0; s < n; s++) sums[s] += totals[s]!;
  }
  return bandOf(sums);
}
