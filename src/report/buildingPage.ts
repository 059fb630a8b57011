/** View model of one building page: summary, charts, per-meter bills with the re-pricing math. */
import type { Bill, Building, Meter } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import type { BuildingPage, CommoditySection, LabelValue, MeterSection } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber, formatQuantity } from "./format.ts";
import { buildingPath, navFor } from "./nav.ts";
import { buildingUsageLast12m, metersCostLast12m, type CommodityUsage } from "../pipeline/usageSummary.ts";
import { commodityLabel } from "./labels.ts";
import { billMath, billsTable, meteredTable } from "./billTables.ts";
import { commodityCharts } from "./usageCharts.ts";
import { findingsTable, forecastTable, modelsTable } from "./analysisTables.ts";
import { baselineSections } from "./baselineSection.ts";
import { qualitySections, weatherQualityTable } from "./qualitySection.ts";
import { forecastSection } from "./forecastSection.ts";
import { tenantPath } from "./tenantPage.ts";

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
}

/**
 * Billed cost of a building's meters over the last 12 months (each meter's own window, see
 * src/pipeline/usageSummary.ts), in currency; null without an as-of date or bills.
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
 * Builds the page of one building.
 * @example buildBuildingPage(input, ctx).path // "buildings/B1.html"
 */
export function buildBuildingPage(input: ReportInput, ctx: BuildingContext): Omit<BuildingPage, "canonical"> {
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
  const meterSections: MeterSection[] = meters.map((m) => {
    const bills = ctx.billsByMeter.get(m.meterId) ?? [];
    return {
      meterId: m.meterId,
      heading: `${commodityLabel(m.commodity)} meter ${m.meterId}`,
      facts: [
        { label: "Commodity", value: commodityLabel(m.commodity) },
        { label: "Bill unit", value: m.unit },
        { label: "Tariff", value: m.tariffId },
        { label: "Multiplier", value: formatNumber(m.multiplier, 4) },
        { label: "Account", value: m.account ?? NOT_AVAILABLE },
      ],
      billsTable: billsTable(m, bills, input, currency),
      math: bills.map((bill) => billMath(bill, m, input.priced.get(bill.billId), currency)),
      meteredTable: meteredTable(m, input),
    };
  });
  return {
    title: b.name,
    root,
    nav: navFor("building", root),
    buildingId: b.buildingId,
    path: buildingPath(b.buildingId),
    summary,
    commodities,
    meters: meterSections,
    findingsTable: findingsTable(b.buildingId, input, currency),
    downloads: [],
    forecastTable: forecastTable(b.buildingId, input, currency),
    modelsTable: modelsTable(meters, input),
    baselines: baselineSections(meters, input.baselines, ctx.billsByMeter),
    quality: qualitySections(b, meters, input.quality, input.portfolio.intervals),
    weatherQualityTable: weatherQualityTable(b, input.weatherDetections, input.portfolio.settings.weatherMaxGapHours),
    weatherQualityNote: `Gaps of up to ${formatNumber(input.portfolio.settings.weatherMaxGapHours)} hours are filled by straight-line interpolation between the hours on either side; longer gaps are left missing, so no temperature is made up for them.`,
    forecast: forecastSection(b.buildingId, meters, input, currency),
    // Relative from buildings/<id>.html to buildings/<id>/tenant.html.
    tenantHref: b.tenantPage ? tenantPath(b.buildingId).slice("buildings/".length) : null,
  };
}
