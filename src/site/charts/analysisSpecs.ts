/**
 * Vega-Lite specs of the analysis charts: baseline scatter with the fitted line, actual vs
 * expected over time, the data-quality heatmap, and horizontal rankings. Pure.
 */
import type { BaselineScatterChartModel, BaselineTimeChartModel, HeatmapChartModel, RankingChartModel } from "../../report/index.ts";
import { chartConfig, FLAG_COLOR, HEAT_RANGE, SERIES_COLORS } from "./palette.ts";
import { chartTitle, wrapLabel } from "./wrapText.ts";

const SCHEMA = "https://vega.github.io/schema/vega-lite/v6.json";

function base(chart: { title: string; description: string }, height: number | { step: number }): Record<string, unknown> {
  return {
    $schema: SCHEMA,
    title: chartTitle(chart.title),
    description: chart.description,
    width: "container",
    height,
    autosize: { type: "fit-x", contains: "padding" },
    config: chartConfig(),
  };
}

/**
 * Use per day against temperature: bill points (colour and shape by whether the bill was in the
 * fit) and the fitted model as a line.
 * @example baselineScatterSpec(chart).layer.length // 2 (1 without a curve)
 */
export function baselineScatterSpec(chart: BaselineScatterChartModel): Record<string, unknown> {
  // Long reasons ("left out: audit finding: …") wrap onto lines so a phone-width chart shows them whole.
  const statusLegend = { labelExpr: wrappedLabelExpr(chart.points.map((p) => p.status), LEGEND_LINE_CHARS) };
  const points = {
    data: { values: chart.points.map((p) => ({ bill: p.billId, period: p.period, temp: p.temp, use: p.usePerDay, status: p.status })) },
    mark: { type: "point", filled: true, size: 60, tooltip: true },
    encoding: {
      x: { field: "temp", type: "quantitative", title: chart.tempLabel, scale: { zero: false } },
      y: { field: "use", type: "quantitative", title: chart.useLabel },
      color: { field: "status", type: "nominal", title: "Bill", scale: { range: [SERIES_COLORS[0], SERIES_COLORS[1], SERIES_COLORS[4]] }, legend: statusLegend },
      shape: { field: "status", type: "nominal", title: "Bill", legend: statusLegend },
      tooltip: [
        { field: "bill", type: "nominal", title: "Bill" },
        { field: "period", type: "nominal", title: "Period" },
        { field: "temp", type: "quantitative", title: chart.tempLabel, format: ",.1f" },
        { field: "use", type: "quantitative", title: chart.useLabel, format: ",.2f" },
        { field: "status", type: "nominal", title: "Fit" },
      ],
    },
  };
  const layer: Record<string, unknown>[] = [points];
  if (chart.curve.length > 1) {
    layer.unshift({
      data: { values: chart.curve.map((c) => ({ temp: c.temp, use: c.usePerDay })) },
      mark: { type: "line", color: SERIES_COLORS[2], strokeWidth: 2 },
      encoding: {
        x: { field: "temp", type: "quantitative" },
        y: { field: "use", type: "quantitative" },
      },
    });
  }
  return { ...base(chart, 240), layer };
}

/**
 * Actual use per day of each bill (bars at the period's middle day) and the model's expected
 * use per day at the same weather (line with points), on a UTC time axis.
 */
export function baselineTimeSpec(chart: BaselineTimeChartModel): Record<string, unknown> {
  const x = { field: "mid", type: "temporal", title: "Billing period (middle day)", scale: { type: "utc", padding: 8 }, axis: { format: "%b %Y" } };
  const tooltip = [
    { field: "period", type: "nominal", title: "Period" },
    { field: "actual", type: "quantitative", title: `Actual, ${chart.useLabel}`, format: ",.2f" },
    { field: "expected", type: "quantitative", title: `Expected, ${chart.useLabel}`, format: ",.2f" },
  ];
  return {
    ...base(chart, 220),
    data: { values: chart.bills.map((b) => ({ bill: b.billId, period: b.period, mid: b.mid, actual: b.actualPerDay, expected: b.expectedPerDay, low: b.lowPerDay, high: b.highPerDay })) },
    layer: [
      ...(chart.hasBand
        ? [
            {
              transform: [{ filter: "isValid(datum.low) && isValid(datum.high)" }],
              mark: { type: "area", opacity: 0.25, color: SERIES_COLORS[1] },
              encoding: { x, y: { field: "low", type: "quantitative" }, y2: { field: "high" } },
            },
          ]
        : []),
      {
        mark: { type: "bar", width: 8, tooltip: true },
        encoding: { x, y: { field: "actual", type: "quantitative", title: chart.useLabel }, color: { datum: "Actual", type: "nominal", title: "Series" }, tooltip },
      },
      {
        mark: { type: "line", point: true, strokeWidth: 2, tooltip: true },
        encoding: { x, y: { field: "expected", type: "quantitative" }, color: { datum: "Expected by the model", type: "nominal" }, tooltip },
      },
    ],
  };
}

/**
 * Day × hour heatmap: one rect per local day and hour, colour by use; flagged hours drawn over
 * in the flag colour. Days arrive as rows with 24-value arrays (compact on the page) and are
 * flattened in the browser; the hour is each value's position within its day.
 */
export function heatmapSpec(chart: HeatmapChartModel): Record<string, unknown> {
  const x = { field: "day", type: "temporal", timeUnit: "utcyearmonthdate", title: "Day", axis: { format: "%b %Y", labelAngle: 0, grid: false, tickCount: 12 } };
  const y = { field: "hour", type: "ordinal", title: "Hour of day (local)", axis: { values: [0, 6, 12, 18], grid: false } };
  const tooltip = [
    { field: "day", type: "temporal", timeUnit: "utcyearmonthdate", title: "Day", format: "%a %b %-d, %Y" },
    { field: "hour", type: "ordinal", title: "Hour" },
    { field: "value", type: "quantitative", title: chart.valueLabel, format: ",.3~f" },
    { field: "flag", type: "nominal", title: "Flagged" },
  ];
  return {
    ...base(chart, 192),
    // ~9,000 cells: drawn on a canvas in the browser (one element instead of one per cell);
    // charts.js reads this hint. Tooltips work the same (vega hit-tests the scenegraph).
    usermeta: { renderer: "canvas" },
    data: { values: chart.days.map((d) => ({ day: d.day, values: d.values, flagged: d.flagged })) },
    transform: [
      { flatten: ["values", "flagged"], as: ["value", "f"] },
      { window: [{ op: "row_number", as: "n" }], groupby: ["day"] },
      { calculate: "datum.n - 1", as: "hour" },
      { calculate: "datum.f === 1 ? 'yes' : 'no'", as: "flag" },
      { filter: "isValid(datum.value)" },
    ],
    layer: [
      {
        mark: { type: "rect", tooltip: true },
        encoding: { x, y, color: { field: "value", type: "quantitative", title: chart.valueLabel, scale: { range: [...HEAT_RANGE], domain: [0, chart.colorMax], clamp: true }, legend: { orient: "bottom", direction: "horizontal", gradientLength: 160 } }, tooltip },
      },
      {
        transform: [{ filter: "datum.f === 1" }],
        mark: { type: "rect", color: FLAG_COLOR, tooltip: true },
        encoding: { x, y, tooltip },
      },
    ],
  };
}

/** Longest line of a wrapped legend label, in characters (≈ 230 px at 11 px). */
export const LEGEND_LINE_CHARS = 36;

/** Longest line of a wrapped ranking label, in characters (≈ 130 px at 11 px): narrow screens keep a plot beside the labels. */
export const RANKING_LABEL_LINE_CHARS = 22;

/**
 * A Vega expression giving each wrapped label as an array of lines (Vega draws an array as
 * multi-line text), so no label is cut short with an ellipsis. Labels are embedded as JSON
 * string literals.
 */
function wrappedLabelExpr(labels: readonly string[], max: number): string {
  const keys: string[] = [];
  const wrapped: string[][] = [];
  for (const label of new Set(labels)) {
    const lines = wrapLabel(label, max);
    if (lines.length > 1) {
      keys.push(label);
      wrapped.push(lines);
    }
  }
  if (keys.length === 0) return "datum.value";
  // One lookup, not one nested test per label: Vega parses nested conditionals recursively, and
  // a ranking of about a thousand buildings overflowed the stack.
  return `${JSON.stringify(wrapped)}[indexof(${JSON.stringify(keys)}, datum.value)] || datum.value`;
}

/**
 * Horizontal bars, largest first; the label axis keeps the given order. Labels wrap onto
 * lines instead of being cut short, and the value axis title is anchored at the plot's end so
 * it never runs past the chart's right edge on a narrow plot.
 */
export function rankingSpec(chart: RankingChartModel): Record<string, unknown> {
  const lines = Math.max(1, ...chart.items.map((i) => wrapLabel(i.label, RANKING_LABEL_LINE_CHARS).length));
  return {
    // A fixed height (not a step): a step height with "fit-x" autosize makes vega-lite warn.
    ...base(chart, Math.max(48, chart.items.length * (14 + 13 * lines))),
    data: { values: chart.items.map((i, rank) => ({ label: i.label, value: i.value, note: i.note, rank })) },
    mark: { type: "bar", tooltip: true, color: SERIES_COLORS[0] },
    encoding: {
      y: {
        field: "label",
        type: "nominal",
        title: null,
        sort: { field: "rank", order: "ascending" },
        axis: { labelLimit: 0, labelExpr: wrappedLabelExpr(chart.items.map((i) => i.label), RANKING_LABEL_LINE_CHARS), labelLineHeight: 13 },
      },
      x: { field: "value", type: "quantitative", title: chart.valueLabel, axis: { titleAnchor: "end", labelFlush: true, tickCount: 4 } },
      tooltip: [
        { field: "label", type: "nominal", title: "Item" },
        { field: "value", type: "quantitative", title: chart.valueLabel, format: chart.valueFormat },
        { field: "note", type: "nominal", title: "Also" },
      ],
    },
  };
}
