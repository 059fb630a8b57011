import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { monthlyUsageSpec } from "../../src/site/charts/monthlyUsageSpec.ts";
import { renderSvg } from "../../src/site/charts/renderSvg.ts";
import { chartSpec } from "../../src/site/prepareSite.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { fixtureInput } from "../report/fixture.ts";
import { validate } from "./jsonSchema.ts";

// Source: the JSON Schema vega-lite 6.4.3 ships (node_modules/vega-lite/build/vega-lite-schema.json).
const schema = JSON.parse(readFileSync(resolve("node_modules/vega-lite/build/vega-lite-schema.json"), "utf8")) as Record<string, unknown>;

const chart = {
  title: "Electricity use by month (kWh)",
  description: "Bars of monthly electricity use",
  valueLabel: "Usage (kWh)",
  data: [
    { month: "2025-01", series: "E1", value: 100 },
    { month: "2025-02", series: "E1", value: 120 },
    { month: "2025-02", series: "E2", value: 30 },
  ],
};

describe("monthlyUsageSpec", () => {
  it("is valid against the Vega-Lite schema", () => {
    expect(validate(monthlyUsageSpec(chart), schema, schema)).toEqual([]);
  });

  it("every chart of the fixture site is valid against the schema", () => {
    const model = buildSiteModel(fixtureInput());
    const charts = [...model.index.charts, ...model.buildings.flatMap((b) => b.commodities.flatMap((c) => c.charts))];
    expect(charts.map((c) => c.kind)).toEqual(["monthly-cost", "monthly-usage", "monthly-usage", "monthly-usage"]);
    for (const c of charts) expect(validate(chartSpec(c), schema, schema)).toEqual([]);
  });

  it("the schema check can fail: a misspelt mark type and an unknown property are caught", () => {
    const bad = { ...monthlyUsageSpec(chart), mark: { type: "barr" }, colour: "red" };
    expect(validate(bad, schema, schema).length).toBeGreaterThan(0);
  });

  it("carries the data unchanged and leaves the input alone", () => {
    const input = structuredClone(chart);
    const spec = monthlyUsageSpec(input) as { data: { values: unknown[] } };
    expect(spec.data.values).toEqual(chart.data);
    expect(input).toEqual(chart);
  });
});

describe("renderSvg", () => {
  it("produces an accessible SVG with one bar per month and series", async () => {
    const svg = await renderSvg(monthlyUsageSpec(chart), "Monthly use & <more>");
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg).toContain('role="img"');
    expect(svg).toContain('aria-label="Monthly use &amp; &lt;more&gt;"');
    expect(svg).toContain("<title>Monthly use &amp; &lt;more&gt;</title>");
    // Three data rows → three bar paths in the rect mark group (vega's SVG renderer output).
    const rectGroup = /<g class="mark-rect role-mark[^"]*"[^>]*>(.*?)<\/g>/s.exec(svg);
    expect(rectGroup).not.toBeNull();
    expect((rectGroup![1].match(/<path/g) ?? []).length).toBe(3);
    expect(svg).not.toContain("NaN");
  });

  it("escapes user text inside the SVG (meter ids appear in the legend and axis)", async () => {
    const evil = "<script>alert(1)</script>&";
    const svg = await renderSvg(monthlyUsageSpec({ ...chart, data: [{ month: "2025-01", series: evil, value: 1 }] }));
    expect(svg).not.toContain("<script>");
    expect(svg).toContain("&lt;script&gt;alert(1)&lt;/script&gt;&amp;");
  });

  it("rejects a spec that does not compile", async () => {
    await expect(renderSvg({ mark: "bar", encoding: { x: { field: "a", type: "nonsense" } }, data: { values: [] } })).rejects.toThrow();
  });
});
