/**
 * Vega-Lite spec of a tenant page's chart: use per day of each calendar month as bars (the latest
 * month and months that include an estimated bill in their own colours) and the use expected for
 * each month's weather as a dashed line with points. Pure.
 */
import type { TenantChartModel, TenantMonthStatus } from "../../report/index.ts";
import { chartConfig } from "./palette.ts";
import { chartTitle } from "./wrapText.ts";

const SCHEMA = "https://vega.github.io/schema/vega-lite/v6.json";

/** Legend name of the expectation line. */
const EXPECTED_SERIES = "Expected for the weather (estimate)";

/** Colour of each bar status and of the line; each at least 3:1 against white (WCAG 1.4.11). */
const TENANT_COLORS: Record<TenantMonthStatus | typeof EXPECTED_SERIES, string> = {
  "Earlier months": "#5b8f95",
  "Latest month": "#17424a",
  "Includes an estimate": "#a5671a",
  [EXPECTED_SERIES]: "#8a3b5c",
};

/**
 * @example tenantSpec(chart).layer.length // 2 (1 when no month has an expectation)
 */
export function tenantSpec(chart: TenantChartModel): Record<string, unknown> {
  const statuses = (["Earlier months", "Latest month", "Includes an estimate"] as const).filter((s) => chart.months.some((m) => m.status === s && m.perDay != null));
  const domain: string[] = [...statuses, ...(chart.hasExpected ? [EXPECTED_SERIES] : [])];
  // Months in data order: `sort: null` keeps the ascending order the view model gives.
  // On a phone the 14 month labels do not all fit: every other one is dropped rather than overlapped.
  // Every month keeps its place, a month without a bar (not completely billed) included.
  const x = { field: "label", type: "ordinal", title: null, sort: null, scale: { domain: chart.months.map((m) => m.label) }, axis: { labelAngle: -45, labelOverlap: "parity" } };
  const tooltip = [
    { field: "label", type: "nominal", title: "Month" },
    { field: "perDay", type: "quantitative", title: `Use, ${chart.useLabel}`, format: ",.0f" },
    ...(chart.hasExpected ? [{ field: "expected", type: "quantitative", title: `Expected, ${chart.useLabel}`, format: ",.0f" }] : []),
    { field: "status", type: "nominal", title: "Month" },
  ];
  const layer: Record<string, unknown>[] = [
    {
      // A month not completely billed keeps its place on the axis but gets no bar.
      transform: [{ filter: "isValid(datum.perDay)" }],
      mark: { type: "bar", tooltip: true },
      encoding: {
        x,
        y: { field: "perDay", type: "quantitative", title: `Use (${chart.useLabel})` },
        color: { field: "status", type: "nominal", title: null, scale: { domain, range: domain.map((d) => TENANT_COLORS[d as keyof typeof TENANT_COLORS]) } },
        tooltip,
      },
    },
  ];
  if (chart.hasExpected) {
    layer.push({
      // The line breaks at a month without an expectation rather than bridging it.
      mark: { type: "line", strokeWidth: 2.5, strokeDash: [6, 3], point: { filled: true, size: 40 }, tooltip: true, invalid: "break-paths-show-domains" },
      encoding: { x, y: { field: "expected", type: "quantitative" }, color: { datum: EXPECTED_SERIES, type: "nominal" }, tooltip },
    });
  }
  return {
    $schema: SCHEMA,
    title: chartTitle(chart.title),
    description: chart.description,
    width: "container",
    height: 220,
    autosize: { type: "fit-x", contains: "padding" },
    config: chartConfig(),
    data: { values: chart.months.map((m) => ({ month: m.month, label: m.label, perDay: m.perDay, expected: m.expectedPerDay, status: m.status })) },
    layer,
  };
}
