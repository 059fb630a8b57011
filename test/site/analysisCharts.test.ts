import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import type { ChartModel, HeatmapChartModel, TenantChartModel } from "../../src/report/siteModel.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { chartSpec, prepareChart } from "../../src/site/prepareSite.ts";
import { heatmapSvg } from "../../src/site/charts/heatmapSvg.ts";
import { fullFixtureInput } from "../report/fixture.ts";
import { everyChart } from "./everyChart.ts";
import { validate } from "./jsonSchema.ts";

// Sources: the JSON Schemas vega-lite 6.4.3 and vega 6.4.0 ship in node_modules.
const vlSchema = JSON.parse(readFileSync(resolve("node_modules/vega-lite/build/vega-lite-schema.json"), "utf8")) as Record<string, unknown>;

const model = buildSiteModel(fullFixtureInput());
const charts: ChartModel[] = everyChart(model);

describe("analysis chart specs", () => {
  it("covers every chart kind", () => {
    expect(new Set(charts.map((c) => c.kind))).toEqual(new Set(["monthly-cost", "monthly-usage", "ranking", "baseline-scatter", "baseline-time", "quality-heatmap", "forecast-band", "tenant-months"]));
  });

  for (const kind of ["ranking", "baseline-scatter", "baseline-time", "quality-heatmap", "forecast-band", "tenant-months"]) {
    it(`${kind}: valid against the Vega-Lite schema`, () => {
      for (const c of charts.filter((x) => x.kind === kind)) expect(validate(chartSpec(c), vlSchema, vlSchema)).toEqual([]);
    });
  }

  it("the validator catches a broken layered spec (a layer with a misspelt mark)", () => {
    const scatter = charts.find((c) => c.kind === "baseline-scatter")!;
    const spec = chartSpec(scatter) as { layer: Record<string, unknown>[] };
    const bad = { ...spec, layer: [{ ...spec.layer[0], mark: { type: "pointt" } }, ...spec.layer.slice(1)] };
    expect(validate(bad, vlSchema, vlSchema).length).toBeGreaterThan(0);
  });

  it("forecast-band: band, P50 line and last year's points; a month without last year's cost is filtered, not drawn at 0", async () => {
    const chart = charts.find((c) => c.kind === "forecast-band")!;
    const spec = chartSpec(chart) as { layer: { mark: { type: string }; transform?: unknown[] }[]; data: { values: { lastYear: number | null }[] } };
    expect(spec.layer.map((l) => l.mark.type)).toEqual(["area", "line", "point"]);
    expect(spec.data.values.map((v) => v.lastYear)).toEqual([4300, 4380, null]);
    expect(spec.layer[2].transform).toEqual([{ filter: "isValid(datum.lastYear)" }]);
    const ready = await prepareChart(chart);
    // Server SVG: the area is one path; last year's diamonds are 2 symbols (the null month is dropped).
    expect(ready.svg).toContain("mark-area");
    expect((ready.svg!.match(/<g class="mark-symbol role-mark layer_2_marks"/g) ?? []).length).toBe(1);
    expect(ready.svg).not.toContain("NaN");
    // Without any of last year's costs the third layer is left out.
    const bare = { ...chart, months: (chart as { months: { lastYear: number | null }[] }).months.map((m) => ({ ...m, lastYear: null })) } as ChartModel;
    const bareSpec = chartSpec(bare) as { layer: unknown[] };
    expect(bareSpec.layer).toHaveLength(2);
    expect(validate(bareSpec, vlSchema, vlSchema)).toEqual([]);
  });

  it("tenant-months: bars by month status and the dashed expectation line; a colour per status, the latest month its own", async () => {
    const electricity = charts.find((c) => c.kind === "tenant-months" && c.id === "tenant-electricity-months")!;
    const spec = chartSpec(electricity) as { layer: { mark: { type: string }; encoding: { color: { scale?: { domain: string[] } } } }[]; data: { values: { status: string; expected: number | null }[] } };
    expect(spec.layer.map((l) => l.mark.type)).toEqual(["bar", "line"]);
    // Fixture E1: Feb 2024 – Feb 2025, Apr and May 2024 touched by the estimated bill E1-04.
    expect(spec.layer[0].encoding.color.scale!.domain).toEqual(["Earlier months", "Latest month", "Includes an estimate", "Expected for the weather (estimate)"]);
    expect(spec.data.values.filter((v) => v.status === "Latest month")).toHaveLength(1);
    expect(spec.data.values.every((v) => v.expected != null)).toBe(true);
    // Gas (G1) has no accepted weather baseline: bars only, no line, no legend entry for it.
    const gas = charts.find((c) => c.id === "tenant-gas-months")!;
    const gasSpec = chartSpec(gas) as { layer: { encoding: { color: { scale?: { domain: string[] } } } }[] };
    expect(gasSpec.layer).toHaveLength(1);
    expect(gasSpec.layer[0].encoding.color.scale!.domain).not.toContain("Expected for the weather (estimate)");
    // A month with no bar (perDay null) keeps its place: the axis lists every month, the bars skip it.
    const holed = { ...electricity, months: (electricity as TenantChartModel).months.map((m, i) => (i === 3 ? { ...m, perDay: null } : m)) } as ChartModel;
    const holedSpec = chartSpec(holed) as { layer: { transform?: unknown[]; encoding: { x: { scale: { domain: string[] } } } }[] };
    expect(holedSpec.layer[0].encoding.x.scale.domain).toEqual((electricity as TenantChartModel).months.map((m) => m.label));
    expect(holedSpec.layer[0].transform).toEqual([{ filter: "isValid(datum.perDay)" }]);
    expect(validate(holedSpec, vlSchema, vlSchema)).toEqual([]);
    const ready = await prepareChart(electricity);
    expect(ready.svg).toContain("mark-line");
    expect(ready.svg).toContain('aria-label="Bars: electricity use per day in kWh');
  });

  it("ships compiled Vega to the page and renders a server SVG for every kind", async () => {
    for (const c of charts) {
      const ready = await prepareChart(c);
      const vega = JSON.parse(ready.specJson!) as { $schema: string; data: unknown[]; marks: unknown[] };
      expect(vega.$schema, c.id).toBe("https://vega.github.io/schema/vega/v6.json");
      expect(vega.marks.length, c.id).toBeGreaterThan(0);
      expect(ready.svg!.startsWith("<svg"), c.id).toBe(true);
      expect(ready.svg, c.id).toContain('role="img"');
      expect(ready.svg, c.id).not.toContain("NaN");
    }
  }, 30_000);
});

describe("heatmap SVG fallback", () => {
  const heat = charts.find((c) => c.kind === "quality-heatmap") as HeatmapChartModel;

  it("stays small: colour bands share paths and hour runs merge (a year of 8,784 cells in < 40 kB)", () => {
    const svg = heatmapSvg(heat);
    expect(svg.length).toBeLessThan(40_000);
    // One path per used colour band plus one for flagged hours, not one element per cell.
    expect((svg.match(/<path /g) ?? []).length).toBeLessThanOrEqual(6);
  });

  it("marks flagged hours: the planted 6-hour zero run and the 1-hour spike", () => {
    const svg = heatmapSvg(heat);
    const flagged = /<path fill="#e0701a" d="([^"]*)"/.exec(svg)![1];
    // Two runs: 6 hours (48 px tall at 8 px per hour) and 1 hour (8 px).
    expect(flagged.match(/v(\d+)/g)).toEqual(["v48", "v8"]);
  });

  it("escapes user text in the title and label", () => {
    const svg = heatmapSvg({ ...heat, title: "<b>&", description: '"x"<script>' });
    expect(svg).not.toContain("<script>");
    expect(svg).toContain("&lt;b&gt;&amp;");
  });
});
