/**
 * View model of one building page: summary, findings, a compact summary of each meter's bills
 * (the bills themselves and their re-pricing are on the meter's bills page), usage charts,
 * baseline and data-quality verdicts (detail on the meter pages), forecast.
 */
import type { Bill, Building, Meter } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import { billCheckState, type BillCheckState } from "../tariff/index.ts";
import type { BuildingPage, CommoditySection, LabelValue, MeterSection, TableCell, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber, formatPeriod, formatQuantity } from "./format.ts";
import { DISPUTES_PATH, buildingPath, meterBillsPath, navFor } from "./nav.ts";
import { buildingUsageLast12m, metersCostLast12m, type CommodityUsage } from "./usageSummary.ts";
import { commodityLabel } from "./labels.ts";
import { billsTable, claimsByBill } from "./billTables.ts";
import { commodityCharts } from "./usageCharts.ts";
import { findingsTable, forecastTable, modelsTable } from "./analysisTables.ts";
import { weatherQualityTable } from "./qualitySection.ts";
import { forecastMethodShown, forecastSection } from "./forecastSection.ts";
import { tenantPath } from "./tenantPage.ts";
import { meterAnalysis, type MeterAnalysis } from "./meterBillsPage.ts";

export { billDifference } from "./billTables.ts";

/** Everything about one building the page builder needs, pre-grouped by the caller. */
export interface BuildingContext {
  building: Building;
  meters: Meter[];
  /** Bills per meter id, sorted by period start. */
  billsByMeter: Map<string, Bill[]>;
  /** As-of date of the portfolio (setting, else the day before the last bill end); null without bills. */
  asOf: string | null;
  /** Therm per ccf for a gas meter (its tariff's heat content, else 1.037). */
  heatContentOf: (meter: Meter) => number;
  currency: string;
  /** The forecast method as this building's page shows it (forecastMethodShown), when the caller made it already. */
  forecastMethod?: ReturnType<typeof forecastMethodShown>;
}

/**
 * Billed cost of a building's meters over the last 12 months (each meter's own window, see
 * src/report/usageSummary.ts), in currency; null without an as-of date or bills.
 */
export function last12mCost(ctx: Pick<BuildingContext, "meters" | "billsByMeter" | "asOf">): number | null {
  return ctx.asOf === null ? null : metersCostLast12m(ctx.meters, ctx.billsByMeter, ctx.asOf);
}

/**
 * Last-12-months usage of one building per commodity in its reporting unit (kWh, therm, gal):
 * the very function portfolio.json uses, so the index and the JSON agree.
 */
export function buildingUsage(ctx: BuildingContext): CommodityUsage[] {
  if (ctx.asOf === null) return [];
  const bills = ctx.meters.flatMap((m) => ctx.billsByMeter.get(m.meterId) ?? []);
  return buildingUsageLast12m(ctx.building, ctx.meters, bills, ctx.asOf, ctx.heatContentOf);
}

/**
 * Builds the page of one building. `sections` are the meters' baseline and quality sections
 * when the caller already computed them (they are shown in full on the meter pages).
 * @example buildBuildingPage(input, ctx).path // "buildings/B1.html"
 */
export function buildBuildingPage(input: ReportInput, ctx: BuildingContext, sections?: MeterAnalysis): Omit<BuildingPage, "canonical"> {
  const { building: b, meters, currency } = ctx;
  const root = "../";
  const allBills = meters.flatMap((m) => ctx.billsByMeter.get(m.meterId) ?? []);
  const floorArea =
    b.areaUnit === "m2"
      ? formatQuantity(b.floorAreaM2, "m²")
      : `${formatQuantity(b.floorArea, "ft²")} (${formatQuantity(b.floorAreaM2, "m²")})`;
  const summary: LabelValue[] = [
    { label: "Building ID", value: b.buildingId },
    { label: "Use type", value: b.useType ?? NOT_AVAILABLE },
    { label: "Floor area", value: floorArea },
    { label: "Time zone", value: b.timezone },
    { label: "Weather station", value: b.weatherStation },
    { label: "Meters", value: formatNumber(meters.length) },
    { label: "Bills", value: formatNumber(allBills.length) },
    { label: "Billed cost, the 12 months up to each meter's last read", value: formatMoney(last12mCost(ctx), currency) },
  ];
  const commodities: CommoditySection[] = [];
  for (const c of ["electricity", "gas", "water"] as const) {
    const cm = meters.filter((m) => m.commodity === c);
    if (cm.length === 0) continue;
    commodities.push({ commodity: c, heading: commodityLabel(c), charts: commodityCharts(b.buildingId, c, cm, ctx.billsByMeter) });
  }
  const analysis = sections ?? meterAnalysis(input, ctx);
  const meterSections: MeterSection[] = meters.map((m) => ({
    meterId: m.meterId,
    heading: `${commodityLabel(m.commodity)} meter ${m.meterId}`,
    billsHref: meterBillsPath(b.buildingId, m.meterId),
  }));
  return {
    title: b.name,
    root,
    nav: navFor("building", root),
    buildingId: b.buildingId,
    path: buildingPath(b.buildingId),
    summary,
    commodities,
    meters: meterSections,
    metersTable: metersTable(input, ctx),
    flaggedBillsTable: flaggedBillsTable(input, ctx),
    findingsTable: findingsTable(b.buildingId, input, currency),
    downloads: [],
    forecastTable: forecastTable(b.buildingId, input, currency),
    modelsTable: modelsTable(meters, input),
    baselinesTable: baselinesTable(meters, analysis),
    qualityTable: qualityTable(meters, analysis),
    weatherQualityTable: weatherQualityTable(b, input.weatherDetections, input.portfolio.settings.weatherMaxGapHours),
    weatherQualityNote: `Gaps of up to ${formatNumber(input.portfolio.settings.weatherMaxGapHours)} hours are filled by straight-line interpolation between the hours on either side; longer gaps are left missing, so no temperature is made up for them.`,
    forecast: forecastSection(b.buildingId, meters, input, currency, ctx.forecastMethod),
    // Relative from buildings/<id>.html to buildings/<id>/tenant.html.
    tenantHref: b.tenantPage ? tenantPath(b.buildingId).slice("buildings/".length) : null,
  };
}

/** Plain-words tally of the bills not re-priced exactly, e.g. "6 only estimated (time-of-use split)". */
function notComparedText(states: Map<BillCheckState, number>): string {
  const parts: string[] = [];
  for (const [state, words] of [
    ["estimated", "only estimated (time-of-use split)"],
    ["needs-interval-data", "need interval data"],
    ["not-priced", "not re-priced"],
  ] as const) {
    const n = states.get(state) ?? 0;
    if (n > 0) parts.push(`${formatNumber(n)} ${words}`);
  }
  return parts.length ? parts.join("; ") : "none";
}

/**
 * One row per meter: bills, service covered, billed total, how many were re-priced exactly and
 * why the others were not compared, the claims on the meter; each meter links to its bills page.
 */
export function metersTable(input: ReportInput, ctx: BuildingContext): TableModel {
  const { currency } = ctx;
  const hasClaims = input.disputes !== undefined;
  return {
    caption: "Bills by meter: how far each meter's bills could be checked (each bill is on the meter's page)",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "Account", numeric: false },
      { label: "Bills", numeric: true },
      { label: "Service", numeric: false },
      { label: "Billed, all bills", numeric: true },
      { label: "Re-priced exactly", numeric: true },
      { label: "Not compared", numeric: false },
      ...(hasClaims ? [{ label: "Claims", numeric: true }] : []),
    ],
    rows: ctx.meters.map((m) => {
      const bills = ctx.billsByMeter.get(m.meterId) ?? [];
      const states = new Map<BillCheckState, number>();
      for (const bill of bills) {
        const s = billCheckState(input.priced.get(bill.billId));
        states.set(s, (states.get(s) ?? 0) + 1);
      }
      const billed = Math.round(bills.reduce((s, x) => s + x.total * 100, 0)) / 100;
      const cells: TableCell[] = [
        { text: `${commodityLabel(m.commodity)} meter ${m.meterId}`, href: meterBillsPath(ctx.building.buildingId, m.meterId) },
        { text: m.account ?? NOT_AVAILABLE },
        { text: formatNumber(bills.length), sort: String(bills.length) },
        { text: bills.length ? formatPeriod(bills[0].periodStart, bills[bills.length - 1].periodEnd) : NOT_AVAILABLE },
        { text: formatMoney(billed, currency), sort: String(billed) },
        { text: `${formatNumber(states.get("exact") ?? 0)} of ${formatNumber(bills.length)}`, sort: String(states.get("exact") ?? 0) },
        { text: notComparedText(states) },
      ];
      if (hasClaims) {
        const mine = (input.disputes ?? []).filter((d) => d.kind === "claim" && d.meterId === m.meterId && d.buildingId === ctx.building.buildingId);
        // A total of the disputes' own two-decimal figures, summed in cents.
        const total = Math.round(mine.reduce((s, d) => s + Math.round(d.claimAmount * 100), 0)) / 100;
        cells.push(
          mine.length
            ? { text: `${formatMoney(total, currency)} (${formatNumber(mine.length)})`, sort: String(total), href: DISPUTES_PATH }
            : { text: NOT_AVAILABLE, sort: "0" },
        );
      }
      return cells;
    }),
  };
}

/**
 * The bills of a building that carry a claim, a back-billing risk or an audit finding, in the
 * bills-table form, each linked to its re-pricing; null when there are none.
 */
export function flaggedBillsTable(input: ReportInput, ctx: BuildingContext): TableModel | null {
  const claims = claimsByBill(input.disputes, ctx.currency);
  const withFinding = new Set((input.findings ?? []).filter((f) => f.buildingId === ctx.building.buildingId && f.billId).map((f) => f.billId!));
  const flagged = ctx.meters.flatMap((m) => (ctx.billsByMeter.get(m.meterId) ?? []).filter((b) => claims.has(b.billId) || withFinding.has(b.billId)));
  if (flagged.length === 0) return null;
  return billsTable(ctx.meters, flagged, input, ctx.currency, {
    withMeter: true,
    caption: "Bills with a claim or an audit finding (each links to its line-by-line re-pricing)",
  });
}

/** Weather-baseline verdict per meter, linked to the meter page's baseline section; null when no meter has one. */
export function baselinesTable(meters: readonly Meter[], analysis: MeterAnalysis): TableModel | null {
  const rows = meters.flatMap((m) => {
    const s = analysis.baselines.get(m.meterId);
    return s ? [[{ text: s.heading, href: `${meterBillsPath(m.buildingId, m.meterId)}#baseline-h` }, { text: s.verdict, tone: s.verdictTone === "warn" ? ("warn" as const) : undefined }]] : [];
  });
  if (rows.length === 0) return null;
  return {
    caption: "Weather baseline of each meter (charts and every model tried are on the meter's page)",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "Verdict", numeric: false },
    ],
    rows,
  };
}

/** Interval-data quality summary per meter, linked to the meter page's data-quality section; null when none. */
export function qualityTable(meters: readonly Meter[], analysis: MeterAnalysis): TableModel | null {
  const rows = meters.flatMap((m) => {
    const q = analysis.quality.get(m.meterId);
    return q ? [[{ text: q.heading, href: `${meterBillsPath(m.buildingId, m.meterId)}#quality-h` }, { text: q.summary }]] : [];
  });
  if (rows.length === 0) return null;
  return {
    caption: "Interval data of each meter (the heatmap and every problem found are on the meter's page)",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "What was found", numeric: false },
    ],
    rows,
  };
}
