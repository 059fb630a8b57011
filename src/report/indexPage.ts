/** View model of the portfolio index: headline figures and the building table. */
import type { Bill, Meter } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import type { IndexPage, LabelValue, TableCell } from "./siteModel.ts";
import { NOT_AVAILABLE, formatDate, formatMoney, formatNumber, formatQuantity } from "./format.ts";
import { buildingPath, navFor } from "./nav.ts";
import { prorateToWindow, type DayWindow } from "./periods.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { windowCost } from "./buildingPage.ts";
import { monthlyCostChart } from "./costChart.ts";
import { EUI_BASIS, findingsByCheckChart, intensityChart, normalizedChangePct } from "./portfolioCharts.ts";
import { addMonthsIso } from "./periods.ts";
import { tenantPath } from "./tenantPage.ts";
import { forecastChangeTable } from "./forecastIndex.ts";
import { trackRecordVerdict } from "./forecastSection.ts";

/** Usage in the window by unit, e.g. "12,345 kWh; 40 MWh", or "—" when none. */
function usageByUnit(meters: Meter[], billsByMeter: Map<string, Bill[]>, window: DayWindow | null): TableCell {
  if (!window || meters.length === 0) return { text: NOT_AVAILABLE, sort: "" };
  const byUnit = new Map<string, number>();
  for (const m of meters) {
    for (const b of billsByMeter.get(m.meterId) ?? []) {
      byUnit.set(m.unit, (byUnit.get(m.unit) ?? 0) + prorateToWindow(b.usage, b.periodStart, b.periodEnd, window));
    }
  }
  if (byUnit.size === 0) return { text: NOT_AVAILABLE, sort: "" };
  const parts = [...byUnit.entries()].map(([unit, v]) => formatQuantity(v, unit));
  // Sorting mixes units only when a building bills one commodity in two units; sort by the first.
  return { text: parts.join("; "), sort: String([...byUnit.values()][0]) };
}

/** Text of a day window, showing its last day inclusive. */
export function windowText(window: DayWindow | null): string {
  if (!window) return "no bills";
  const lastDay = new Date(Date.parse(`${window.end}T00:00:00Z`) - 86_400_000).toISOString().slice(0, 10);
  return `${formatDate(window.start)} – ${formatDate(lastDay)}`;
}

/**
 * Builds the index page from per-building contexts (in display order).
 * @example buildIndexPage(input, contexts, window).buildingsTable.rows.length // number of buildings
 */
export function buildIndexPage(input: ReportInput, contexts: BuildingContext[], window: DayWindow | null): Omit<IndexPage, "canonical"> {
  const { settings } = input.portfolio;
  const currency = settings.currency;
  let totalCost = 0;
  const rows: TableCell[][] = contexts.map((ctx) => {
    const b = ctx.building;
    const bills = ctx.meters.flatMap((m) => ctx.billsByMeter.get(m.meterId) ?? []);
    const cost = windowCost(bills, window);
    totalCost += cost ?? 0;
    const rejectedMap = input.rejectedRowsByBuilding;
    const rejected = rejectedMap?.get(b.buildingId) ?? 0;
    return [
      { text: b.name, href: buildingPath(b.buildingId), sort: b.name.toLowerCase() },
      { text: b.useType ?? NOT_AVAILABLE },
      { text: formatNumber(b.floorAreaM2), sort: String(b.floorAreaM2) },
      { text: formatMoney(cost, currency), sort: cost == null ? "" : String(cost) },
      ...(["electricity", "gas", "water"] as const).map((c) =>
        usageByUnit(
          ctx.meters.filter((m) => m.commodity === c),
          ctx.billsByMeter,
          window,
        ),
      ),
      { text: formatNumber(bills.length), sort: String(bills.length) },
      // The column exists only when ingest attributed rejected rows to buildings.
      ...(rejectedMap ? [{ text: formatNumber(rejected), sort: String(rejected), tone: rejected > 0 ? ("warn" as const) : undefined }] : []),
    ];
  });
  const headline: LabelValue[] = [
    { label: "Buildings", value: formatNumber(contexts.length) },
    { label: "Meters", value: formatNumber(input.portfolio.meters.length) },
    { label: "Bills", value: formatNumber(input.portfolio.bills.length) },
    { label: "Billed cost, last 12 months", value: window ? formatMoney(totalCost, currency) : NOT_AVAILABLE },
  ];
  let notPriced = 0;
  for (const b of input.portfolio.bills) if (!input.priced.get(b.billId)?.computed) notPriced++;
  headline.push({ label: "Bills not re-priced", value: formatNumber(notPriced) });
  const rowsRejected = input.portfolio.report.files.reduce((s, f) => s + f.rowsRejected, 0);
  headline.push({ label: "Input rows rejected (see Data)", value: formatNumber(rowsRejected) });
  if (input.findings) {
    let atStake = 0;
    for (const f of input.findings) if (f.amountAtStake != null && f.amountAtStake > 0) atStake += f.amountAtStake;
    headline.push({ label: "Findings", value: formatNumber(input.findings.length) });
    headline.push({ label: "Money at stake (bills that look too high)", value: formatMoney(atStake, currency) });
  }
  const horizon = input.portfolio.settings.forecastMonths;
  if (input.portfolioForecast) {
    const f = input.portfolioForecast;
    headline.push({
      label: `Forecast cost, next ${formatNumber(horizon)} months`,
      value: `${formatMoney(f.p50, currency)} (80 % range ${formatMoney(f.p10, currency)} – ${formatMoney(f.p90, currency)})`,
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
    headline.push({
      label: `Forecast cost, next ${formatNumber(months)} months`,
      // Sums of monthly percentiles: wider than the true range of the total.
      value: `${formatMoney(p50, currency)} (at most ${formatMoney(p10, currency)} – ${formatMoney(p90, currency)})`,
    });
  }
  const prior = window ? { start: addMonthsIso(window.start, -12), end: window.start } : null;
  const change = normalizedChangePct(contexts, input.baselines, window, prior);
  if (change != null) {
    const r = Math.round(change * 10) / 10;
    headline.push({
      label: "Weather-normalized energy use vs the year before",
      value: r === 0 ? "no change" : `${r > 0 ? "+" : "−"}${formatNumber(Math.abs(r), 1)} %`,
    });
  }
  const costChart = monthlyCostChart(input.portfolio.bills, input.portfolio.meters, currency);
  return {
    title: settings.name,
    charts: costChart ? [costChart] : [],
    intensityChart: intensityChart(contexts, window),
    intensityNote: EUI_BASIS,
    findingsChart: findingsByCheckChart(input.findings, currency),
    forecastChangeTable: forecastChangeTable(contexts, input.buildingForecasts, currency),
    forecastTrackRecord: input.portfolioTrackRecord ? trackRecordVerdict(input.portfolioTrackRecord) : null,
    tenantLinks: contexts.filter((c) => c.building.tenantPage).map((c) => ({ name: c.building.name, href: tenantPath(c.building.buildingId) })),
    lede: `Utility bills for ${formatNumber(contexts.length)} ${contexts.length === 1 ? "building" : "buildings"}, each re-priced from its tariff and checked. Figures for the last 12 months cover ${windowText(window)}.`,
    root: "",
    path: "index.html",
    nav: navFor("index", ""),
    headline,
    windowText: windowText(window),
    buildings: contexts.map((c) => ({ buildingId: c.building.buildingId, name: c.building.name, href: buildingPath(c.building.buildingId) })),
    buildingsTable: {
      caption: `Buildings: floor area, billed cost and billed use over the last 12 months (${windowText(window)})`,
      sortable: true,
      columns: [
        { label: "Building", numeric: false },
        { label: "Use type", numeric: false },
        { label: "Floor area (m²)", numeric: true },
        { label: "Billed cost, 12 months", numeric: true },
        { label: "Electricity use", numeric: true },
        { label: "Gas use", numeric: true },
        { label: "Water use", numeric: true },
        { label: "Bills", numeric: true },
        ...(input.rejectedRowsByBuilding ? [{ label: "Rows rejected", numeric: true }] : []),
      ],
      rows,
    },
  };
}
