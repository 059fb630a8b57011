/**
 * Scale benchmark (a script, not a test):
 *   npm run bench:scale -- --buildings N [--jobs J] [--seed S] [--repeat R] [--shards K] [--rebuild] [--keep] [--source]
 *
 * Writes a synthetic portfolio of N buildings with the demo's mix (bench/lib/scalePortfolio.ts:
 * the demo's 8 buildings replicated with unique ids) into a temporary folder, builds it once in a
 * fresh child process (bench/lib/scaleChild.ts) and prints, per pipeline stage and in total, wall
 * time and CPU time (all threads, and the client bundler it forks), the peak RSS of the build
 * process and CPU per building.
 * Other processes sharing the machine stretch wall time, not CPU time. The folder and the site
 * are removed afterwards unless --keep. With --shards K it then runs K local shard processes at
 * once (ohmbook build --shard k/K --partial …) and a merge, prints their wall times, and checks
 * that the merged site equals the single build's byte for byte. With --rebuild it builds with a
 * cache, changes one bill, rebuilds (the incremental case) and compares the rebuilt site with a
 * build of the changed folder without the cache.
 *
 * It measures the program `ohmbook` runs: the launcher runs the CLI compiled by esbuild
 * (package.json's `prepare`), not the TypeScript through tsx, whose loader, per-function name
 * wrappers and source maps cost 5–13 % more CPU. So the builds run a bundle made here with the
 * same esbuild options as `prepare` (in dist/bench, beside dist/cli, so every path the code
 * derives from its own location is the same); `--source` runs the TypeScript through tsx instead.
 */
import { spawn, spawnSync } from "node:child_process";
import { readFileSync, rmSync } from "node:fs";
import { mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { availableParallelism, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { parseArgs } from "node:util";
import { writeScalePortfolio } from "./lib/scalePortfolio.ts";
import { childEnv } from "../bin/childEnv.js";

const { values } = parseArgs({
  options: {
    buildings: { type: "string", default: "8" },
    jobs: { type: "string" },
    seed: { type: "string", default: "1" },
    repeat: { type: "string", default: "1" },
    keep: { type: "boolean", default: false },
    shards: { type: "string" },
    rebuild: { type: "boolean", default: false },
    source: { type: "boolean", default: false },
  },
});
const buildings = Number(values.buildings);
const repeat = Number(values.repeat);
const root = fileURLToPath(new URL("..", import.meta.url));

interface ChildReport {
  stages: { name: string; wallMs: number; cpuMs: number; rssEndMiB: number; peakRssMiB: number | null; heapAfterGcMiB: number | null; buffersAfterGcMiB: number | null }[];
  wallMs: number;
  cpuMs: number;
  maxRssKiB: number;
  buildings: number;
  failed: number;
}

const compiled = values.source ? null : compileForBench();
const folder = await mkdtemp(join(tmpdir(), `ohmbook-scale-${buildings}-`));
const dir = join(folder, "portfolio");
const generated = await writeScalePortfolio(join(root, "data", "demo"), dir, buildings, Number(values.seed));
const s = (ms: number) => (ms / 1000).toFixed(1).padStart(7);
console.log(`# ohmbook scale benchmark: ${generated.buildings} buildings, ${generated.meters} meters (${generated.intervalMeters} with 15-minute data), ${generated.bills} bills`);
console.log(`# machine: ${availableParallelism()} cores, load average ${loadavg().map((x) => x.toFixed(2)).join(" ")}; ${join(folder)}`);
console.log(`# program: ${compiled ? "compiled by esbuild as ohmbook runs it (dist/bench)" : "TypeScript source through tsx (--source)"}`);
const options: Record<string, unknown> = {};
if (values.jobs !== undefined) options.jobs = Number(values.jobs);
try {
  for (let run = 0; run < repeat; run++) {
    const out = join(folder, `site-${run}`);
    printReport(`run ${run + 1}${values.jobs !== undefined ? ` (--jobs ${values.jobs})` : ""}`, buildOnce(out, options), true);
  }
  if (values.rebuild) await rebuildRun();
  // --rebuild changed a bill: the shards then build the changed folder, whose single build is site-fresh
  if (values.shards !== undefined) await shardRun(Number(values.shards), join(folder, values.rebuild ? "site-fresh" : "site-0"));
} finally {
  if (!values.keep) await rm(folder, { recursive: true, force: true });
}

/** One build of the portfolio in a fresh child process (bench/lib/scaleChild.ts), its report. */
function buildOnce(out: string, buildOptions: Record<string, unknown>): ChildReport {
  const program = compiled ? [join(compiled, "scaleChild.js")] : ["--import", "tsx", join(root, "bench", "lib", "scaleChild.ts")];
  const child = spawnSync(process.execPath, ["--expose-gc", ...program, dir, out, JSON.stringify(buildOptions)], {
    cwd: root,
    encoding: "utf8",
    maxBuffer: 1 << 26,
    // The environment the launcher (bin/ohmbook.js) gives the CLI, so the figures are the ones users get.
    env: childEnv({ ...process.env, NODE_OPTIONS: process.env.NODE_OPTIONS ?? "" }),
  });
  if (child.status !== 0) {
    console.error(child.stderr);
    throw new Error(`build failed (exit ${child.status ?? child.signal})`);
  }
  return JSON.parse(child.stdout.trim().split("\n").pop()!) as ChildReport;
}

function printReport(title: string, report: ChildReport, result: boolean): void {
  console.log(`\n## ${title}`);
  console.log(`${"stage".padEnd(58)} ${"wall s".padStart(7)} ${"CPU s".padStart(7)} ${"peak RSS MiB".padStart(13)} ${"kept: heap".padStart(11)} ${"buffers MiB".padStart(12)}`);
  for (const st of report.stages) console.log(`${st.name.slice(0, 58).padEnd(58)} ${s(st.wallMs)} ${s(st.cpuMs)} ${String(st.peakRssMiB ?? st.rssEndMiB).padStart(13)} ${String(st.heapAfterGcMiB ?? "-").padStart(11)} ${String(st.buffersAfterGcMiB ?? "-").padStart(12)}`);
  console.log(`${"total".padEnd(58)} ${s(report.wallMs)} ${s(report.cpuMs)}`);
  console.log(`CPU per building ${(report.cpuMs / 1000 / report.buildings).toFixed(2)} s; wall per building ${(report.wallMs / 1000 / report.buildings).toFixed(2)} s; peak RSS ${(report.maxRssKiB / 1024 / 1024).toFixed(2)} GiB; buildings failed ${report.failed}`);
  if (result) console.log(`RESULT ${JSON.stringify({ buildings, jobs: values.jobs ?? null, wallS: +(report.wallMs / 1000).toFixed(1), cpuPerBuildingS: +(report.cpuMs / 1000 / report.buildings).toFixed(3), peakRssGiB: +(report.maxRssKiB / 1024 / 1024).toFixed(3) })}`);
}

/**
 * The incremental rebuild a nightly run sees: a build with a cache, then one bill's total
 * changed by a cent (the first bill in bills.csv) and the same build again, timed; the rebuilt
 * site is then compared with a build of the changed folder without the cache.
 */
async function rebuildRun(): Promise<void> {
  const cacheDir = join(folder, "cache");
  const out = join(folder, "site-cached");
  printReport("build with a cache (--cache)", buildOnce(out, { ...options, cacheDir }), false);
  const billsFile = join(dir, "bills.csv");
  const lines = (await readFile(billsFile, "utf8")).split("\n");
  const header = lines[0]!.split(",");
  const total = header.indexOf("total");
  const cells = lines[1]!.split(",");
  cells[total] = (Number(cells[total]) + 0.01).toFixed(2);
  lines[1] = cells.join(",");
  await writeFile(billsFile, lines.join("\n"));
  const rebuilt = buildOnce(out, { ...options, cacheDir });
  printReport(`rebuild after one bill changed (${cells[1]})`, rebuilt, false);
  const fresh = join(folder, "site-fresh");
  const full = buildOnce(fresh, options);
  const same = await sameTree(out, fresh);
  console.log(`\none-bill rebuild ${(rebuilt.wallMs / 1000).toFixed(1)} s wall, ${(rebuilt.cpuMs / 1000).toFixed(1)} s CPU: ${(rebuilt.wallMs / full.wallMs).toFixed(2)}× the wall and ${(rebuilt.cpuMs / full.cpuMs).toFixed(2)}× the CPU of a build without the cache (${(full.wallMs / 1000).toFixed(1)} s); rebuilt site ${same ? "identical to" : "DIFFERENT from"} that build`);
  console.log(`REBUILD ${JSON.stringify({ buildings, rebuildWallS: +(rebuilt.wallMs / 1000).toFixed(1), rebuildCpuS: +(rebuilt.cpuMs / 1000).toFixed(1), fullWallS: +(full.wallMs / 1000).toFixed(1), identical: same })}`);
  if (!same) process.exitCode = 1;
}

async function sameTree(a: string, b: string): Promise<boolean> {
  const files = await filesOf(a);
  return JSON.stringify(await filesOf(b)) === JSON.stringify(files) && (await Promise.all(files.map(async (f) => (await readFile(join(a, f))).equals(await readFile(join(b, f)))))).every(Boolean);
}

/**
 * The bench's own bundle of the CLI, the analysis worker, the client-bundle child and the bench
 * child, made with package.json's `prepare` command (its esbuild options) into dist/bench.
 * Returns the folder.
 */
function compileForBench(): string {
  const pkg = JSON.parse(readFileSync(join(root, "package.json"), "utf8")) as { scripts: Record<string, string> };
  const [tool, ...args] = pkg.scripts.prepare!.split(/\s+/);
  const outdir = join("dist", "bench");
  if (tool !== "esbuild" || !args.some((a) => a.startsWith("--outdir="))) throw new Error(`package.json's prepare is not the esbuild command this bench expects: ${pkg.scripts.prepare}`);
  // emptied first: chunk names change with the code, and old chunks would stay beside the new
  rmSync(join(root, outdir), { recursive: true, force: true });
  const built = spawnSync(join(root, "node_modules", ".bin", "esbuild"), [...args.map((a) => (a.startsWith("--outdir=") ? `--outdir=${outdir}` : a)), "scaleChild=bench/lib/scaleChild.ts"], { cwd: root, encoding: "utf8" });
  if (built.status !== 0) throw new Error(`esbuild failed:\n${built.stderr}`);
  return join(root, outdir);
}

/** The CLI in a child process (the bench's bundle, or the source through tsx); resolves with its wall time, rejects on a failure. */
function cli(args: string[]): Promise<number> {
  const t0 = performance.now();
  const program = compiled ? [join(compiled, "main.js")] : ["--import", "tsx", join(root, "src", "cli", "main.ts")];
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [...program, ...args], { cwd: root, stdio: ["ignore", "ignore", "pipe"], env: childEnv() });
    let err = "";
    child.stderr.on("data", (d) => (err += String(d)));
    child.on("close", (code) => (code === 0 ? resolve(performance.now() - t0) : reject(new Error(`ohmbook ${args.join(" ")} failed:\n${err}`))));
  });
}

async function filesOf(dir: string): Promise<string[]> {
  return (await readdir(dir, { withFileTypes: true, recursive: true })).filter((e) => e.isFile()).map((e) => join(e.parentPath, e.name).slice(dir.length + 1)).sort();
}

/** K shard processes at once, then the merge; the merged site must equal the single build's. */
async function shardRun(k: number, single: string): Promise<void> {
  const t0 = performance.now();
  const partials = Array.from({ length: k }, (_, i) => join(folder, `partial-${i + 1}`));
  const shardWalls = await Promise.all(partials.map((p, i) => cli(["build", dir, "--shard", `${i + 1}/${k}`, "--partial", p, "--jobs", "1", "--quiet"])));
  const shardsWall = performance.now() - t0;
  const merged = join(folder, "merged");
  const mergeWall = await cli(["merge", ...partials, "--out", merged, "--quiet"]);
  const same = await sameTree(single, merged);
  console.log(`\n## ${k} local shards + merge`);
  console.log(`shards (at once) ${(shardsWall / 1000).toFixed(1)} s wall (each ${shardWalls.map((w) => (w / 1000).toFixed(1)).join(", ")} s); merge ${(mergeWall / 1000).toFixed(1)} s; merged site ${same ? "identical to" : "DIFFERENT from"} the single build`);
  console.log(`SHARDS ${JSON.stringify({ shards: k, shardsWallS: +(shardsWall / 1000).toFixed(1), mergeWallS: +(mergeWall / 1000).toFixed(1), identical: same })}`);
  if (!same) process.exitCode = 1;
}
