/** Monthly-use charts of one building, per commodity. */
import type { Bill, Meter } from "../domain/types.ts";
import type { ChartDatum, MonthlyChartModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMonth, formatQuantity } from "./format.ts";
import { commodityLabel } from "./labels.ts";
import { partialMonthsNote } from "./coverage.ts";
import { spreadOverMonths } from "../core/time/index.ts";

/**
 * Monthly usage charts for one commodity: one chart per usage unit (meters of one commodity
 * may bill in different units, which must not be added), bills spread over calendar months by days.
 */
export function commodityCharts(buildingId: string, commodity: string, meters: Meter[], billsByMeter: Map<string, Bill[]>): MonthlyChartModel[] {
  const byUnit = new Map<string, Meter[]>();
  for (const m of meters) byUnit.set(m.unit, [...(byUnit.get(m.unit) ?? []), m]);
  const charts: MonthlyChartModel[] = [];
  for (const [unit, unitMeters] of byUnit) {
    const sums = new Map<string, number>(); // key month|meter
    const unitBills = unitMeters.flatMap((m) => billsByMeter.get(m.meterId) ?? []);
    for (const m of unitMeters) {
      for (const b of billsByMeter.get(m.meterId) ?? []) {
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

