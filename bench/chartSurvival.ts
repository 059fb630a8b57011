/**
 * How much of a rendered chart minor garbage collections cannot free (a diagnostic, not a test):
 *   npx tsx --expose-gc bench/chartSurvival.ts [charts]
 * (charts: default 3; keep it small enough that they fit in V8's young generation, about 16 MB,
 * or scavenges run between them and promote what they keep, out of reach of this count)
 *
 * Renders charts one after another through the site's own path (monthlyUsageSpec → renderSvg),
 * drops them, and reads the young generation after a minor collection: what it kept of charts
 * nobody refers to any more, which every scavenge copies and the next one promotes, and which
 * only a full collection frees (shown after one). In the site stage that is most of what
 * scavenges keep (DEVELOPERS.md, "Where the growth is").
 * Measured on this machine kind with vega 6: about 0.5 MB a chart of about 3.5 MB allocated.
 */
import { getHeapSpaceStatistics } from "node:v8";
import { monthlyUsageSpec } from "../src/site/charts/monthlyUsageSpec.ts";
import { compileToVegaJson, renderSvg } from "../src/site/charts/renderSvg.ts";
import { monthsAfter } from "../src/core/time/index.ts";

const gc = (globalThis as { gc?: (options?: { type: "minor" | "major" }) => void }).gc;
if (!gc) {
  console.error("run with node's --expose-gc: npx tsx --expose-gc bench/chartSurvival.ts");
  process.exit(2);
}
const charts = Number(process.argv[2] ?? 3);
const months = monthsAfter("2022-12-31", 36).map((m) => m.month);

async function renderOne(k: number): Promise<void> {
  const chart = {
    title: `Use of meter ${k}`,
    description: "Monthly use",
    valueLabel: "Usage (kWh)",
    data: months.flatMap((month, i) => [
      { month, series: "Electricity", value: 100 + ((i * (k + 3)) % 37) },
      { month, series: "Gas", value: 30 + (k % 11) },
    ]),
  };
  const spec = monthlyUsageSpec(chart);
  const { compiled } = await compileToVegaJson(spec);
  await renderSvg(spec, chart.description, compiled);
}

/** Bytes in V8's young generation (after a minor collection: what that collection kept). */
const young = () => getHeapSpaceStatistics().find((space) => space.space_name === "new_space")?.space_used_size ?? Number.NaN;
// warm up: libraries loaded, the chart's shape compiled and parsed, code optimized
for (let k = 0; k < 30; k++) await renderOne(k);
gc();
gc({ type: "minor" });
const before = young();
for (let k = 0; k < charts; k++) await renderOne(100 + k);
gc({ type: "minor" });
const kept = young();
gc();
gc({ type: "minor" });
const afterFull = young();
const mb = (bytes: number) => (bytes / 2 ** 20).toFixed(2);
console.log(`${charts} charts rendered and dropped: a minor collection keeps ${mb(kept - before)} MB of them (${mb((kept - before) / charts)} MB a chart); after a full collection ${mb(afterFull - before)} MB`);
