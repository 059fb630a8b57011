/**
 * Completes a site model for rendering: chart specs, their escaped JSON and server SVGs,
 * and the downloads list from the data files actually written. Returns a new model.
 */
import type { ChartModel, SiteModel } from "../report/siteModel.ts";
import { buildingDataFolder, describeDataFiles } from "../report/dataPage.ts";
import { jsonForScript } from "../report/format.ts";
import { monthlyUsageSpec } from "./charts/monthlyUsageSpec.ts";
import { renderSvg } from "./charts/renderSvg.ts";

/** Vega-Lite spec for a chart model, by kind. */
export function chartSpec(chart: ChartModel): Record<string, unknown> {
  switch (chart.kind) {
    case "monthly-usage":
    case "monthly-cost":
      return monthlyUsageSpec(chart);
  }
}

async function prepareChart(chart: ChartModel): Promise<ChartModel> {
  const spec = chartSpec(chart);
  return { ...chart, spec, specJson: jsonForScript(spec), svg: await renderSvg(spec, chart.description) };
}

/**
 * Fills every chart's `spec`, `specJson` and `svg`, the data page's file list, and each
 * building's own downloads (files under `data/buildings/<building_id>/`).
 * @example const ready = await prepareSite(model, { "findings.csv": "..." });
 */
export async function prepareSite(model: SiteModel, dataFiles: Record<string, string>): Promise<SiteModel> {
  const sizes: Record<string, number> = {};
  for (const [name, text] of Object.entries(dataFiles)) sizes[name] = Buffer.byteLength(text, "utf8");
  const buildings = [];
  for (const page of model.buildings) {
    const commodities = [];
    for (const section of page.commodities) {
      const charts = [];
      // Sequential: the headless views are cheap (~20 ms) and this keeps memory flat.
      for (const chart of section.charts) charts.push(await prepareChart(chart));
      commodities.push({ ...section, charts });
    }
    const folder = buildingDataFolder(page.buildingId);
    const own: Record<string, number> = {};
    for (const [name, size] of Object.entries(sizes)) if (name.startsWith(folder)) own[name] = size;
    buildings.push({ ...page, commodities, downloads: describeDataFiles(own, page.root) });
  }
  const indexCharts = [];
  for (const chart of model.index.charts) indexCharts.push(await prepareChart(chart));
  return {
    ...model,
    index: { ...model.index, charts: indexCharts },
    buildings,
    data: { ...model.data, files: describeDataFiles(sizes, model.data.root) },
  };
}
