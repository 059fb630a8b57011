import { describe, expect, it } from "vitest";
import * as vega from "vega";
import * as vl from "vega-lite";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { chartSpec } from "../../src/site/prepareSite.ts";
import { SERVER_WIDTH_PX } from "../../src/site/charts/renderSvg.ts";
import { keptExpressions } from "../../src/site/charts/vegaExpressions.ts";
import { fullFixtureInput } from "../report/fixture.ts";
import { everyChart } from "./everyChart.ts";

async function svgOf(spec: Record<string, unknown>, expr?: unknown): Promise<string> {
  const compiled = vl.compile({ ...spec, width: SERVER_WIDTH_PX } as never).spec;
  const view = new vega.View(vega.parse(compiled), { renderer: "none", ...(expr ? { expr } : {}) } as never);
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

describe("keptExpressions", () => {
  // Tolerance: none. A view whose expressions were compiled for an earlier view draws the same
  // SVG, byte for byte, as one with vega's own code generator.
  it("draws every chart kind as vega's own code generator does, the second time from kept functions", async () => {
    const expr = keptExpressions(vega);
    const charts = everyChart(buildSiteModel(fullFixtureInput())).filter((c) => c.kind !== "quality-heatmap");
    expect(new Set(charts.map((c) => c.kind)).size).toBe(7);
    for (const c of charts.filter((c, i) => charts.findIndex((d) => d.kind === c.kind) === i)) {
      const spec = chartSpec(c);
      const want = await svgOf(structuredClone(spec));
      expect(await svgOf(structuredClone(spec), expr), c.id).toBe(want);
      expect(await svgOf(structuredClone(spec), expr), `${c.id} again`).toBe(want);
    }
  });

  it("gives each view a function of its own, bound to that view's functions", () => {
    const expr = keptExpressions(vega);
    const a = { functions: { k: 1 } };
    const b = { functions: { k: 2 } };
    const code = { code: "this.k + _.x" };
    const fa = expr.operator(a, code) as (_: unknown) => number;
    const fb = expr.operator(b, code) as (_: unknown) => number;
    expect(fa).not.toBe(fb);
    expect(fa({ x: 10 })).toBe(11);
    expect(fb({ x: 10 })).toBe(12);
    const enc = expr.encode(a, { marktype: "rect", channels: { x: { code: "1" }, x2: { code: "4" } } }) as (item: Record<string, unknown>, _: unknown) => number;
    const item: Record<string, unknown> = { datum: {} };
    expect(enc(item, {})).toBe(1);
    expect(item).toMatchObject({ x: 1, x2: 4, width: 3 });
  });
});
