/**
 * The whole portfolio's forecast as of a date: every meter's forecast, the CSV rows and each
 * building's cost range. Pure: the portfolio and the as-of date come in, plain data goes out.
 */
import type { Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/model.ts";
import { forecastMeter, type MeterForecast } from "./forecastMeter.ts";
import { buildingForecastInputs, type ForecastRunOptions } from "./portfolioInputs.ts";
import { buildingCostBand, buildingMonthlyCostBands, forecastRows, type ForecastRow } from "./rollup.ts";
import type { Band } from "./quantiles.ts";

export interface BuildingForecast {
  buildingId: string;
  meters: MeterForecast[];
  /** Next-12-month cost range (scenario sums across the building's meters); null when nothing was priced. */
  costNext12m: Band | null;
  monthly: { month: string; cost: Band }[];
}

export interface PortfolioForecast {
  asOf: string;
  calibration: number;
  buildings: BuildingForecast[];
  rows: ForecastRow[];
}

/**
 * Forecasts every meter of every building.
 * @example forecastPortfolio(portfolio, { asOf: "2025-12-31", months: 12 }).rows // forecast.csv rows
 */
export function forecastPortfolio(portfolio: Portfolio<Tariff>, options: ForecastRunOptions): PortfolioForecast {
  const buildings = portfolio.buildings.map((building) => {
    const meters = buildingForecastInputs(portfolio, building, options).map(forecastMeter);
    return { buildingId: building.buildingId, meters, costNext12m: buildingCostBand(meters, 12), monthly: buildingMonthlyCostBands(meters) };
  });
  return { asOf: options.asOf, calibration: options.calibration ?? 1, buildings, rows: forecastRows(buildings.flatMap((b) => b.meters)) };
}
