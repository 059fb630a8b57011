/** Portfolio chart: billed cost per calendar month, stacked by commodity. */
import type { Bill, Meter } from "../domain/types.ts";
import type { ChartDatum, MonthlyChartModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatMonth } from "./format.ts";
import { commodityLabel } from "./labels.ts";
import { partialMonthsNote } from "./coverage.ts";
import { spreadOverMonths } from "../core/time/index.ts";
import { roundCents } from "../core/money.ts";

/**
 * Monthly billed cost by commodity over all bills, each bill spread over calendar months by
 * days. Null when there are no bills.
 * @example monthlyCostChart(bills, meters, "USD")?.data[0] // { month: "2024-01", series: "Electricity", value: 1234.56 }
 */
export function monthlyCostChart(bills: readonly Bill[], meters: readonly Meter[], currency: string): MonthlyChartModel | null {
  const commodityOf = new Map(meters.map((m) => [m.meterId, commodityLabel(m.commodity)]));
  const sums = new Map<string, Map<string, number>>(); // month → commodity → cost
  for (const b of bills) {
    const series = commodityOf.get(b.meterId);
    if (!series) continue;
    for (const s of spreadOverMonths(b.total, b.periodStart, b.periodEnd)) {
      const row = sums.get(s.month) ?? new Map<string, number>();
      row.set(series, (row.get(series) ?? 0) + s.amount);
      sums.set(s.month, row);
    }
  }
  if (sums.size === 0) return null;
  const months = [...sums.keys()].sort();
  const series = ["Electricity", "Gas", "Water"].filter((c) => months.some((m) => sums.get(m)!.has(c)));
  const data: ChartDatum[] = [];
  for (const month of months) {
    for (const s of series) {
      const v = sums.get(month)!.get(s);
      if (v !== undefined) data.push({ month, series: s, value: roundCents(v) });
    }
  }
  return {
    id: "chart-portfolio-cost",
    kind: "monthly-cost",
    title: `Billed cost by month (${currency})`,
    description: `Bar chart of billed cost per calendar month in ${currency} for the whole portfolio, ${formatMonth(months[0])} to ${formatMonth(months[months.length - 1])}, stacked by commodity; billing periods are spread over months by days. ${partialMonthsNote(bills)}`.trim(),
    valueLabel: `Cost (${currency})`,
    seriesLabel: "Commodity",
    data,
    table: {
      caption: `Billed cost by month and commodity (${currency})`,
      sortable: false,
      columns: [{ label: "Month", numeric: false }, ...series.map((s) => ({ label: s, numeric: true }))],
      rows: months.map((month) => [
        { text: formatMonth(month), sort: month },
        ...series.map((s) => {
          const v = sums.get(month)!.get(s);
          return v === undefined ? { text: NOT_AVAILABLE, sort: "" } : { text: formatMoney(v, currency), sort: String(v) };
        }),
      ]),
    },
  };
}
