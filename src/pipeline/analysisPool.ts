/**
 * Buildings analysed on every core: each building's analysis (analyseBuilding) runs in a worker
 * thread of a pool (tinypool), `jobs` at a time, and its results come back as plain data
 * (structured clone) in the portfolio's building order, so the site does not depend on `jobs`.
 *
 * What crosses the boundary:
 * - in: the building's slice of the portfolio (its meters, bills, lines, interval series and
 *   masks, the weather it uses, every tariff), plus — for a building with a short-history
 *   interval meter, whose hourly model borrows from the portfolio's other electricity meters
 *   (intervalBaselines.ts poolFor) — those meters and their buildings' weather;
 * - out: the results with functions dropped (plainResults): the hourly models reduced to their
 *   summaries (all later stages read), and each meter's change-point fit rebuilt on this side
 *   from its points (hydrateResults; the same fit, bit for bit, as the search found).
 * `jobs: 1` analyses in this thread but through the same task and plain form, so both paths give
 * the same results; test/pipeline/analysisPool.test.ts builds a portfolio both ways and compares every file.
 */
import { availableParallelism } from "node:os";
import Tinypool from "tinypool";
import type { Building, Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { internStrings } from "../core/internStrings.ts";
import { OhmbookError, type BugPolicy } from "../core/errors.ts";
import type { BuildingResults } from "../report/index.ts";
import { analyseTask, buildingTask, hydrateResults, type BuildingTask, type PlainResults } from "./buildingTask.ts";
import { cacheKey, digestAnalysis, isCached, keyTariffs, pruneCache, readCached, writeCached, type AnalysisCache } from "./analysisCache.ts";

export interface AnalyseOptions {
  /** Worker threads; 1 analyses in this thread. Default: os.availableParallelism(). */
  jobs?: number;
  /** Called as each building finishes (in completion order), with how many are done. */
  onDone?: (done: number, total: number, buildingId: string) => void;
  /** Reuse and store each building's results here (analysisCache.ts); none by default. */
  cache?: AnalysisCache;
  /** A bug in a building's analysis: fail the build (default) or make it the building's failure and report it. */
  onBug?: BugPolicy;
  /** Called with the bug report line of a building whose analysis hit a bug (onBug `report`). */
  onBugReport?: (buildingId: string, line: string) => void;
  /** Analyse only these buildings (a shard); the others are left out of the results. */
  only?: ReadonlySet<string>;
  /** Every building must come from the cache (merging shards): a miss is an error, never analysed here. */
  requireCached?: boolean;
}

/** The default `--jobs`: the cores Node may use. */
export function defaultJobs(): number {
  return availableParallelism();
}

/** Where the worker module is: beside the compiled CLI (dist/cli), or the TypeScript source through tsx. */
function workerFilename(): string {
  const here = import.meta.url;
  return here.endsWith(".ts") ? new URL("./analyseWorker.dev.mjs", here).href : new URL("./analyseWorker.js", here).href;
}

/**
 * Every building of `portfolio` analysed, results in the portfolio's building order; with a
 * cache, buildings whose task is unchanged are read from it instead (analysisCache.ts).
 * @example const results = await analyseBuildings(portfolio, masks, { jobs: 2 });
 */
export async function analyseBuildings(portfolio: Portfolio<Tariff>, masks: ReadonlyMap<string, Uint8Array>, options: AnalyseOptions = {}): Promise<BuildingResults[]> {
  const buildings = options.only ? portfolio.buildings.filter((b) => options.only!.has(b.buildingId)) : portfolio.buildings;
  const jobs = Math.max(1, Math.min(options.jobs ?? defaultJobs(), buildings.length));
  const cache = options.cache ?? null;
  if (cache) keyTariffs(cache, portfolio.tariffs);
  const results: BuildingResults[] = new Array(buildings.length);
  // Results from threads and the cache carry a copy of every string; keep one of each (internStrings.ts).
  const strings = new Map<string, string>();
  let done = 0;
  const onBug = options.onBug ?? "fail";
  const { threads, keys } = threadsWorthStarting(portfolio, buildings, masks, jobs, cache, onBug);
  // Threads start only when a building is not in the cache.
  let pool: Tinypool | null = null;
  const analyse = async (task: BuildingTask): Promise<PlainResults> => {
    if (threads <= 1) return analyseTask(task);
    pool ??= new Tinypool({ filename: workerFilename(), minThreads: threads, maxThreads: threads, idleTimeout: 1000 });
    return (await pool.run(task)) as PlainResults;
  };
  try {
    let next = 0;
    const run = async (): Promise<void> => {
      while (next < buildings.length) {
        const i = next++;
        // A building whose key is known and cached needs no task (its slice is not even made).
        let slice: BuildingTask | null = null;
        const task = () => (slice ??= buildingTask(portfolio, buildings[i]!, masks, onBug));
        const key = cache ? (keys[i] ?? cacheKey(cache, task())) : null;
        let plain = cache && key ? await readCached(cache, key) : null;
        if (!plain && options.requireCached) {
          throw new OhmbookError(`building ${buildings[i]!.buildingId} is in no partial result with these inputs: a shard was built from other input files, settings or program; build the shards again`);
        }
        if (!plain) {
          plain = await analyse(task());
          // A bug's outcome is not kept: the next build (or a fixed ohmbook) tries again.
          if (cache && key && plain.bugReport === undefined) await writeCached(cache, key, plain);
        }
        if (plain.bugReport !== undefined) options.onBugReport?.(buildings[i]!.buildingId, plain.bugReport);
        results[i] = hydrateResults(internStrings(plain, strings));
        if (key) digestAnalysis(results[i]!, key);
        options.onDone?.(++done, buildings.length, buildings[i]!.buildingId);
      }
    };
    // With threads, two tasks per thread in flight, so the slices waiting to be sent stay few.
    await Promise.all(Array.from({ length: threads <= 1 ? 1 : threads * 2 }, run));
  } finally {
    await (pool as Tinypool | null)?.destroy();
  }
  if (cache) await pruneCache(cache);
  return results;
}

/**
 * Threads pay for themselves only with two or more buildings to analyse (each thread loads the
 * whole analysis code first): with a cache, the keys are worked out until a second building
 * missing from it is found, and with fewer than two the analysis runs in this thread (the
 * results are the same either way). The keys worked out are kept for the run.
 */
export function threadsWorthStarting(portfolio: Portfolio<Tariff>, buildings: readonly Building[], masks: ReadonlyMap<string, Uint8Array>, jobs: number, cache: AnalysisCache | null, onBug: BugPolicy): { threads: number; keys: (string | undefined)[] } {
  const keys: (string | undefined)[] = new Array(buildings.length);
  if (!cache || jobs <= 1) return { threads: jobs, keys };
  let misses = 0;
  for (let i = 0; i < buildings.length && misses < 2; i++) {
    const key = (keys[i] = cacheKey(cache, buildingTask(portfolio, buildings[i]!, masks, onBug)));
    if (!isCached(cache, key)) misses++;
  }
  return { threads: misses < 2 ? 1 : jobs, keys };
}
