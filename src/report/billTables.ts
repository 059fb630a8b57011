/** Per-meter bill tables and the line-by-line re-pricing of each bill. */
import type { Bill, Meter } from "../domain/types.ts";
import type { ComputedBill } from "../tariff/types.ts";
import type { ReportInput, PricedBill } from "./input.ts";
import type { BillMath, LabelValue, TableModel } from "./siteModel.ts";
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
import { periodDays } from "./periods.ts";
import { lineStatusLabel } from "./labels.ts";

/** Billed minus recomputed, rounded to cents; null when not priced. */
export function billDifference(bill: Bill, priced: PricedBill | undefined): number | null {
  if (!priced?.computed) return null;
  return Math.round((bill.total - priced.computed.total) * 100) / 100;
}

/** Plain-words reason a bill has no recomputed total. */
export function notPricedReason(priced: PricedBill | undefined): string {
  if (!priced) return "no pricing result";
  return priced.error ?? "no pricing result";
}

/**
 * The re-pricing of one bill line by line (quantity × rate = amount, status), with its totals.
 * @example billMath(bill, meter, priced, "USD").lines[0].amount // "$25.00"
 */
export function billMath(bill: Bill, meter: Meter, priced: PricedBill | undefined, currency: string): BillMath {
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

/** Bills table of one meter: period, days, usage, read, demand, billed, recomputed, difference. */
export function billsTable(meter: Meter, bills: Bill[], input: ReportInput, currency: string): TableModel {
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

/** Interval data of one meter by calendar month with coverage; null without interval data. */
export function meteredTable(meter: Meter, input: ReportInput): TableModel | null {
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

