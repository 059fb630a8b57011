/**
 * Child process of bench/scale.ts: builds one portfolio through the pipeline
 * (buildPortfolioSite) with a reporter that timestamps every stage, then prints one JSON line
 * with each stage's wall time and CPU time (process.cpuUsage: every thread of the process, so
 * worker threads count; plus the children it has waited for, the client bundler: childCpu.ts)
 * and the process's peak RSS (process.resourceUsage().maxRSS, KiB).
 * Usage: tsx bench/lib/scaleChild.ts DIR OUT [build options as JSON]
 */
import { readFileSync, writeFileSync } from "node:fs";
import { buildPortfolioSite } from "../../src/pipeline/build.ts";
import type { Reporter } from "../../src/cli/progress.ts";
import { finishedChildrenCpuMs } from "./childCpu.ts";

const [dir, out, extra] = process.argv.slice(2);
if (!dir || !out) throw new Error("usage: scaleChild.ts DIR OUT [options-json]");
const options = extra ? (JSON.parse(extra) as Record<string, unknown>) : {};

interface Stage { name: string; wallMs: number; cpuMs: number; rssEndMiB: number; peakRssMiB: number | null; heapAfterGcMiB: number | null; buffersAfterGcMiB: number | null }
const stages: Stage[] = [];
let current: { name: string; wall: number; cpu: number } | null = null;
const cpuNow = () => { const u = process.cpuUsage(); return (u.user + u.system) / 1000 + finishedChildrenCpuMs(); };
// With --expose-gc (bench/scale.ts passes it) each stage ends with a full collection, outside
// its timing, so the heap left is what the stage keeps, not garbage it has not collected yet.
const gc = (globalThis as { gc?: () => void }).gc;
const close = () => {
  if (current) {
    const wallMs = performance.now() - current.wall;
    const cpuMs = cpuNow() - current.cpu;
    const rssEndMiB = Math.round(process.memoryUsage().rss / 2 ** 20);
    const peakRssMiB = stagePeakRssMiB();
    gc?.();
    const m = process.memoryUsage();
    stages.push({ name: current.name, wallMs, cpuMs, rssEndMiB, peakRssMiB, heapAfterGcMiB: gc ? Math.round(m.heapUsed / 2 ** 20) : null, buffersAfterGcMiB: gc ? Math.round(m.arrayBuffers / 2 ** 20) : null });
  }
  current = null;
};

/**
 * The stage's peak RSS: Linux keeps the process's high-water mark in /proc/self/status (VmHWM),
 * and writing 5 to /proc/self/clear_refs resets it (proc(5)), so each stage reads its own peak.
 * Null elsewhere.
 */
function stagePeakRssMiB(): number | null {
  try {
    const kib = Number(/VmHWM:\s+(\d+)/.exec(readFileSync("/proc/self/status", "utf8"))?.[1]);
    writeFileSync("/proc/self/clear_refs", "5");
    return Number.isFinite(kib) ? Math.round(kib / 1024) : null;
  } catch {
    return null;
  }
}
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
  // Resetting the high-water mark per stage also lowers getrusage's figure: take the stages' peaks too.
  maxRssKiB: Math.max(process.resourceUsage().maxRSS, ...stages.map((st) => (st.peakRssMiB ?? 0) * 1024)),
  buildings: result.summary.buildings,
  failed: result.summary.buildingsFailed.length,
})}\n`);
