/** The pages of every building: buildings.html (the buildings table) and forecast.html (next year's cost). */
import type { ReportInput } from "./input.ts";
import type { BuildingListPage, ForecastListPage } from "./siteModel.ts";
import type { BuildingsTable } from "./buildingsTable.ts";
import type { ForecastChangeTable } from "./forecastIndex.ts";
import { formatMoney } from "./format.ts";
import { BUILDING_LIST_PATH, FORECAST_LIST_PATH, navFor } from "./nav.ts";
import { buildingsText, forecastTotalsText, total } from "./indexLists.ts";
import { trackRecordVerdict } from "./forecastSection.ts";

/**
 * buildings.html: every building in the portfolio's order (buildings.csv), the same table the
 * index shows whole for a short portfolio, with the billed total over all of them.
 * @example buildBuildingListPage(input, buildingsTable(input, contexts, asOf)).path // "buildings.html"
 */
export function buildBuildingListPage(input: ReportInput, list: BuildingsTable): Omit<BuildingListPage, "canonical"> {
  const n = list.table.rows.length;
  const billed = total(list.lastYearCosts);
  const anyBilled = list.lastYearCosts.some((c) => c != null);
  return {
    title: "Buildings",
    root: "",
    path: BUILDING_LIST_PATH,
    nav: navFor("buildings", ""),
    lede: `All ${buildingsText(n)} of the portfolio, in its own order (buildings.csv)${anyBilled ? `, billed ${formatMoney(billed, input.portfolio.settings.currency)} together over the last 12 months` : ""}. Column headings sort the table when JavaScript is on.`,
    table: list.table,
  };
}

/**
 * forecast.html: next year's cost against last year of every building with forecast drivers,
 * largest increase first, with the totals over all of them and the portfolio's track record.
 * @example buildForecastListPage(input, forecastChangeTable(contexts, input.buildingForecasts, "USD")).path // "forecast.html"
 */
export function buildForecastListPage(input: ReportInput, list: ForecastChangeTable | null): Omit<ForecastListPage, "canonical"> {
  const currency = input.portfolio.settings.currency;
  return {
    title: "Next year's cost by building",
    root: "",
    path: FORECAST_LIST_PATH,
    nav: navFor("forecast", ""),
    lede: list
      ? "Each building's likely cost (P50) over the same calendar months as last year's bills, and what moves it: billing errors corrected, the weather (a typical year against last year's), rates (next year's tariffs and escalation on last year's use) and the usage trend (the rest). Forecasts are estimates; see each building's page for the monthly range and budget."
      : "No building has a forecast to compare with last year's bills in this build.",
    totals: list ? forecastTotalsText(list, currency) : null,
    trackRecord: input.portfolioTrackRecord ? trackRecordVerdict(input.portfolioTrackRecord) : null,
    table: list?.table ?? null,
  };
}
