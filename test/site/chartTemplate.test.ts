import { describe, expect, it } from "vitest";
import fc from "fast-check";
import * as vega from "vega";
import * as vl from "vega-lite";
import type { ChartModel } from "../../src/report/siteModel.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { jsonForScript } from "../../src/report/format.ts";
import { chartSpec } from "../../src/site/prepareSite.ts";
import { chartTemplate, fillJson, fillPlanOf, fillTemplate, jsonFillable, type ChartTemplate } from "../../src/site/charts/chartTemplate.ts";
import { accessibleSvg, compileToVega, compileToVegaJson, renderSvg, SERVER_WIDTH_PX } from "../../src/site/charts/renderSvg.ts";
import { serverVegaSpec } from "../../src/site/charts/serverSpec.ts";
import { fullFixtureInput } from "../report/fixture.ts";
import { everyChart } from "./everyChart.ts";

const allCharts: ChartModel[] = everyChart(buildSiteModel(fullFixtureInput()));
/** Two charts of each kind (two of a kind often share a shape, so the second is made from the first's). */
const charts = allCharts.filter((c, i) => allCharts.slice(0, i).filter((d) => d.kind === c.kind).length < 2);

/** The chart as it was made before shapes were shared: its own compile, its own parse. */
async function direct(spec: Record<string, unknown>, label: string): Promise<{ json: string; svg: string }> {
  const compiled = vl.compile(spec as never).spec as unknown as Record<string, unknown>;
  const json = jsonForScript(compiled);
  const server = spec.width !== "container" ? compiled : (serverVegaSpec(spec, compiled, SERVER_WIDTH_PX) ?? vl.compile({ ...spec, width: SERVER_WIDTH_PX } as never).spec);
  const view = new vega.View(vega.parse(server as never), { renderer: "none" });
  try {
    return { json, svg: accessibleSvg(await view.toSVG(), spec, label) };
  } finally {
    view.finalize();
  }
}

async function shared(spec: Record<string, unknown>, label: string, kind: string): Promise<{ json: string; svg: string }> {
  const compiled = await compileToVega(spec);
  const json = jsonForScript(compiled);
  // The site's path: the JSON written from the shape's text, the compile made only if needed.
  const page = await compileToVegaJson(structuredClone(spec));
  expect(page.json).toBe(json);
  expect(jsonForScript(page.compiled())).toBe(json);
  return { json, svg: kind === "quality-heatmap" ? "" : await renderSvg(spec, label, compiled) };
}

/** Variants of a spec that keep its shape or change only its holes: other data, title and description. */
function variants(spec: Record<string, unknown>): Record<string, unknown>[] {
  const retitle = (s: Record<string, unknown>, text: string): Record<string, unknown> => {
    const title = s.title as { text: string | string[] };
    return { ...s, title: { ...title, text: Array.isArray(title.text) ? title.text.map((l, i) => `${text} ${i}`) : text } };
  };
  const mapData = (s: Record<string, unknown>, f: (rows: Record<string, unknown>[]) => Record<string, unknown>[]): Record<string, unknown> => {
    const withData = (v: Record<string, unknown>) => (v.data ? { ...v, data: { values: f((v.data as { values: Record<string, unknown>[] }).values) } } : v);
    const out = withData(s);
    return Array.isArray(s.layer) ? { ...out, layer: (s.layer as Record<string, unknown>[]).map(withData) } : out;
  };
  const scale = (rows: Record<string, unknown>[]) => rows.map((r) => Object.fromEntries(Object.entries(r).map(([k, v]) => [k, typeof v === "number" ? v * 3.7 + 1 : v])));
  return [
    mapData(spec, scale),
    mapData(spec, (rows) => rows.slice(0, Math.ceil(rows.length / 2)).reverse()),
    { ...retitle(spec, `Use at "Quill" <Tower> & café — ${"long ".repeat(3)}`), description: "Another <description> with \"quotes\", a \\ backslash and ünïcode" },
    mapData({ ...spec, description: "x" }, () => []),
  ];
}

describe("charts sharing a shape (chartTemplate.ts, renderSvg.ts)", () => {
  // Tolerance: none. A chart made from its shape's compile and parse must equal, byte for byte,
  // the one made by compiling and parsing it alone: the compiled JSON and the SVG.
  it("give the same compiled spec and SVG as each chart made alone, for every chart kind and variants of them", async () => {
    expect(new Set(charts.map((c) => c.kind)).size).toBe(8);
    let compared = 0;
    for (const c of charts) {
      const spec = chartSpec(c);
      // The shared path is taken: the shape compiles to something fillable.
      const t = chartTemplate(spec);
      expect(t, c.id).not.toBeNull();
      expect(fillPlanOf(vl.compile(t!.shape as never).spec, t!.strings.length, t!.data.length), c.id).not.toBeNull();
      for (const s of [spec, ...variants(spec)]) {
        const label = String(s.description);
        // The shared path may let vega add fields to the data rows, as rendering does: each path its own copy.
        const want = c.kind === "quality-heatmap" ? { json: jsonForScript(vl.compile(structuredClone(s) as never).spec), svg: "" } : await direct(structuredClone(s), label);
        const got = await shared(structuredClone(s), label, c.kind);
        expect(got.json, `${c.id} compiled`).toBe(want.json);
        expect(got.svg, `${c.id} svg`).toBe(want.svg);
        compared++;
      }
    }
    expect(compared).toBe(charts.length * 5);
  });

  it("charts that differ only in data, title and description share a key; others do not", () => {
    const spec = chartSpec(charts.find((c) => c.kind === "monthly-usage")!);
    const [other, fewer, retitled] = variants(spec);
    const key = chartTemplate(spec)!.key;
    expect(chartTemplate(other!)!.key).toBe(key);
    expect(chartTemplate(fewer!)!.key).toBe(key);
    expect(chartTemplate(retitled!)!.key).toBe(key);
    expect(chartTemplate({ ...spec, height: 300 })!.key).not.toBe(key);
  });

  it("declines holes that could change the compile or the parse", () => {
    const spec = chartSpec(charts.find((c) => c.kind === "monthly-usage")!);
    expect(chartTemplate(spec)).not.toBeNull();
    expect(chartTemplate({ ...spec, description: "" })).toBeNull();
    expect(chartTemplate({ ...spec, description: "line\u2028separator" })).toBeNull();
    expect(chartTemplate({ ...spec, description: "marker \u0001" })).toBeNull();
    expect(chartTemplate({ ...spec, height: "\u0001h0\u0001" })).toBeNull();
    // vega-lite merges layers whose inline data are equal: such a spec is compiled as it is.
    const values = [{ a: 1 }];
    expect(chartTemplate({ ...spec, data: undefined, layer: [{ data: { values }, mark: "bar" }, { data: { values: [{ a: 1 }] }, mark: "line" }] })).toBeNull();
  });

  it("fills the holes with the chart's own data arrays and strings, and refuses unfillable results", () => {
    const spec = chartSpec(charts.find((c) => c.kind === "monthly-usage")!);
    const t = chartTemplate(spec)!;
    const plan = fillPlanOf({ a: t.shape, b: [t.shape] }, t.strings.length, t.data.length)!;
    const filled = fillTemplate(plan, t) as { a: Record<string, unknown>; b: Record<string, unknown>[] };
    expect((filled.a.data as { values: unknown }).values).toBe((spec.data as { values: unknown }).values);
    expect(filled.a.description).toBe(spec.description);
    // A sub-object reached twice stays one object; the shape itself is copied, not changed.
    expect(filled.b[0]).toBe(filled.a);
    expect(filled.a).not.toBe(t.shape);
    expect(String(t.shape.description)).toContain("\u0001");
    // A hole dropped, or a marker inside other text, cannot be filled exactly.
    expect(fillPlanOf({ ...t.shape, description: "x" }, t.strings.length, t.data.length)).toBeNull();
    expect(fillPlanOf({ ...t.shape, note: `${String(t.shape.description)}!` }, t.strings.length, t.data.length)).toBeNull();
    expect(fillPlanOf({ ...t.shape, f: () => 1 }, t.strings.length, t.data.length)).toBeNull();
  });

  // Tolerance: none. The JSON written from a shape's text must be JSON.stringify of the filled
  // copy, byte for byte, for any hole text (quotes, backslashes, `<`, non-ASCII) and data,
  // wherever the holes stand: whole strings, string literals inside code, data markers.
  it("fillJson writes the JSON of fillTemplate's copy, for any holes", () => {
    const t = chartTemplate({ description: "d", title: "t", data: { values: [{ a: 1 }] }, mark: "bar" })!;
    const [s0, s1] = [t.shape.description as string, t.shape.title as string];
    const marker = (t.shape.data as { values: unknown }).values;
    const value = { a: s0, code: `f(${JSON.stringify(s0)}, datum.x) + ${JSON.stringify(s1)} + ${JSON.stringify(s0)}`, d: marker, b: [s1, { c: s0, n: null, x: 1.5 }], e: { d: marker } };
    const plan = fillPlanOf(value, 2, 1)!;
    expect(plan).not.toBeNull();
    expect(jsonFillable(plan)).toBe(true);
    const hole = fc.string({ minLength: 1, maxLength: 20, unit: "binary" }).filter((x) => !/[\u0001\u2028\u2029]/.test(x) && !x.includes("\\u0001"));
    const rows = fc.array(fc.record({ a: fc.oneof(fc.integer(), fc.string(), fc.constant(null)), b: fc.constantFrom("<", "\"", "\\", "é") }), { maxLength: 4 });
    fc.assert(
      fc.property(hole, hole, rows, (a, b, data) => {
        const template: ChartTemplate = { key: "", shape: {}, data: [data], strings: [a, b] };
        expect(fillJson(JSON.stringify(plan.value), template)).toBe(JSON.stringify(fillTemplate(plan, template)));
      }),
      { numRuns: 300 },
    );
  });

  it("fillJson is not used for a value JSON.stringify would read differently from its copy", () => {
    const t = chartTemplate({ description: "d", data: { values: [{ a: 1 }] }, mark: "bar" })!;
    const marker = (t.shape.data as { values: unknown }).values;
    const withToJson = { a: t.shape.description, d: marker, toJSON: () => "x" };
    expect(jsonFillable(fillPlanOf(withToJson, 1, 1) ?? { value: withToJson, shared: new Set(), marks: new Map(), holed: new Set() })).toBe(false);
  });
});
