/**
 * The tenant page of a building: the latest billing period against the same period a year
 * earlier, weather-adjusted and per floor area, in plain words. No findings, no money.
 */
import type { Bill, Building, Meter } from "../domain/types.ts";
import type { ReportBaseline } from "./input.ts";
import type { TableModel, TenantCommodity, TenantPage } from "./siteModel.ts";
import { NOT_AVAILABLE, formatNumber, formatPeriod, formatQuantity } from "./format.ts";
import { commodityLabel } from "./labels.ts";
import { kwhPerM2ToKbtuPerFt2, siteKwh } from "./energy.ts";
import { addMonthsIso, daysBetween, isoDateToDayNumber } from "../core/time/index.ts";
import { FT2_PER_M2, KBTU_PER_KWH, KWH_PER_THERM } from "../core/units.ts";

/** A bill counts as "the same period last year" when its start is within this many days of one year before. */
export const SAME_PERIOD_TOLERANCE_DAYS = 20;

/** Path of a building's tenant page relative to the site root. */
export function tenantPath(buildingId: string): string {
  return `buildings/${encodeURIComponent(buildingId)}/tenant.html`;
}

/** One side of the comparison (this period or last year's), summed over a commodity's meters. */
export interface TenantPeriod {
  start: string;
  end: string;
  /** Use in `unit` over the period(s). */
  use: number;
  /** Σ over meters of use ÷ that meter's billing days. */
  usePerDay: number;
  /** Weather-adjusted use per day (actual × expected at typical ÷ expected at actual weather), or null without a model for every bill. */
  adjustedPerDay: number | null;
}

export interface TenantComparison {
  commodity: string;
  /** kWh for electricity and gas (site energy), the meter unit for water. */
  unit: string;
  current: TenantPeriod;
  lastYear: TenantPeriod | null;
  /** Percent change of use per day, last year → this period. */
  changePct: number | null;
  /** Percent change of weather-adjusted use per day. */
  adjustedChangePct: number | null;
  /** Use of this period per m² of floor area (unit/m²). */
  perM2: number | null;
  /** Use of this period per ft² (kBtu/ft² for energy, unit/ft² for water). */
  perFt2: number | null;
}

/**
 * Weather-adjusted use of one bill: actual × (model at typical weather ÷ model at the period's
 * actual weather). Null when either expectation is missing or not positive.
 * @example weatherAdjusted(1000, 900, 1200) // 1333.33 (a mild period: typical weather needs more)
 */
export function weatherAdjusted(actual: number, expectedAtActual: number | undefined, expectedAtTypical: number | undefined): number | null {
  if (expectedAtActual == null || expectedAtTypical == null || !(expectedAtActual > 0) || !(expectedAtTypical >= 0)) return null;
  return (actual * expectedAtTypical) / expectedAtActual;
}

function sameBillLastYear(bills: readonly Bill[], latest: Bill): Bill | null {
  const target = isoDateToDayNumber(addMonthsIso(latest.periodStart, -12));
  let best: Bill | null = null;
  let bestGap = Infinity;
  for (const b of bills) {
    const gap = Math.abs(isoDateToDayNumber(b.periodStart) - target);
    if (gap <= SAME_PERIOD_TOLERANCE_DAYS && gap < bestGap) {
      best = b;
      bestGap = gap;
    }
  }
  return best;
}

function sumPeriod(
  picks: { meter: Meter; bill: Bill }[],
  convert: (m: Meter, q: number) => number | null,
  expectations: Map<string, { expectedAtActualWeather: number; expectedAtTypicalWeather: number }>,
): TenantPeriod | null {
  let use = 0;
  let perDay = 0;
  let adjusted: number | null = 0;
  let start = "";
  let end = "";
  let used = 0;
  for (const { meter, bill } of picks) {
    const q = convert(meter, bill.usage);
    const days = daysBetween(bill.periodStart, bill.periodEnd);
    if (q == null || days <= 0) continue;
    used++;
    use += q;
    perDay += q / days;
    const e = expectations.get(bill.billId);
    const adj = weatherAdjusted(bill.usage, e?.expectedAtActualWeather, e?.expectedAtTypicalWeather);
    const adjConverted = adj == null ? null : convert(meter, adj);
    adjusted = adjusted == null || adjConverted == null ? null : adjusted + adjConverted / days;
    if (!start || bill.periodStart < start) start = bill.periodStart;
    if (!end || bill.periodEnd > end) end = bill.periodEnd;
  }
  if (used === 0) return null;
  return { start, end, use, usePerDay: perDay, adjustedPerDay: adjusted };
}

const changeOf = (now: number | null, before: number | null) => (now == null || before == null || !(before > 0) ? null : (100 * (now - before)) / before);

/**
 * Compares a commodity's latest billing period with the same period a year earlier, per meter
 * then summed. Electricity and gas are in site kWh (therm × 29.3071; ccf × 1.037 therm); water
 * stays in its unit. Null when the commodity has no usable bill.
 */
export function compareCommodity(
  commodity: string,
  meters: readonly Meter[],
  billsByMeter: Map<string, Bill[]>,
  baselines: readonly ReportBaseline[] | undefined,
  floorAreaM2: number,
): TenantComparison | null {
  const energy = commodity === "electricity" || commodity === "gas";
  const cm = meters.filter((m) => m.commodity === commodity);
  if (cm.length === 0) return null;
  const unit = energy ? "kWh" : cm[0].unit;
  const convert = (m: Meter, q: number) => (energy ? siteKwh(commodity, m.unit, q) : m.unit === unit ? q : null);
  const expectations = new Map<string, { expectedAtActualWeather: number; expectedAtTypicalWeather: number }>();
  for (const b of baselines ?? []) if (cm.some((m) => m.meterId === b.meterId)) for (const e of b.perBill) expectations.set(e.billId, e);
  const current: { meter: Meter; bill: Bill }[] = [];
  const previous: { meter: Meter; bill: Bill }[] = [];
  for (const m of cm) {
    const bills = billsByMeter.get(m.meterId) ?? [];
    if (bills.length === 0 || convert(m, 1) == null) continue;
    const latest = bills.reduce((a, b) => (b.periodEnd > a.periodEnd ? b : a));
    current.push({ meter: m, bill: latest });
    const before = sameBillLastYear(bills, latest);
    if (before) previous.push({ meter: m, bill: before });
  }
  const now = sumPeriod(current, convert, expectations);
  if (!now) return null;
  // Compare like with like: last year only when every meter in this period has its match.
  const then = previous.length === current.length ? sumPeriod(previous, convert, expectations) : null;
  const perM2 = floorAreaM2 > 0 ? now.use / floorAreaM2 : null;
  return {
    commodity,
    unit,
    current: now,
    lastYear: then,
    changePct: then ? changeOf(now.usePerDay, then.usePerDay) : null,
    adjustedChangePct: then ? changeOf(now.adjustedPerDay, then.adjustedPerDay) : null,
    perM2,
    perFt2: perM2 == null ? null : energy ? kwhPerM2ToKbtuPerFt2(perM2) : perM2 / FT2_PER_M2,
  };
}

/** "3.6 % more per day than in", "the same per day as in". */
function changeWords(pct: number): string {
  const r = Math.round(pct * 10) / 10;
  if (r === 0) return "the same per day as in";
  return `${formatNumber(Math.abs(r), 1)} % ${r > 0 ? "more" : "less"} per day than in`;
}

function tenantCommodity(c: TenantComparison): TenantCommodity {
  const label = commodityLabel(c.commodity);
  const energy = c.commodity !== "water";
  const ft2Unit = energy ? "kBtu per ft²" : `${c.unit} per ft²`;
  const period = formatPeriod(c.current.start, c.current.end);
  const sentences = [`In the latest billing period (${period}) the building used ${formatQuantity(c.current.use, c.unit)} of ${label.toLowerCase()}${energy && c.commodity === "gas" ? " (as energy)" : ""}, about ${formatQuantity(c.current.usePerDay, c.unit)} a day.`];
  if (c.lastYear && c.changePct != null) {
    sentences.push(`That is ${changeWords(c.changePct)} the same period last year (${formatPeriod(c.lastYear.start, c.lastYear.end)}).`);
    if (c.adjustedChangePct != null) {
      sentences.push(`Allowing for the weather of each period, use was ${changeWords(c.adjustedChangePct)} the same period last year.`);
    } else {
      sentences.push("There is no weather model for this meter, so the change is not adjusted for weather.");
    }
  } else {
    sentences.push("There is no reading for the same period last year yet, so there is nothing to compare with.");
  }
  if (c.perM2 != null) {
    sentences.push(`Per floor area that is ${formatNumber(c.perM2, 2)} ${c.unit} per m² (${formatNumber(c.perFt2, 3)} ${ft2Unit}) for the period.`);
  }
  const pctText = (v: number | null) => (v == null ? NOT_AVAILABLE : `${v > 0 ? "+" : v < 0 ? "−" : ""}${formatNumber(Math.abs(v), 1)} %`);
  const cell = (v: number | null | undefined, digits: number, unit: string) => ({ text: v == null ? NOT_AVAILABLE : `${formatNumber(v, digits)} ${unit}` });
  const ly = c.lastYear;
  const lastPerM2 = ly && c.perM2 != null && c.current.use > 0 ? (ly.use / c.current.use) * c.perM2 : null;
  const table: TableModel = {
    caption: `${label}: latest billing period and the same period last year`,
    sortable: false,
    columns: [
      { label: "Measure", numeric: false },
      { label: "Latest period", numeric: true },
      { label: "Same period last year", numeric: true },
      { label: "Change", numeric: true },
    ],
    rows: [
      [{ text: "Dates" }, { text: period }, { text: ly ? formatPeriod(ly.start, ly.end) : NOT_AVAILABLE }, { text: "" }],
      [{ text: `Use (${c.unit})` }, cell(c.current.use, 0, c.unit), cell(ly?.use, 0, c.unit), { text: "" }],
      [{ text: `Use per day (${c.unit})` }, cell(c.current.usePerDay, 1, c.unit), cell(ly?.usePerDay, 1, c.unit), { text: pctText(c.changePct) }],
      [{ text: `Weather-adjusted use per day (${c.unit})` }, cell(c.current.adjustedPerDay, 1, c.unit), cell(ly?.adjustedPerDay, 1, c.unit), { text: pctText(c.adjustedChangePct) }],
      [{ text: `Use per m² (${c.unit})` }, cell(c.perM2, 2, `${c.unit}/m²`), cell(lastPerM2, 2, `${c.unit}/m²`), { text: "" }],
      [{ text: `Use per ft² (${ft2Unit})` }, cell(c.perFt2, 3, energy ? "kBtu/ft²" : `${c.unit}/ft²`), cell(lastPerM2 == null ? null : energy ? kwhPerM2ToKbtuPerFt2(lastPerM2) : lastPerM2 / FT2_PER_M2, 3, energy ? "kBtu/ft²" : `${c.unit}/ft²`), { text: "" }],
    ],
  };
  return { commodity: c.commodity, heading: label, sentences, table };
}

/** Notes on how the tenant page's figures are made; each conversion factor named. */
export const TENANT_NOTES: readonly string[] = [
  "Use per day is compared rather than the period total, because billing periods differ in length by a few days.",
  "Weather-adjusted use = actual use × (the building's weather model at typical-year temperatures ÷ the same model at the period's actual temperatures), for the same days. A colder-than-usual winter month therefore counts for less.",
  `Electricity and gas are shown as site energy in kWh: gas in therms × ${KWH_PER_THERM.toFixed(4)} kWh per therm (1 therm = 100,000 Btu, U.S. EIA).`,
  `Per floor area: kWh per m², and kBtu per ft² with 1 kWh = ${KBTU_PER_KWH.toFixed(6)} kBtu (Btu of the International Table, NIST SP 811) and 1 m² = ${FT2_PER_M2.toFixed(4)} ft² (international foot = 0.3048 m).`,
];

/**
 * Builds the tenant page of a building.
 * @example buildTenantPage(b, meters, billsByMeter, baselines).path // "buildings/B1/tenant.html"
 */
export function buildTenantPage(
  building: Building,
  meters: readonly Meter[],
  billsByMeter: Map<string, Bill[]>,
  baselines: readonly ReportBaseline[] | undefined,
): Omit<TenantPage, "canonical"> {
  const root = "../../";
  const commodities = (["electricity", "gas", "water"] as const)
    .map((c) => compareCommodity(c, meters, billsByMeter, baselines, building.floorAreaM2))
    .filter((c): c is TenantComparison => c !== null)
    .map(tenantCommodity);
  return {
    title: `${building.name}: energy and water this month`,
    root,
    path: tenantPath(building.buildingId),
    nav: [],
    buildingId: building.buildingId,
    buildingName: building.name,
    intro:
      commodities.length > 0
        ? `How much energy and water ${building.name} used in its latest billing period, compared with the same time last year, with and without the effect of weather.`
        : `There are no readings for ${building.name} yet.`,
    commodities,
    notes: [...TENANT_NOTES],
  };
}
