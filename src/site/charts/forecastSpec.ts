/**
 * Vega-Lite spec of the monthly cost forecast: the P10–P90 band as an area, the P50 as a line
 * with points, and last year's billed cost of the same calendar month as points. Pure.
 */
import type { ForecastChartModel } from "../../report/index.ts";
import { formatMonth } from "../../core/time/index.ts";
import { chartConfig, SERIES_COLORS } from "./palette.ts";
import { chartTitle } from "./wrapText.ts";

const SCHEMA = "https://vega.github.io/schema/vega-lite/v6.json";

/** Legend entries, in sorted order (how Vega-Lite orders a nominal domain): slate band, teal line, ochre points. */
export const FORECAST_SERIES = ["80 % range (P10–P90)", "Likely (P50)", "Same month last year, billed"] as const;

/**
 * @example forecastSpec(chart).layer.length // 3 (2 when no month has last year's cost)
 */
export function forecastSpec(chart: ForecastChartModel): Record<string, unknown> {
  // Each month's marks sit on its first day (UTC), where the month's tick is.
  const values = chart.months.map((m) => ({
    date: `${m.month}-01`,
    month: formatMonth(m.month),
    p10: m.p10,
    p50: m.p50,
    p90: m.p90,
    lastYear: m.lastYear,
    lastYearMonth: m.lastYearMonth,
  }));
  // Ticks on month starts (automatic ticks can land on arbitrary days and repeat a month's
  // label). Not explicit tick values: vega-lite turns those into datetime() signal
  // expressions, which the page's CSP-safe expression interpreter does not draw.
  const x = { field: "date", type: "temporal", title: "Month", scale: { type: "utc" }, axis: { format: "%b %Y", labelAngle: 0, tickCount: { interval: "month", step: 1 }, grid: false } };
  // A datum colour may not carry a scale (Vega-Lite schema); the legend's domain is the sorted
  // series names, which FORECAST_SERIES lists in that order, so the category range maps them.
  const color = (series: string) => ({ datum: series, type: "nominal", title: null });
  const fmt = ",.0f";
  const tooltip = [
    { field: "month", type: "nominal", title: "Month" },
    { field: "p10", type: "quantitative", title: `Low (P10), ${chart.valueLabel}`, format: fmt },
    { field: "p50", type: "quantitative", title: `Likely (P50), ${chart.valueLabel}`, format: fmt },
    { field: "p90", type: "quantitative", title: `High (P90), ${chart.valueLabel}`, format: fmt },
    { field: "lastYear", type: "quantitative", title: `Same month last year, ${chart.valueLabel}`, format: fmt },
  ];
  const layer: Record<string, unknown>[] = [
    {
      mark: { type: "area", opacity: 0.3 },
      encoding: { x, y: { field: "p10", type: "quantitative", title: chart.valueLabel, scale: { zero: true } }, y2: { field: "p90" }, color: color(FORECAST_SERIES[0]) },
    },
    {
      mark: { type: "line", point: true, strokeWidth: 2, tooltip: true },
      encoding: { x, y: { field: "p50", type: "quantitative" }, color: color(FORECAST_SERIES[1]), tooltip },
    },
  ];
  if (chart.months.some((m) => m.lastYear != null)) {
    layer.push({
      transform: [{ filter: "isValid(datum.lastYear)" }],
      mark: { type: "point", shape: "diamond", filled: true, size: 70, tooltip: true },
      encoding: { x, y: { field: "lastYear", type: "quantitative" }, color: color(FORECAST_SERIES[2]), tooltip },
    });
  }
  const base = chartConfig();
  return {
    $schema: SCHEMA,
    title: chartTitle(chart.title),
    description: chart.description,
    width: "container",
    height: 240,
    autosize: { type: "fit-x", contains: "padding" },
    config: {
      ...base,
      range: { category: [SERIES_COLORS[2], SERIES_COLORS[0], SERIES_COLORS[1]] },
      // Full-colour swatches (the band's own opacity would make its swatch faint) and whole labels.
      legend: { ...(base.legend as Record<string, unknown>), symbolOpacity: 1, labelLimit: 320 },
    },
    data: { values },
    layer,
  };
}
