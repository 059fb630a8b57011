/**
 * How much of a rendered chart minor garbage collections cannot free (a diagnostic, not a test):
 *   npx tsx --expose-gc bench/chartSurvival.ts [charts]
 *
 * Renders charts one after another through the site's own path (monthlyUsageSpec → renderSvg),
 * then compares the heap after two minor collections with the heap after a full one. What only
 * the full collection frees is garbage that every scavenge copies and then promotes: in the
 * site stage that is most of what scavenges keep (DEVELOPERS.md, "Where the growth is").
 * Measured on this machine kind with vega 6: about 0.7 MB a chart of about 3.5 MB allocated.
 */
import { getHeapStatistics } from "node:v8";
import { monthlyUsageSpec } from "../src/site/charts/monthlyUsageSpec.ts";
import { compileToVegaJson, renderSvg } from "../src/site/charts/renderSvg.ts";

const gc = (globalThis as { gc?: (options?: { type: "minor" | "major" }) => void }).gc;
if (!gc) {
  console.error("run with node's --expose-gc: npx tsx --expose-gc bench/chartSurvival.ts");
  process.exit(2);
}
const charts = Number(process.argv[2] ?? 5);
const months = Array.from({ length: 36 }, (_, i) => `${2023 + Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, "0")}`);

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

const used = () => getHeapStatistics().used_heap_size;
// warm up: libraries loaded, the chart's shape compiled and parsed, code optimized
for (let k = 0; k < 30; k++) await renderOne(k);
gc();
gc({ type: "minor" });
const start = used();
for (let k = 0; k < charts; k++) await renderOne(100 + k);
gc({ type: "minor" });
gc({ type: "minor" });
const afterMinor = used();
gc();
const afterFull = used();
const mb = (bytes: number) => (bytes / 2 ** 20).toFixed(2);
console.log(`${charts} charts: heap +${mb(afterMinor - start)} MB after two minor collections, +${mb(afterFull - start)} MB after a full one`);
console.log(`kept by minor collections only: ${mb((afterMinor - afterFull) / charts)} MB a chart`);
