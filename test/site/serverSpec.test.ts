import { describe, expect, it } from "vitest";
import * as vl from "vega-lite";
import type { ChartModel } from "../../src/report/siteModel.ts";
import { buildSiteModel } from "../../src/report/buildSiteModel.ts";
import { chartSpec } from "../../src/site/prepareSite.ts";
import { serverVegaSpec } from "../../src/site/charts/serverSpec.ts";
import { SERVER_WIDTH_PX, compileToVega } from "../../src/site/charts/renderSvg.ts";
import { fullFixtureInput } from "../report/fixture.ts";
import { everyChart } from "./everyChart.ts";

const model = buildSiteModel(fullFixtureInput());
const charts: ChartModel[] = everyChart(model);

/** vega-lite's own compile of the spec at the server width: what serverVegaSpec must equal. */
function compiledAtServerWidth(spec: Record<string, unknown>): Record<string, unknown> {
  return vl.compile({ ...spec, width: SERVER_WIDTH_PX } as never).spec as unknown as Record<string, unknown>;
}

describe("serverVegaSpec", () => {
  // Tolerance: none. The derived spec must serialise byte for byte like vega-lite's compile
  // (same keys, same order), so the server SVG is the one a second compile gave.
  it("equals vega-lite's compile at the server width for every chart kind, key order included", async () => {
    expect(new Set(charts.map((c) => c.kind)).size).toBe(8);
    for (const c of charts) {
      const spec = chartSpec(c);
      const derived = serverVegaSpec(spec, await compileToVega(spec), SERVER_WIDTH_PX);
      expect(derived, c.id).not.toBeNull();
      expect(JSON.stringify(derived), c.id).toBe(JSON.stringify(compiledAtServerWidth(spec)));
    }
  });

  it("leaves the browser spec alone", async () => {
    const spec = chartSpec(charts[0]);
    const browser = await compileToVega(spec);
    const before = JSON.stringify(browser);
    serverVegaSpec(spec, browser, SERVER_WIDTH_PX);
    expect(JSON.stringify(browser)).toBe(before);
  });

  it("declines shapes it does not know (the caller compiles again)", async () => {
    const spec = chartSpec(charts[0]);
    const browser = await compileToVega(spec);
    // Without its own autosize the container spec gets "fit-x" and the numeric one "pad": not derivable.
    const { autosize: _autosize, ...noAutosize } = spec;
    expect(serverVegaSpec(noAutosize, await compileToVega(noAutosize), SERVER_WIDTH_PX)).toBeNull();
    expect(serverVegaSpec({ ...spec, width: 500 }, browser, SERVER_WIDTH_PX)).toBeNull();
    const signals = browser.signals as unknown[];
    expect(serverVegaSpec(spec, { ...browser, signals: [...signals, { name: "x", value: 1 }] }, SERVER_WIDTH_PX)).toBeNull();
    expect(serverVegaSpec(spec, { ...browser, height: { signal: "h" } }, SERVER_WIDTH_PX)).toBeNull();
  });
});
