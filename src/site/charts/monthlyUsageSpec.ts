/** Vega-Lite spec for monthly values (use or cost): bars per calendar month, stacked by series. */
import type { MonthlyChartModel } from "../../report/index.ts";
import { chartConfig } from "./palette.ts";
import { chartTitle } from "./wrapText.ts";

/**
 * Builds a Vega-Lite v6 spec from a monthly-usage chart model. Pure. Months are ordinal
 * `YYYY-MM` strings rather than temporal values, so no time zone can shift a bar.
 * @example monthlyUsageSpec(chart).mark // { type: "bar", tooltip: true }
 */
export function monthlyUsageSpec(
  chart: Pick<MonthlyChartModel, "title" | "description" | "valueLabel" | "data"> & Partial<Pick<MonthlyChartModel, "seriesLabel" | "kind">>,
): Record<string, unknown> {
  const seriesLabel = chart.seriesLabel ?? "Meter";
  const valueFormat = chart.kind === "monthly-cost" ? ",.2f" : ",.0f";
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    title: chartTitle(chart.title),
    description: chart.description,
    width: "container",
    height: 220,
    autosize: { type: "fit-x", contains: "padding" },
    data: { values: chart.data.map((d) => ({ month: d.month, series: d.series, value: d.value })) },
    mark: { type: "bar", tooltip: true },
    encoding: {
      x: { field: "month", type: "ordinal", title: "Month", axis: { labelAngle: -45 } },
      y: { field: "value", type: "quantitative", title: chart.valueLabel, stack: "zero" },
      color: { field: "series", type: "nominal", title: seriesLabel },
      tooltip: [
        { field: "month", type: "ordinal", title: "Month" },
        { field: "series", type: "nominal", title: seriesLabel },
        { field: "value", type: "quantitative", title: chart.valueLabel, format: valueFormat },
      ],
    },
    config: chartConfig(),
  };
}
