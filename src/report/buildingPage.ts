/** View model of one building page: summary, per-meter bills with the re-pricing math, charts. */
import type { Bill, Building, Meter } from "../domain/types.ts";
import type { ComputedBill } from "../tariff/types.ts";
import type { ReportInput, PricedBill } from "./input.ts";
import type {
  BillMath,
  BuildingPage,
  ChartDatum,
  ChartModel,
  CommoditySection,
  LabelValue,
  MeterSection,
  TableModel,
} from "./siteModel.ts";
import {
  NOT_AVAILABLE,
  formatDate,
  formatMoney,
  formatMoneySigned,
  formatMonth,
  formatNumber,
  formatPercent,
  formatPeriod,
  formatQuantity,
  formatRate,
} from "./format.ts";
import { buildingPath, navFor } from "./nav.ts";
import { periodDays, prorateToWindow, spreadOverMonths, type DayWindow } from "./periods.ts";
import { checkTitle, commodityLabel, lineStatusLabel } from "./labels.ts";
import { partialMonthsNote } from "./coverage.ts";

/** Everything about one building the page builder needs, pre-grouped by the caller. */
export interface BuildingContext {
  building: Building;
  meters: Meter[];
  /** Bills per meter id, sorted by period start. */
  billsByMeter: Map<string, Bill[]>;
  window: DayWindow | null;
  currency: string;
}

/** Billed minus recomputed, rounded to cents; null when not priced. */
export function billDifference(bill: Bill, priced: PricedBill | undefined): number | null {
  if (!priced?.computed) return null;
  return Math.round((bill.total - priced.computed.total) * 100) / 100;
}

function notPricedReason(priced: PricedBill | undefined): string {
  if (!priced) return "no pricing result";
  return priced.error ?? "no pricing result";
}

function billMath(bill: Bill, meter: Meter, priced: PricedBill | undefined, currency: string): BillMath {
  const period = formatPeriod(bill.periodStart, bill.periodEnd);
  const billed = formatMoney(bill.total, currency);
  const computed: ComputedBill | null | undefined = priced?.computed;
  if (!computed) {
    return {
      billId: bill.billId,
      period,
      state: "not-priced",
      reason: notPricedReason(priced),
      lines: [],
      total: NOT_AVAILABLE,
      billed,
      difference: NOT_AVAILABLE,
      facts: [],
      notes: [],
    };
  }
  const facts: LabelValue[] = [
    { label: "Tariff", value: meter.tariffId },
    { label: "Billing days", value: formatNumber(periodDays(bill.periodStart, bill.periodEnd)) },
  ];
  if (computed.billingDemandKw != null) {
    facts.push({ label: "Billing demand", value: formatQuantity(computed.billingDemandKw, "kW") });
  }
  if (computed.versions.length > 0) {
    facts.push({
      label: "Tariff versions",
      value: computed.versions
        .map((v) => `from ${formatDate(v.from)}: ${formatNumber(v.days)} days (${formatPercent(v.weight)})`)
        .join("; "),
    });
  }
  facts.push({ label: "Every line exact", value: computed.exact ? "yes" : "no" });
  return {
    billId: bill.billId,
    period,
    state: "priced",
    reason: "",
    lines: computed.lines.map((l) => ({
      label: l.label,
      kind: l.kind,
      // Percent lines apply to an amount of money: their quantity's unit is the currency.
      quantity: l.quantity == null ? NOT_AVAILABLE : l.unit === currency ? formatMoney(l.quantity, currency) : formatQuantity(l.quantity, l.unit),
      rate: l.rate == null ? NOT_AVAILABLE : l.kind === "percent" ? formatPercent(l.rate, 4) : formatRate(l.rate, currency, l.unit),
      amount: formatMoney(l.amount, currency),
      status: lineStatusLabel(l.status),
      note: l.note ?? "",
    })),
    total: formatMoney(computed.total, currency),
    billed,
    difference: formatMoneySigned(bill.total - computed.total, currency),
    facts,
    notes: [...computed.notes],
  };
}

function billsTable(meter: Meter, bills: Bill[], input: ReportInput, currency: string): TableModel {
  return {
    caption: `Bills for meter ${meter.meterId}: billed and recomputed totals`,
    sortable: true,
    columns: [
      { label: "Service period", numeric: false },
      { label: "Days", numeric: true },
      { label: "Usage", numeric: true },
      { label: "Read", numeric: false },
      { label: "Demand", numeric: true },
      { label: "Billed", numeric: true },
      { label: "Recomputed", numeric: true },
      { label: "Difference", numeric: true },
    ],
    rows: bills.map((b) => {
      const priced = input.priced.get(b.billId);
      const diff = billDifference(b, priced);
      return [
        { text: formatPeriod(b.periodStart, b.periodEnd), sort: b.periodStart },
        { text: formatNumber(periodDays(b.periodStart, b.periodEnd)), sort: String(periodDays(b.periodStart, b.periodEnd)) },
        { text: formatQuantity(b.usage, meter.unit), sort: String(b.usage) },
        { text: b.readType, tone: b.readType === "estimated" ? "warn" : undefined },
        b.demandKw == null ? { text: NOT_AVAILABLE, sort: "" } : { text: formatQuantity(b.demandKw, "kW"), sort: String(b.demandKw) },
        { text: formatMoney(b.total, currency), sort: String(b.total) },
        priced?.computed
          ? { text: formatMoney(priced.computed.total, currency), sort: String(priced.computed.total) }
          : { text: `not priced: ${notPricedReason(priced)}`, sort: "", tone: "muted" },
        diff == null
          ? { text: NOT_AVAILABLE, sort: "" }
          : { text: formatMoneySigned(diff, currency), sort: String(diff), tone: diff > 0 ? "pos" : diff < 0 ? "neg" : undefined },
      ];
    }),
  };
}

function meteredTable(meter: Meter, input: ReportInput): TableModel | null {
  const months = input.monthlyMetered.get(meter.meterId);
  if (!months || months.length === 0) return null;
  return {
    caption: `Interval data for meter ${meter.meterId} by calendar month (multiplier applied)`,
    sortable: true,
    columns: [
      { label: "Month", numeric: false },
      { label: "Metered usage", numeric: true },
      { label: "Intervals", numeric: true },
      { label: "Coverage", numeric: true },
    ],
    rows: months.map((m) => {
      const coverage = m.expectedIntervals > 0 ? m.intervals / m.expectedIntervals : null;
      return [
        { text: formatMonth(m.month), sort: m.month },
        { text: formatQuantity(m.total, meter.unit), sort: String(m.total) },
        { text: `${formatNumber(m.intervals)} of ${formatNumber(m.expectedIntervals)}`, sort: String(m.intervals) },
        { text: formatPercent(coverage), sort: coverage == null ? "" : String(coverage) },
      ];
    }),
  };
}

/**
 * Monthly usage charts for one commodity: one chart per usage unit (meters of one commodity
 * may bill in different units, which must not be added), bills spread over calendar months by days.
 */
function commodityCharts(buildingId: string, commodity: string, meters: Meter[], ctx: BuildingContext): ChartModel[] {
  const byUnit = new Map<string, Meter[]>();
  for (const m of meters) byUnit.set(m.unit, [...(byUnit.get(m.unit) ?? []), m]);
  const charts: ChartModel[] = [];
  for (const [unit, unitMeters] of byUnit) {
    const sums = new Map<string, number>(); // key month|meter
    const unitBills = unitMeters.flatMap((m) => ctx.billsByMeter.get(m.meterId) ?? []);
    for (const m of unitMeters) {
      for (const b of ctx.billsByMeter.get(m.meterId) ?? []) {
        for (const s of spreadOverMonths(b.usage, b.periodStart, b.periodEnd)) {
          const key = `${s.month}|${m.meterId}`;
          sums.set(key, (sums.get(key) ?? 0) + s.amount);
        }
      }
    }
    if (sums.size === 0) continue;
    const data: ChartDatum[] = [...sums.entries()]
      .map(([key, value]) => {
        const [month, series] = key.split("|");
        return { month, series, value: Math.round(value * 1000) / 1000 };
      })
      .sort((a, b) => (a.month < b.month ? -1 : a.month > b.month ? 1 : a.series < b.series ? -1 : 1));
    const months = [...new Set(data.map((d) => d.month))];
    const series = unitMeters.map((m) => m.meterId).filter((id) => data.some((d) => d.series === id));
    const label = commodityLabel(commodity);
    const id = `chart-${commodity}-${charts.length + 1}`;
    charts.push({
      id,
      kind: "monthly-usage",
      title: `${label} use by month (${unit})`,
      description: `Bar chart of billed ${label.toLowerCase()} use per calendar month in ${unit} for building ${buildingId}, ${formatMonth(months[0])} to ${formatMonth(months[months.length - 1])}, one colour per meter; billing periods are spread over months by days. ${partialMonthsNote(unitBills)}`.trim(),
      valueLabel: `Usage (${unit})`,
      seriesLabel: "Meter",
      data,
      table: {
        caption: `${label} use by month (${unit}), by meter`,
        sortable: false,
        columns: [{ label: "Month", numeric: false }, ...series.map((s) => ({ label: s, numeric: true }))],
        rows: months.map((month) => [
          { text: formatMonth(month), sort: month },
          ...series.map((s) => {
            const d = data.find((x) => x.month === month && x.series === s);
            return d ? { text: formatQuantity(d.value, unit), sort: String(d.value) } : { text: NOT_AVAILABLE, sort: "" };
          }),
        ]),
      },
    });
  }
  return charts;
}

function findingsTable(buildingId: string, input: ReportInput, currency: string): TableModel | null {
  if (!input.findings) return null;
  const rows = input.findings
    .filter((f) => f.buildingId === buildingId)
    .sort((a, b) => Math.abs(b.amountAtStake ?? 0) - Math.abs(a.amountAtStake ?? 0));
  return {
    caption: "Audit findings for this building, largest amount at stake first",
    sortable: true,
    columns: [
      { label: "Finding", numeric: false },
      { label: "Severity", numeric: false },
      { label: "Meter", numeric: false },
      { label: "Period", numeric: false },
      { label: "Amount at stake", numeric: true },
      { label: "Details", numeric: false },
    ],
    rows: rows.map((f) => [
      { text: checkTitle(f.check) },
      { text: f.severity },
      { text: f.meterId ?? NOT_AVAILABLE },
      f.periodStart && f.periodEnd
        ? { text: formatPeriod(f.periodStart, f.periodEnd), sort: f.periodStart }
        : { text: NOT_AVAILABLE, sort: "" },
      f.amountAtStake == null
        ? { text: NOT_AVAILABLE, sort: "" }
        : { text: formatMoneySigned(f.amountAtStake, currency), sort: String(f.amountAtStake) },
      { text: f.message },
    ]),
  };
}

function forecastTable(buildingId: string, input: ReportInput, currency: string): TableModel | null {
  const rows = (input.forecast ?? []).filter((f) => f.buildingId === buildingId);
  if (rows.length === 0) return null;
  const byMonth = new Map<string, { p10: number; p50: number; p90: number }>();
  for (const r of rows) {
    const s = byMonth.get(r.month) ?? { p10: 0, p50: 0, p90: 0 };
    // Percentiles of a sum are not sums of percentiles; the per-month sum of p10/p90 is a
    // conservative (wider) range, labelled as such on the page.
    s.p10 += r.costP10;
    s.p50 += r.costP50;
    s.p90 += r.costP90;
    byMonth.set(r.month, s);
  }
  return {
    caption: "Cost forecast by month, all meters (low and high are sums of per-meter 10th and 90th percentiles)",
    sortable: false,
    columns: [
      { label: "Month", numeric: false },
      { label: "Low (P10)", numeric: true },
      { label: "Likely (P50)", numeric: true },
      { label: "High (P90)", numeric: true },
    ],
    rows: [...byMonth.entries()]
      .sort(([a], [b]) => (a < b ? -1 : 1))
      .map(([month, s]) => [
        { text: formatMonth(month), sort: month },
        { text: formatMoney(s.p10, currency) },
        { text: formatMoney(s.p50, currency) },
        { text: formatMoney(s.p90, currency) },
      ]),
  };
}

function modelsTable(meters: Meter[], input: ReportInput): TableModel | null {
  const ids = new Set(meters.map((m) => m.meterId));
  const rows = (input.models ?? []).filter((m) => ids.has(m.meterId));
  if (rows.length === 0) return null;
  return {
    caption: "Weather model chosen per meter, with ASHRAE Guideline 14 fit statistics",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "Model", numeric: false },
      { label: "CV(RMSE)", numeric: true },
      { label: "NMBE", numeric: true },
      { label: "R²", numeric: true },
      { label: "Observations", numeric: true },
    ],
    rows: rows.map((m) => [
      { text: m.meterId },
      { text: m.kind },
      { text: m.cvRmsePct == null ? NOT_AVAILABLE : `${formatNumber(m.cvRmsePct, 1)}%` },
      { text: m.nmbePct == null ? NOT_AVAILABLE : `${formatNumber(m.nmbePct, 2)}%` },
      { text: formatNumber(m.r2, 3) },
      { text: formatNumber(m.n) },
    ]),
  };
}

/** Billed cost of a building's bills prorated into the window, in currency. */
export function windowCost(bills: Iterable<Bill>, window: DayWindow | null): number | null {
  if (!window) return null;
  let sum = 0;
  for (const b of bills) sum += prorateToWindow(b.total, b.periodStart, b.periodEnd, window);
  return sum;
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
    { label: "Billed cost, last 12 months", value: formatMoney(windowCost(allBills, ctx.window), currency) },
  ];
  const commodities: CommoditySection[] = [];
  for (const c of ["electricity", "gas", "water"] as const) {
    const cm = meters.filter((m) => m.commodity === c);
    if (cm.length === 0) continue;
    commodities.push({ commodity: c, heading: commodityLabel(c), charts: commodityCharts(b.buildingId, c, cm, ctx) });
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
    forecastTable: forecastTable(b.buildingId, input, currency),
    modelsTable: modelsTable(meters, input),
  };
}
