/** View model of the portfolio index: bills to dispute first, headline figures, the building table. */
import type { ReportInput } from "./input.ts";
import { billCheckState } from "../tariff/index.ts";
import type { HeadlineFigure, IndexPage, LabelValue } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber } from "./format.ts";
import { buildingPath, navFor } from "./nav.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { monthlyCostChart } from "./costChart.ts";
import { EUI_BASIS, findingsByCheckTable, intensityChart, normalizedChangePct } from "./portfolioCharts.ts";
import { buildIndexDisputes } from "./disputesPage.ts";
import { last12MonthsText } from "./periods.ts";
import { tenantPath } from "./tenantPage.ts";
import { forecastChangeTable, type ForecastChangeTable } from "./forecastIndex.ts";
import { trackRecordVerdict } from "./forecastSection.ts";
import { buildingsTable, type BuildingsTable } from "./buildingsTable.ts";
import { indexBuildingsList, indexForecastList } from "./indexLists.ts";

/** The complete per-building lists, made once for the index and for the pages of their own (listPages.ts). */
export interface PortfolioLists {
  buildings: BuildingsTable;
  /** Null when no building has forecast drivers. */
  forecast: ForecastChangeTable | null;
}

/**
 * Every building's row of the buildings table and of the forecast ranking.
 * @example portfolioLists(input, contexts, asOf).buildings.table.rows.length // number of buildings
 */
export function portfolioLists(input: ReportInput, contexts: readonly BuildingContext[], asOf: string | null): PortfolioLists {
  return {
    buildings: buildingsTable(input, contexts, asOf),
    forecast: forecastChangeTable(contexts, input.buildingForecasts, input.portfolio.settings.currency),
  };
}

/**
 * Builds the index page from per-building contexts (in display order). Its totals (cost cards,
 * headline counts) cover every building; its two per-building lists show every building of a
 * short portfolio and the first rows of a long one (indexLists.ts), linking the whole list.
 * @example buildIndexPage(input, contexts, window).buildingsTable.rows.length // every building up to INDEX_LIST_WHOLE_MAX, else INDEX_LIST_SHOWN
 */
export function buildIndexPage(input: ReportInput, contexts: BuildingContext[], asOf: string | null, lists: PortfolioLists = portfolioLists(input, contexts, asOf)): Omit<IndexPage, "canonical"> {
  const { settings } = input.portfolio;
  const currency = settings.currency;
  // Over every building, in table order, never only the rows the index shows.
  let totalCost = 0;
  for (const cost of lists.buildings.lastYearCosts) totalCost += cost ?? 0;
  const buildingList = indexBuildingsList(lists.buildings, currency);
  const forecastList = indexForecastList(lists.forecast, currency);
  // What was checked: counts only. The money (claims, risks, last year's and next year's cost)
  // leads the page in its own cards (costFigures, disputes), never in this list.
  const headline: LabelValue[] = [
    { label: "Buildings", value: formatNumber(contexts.length) },
    { label: "Meters", value: formatNumber(input.portfolio.meters.length) },
    { label: "Bills", value: formatNumber(input.portfolio.bills.length) },
  ];
  // Bills that were not compared are counted as such, never as differences (issue 11).
  let exact = 0;
  let estimated = 0;
  let notPriced = 0;
  for (const b of input.portfolio.bills) {
    const state = billCheckState(input.priced.get(b.billId));
    if (state === "exact") exact++;
    else if (state === "not-priced") notPriced++;
    else estimated++;
  }
  headline.push({ label: "Bills checked exactly", value: `${formatNumber(exact)} of ${formatNumber(input.portfolio.bills.length)}` });
  headline.push({ label: "Bills only estimated, not compared", value: formatNumber(estimated) });
  headline.push({ label: "Bills not re-priced", value: formatNumber(notPriced) });
  const rowsRejected = input.portfolio.report.files.reduce((s, f) => s + f.rowsRejected, 0);
  headline.push({ label: "Input rows rejected (see Data)", value: formatNumber(rowsRejected) });
  if (input.findings) headline.push({ label: "Findings", value: formatNumber(input.findings.length) });

  const costFigures: HeadlineFigure[] = [];
  const horizon = input.portfolio.settings.forecastMonths;
  if (input.portfolioForecast) {
    const f = input.portfolioForecast;
    costFigures.push({
      id: "forecast-total",
      label: `Forecast cost, next ${formatNumber(horizon)} months`,
      value: formatMoney(f.p50, currency),
      note: `likely (P50); 80 % range ${formatMoney(f.p10, currency)} – ${formatMoney(f.p90, currency)}`,
    });
  } else if (input.forecast && input.forecast.length > 0) {
    let p10 = 0;
    let p50 = 0;
    let p90 = 0;
    for (const f of input.forecast) {
      p10 += f.costP10;
      p50 += f.costP50;
      p90 += f.costP90;
    }
    const months = new Set(input.forecast.map((f) => f.month)).size;
    costFigures.push({
      id: "forecast-total",
      label: `Forecast cost, next ${formatNumber(months)} months`,
      value: formatMoney(p50, currency),
      // Sums of monthly percentiles: wider than the true range of the total.
      note: `likely (P50); at most ${formatMoney(p10, currency)} – ${formatMoney(p90, currency)}`,
    });
  }
  costFigures.push({ id: "billed-total", label: "Billed cost, last 12 months", value: asOf ? formatMoney(totalCost, currency) : NOT_AVAILABLE, note: "all buildings, as billed" });
  const change = normalizedChangePct(contexts, input.baselines);
  const energyTrend =
    change == null
      ? null
      : (() => {
          const r = Math.round(Math.abs(change) * 10) / 10;
          return r === 0
            ? "Adjusted for the weather of each year, the site energy of the meters with a weather baseline was unchanged from the year before."
            : `Adjusted for the weather of each year, the site energy of the meters with a weather baseline was ${formatNumber(r, 1)} % ${change > 0 ? "higher" : "lower"} than the year before.`;
        })();
  const costChart = monthlyCostChart(input.portfolio.bills, input.portfolio.meters, currency);
  return {
    title: settings.name,
    charts: costChart ? [costChart] : [],
    intensityChart: intensityChart(contexts),
    intensityNote: EUI_BASIS,
    disputes: buildIndexDisputes(input),
    findingsTable: findingsByCheckTable(input.findings, input.disputes, currency),
    forecastChangeTable: forecastList?.table ?? null,
    forecastCut: forecastList?.cut ?? null,
    forecastTrackRecord: input.portfolioTrackRecord ? trackRecordVerdict(input.portfolioTrackRecord) : null,
    tenantLinks: contexts.filter((c) => c.building.tenantPage).map((c) => ({ name: c.building.name, href: tenantPath(c.building.buildingId) })),
    lede: `Utility bills for ${formatNumber(contexts.length)} ${contexts.length === 1 ? "building" : "buildings"}, each re-priced from its tariff and checked.${asOf ? ` “Last 12 months” means ${last12MonthsText(asOf)}, so a bill not yet received does not read as a drop.` : ""}`,
    root: "",
    path: "index.html",
    nav: navFor("index", ""),
    headline,
    costFigures,
    energyTrend,
    windowText: last12MonthsText(asOf),
    buildings: contexts.map((c) => ({ buildingId: c.building.buildingId, name: c.building.name, href: buildingPath(c.building.buildingId) })),
    buildingsTable: buildingList.table,
    buildingsCut: buildingList.cut,
  };
}
