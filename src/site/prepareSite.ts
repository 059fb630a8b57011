/**
 * Completes a site model for rendering: every chart's Vega-Lite spec, the spec compiled to Vega
 * (escaped JSON for the page: the browser runs only the vega runtime), its server SVG, and the
 * downloads lists from the data files actually written. Returns a new model.
 */
import type { ChartModel, SiteModel } from "../report/index.ts";
import { buildingDataFolder, describeDataFiles } from "../report/index.ts";
import { monthlyUsageSpec } from "./charts/monthlyUsageSpec.ts";
import { baselineScatterSpec, baselineTimeSpec, heatmapSpec, rankingSpec } from "./charts/analysisSpecs.ts";
import { compileToVegaJson, renderSvg } from "./charts/renderSvg.ts";
import { heatmapSvg } from "./charts/heatmapSvg.ts";
import { forecastSpec } from "./charts/forecastSpec.ts";
import { tenantSpec } from "./charts/tenantSpec.ts";

/** The data files the dispute list offers for download, when this build wrote them. */
const DISPUTE_FILES = ["disputes.csv", "disputes.json"];

function pick(sizes: Record<string, number>, names: readonly string[]): Record<string, number> {
  const out: Record<string, number> = {};
  for (const n of names) if (n in sizes) out[n] = sizes[n];
  return out;
}

/** Vega-Lite spec for a chart model, by kind. */
export function chartSpec(chart: ChartModel): Record<string, unknown> {
  switch (chart.kind) {
    case "monthly-usage":
    case "monthly-cost":
      return monthlyUsageSpec(chart);
    case "baseline-scatter":
      return baselineScatterSpec(chart);
    case "baseline-time":
      return baselineTimeSpec(chart);
    case "quality-heatmap":
      return heatmapSpec(chart);
    case "ranking":
      return rankingSpec(chart);
    case "forecast-band":
      return forecastSpec(chart);
    case "tenant-months":
      return tenantSpec(chart);
  }
}

/** Fills `spec`, `specJson` (compiled Vega) and `svg` of one chart. */
export async function prepareChart<T extends ChartModel>(chart: T): Promise<T> {
  const spec = chartSpec(chart);
  // The JSON is written before the server render, which may reuse parts of the compile.
  const { json: specJson, compiled } = await compileToVegaJson(spec);
  // The heatmap's SVG from vega would hold one element per cell; ours bands them into paths.
  const svg = chart.kind === "quality-heatmap" ? heatmapSvg(chart) : await renderSvg(spec, chart.description, compiled);
  return { ...chart, spec, specJson, svg };
}

async function prepareAll<T extends ChartModel>(charts: readonly T[]): Promise<T[]> {
  const out: T[] = [];
  // Sequential: the headless views are cheap (~20 ms) and this keeps memory flat.
  for (const c of charts) out.push(await prepareChart(c));
  return out;
}

async function prepareMaybe<T extends ChartModel>(chart: T | null): Promise<T | null> {
  return chart ? prepareChart(chart) : null;
}

/** Byte size of each data file (name relative to data/ → bytes), for the downloads lists. */
export function dataFileSizes(dataFiles: Record<string, string>): Record<string, number> {
  const sizes: Record<string, number> = {};
  for (const [name, text] of Object.entries(dataFiles)) sizes[name] = Buffer.byteLength(text, "utf8");
  return sizes;
}

/** Building pages with their charts filled and their own downloads (files under `data/buildings/<building_id>/`). */
export async function prepareBuildingPages(pages: readonly SiteModel["buildings"][number][], ownSizes: (buildingId: string) => Record<string, number>): Promise<SiteModel["buildings"]> {
  const buildings = [];
  for (const page of pages) {
    const commodities = [];
    for (const section of page.commodities) commodities.push({ ...section, charts: await prepareAll(section.charts) });
    const own = ownSizes(page.buildingId);
    const forecast = page.forecast ? { ...page.forecast, chart: await prepareMaybe(page.forecast.chart) } : null;
    buildings.push({ ...page, commodities, forecast, downloads: describeDataFiles(own, page.root) });
  }
  return buildings;
}

/**
 * A building's own data files (under `data/buildings/<building_id>/`) with their sizes, looked up
 * in an index of `sizes` made once: filtering every file's name for each building cost time in
 * proportion to buildings × files. Each record lists its files in the order `sizes` does.
 */
export function buildingDataSizeIndex(sizes: Readonly<Record<string, number>>): (buildingId: string) => Record<string, number> {
  // Every name under each folder that ends a prefix of it (`buildings/`, `buildings/a/`, …): the
  // names that start with a folder are exactly those indexed under it.
  const byFolder = new Map<string, Record<string, number>>();
  for (const [name, size] of Object.entries(sizes)) {
    for (let slash = name.indexOf("/"); slash !== -1; slash = name.indexOf("/", slash + 1)) {
      const folder = name.slice(0, slash + 1);
      let own = byFolder.get(folder);
      if (own === undefined) byFolder.set(folder, (own = {}));
      own[name] = size;
    }
  }
  return (buildingId) => ({ ...byFolder.get(buildingDataFolder(buildingId)) });
}

/** Meter pages with their weather-baseline and data-quality charts filled. */
export async function prepareMeterPages(pages: readonly SiteModel["meterBills"][number][]): Promise<SiteModel["meterBills"]> {
  const meterBills = [];
  for (const page of pages) {
    const baseline = page.baseline ? { ...page.baseline, charts: await prepareAll(page.baseline.charts) } : null;
    const quality = page.quality ? { ...page.quality, charts: await prepareAll(page.quality.charts) } : null;
    meterBills.push({ ...page, baseline, quality });
  }
  return meterBills;
}

/** Tenant pages with their charts filled. */
export async function prepareTenantPages(pages: readonly SiteModel["tenants"][number][]): Promise<SiteModel["tenants"]> {
  const tenants = [];
  for (const page of pages) {
    const commodities = [];
    for (const c of page.commodities) commodities.push({ ...c, chart: await prepareMaybe(c.chart) });
    tenants.push({ ...page, commodities });
  }
  return tenants;
}

/**
 * The model with the portfolio-level pages filled (index charts, the data page's file list, the
 * dispute list's downloads) and the building, meter and tenant pages left as they are: the site
 * writer fills those a few at a time (prepareBuildingPages, prepareMeterPages,
 * prepareTenantPages) so their charts are never all in memory at once.
 */
export async function preparePortfolioPages(model: SiteModel, sizes: Record<string, number>): Promise<SiteModel> {
  return {
    ...model,
    index: {
      ...model.index,
      charts: await prepareAll(model.index.charts),
      intensityChart: await prepareMaybe(model.index.intensityChart),
    },
    data: { ...model.data, files: describeDataFiles(sizes, model.data.root) },
    disputes: { ...model.disputes, downloads: describeDataFiles(pick(sizes, DISPUTE_FILES), model.disputes.root) },
  };
}

/**
 * Fills every chart's `spec`, `specJson` and `svg` (index, building and meter pages), the data
 * page's file list, each building's own downloads (files under `data/buildings/<building_id>/`)
 * and the dispute list's downloads (disputes.csv and disputes.json, when written).
 * @example const ready = await prepareSite(model, { "findings.csv": "..." });
 */
export async function prepareSite(model: SiteModel, dataFiles: Record<string, string>): Promise<SiteModel> {
  const sizes = dataFileSizes(dataFiles);
  const buildings = await prepareBuildingPages(model.buildings, buildingDataSizeIndex(sizes));
  const meterBills = await prepareMeterPages(model.meterBills);
  const tenants = await prepareTenantPages(model.tenants);
  return { ...(await preparePortfolioPages(model, sizes)), buildings, meterBills, tenants };
}
