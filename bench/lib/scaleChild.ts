/**
 * Child process of bench/scale.ts: builds one portfolio through the pipeline
 * (buildPortfolioSite) with a reporter that timestamps every stage, then prints one JSON line
 * with each stage's wall time and CPU time (process.cpuUsage: every thread of the process, so
 * worker threads count) and the process's peak RSS (process.resourceUsage().maxRSS, KiB).
 * Usage: tsx bench/lib/scaleChild.ts DIR OUT [build options as JSON]
 */
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import type { Reporter } from "../../src/cli/progress.ts";

const [dir, out, extra] = process.argv.slice(2);
if (!dir || !out) throw new Error("usage: scaleChild.ts DIR OUT [options-json]");
const options = extra ? (JSON.parse(extra) as Record<string, unknown>) : {};

interface Stage { name: string; wallMs: number; cpuMs: number; rssEndMiB: number }
const stages: Stage[] = [];
let current: { name: string; wall: number; cpu: number } | null = null;
const cpuNow = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1000; };
const close = () => {
  if (current) stages.push({ name: current.name, wallMs: performance.now() - current.wall, cpuMs: cpuNow() - current.cpu, rssEndMiB: Math.round(process.memoryUsage().rss / 2 ** 20) });
  current = null;
};
const reporter: Reporter = {
  stage(message) {
    close();
    current = { name: message.replace(/ to \/.*$/, "").replace(/^Reading .*/, "Reading the portfolio"), wall: performance.now(), cpu: cpuNow() };
  },
  step() {},
  warn() {},
  finish() {},
};
const wall0 = performance.now();
const cpu0 = cpuNow();
const result = await buildPortfolioSite({ dir, outDir: out, strict: false, reporter, ...options });
close();
process.stdout.write(`${JSON.stringify({
  stages,
  wallMs: performance.now() - wall0,
  cpuMs: cpuNow() - cpu0,
  maxRssKiB: process.resourceUsage().maxRSS,
  buildings: result.summary.buildings,
  failed: result.summary.buildingsFailed.length,
})}\n`);
