/** View model of the portfolio index: bills to dispute first, headline figures, the building table. */
import type { ReportFinding, ReportInput } from "./input.ts";
import { billCheckState } from "../tariff/index.ts";
import type { HeadlineFigure, IndexPage, LabelValue, TableCell } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber, formatQuantity } from "./format.ts";
import { DISPUTES_PATH, buildingPath, navFor } from "./nav.ts";
import type { CommodityUsage } from "./usageSummary.ts";
import type { BuildingContext } from "./buildingPage.ts";
import { buildingUsage, last12mCost } from "./buildingPage.ts";
import { monthlyCostChart } from "./costChart.ts";
import { EUI_BASIS, findingsByCheckTable, intensityChart, normalizedChangePct } from "./portfolioCharts.ts";
import { buildIndexDisputes, sumCents } from "./disputesPage.ts";
import type { Dispute } from "../disputes/index.ts";
import { last12MonthsText } from "./periods.ts";
import { tenantPath } from "./tenantPage.ts";
import { forecastChangeTable } from "./forecastIndex.ts";
import { trackRecordVerdict } from "./forecastSection.ts";

/** Table cell of one commodity's usage, e.g. "12,345 kWh", or "—" when none. */
function usageCell(usage: readonly CommodityUsage[], commodity: CommodityUsage["commodity"]): TableCell {
  const u = usage.find((x) => x.commodity === commodity);
  if (!u || u.actualLast12m === null) return { text: NOT_AVAILABLE, sort: "" };
  return { text: formatQuantity(u.actualLast12m, u.unit), sort: String(u.actualLast12m) };
}

/** Number of audit findings of one building. */
function buildingFindingCount(findings: readonly ReportFinding[] | undefined, buildingId: string): number {
  let count = 0;
  for (const f of findings ?? []) if (f.buildingId === buildingId) count++;
  return count;
}

/** Total of one building's claims (kind `claim`), cent-exact: its share of the index's "Bills to dispute". */
function buildingClaimTotal(disputes: readonly Dispute[] | undefined, buildingId: string): number {
  return sumCents((disputes ?? []).filter((d) => d.kind === "claim" && d.buildingId === buildingId).map((d) => d.claimAmount));
}

/**
 * Builds the index page from per-building contexts (in display order).
 * @example buildIndexPage(input, contexts, window).buildingsTable.rows.length // number of buildings
 */
export function buildIndexPage(input: ReportInput, contexts: BuildingContext[], asOf: string | null): Omit<IndexPage, "canonical"> {
  const { settings } = input.portfolio;
  const currency = settings.currency;
  let totalCost = 0;
  const rows: TableCell[][] = contexts.map((ctx) => {
    const b = ctx.building;
    const bills = ctx.meters.flatMap((m) => ctx.billsByMeter.get(m.meterId) ?? []);
    const cost = last12mCost(ctx);
    totalCost += cost ?? 0;
    const usage = buildingUsage(ctx);
    const findingCount = buildingFindingCount(input.findings, b.buildingId);
    const claimed = buildingClaimTotal(input.disputes, b.buildingId);
    const auditHref = `${buildingPath(b.buildingId)}#audit-h`;
    const rejectedMap = input.rejectedRowsByBuilding;
    const rejected = rejectedMap?.get(b.buildingId) ?? 0;
    return [
      { text: b.name, href: buildingPath(b.buildingId), sort: b.name.toLowerCase() },
      { text: b.useType ?? NOT_AVAILABLE },
      { text: formatNumber(b.floorAreaM2), sort: String(b.floorAreaM2) },
      { text: formatMoney(cost, currency), sort: cost == null ? "" : String(cost) },
      // Money to claim next to the cost, so a wide table never scrolls it out of sight.
      ...(input.disputes
        ? [{ text: formatMoney(claimed, currency), sort: String(claimed), href: claimed > 0 ? DISPUTES_PATH : undefined, tone: claimed > 0 ? ("warn" as const) : undefined }]
        : []),
      ...(input.findings ? [{ text: formatNumber(findingCount), sort: String(findingCount), href: auditHref }] : []),
      ...(["electricity", "gas", "water"] as const).map((c) => usageCell(usage, c)),
      { text: formatNumber(bills.length), sort: String(bills.length) },
      // The column exists only when ingest attributed rejected rows to buildings.
      ...(rejectedMap ? [{ text: formatNumber(rejected), sort: String(rejected), tone: rejected > 0 ? ("warn" as const) : undefined }] : []),
    ];
  });
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
    forecastChangeTable: forecastChangeTable(contexts, input.buildingForecasts, currency),
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
    buildingsTable: {
      caption: `Buildings: floor area, billed cost and billed use over the last 12 months (${last12MonthsText(asOf)}; gas in therms, water in gallons)${input.disputes ? ", the total of each building's claims" : ""}${input.findings ? ` ${input.disputes ? "and" : "and each building's"} audit findings` : ""}`,
      sortable: true,
      columns: [
        { label: "Building", numeric: false },
        { label: "Use type", numeric: false },
        { label: "Floor area (m²)", numeric: true },
        { label: "Billed cost, 12 months", numeric: true },
        ...(input.disputes ? [{ label: "To dispute", numeric: true }] : []),
        ...(input.findings ? [{ label: "Findings", numeric: true }] : []),
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
