/**
 * `ohmbook build`: the whole pipeline, stage by stage —
 * ingest → price every bill → reconcile with interval data → audit → baselines → view models → site.
 * Computation stages are pure; this module only sequences them, isolates failures per building,
 * and hands the results to the site writer (the only stage that writes files).
 */
import { InputError, bugReportLine, type BugPolicy } from "../core/errors.ts";
import type { Portfolio } from "../domain/types.ts";
import { join, resolve, sep } from "node:path";
import type { InputIssue } from "../core/issues.ts";
import { loadPortfolio } from "../ingest/index.ts";
import type { Tariff } from "../tariff/index.ts";
import type { Finding } from "../audit/index.ts";
import { silentReporter, type Reporter } from "./reporter.ts";
import type { PricedBill } from "../tariff/index.ts";
import { assessIntervalMeters } from "../clean/index.ts";
import { buildDisputes, type Dispute } from "../disputes/index.ts";
import { billCheckState } from "../tariff/index.ts";
import { monthlyMeteredByMeter } from "./monthly.ts";
import { meteredViewsByBill } from "../audit/index.ts";
import { toReportInput, type BuildingResults } from "../report/index.ts";
import { dataFileEntries } from "../report/index.ts";
import { collectGarbage } from "../core/collectGarbage.ts";
import { tuneCompilerForBuilds } from "../core/compilerTuning.ts";
import { oneShot } from "../core/oneShot.ts";
import { buildSiteModel, siteModelInParts, tenantSiteModel } from "../report/index.ts";
import { analysedPricing, forecastWithTrackRecord, type AnalysedPricing, type ForecastBundle } from "../forecast/index.ts";
import { effectiveAsOf } from "../report/index.ts";
import { cutAtAsOf } from "./asOf.ts";
import { checkOutputFolder, makeScratchFolder, removeScratchFolder, SiteWriteError, startClientBundle, writeSite, type EarlyBundle } from "../site/index.ts";
import { IntervalShelf } from "./intervalShelf.ts";
import { withInputDigests } from "./hashOnce.ts";
import { PricedShelf } from "./pricedShelf.ts";
import { problemOrBug, rethrow, type BugHandler } from "./analyseBuilding.ts";
import { analyseBuildings } from "./analysisPool.ts";
import { cacheMemo, defaultCacheDir, openAnalysisCache, programFingerprint, type AnalysisCache } from "./analysisCache.ts";
import { buildingsDigest, gatherPartials, partialAnalysesDir, PARTIAL_FORMAT, preparePartialDir, shardOf, writeManifest, type ShardSpec } from "./shards.ts";
import { rm } from "node:fs/promises";
import { moneyText, roundCents } from "../core/money.ts";
import type { Memo } from "../core/memo.ts";

export interface BuildOptions {
  dir: string;
  outDir: string;
  /** Any rejected row or failing building fails the build (exit 1, nothing written). */
  strict: boolean;
  reporter?: Reporter;
  /** `tenants`: write only the tenant pages (no internal page, link, CSV or JSON). Default `internal`. */
  audience?: "internal" | "tenants";
  /**
   * Build date `YYYY-MM-DD` (the CLI passes SOURCE_DATE_EPOCH's). Default: the portfolio's
   * as-of date (its `as_of`, else its last data), so the same inputs give the same site on any
   * day; the clock only for a portfolio with no bills at all.
   */
  buildDate?: string;
  /**
   * A bug (any error that is not an OhmbookError) inside one building or the forecast: `fail`
   * stops the build (default; tests and --strict), `report` prints a bug report line, marks that
   * building as failed, and finishes the other pages (the CLI without --strict).
   */
  onBug?: BugPolicy;
  /** Worker threads analysing buildings (1: in this thread). Default: os.availableParallelism(). */
  jobs?: number;
  /**
   * Folder of the incremental-rebuild cache (analysisCache.ts): buildings whose inputs, settings
   * and program are unchanged are not analysed again. Default none (the CLI passes one beside
   * the output folder). Refused inside the output folder or the portfolio folder.
   */
  cacheDir?: string;
  /** Every building's analysis must come from `cacheDir` (merging shards, see shards.ts). */
  requireCached?: boolean;
}

export interface BuildResult {
  issues: InputIssue[];
  summary: BuildSummary;
  summaryText: string;
  /** How many findings are at or above a severity (for `--fail-on`). */
  findingsAtOrAbove(severity: "warning" | "error"): number;
}

export interface BuildSummary {
  outDir: string;
  buildings: number;
  bills: number;
  billsPriced: number;
  /** Bills whose billed-basis recomputation is exact, so their totals were compared. */
  billsCheckedExactly: number;
  /** Bills priced only with estimated lines (time-of-use or period demand without interval data): not compared. */
  billsEstimated: number;
  /** Claims (bill too high) and their total; back-billing risks (too low or not billed) and their total. */
  claims: { count: number; total: number };
  backBillRisks: { count: number; total: number };
  findings: { error: number; warning: number; info: number };
  amountAtStake: number;
  rowsRejected: number;
  buildingsFailed: { buildingId: string; reason: string }[];
  /** Buildings whose analysis came from the cache (0 without one). */
  buildingsFromCache: number;
  /** Building, meter and tenant pages and claim sheets unchanged since the last build, copied from it (0 without a cache). */
  pagesReused: number;
}


export { analyseBuilding } from "./analyseBuilding.ts";

const SEVERITY_RANK = { info: 0, warning: 1, error: 2 } as const;

/**
 * Runs the pipeline and writes the site atomically.
 * @throws InputError when inputs are unusable (or, with `strict`, when any row was rejected).
 */
export async function buildPortfolioSite(options: BuildOptions): Promise<BuildResult> {
  const reporter = options.reporter ?? silentReporter;
  tuneCompilerForBuilds();

  // A wrong output folder is refused before any work.
  await checkOutputFolder(options.outDir, options.dir);
  if (options.cacheDir !== undefined) checkCacheFolder(options.cacheDir, options.outDir, options.dir);
  const cache = options.cacheDir !== undefined ? await openAnalysisCache(options.cacheDir) : undefined;
  // With a cache, pages unchanged since the last build into this folder are copied from it.
  const reuse = options.cacheDir !== undefined && !options.requireCached ? { cacheDir: join(options.cacheDir, "site"), program: cache!.program } : undefined;
  // The client bundle depends on no input: made by a child process while this one works.
  const bundle = startClientBundle(options.outDir, { reuse });
  const scratch = scratchBeside(options.outDir);
  try {
    return await buildWithBundle(options, reporter, cache, reuse, bundle, scratch.dir);
  } finally {
    await bundle.dispose();
    await scratch.remove();
  }
}

/** A scratch folder next to `path`, made when first asked for (see makeScratchFolder). */
function scratchBeside(path: string): { dir: () => Promise<string>; remove: () => Promise<void> } {
  let made: Promise<string> | null = null;
  return {
    dir: () => (made ??= makeScratchFolder(path)),
    async remove() {
      const dir = await made?.catch(() => null);
      if (dir) await removeScratchFolder(dir);
    },
  };
}

async function buildWithBundle(options: BuildOptions, reporter: Reporter, cache: AnalysisCache | undefined, reuse: { cacheDir: string; program: string } | undefined, bundle: EarlyBundle, scratch: () => Promise<string>): Promise<BuildResult> {
  const { weatherGaps, issues, quality, portfolio } = await readAndScreen(options.dir, options.strict, reporter, scratch, { cache, keyed: cache !== undefined });
  const dataDate = effectiveAsOf(portfolio);
  const buildDate = options.buildDate ?? dataDate ?? new Date().toISOString().slice(0, 10);
  const buildDateKind = options.buildDate === undefined && dataDate !== null ? "data" : "built";

  // Each stage starts from what is live, not from the previous stage's garbage (collectGarbage.ts).
  collectGarbage();
  reporter.stage(`Pricing, checking and modelling ${portfolio.buildings.length} building(s)`);
  const masks = new Map(quality.meters.map((q) => [q.meterId, q.mask]));
  reporter.step(0, portfolio.buildings.length, "");
  const analysed = await analyseBuildings(portfolio, masks, {
    jobs: options.jobs,
    cache,
    onBug: (options.onBug ?? "fail") === "fail" || options.strict ? "fail" : "report",
    onBugReport: (buildingId, line) => reporter.warn(line),
    onDone: (done, total, buildingId) => reporter.step(done, total, buildingId),
    requireCached: options.requireCached,
  });
  reporter.finish();

  const failed = analysed.filter((r) => r.failure !== null);
  if (options.strict && failed.length > 0) {
    throw new InputError(
      failed.map((r) => ({
        file: r.building.source.file,
        line: r.building.source.line,
        column: 0,
        severity: "error" as const,
        message: `building ${r.building.buildingId} could not be analysed: ${r.failure}`,
      })),
    );
  }

  const findings = analysed.flatMap((r) => r.findings);
  const allPriced = new Map<string, PricedBill>();
  for (const r of analysed) for (const [id, p] of r.priced) allPriced.set(id, p);
  // What the later stages need from every bill's pricing at once, taken before it goes on disk.
  const disputes = portfolioDisputes(portfolio, findings, allPriced);
  const tally = pricingTally(allPriced);
  const ratchetPricing = analysedPricing(portfolio.bills, allPriced);
  allPriced.clear();
  // From here on a building's priced bills (with their lines) are read from disk when its pages
  // or data files ask for them (pricedShelf.ts).
  const priced = PricedShelf.fill(await scratch(), analysed.map((r) => r.priced));
  const results: BuildingResults[] = analysed.map((r, i) => ({ ...r, priced: priced.building(i) }));
  analysed.length = 0;
  const monthlyMetered = monthlyMeteredByMeter(portfolio);

  collectGarbage();
  reporter.stage(`Forecasting the next ${portfolio.settings.forecastMonths} months`);
  let forecast = runForecast(portfolio, results, issues, findings, bugHandler(options, reporter, "forecasting"), cache ? cacheMemo(cache) : undefined, ratchetPricing);

  collectGarbage();
  reporter.stage(`Writing the site to ${options.outDir}`);
  // Made one file at a time as the site writer puts each on disk.
  // Iterated once by the site writer, then let go: the forecast's scenario matrices it holds are
  // freed before the pages are made (the pages read only reportInput's summaries of them).
  const dataFiles = oneShot(dataFileEntries({ portfolio, results, findings, disputes, priced, monthlyMetered, weatherGaps, quality: quality.meters, forecast, meteredViews: meteredViewsByBill(portfolio, masks) }));
  const reportInput = toReportInput({ portfolio, priced, monthlyMetered, issues, buildDate, buildDateKind, findings, disputes, results, quality: quality.meters, weatherGaps, forecast });
  forecast = null;
  const onProgress = (done: number, total: number) => reporter.step(done, total, "building pages");
  // The internal site's building pages are made a few buildings at a time as they are written.
  const written = options.audience === "tenants"
    ? await writeSite(tenantSiteModel(buildSiteModel(reportInput)), {}, options.outDir, { onProgress, reuse, bundle })
    : await writeSite(siteModelInParts(reportInput), dataFiles, options.outDir, { onProgress, reuse, bundle });
  reporter.finish();

  const count = (s: "error" | "warning" | "info") => findings.filter((f) => f.severity === s).length;
  const summary: BuildSummary = {
    outDir: options.outDir,
    buildings: portfolio.buildings.length,
    bills: portfolio.bills.length,
    ...tally,
    claims: moneyOf(disputes.filter((d) => d.kind === "claim")),
    backBillRisks: moneyOf(disputes.filter((d) => d.kind === "back-bill-risk")),
    findings: { error: count("error"), warning: count("warning"), info: count("info") },
    amountAtStake: roundCents(findings.reduce((s, f) => s + (f.severity !== "info" && f.amountAtStake ? f.amountAtStake : 0), 0)),
    rowsRejected: portfolio.report.files.reduce((s, f) => s + f.rowsRejected, 0),
    buildingsFailed: failed.map((r) => ({ buildingId: r.building.buildingId, reason: r.failure! })),
    buildingsFromCache: cache?.hits ?? 0,
    pagesReused: written.pagesReused,
  };
  return {
    issues,
    summary,
    summaryText: summaryText(summary, portfolio.settings.currency),
    findingsAtOrAbove: (severity) => findings.filter((f) => SEVERITY_RANK[f.severity] >= SEVERITY_RANK[severity]).length,
  };
}

/**
 * Backtest, calibration and forecast over the whole portfolio (scenarios share weather years
 * across buildings). A failure here costs the forecast, never the rest of the site: it becomes a
 * warning and the pages say no forecast was made.
 */
function runForecast(portfolio: Portfolio<Tariff>, results: BuildingResults[], issues: InputIssue[], findings: readonly Finding[], onBug: BugHandler = rethrow, memo?: Memo, analysed?: AnalysedPricing): ForecastBundle | null {
  const asOf = effectiveAsOf(portfolio);
  if (!asOf) return null;
  const baselines = new Map(results.flatMap((r) => r.baselines.map((b) => [b.meterId, b] as const)));
  // The backtest reads each meter's readings at several as-of dates and keeps what it read until
  // the stage ends: one copy in memory for the stage, not one per read from the shelf.
  const held: Portfolio<Tariff> = { ...portfolio, intervals: new Map(portfolio.intervals) };
  try {
    // The ratchet history reads the analysis's pricing where it is the same as pricing again (portfolioInputs.ts).
    return forecastWithTrackRecord(held, { asOf, months: portfolio.settings.forecastMonths, baselines, findings, memo, analysed });
  } catch (error) {
    issues.push({
      file: "portfolio.yaml",
      line: 0,
      column: 0,
      severity: "warning",
      message: `no cost forecast was made: ${problemOrBug(error, onBug)}`,
      hint: "the rest of the site is complete; please report this with the portfolio folder",
    });
    return null;
  }
}

function bugHandler(options: BuildOptions, reporter: Reporter, where: string): BugHandler {
  if ((options.onBug ?? "fail") === "fail" || options.strict) return rethrow;
  return (error) => {
    reporter.warn(bugReportLine(where, error));
    return `internal error (a bug in ohmbook, reported on the terminal): ${error instanceof Error ? error.message : String(error)}`;
  };
}

/** The cache must never be published nor written into the user's portfolio folder. */
function checkCacheFolder(cacheDir: string, outDir: string, inputDir: string): void {
  const cache = resolve(cacheDir);
  const inside = (child: string, parent: string) => child === parent || child.startsWith(parent.endsWith(sep) ? parent : parent + sep);
  if (inside(cache, resolve(outDir)) || inside(resolve(outDir), cache)) {
    throw new SiteWriteError(`refusing to keep the cache in ${cacheDir}: it is the output folder, inside it, or contains it, and would be published or deleted with the site; choose a folder beside it (the default is ${defaultCacheDir(outDir)})`);
  }
  if (inside(cache, resolve(inputDir)) || inside(resolve(inputDir), cache)) {
    throw new SiteWriteError(`refusing to keep the cache in ${cacheDir}: it is the portfolio folder, inside it, or contains it; choose a folder of its own (the default is ${defaultCacheDir(outDir)})`);
  }
}

function moneyOf(disputes: Dispute[]): { count: number; total: number } {
  return { count: disputes.length, total: roundCents(disputes.reduce((s, d) => s + d.claimAmount, 0)) };
}

/** How far the bills could be checked, for the summary. */
function pricingTally(priced: ReadonlyMap<string, PricedBill>): Pick<BuildSummary, "billsPriced" | "billsCheckedExactly" | "billsEstimated"> {
  let billsPriced = 0;
  let billsCheckedExactly = 0;
  let billsEstimated = 0;
  for (const p of priced.values()) {
    if (p.computed !== null) billsPriced++;
    const state = billCheckState(p);
    if (state === "exact") billsCheckedExactly++;
    else if (state === "estimated" || state === "needs-interval-data") billsEstimated++;
  }
  return { billsPriced, billsCheckedExactly, billsEstimated };
}

/** The dispute list of the whole portfolio, from every building's findings. */
function portfolioDisputes(portfolio: Portfolio<Tariff>, findings: Finding[], priced: Map<string, PricedBill>): Dispute[] {
  const metered = new Map<string, { usage: number | null; peakKw: number | null }>();
  for (const [id, p] of priced) if (p.metered) metered.set(id, { usage: p.meteredUsage ?? null, peakKw: p.meteredDemandKw ?? null });
  return buildDisputes({ findings, bills: portfolio.bills, meters: portfolio.meters, billLines: portfolio.billLines, metered });
}

function summaryText(s: BuildSummary, currency: string): string {
  const notPriced = s.bills - s.billsPriced;
  const lines = [
    `Built ${s.buildings} building page(s) into ${s.outDir}`,
    `  ${s.billsCheckedExactly} of ${s.bills} bills checked exactly; ${s.billsEstimated} only estimated (a time-of-use or period-demand split that interval data does not pin down: not compared); ${notPriced} not re-priced`,
    `  bills to dispute: ${s.claims.count} claim(s), ${moneyText(s.claims.total, currency)}; billed too low or not billed: ${s.backBillRisks.count}, ${moneyText(-s.backBillRisks.total, currency)}`,
    `  findings: ${s.findings.error} error, ${s.findings.warning} warning, ${s.findings.info} info`,
  ];
  if (s.rowsRejected > 0) lines.push(`  ${s.rowsRejected} input row(s) rejected — see ${s.outDir}/data/ingest-report.json`);
  if (s.buildingsFromCache > 0) lines.push(`  ${s.buildingsFromCache} of ${s.buildings} building(s) unchanged since the last build: their analysis came from the cache`);
  if (s.pagesReused > 0) lines.push(`  ${s.pagesReused} page(s) unchanged since the last build (building, meter, tenant pages and claim sheets): copied from the previous site`);
  for (const f of s.buildingsFailed) lines.push(`  building ${f.buildingId} could not be analysed: ${f.reason}`);
  lines.push(`View it: open ${s.outDir}/index.html in a browser, or run 'ohmbook serve' on the portfolio folder to serve it and rebuild on every change.`);
  return lines.join("\n");
}

/**
 * The stages before any building is analysed, shared by a build and a shard: read the folder,
 * cut at the as-of date, screen interval data and align meter clocks.
 * @throws InputError when inputs are unusable (or, with `strict`, when any row was rejected).
 */
async function readAndScreen(dir: string, strict: boolean, reporter: Reporter, shelfDir: () => Promise<string>, { cache, keyed }: { cache?: AnalysisCache; keyed: boolean }) {
  reporter.stage(`Reading ${dir}`);
  const loaded = await loadPortfolio(dir);
  const issues = loaded.issues;
  if (loaded.fatal || !loaded.portfolio) throw new InputError(issues);
  if (strict && issues.some((i) => i.severity === "error")) throw new InputError(issues);
  // as_of is the last day of data used: later bills and readings are left out, with a warning.
  const cut = cutAtAsOf(loaded.portfolio);
  issues.push(...cut.issues);
  reporter.stage("Screening interval data and aligning meter clocks");
  // With a cache, meters whose interval data and weather are unchanged are not screened again.
  // Bills, lines, tariffs and weather hashed once for every cache key that holds them (hashOnce.ts);
  // a build without a cache takes no key, so nothing is hashed.
  const quality = assessIntervalMeters(keyed ? withInputDigests(cut.portfolio) : cut.portfolio, cache ? cacheMemo(cache) : undefined);
  // From here on every stage sees the corrected clocks (flagged readings stay in the record),
  // read from the shelf a meter at a time. Neither the portfolio as read nor its in-memory
  // readings are returned, so they can go.
  const shelf = IntervalShelf.fill(await shelfDir(), quality.portfolio.intervals, { digests: keyed });
  const portfolio = { ...quality.portfolio, intervals: shelf } as Portfolio<Tariff>;
  return { weatherGaps: loaded.weatherGaps, issues, quality: { meters: quality.meters }, portfolio };
}

export interface ShardOptions {
  dir: string;
  shard: ShardSpec;
  /** Folder for this shard's analyses and manifest (shards.ts). */
  partialDir: string;
  strict: boolean;
  reporter?: Reporter;
  jobs?: number;
}

export interface ShardResult {
  issues: InputIssue[];
  shard: ShardSpec;
  buildings: string[];
  failed: { buildingId: string; reason: string }[];
}

/**
 * `build --shard K/N --partial OUT`: reads and screens the whole portfolio as a build does, then
 * analyses only shard K's buildings into OUT (their analyses and a manifest); `merge` does the rest.
 * @throws InputError as buildPortfolioSite does.
 */
export async function buildShard(options: ShardOptions): Promise<ShardResult> {
  const reporter = options.reporter ?? silentReporter;
  tuneCompilerForBuilds();
  await preparePartialDir(options.partialDir);
  const scratch = scratchBeside(options.partialDir);
  try {
    return await analyseShard(options, reporter, scratch.dir);
  } finally {
    await scratch.remove();
  }
}

async function analyseShard(options: ShardOptions, reporter: Reporter, scratch: () => Promise<string>): Promise<ShardResult> {
  const { issues, quality, portfolio } = await readAndScreen(options.dir, options.strict, reporter, scratch, { keyed: true });
  const only = new Set(portfolio.buildings.filter((b) => shardOf(b.buildingId, options.shard.count) === options.shard.index).map((b) => b.buildingId));
  reporter.stage(`Shard ${options.shard.index} of ${options.shard.count}: pricing, checking and modelling ${only.size} of ${portfolio.buildings.length} building(s)`);
  const cache = await openAnalysisCache(partialAnalysesDir(options.partialDir));
  const results = await analyseBuildings(portfolio, new Map(quality.meters.map((q) => [q.meterId, q.mask])), {
    jobs: options.jobs,
    cache,
    only,
    onBug: options.strict ? "fail" : "report",
    onBugReport: (_id, line) => reporter.warn(line),
    onDone: (done, total, buildingId) => reporter.step(done, total, buildingId),
  });
  reporter.finish();
  const failed = results.filter((r) => r.failure !== null).map((r) => ({ buildingId: r.building.buildingId, reason: r.failure! }));
  if (options.strict && failed.length > 0) throw new InputError(failed.map((f) => ({ file: "buildings.csv", line: 0, column: 0, severity: "error" as const, message: `building ${f.buildingId} could not be analysed: ${f.reason}` })));
  await writeManifest(options.partialDir, {
    format: PARTIAL_FORMAT,
    program: cache.program,
    shard: options.shard,
    portfolio: resolve(options.dir),
    portfolioBuildings: buildingsDigest(portfolio.buildings.map((b) => b.buildingId)),
    buildings: results.map((r) => r.building.buildingId),
  });
  return { issues, shard: options.shard, buildings: results.map((r) => r.building.buildingId), failed };
}

/**
 * `merge OUT_1 … OUT_N --out SITE`: the site and every portfolio-level file from the shards'
 * analyses (disputes, forecast and pages computed once, exactly as a one-machine build).
 */
export async function mergeShards(options: Omit<BuildOptions, "dir" | "cacheDir" | "requireCached"> & { partials: string[]; dir?: string }): Promise<BuildResult> {
  const program = programFingerprint();
  const gathered = await gatherPartials(options.partials, options.outDir, program);
  try {
    return await buildPortfolioSite({ ...options, dir: options.dir ?? gathered.portfolio, cacheDir: gathered.analysesDir, requireCached: true });
  } finally {
    await rm(gathered.analysesDir, { recursive: true, force: true });
  }
}
