/** Building-page forecast: totals with range, month by month, and how well it did on past data. */
import type { Meter } from "../domain/types.ts";
import type { ReportInput } from "./input.ts";
import type { ForecastSection, TableModel } from "./siteModel.ts";
import { NOT_AVAILABLE, formatMoney, formatNumber, formatPercent } from "./format.ts";
import { forecastTable } from "./analysisTables.ts";

function signedPct(v: number): string {
  if (!Number.isFinite(v)) return NOT_AVAILABLE;
  const r = Math.round(v * 10) / 10;
  return r === 0 ? "0 %" : `${r > 0 ? "+" : "−"}${formatNumber(Math.abs(r), 1)} %`;
}

function trackRecordTable(meters: Meter[], input: ReportInput): TableModel | null {
  const ids = new Set(meters.map((m) => m.meterId));
  const rows = (input.trackRecord ?? []).filter((t) => ids.has(t.meterId));
  if (rows.length === 0) return null;
  return {
    caption: "Track record: the same method forecasting a past year, compared with what was billed",
    sortable: false,
    columns: [
      { label: "Meter", numeric: false },
      { label: "Annual cost error", numeric: true },
      { label: "Same month last year, annual error", numeric: true },
      { label: "Monthly CV(RMSE)", numeric: true },
      { label: "Months inside the range", numeric: true },
    ],
    rows: rows.map((t) => [
      { text: t.meterId },
      { text: signedPct(t.annualCostErrorPct) },
      { text: signedPct(t.naiveAnnualCostErrorPct) },
      { text: Number.isFinite(t.monthlyCvRmsePct) ? `${formatNumber(t.monthlyCvRmsePct, 1)} %` : NOT_AVAILABLE },
      { text: formatPercent(t.coverage, 0) },
    ]),
  };
}

/**
 * The forecast section of one building; null when there is nothing forecast for it.
 * Totals come from `forecastTotals` (percentiles of the building's summed scenarios) when
 * present, otherwise from summing the monthly rows (then the range is the wider sum of
 * per-month percentiles, and the page says so).
 */
export function forecastSection(buildingId: string, meters: Meter[], input: ReportInput, currency: string): ForecastSection | null {
  const monthlyTable = forecastTable(buildingId, input, currency);
  const trackRecord = trackRecordTable(meters, input);
  const total = input.forecastTotals?.find((t) => t.buildingId === buildingId);
  if (!monthlyTable && !trackRecord && !total) return null;
  const months = (input.forecast ?? []).filter((f) => f.buildingId === buildingId);
  const monthCount = new Set(months.map((f) => f.month)).size;
  let summary: string;
  if (total) {
    summary = `Likely cost over the next ${formatNumber(monthCount || input.portfolio.settings.forecastMonths)} months: ${formatMoney(total.p50, currency)}, with an 80 % range of ${formatMoney(total.p10, currency)} to ${formatMoney(total.p90, currency)}.`;
  } else if (months.length > 0) {
    const sum = (k: "costP10" | "costP50" | "costP90") => months.reduce((s, f) => s + f[k], 0);
    summary = `Likely cost over the next ${formatNumber(monthCount)} months: ${formatMoney(sum("costP50"), currency)}; adding each month's low and high gives ${formatMoney(sum("costP10"), currency)} to ${formatMoney(sum("costP90"), currency)}, wider than the true range for the whole period.`;
  } else {
    summary = "No forecast for the coming months; the track record below shows how the method did on past data.";
  }
  return { summary, monthlyTable, trackRecordTable: trackRecord };
}
