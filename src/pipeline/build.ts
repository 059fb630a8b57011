/**
 * `ohmbook build`: the whole pipeline, stage by stage —
 * ingest → price every bill → reconcile with interval data → audit → baselines → view models → site.
 * Computation stages are pure; this module only sequences them, isolates failures per building,
 * and hands the results to the site writer (the only stage that writes files).
 */
import { InputError, bugReportLine, expectedProblem, type BugPolicy } from "../core/errors.ts";
import type { InputIssue } from "../core/issues.ts";
import type { Building, IntervalSeries, Meter, Portfolio } from "../domain/types.ts";
import { withFlaggedAsMissing } from "../clean/index.ts";
import { loadPortfolio } from "../ingest/index.ts";
import type { Tariff } from "../tariff/index.ts";
import { priceBill } from "../tariff/index.ts";
import { runAudit } from "../audit/index.ts";
import type { Finding } from "../audit/index.ts";
import { silentReporter, type Reporter } from "./reporter.ts";
import type { PricedBill } from "../tariff/index.ts";
import { priceMeterBills } from "../tariff/index.ts";
import { meteredForBills } from "../audit/index.ts";
import { assessIntervalMeters } from "../clean/index.ts";
import { makeRepricer } from "../audit/index.ts";
import { buildingDegreeDayBands, expectedUsageForStretch, fitBuildingBaselines, type MeterBaseline } from "../model/index.ts";
import { buildDisputes, type Dispute } from "../disputes/index.ts";
import { billCheckState } from "../tariff/index.ts";
import { fitBuildingIntervalBaselines, type IntervalBaselineOutcome } from "../model/index.ts";
import { monthlyMeteredByMeter } from "./monthly.ts";
import { meteredViewsByBill } from "../audit/index.ts";
import { toReportInput, type BuildingResults } from "../report/index.ts";
import { buildDataFiles } from "../report/index.ts";
import { buildSiteModel, tenantSiteModel } from "../report/index.ts";
import { forecastWithTrackRecord, type ForecastBundle } from "../forecast/index.ts";
import { effectiveAsOf } from "../report/index.ts";
import { cutAtAsOf } from "./asOf.ts";
import { checkOutputFolder, writeSite } from "../site/index.ts";
import { moneyText, roundCents } from "../core/money.ts";

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
}


const SEVERITY_RANK = { info: 0, warning: 1, error: 2 } as const;

/**
 * Runs the pipeline and writes the site atomically.
 * @throws InputError when inputs are unusable (or, with `strict`, when any row was rejected).
 */
export async function buildPortfolioSite(options: BuildOptions): Promise<BuildResult> {
  const reporter = options.reporter ?? silentReporter;

  // A wrong output folder is refused before any work.
  await checkOutputFolder(options.outDir, options.dir);
  reporter.stage(`Reading ${options.dir}`);
  const loaded = await loadPortfolio(options.dir);
  const issues = loaded.issues;
  const errors = issues.filter((i) => i.severity === "error");
  if (loaded.fatal || !loaded.portfolio) throw new InputError(issues);
  if (options.strict && errors.length > 0) throw new InputError(issues);
  // as_of is the last day of data used: later bills and readings are left out, with a warning.
  const cut = cutAtAsOf(loaded.portfolio);
  issues.push(...cut.issues);
  reporter.stage("Screening interval data and aligning meter clocks");
  const quality = assessIntervalMeters(cut.portfolio);
  // From here on every stage sees the corrected clocks (flagged readings stay in the record).
  const portfolio = quality.portfolio as Portfolio<Tariff>;
  const dataDate = effectiveAsOf(portfolio);
  const buildDate = options.buildDate ?? dataDate ?? new Date().toISOString().slice(0, 10);
  const buildDateKind = options.buildDate === undefined && dataDate !== null ? "data" : "built";

  reporter.stage(`Pricing, checking and modelling ${portfolio.buildings.length} building(s)`);
  const results: BuildingResults[] = [];
  const masks = new Map(quality.meters.map((q) => [q.meterId, q.mask]));
  portfolio.buildings.forEach((building, index) => {
    reporter.step(index, portfolio.buildings.length, building.buildingId);
    results.push(analyseBuilding(portfolio, building, masks, bugHandler(options, reporter, `analysing building ${building.buildingId}`)));
  });
  reporter.step(portfolio.buildings.length, portfolio.buildings.length, "done");
  reporter.finish();

  const failed = results.filter((r) => r.failure !== null);
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

  const findings = results.flatMap((r) => r.findings);
  const priced = new Map<string, PricedBill>();
  for (const r of results) for (const [id, p] of r.priced) priced.set(id, p);
  const disputes = portfolioDisputes(portfolio, findings, priced);
  const monthlyMetered = monthlyMeteredByMeter(portfolio);

  reporter.stage(`Forecasting the next ${portfolio.settings.forecastMonths} months`);
  const forecast = runForecast(portfolio, results, issues, findings, bugHandler(options, reporter, "forecasting"));

  reporter.stage(`Writing the site to ${options.outDir}`);
  const dataFiles = buildDataFiles({ portfolio, results, findings, disputes, priced, monthlyMetered, weatherGaps: loaded.weatherGaps, quality: quality.meters, forecast, meteredViews: meteredViewsByBill(portfolio, masks) });
  const model = buildSiteModel(
    toReportInput({ portfolio, priced, monthlyMetered, issues, buildDate, buildDateKind, findings, disputes, results, quality: quality.meters, weatherGaps: loaded.weatherGaps, forecast }),
  );
  if (options.audience === "tenants") await writeSite(tenantSiteModel(model), {}, options.outDir);
  else await writeSite(model, dataFiles, options.outDir);

  const count = (s: "error" | "warning" | "info") => findings.filter((f) => f.severity === s).length;
  const summary: BuildSummary = {
    outDir: options.outDir,
    buildings: portfolio.buildings.length,
    bills: portfolio.bills.length,
    billsPriced: [...priced.values()].filter((p) => p.computed !== null).length,
    billsCheckedExactly: [...priced.values()].filter((p) => billCheckState(p) === "exact").length,
    billsEstimated: [...priced.values()].filter((p) => { const s = billCheckState(p); return s === "estimated" || s === "needs-interval-data"; }).length,
    claims: moneyOf(disputes.filter((d) => d.kind === "claim")),
    backBillRisks: moneyOf(disputes.filter((d) => d.kind === "back-bill-risk")),
    findings: { error: count("error"), warning: count("warning"), info: count("info") },
    amountAtStake: roundCents(findings.reduce((s, f) => s + (f.severity !== "info" && f.amountAtStake ? f.amountAtStake : 0), 0)),
    rowsRejected: portfolio.report.files.reduce((s, f) => s + f.rowsRejected, 0),
    buildingsFailed: failed.map((r) => ({ buildingId: r.building.buildingId, reason: r.failure! })),
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
function runForecast(portfolio: Portfolio<Tariff>, results: BuildingResults[], issues: InputIssue[], findings: readonly Finding[], onBug: BugHandler = rethrow): ForecastBundle | null {
  const asOf = effectiveAsOf(portfolio);
  if (!asOf) return null;
  const baselines = new Map(results.flatMap((r) => r.baselines.map((b) => [b.meterId, b] as const)));
  try {
    return forecastWithTrackRecord(portfolio, { asOf, months: portfolio.settings.forecastMonths, baselines, findings });
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

/**
 * A bug at a per-building boundary: rethrown (`fail`), or reported as one line and turned into
 * the failure text the pages show (`report`).
 */
type BugHandler = (error: unknown) => string;
const rethrow: BugHandler = (error) => {
  throw error;
};

function bugHandler(options: BuildOptions, reporter: Reporter, where: string): BugHandler {
  if ((options.onBug ?? "fail") === "fail" || options.strict) return rethrow;
  return (error) => {
    reporter.warn(bugReportLine(where, error));
    return `internal error (a bug in ohmbook, reported on the terminal): ${error instanceof Error ? error.message : String(error)}`;
  };
}

/** An expected problem's message, or what the bug policy makes of anything else. */
function problemOrBug(error: unknown, onBug: BugHandler): string {
  try {
    return expectedProblem(error);
  } catch (bug) {
    return onBug(bug);
  }
}

/**
 * Prices, reconciles, audits and models one building. An expected problem (an OhmbookError) is
 * caught and becomes the building's failure; a bug goes to `onBug` (by default rethrown).
 */
export function analyseBuilding(portfolio: Portfolio<Tariff>, building: Building, masks: ReadonlyMap<string, Uint8Array> = new Map(), onBug: BugHandler = rethrow): BuildingResults {
  const empty: BuildingResults = { building, priced: new Map(), findings: [], baselines: [], intervalBaselines: [], failure: null };
  try {
    const meters = portfolio.meters.filter((m) => m.buildingId === building.buildingId);
    // Money never rests on a flagged reading: metered quantities read the cleaned view.
    const cleaned = cleanedIntervals(portfolio, meters, masks);
    const priced = new Map<string, PricedBill>();
    for (const meter of meters) {
      const tariff = portfolio.tariffs.get(meter.tariffId);
      const bills = portfolio.bills.filter((b) => b.meterId === meter.meterId);
      const meterPriced = priceMeterBills({
        meter,
        bills,
        timezone: building.timezone,
        series: portfolio.intervals.get(meter.meterId),
        meteredSeries: cleaned.get(meter.meterId),
        price: tariff ? (request) => priceBill(tariff, request) : null,
        pricerError: `tariff '${meter.tariffId}' could not be loaded (see the tariff file's errors)`,
      });
      for (const [id, p] of meterPriced) priced.set(id, p);
    }
    const scoped = scopeToBuilding(portfolio, building);
    const metered = meteredForBills(scoped, (meter) => demandWindowMinutes(portfolio.tariffs.get(meter.tariffId)), masks);
    const bands = buildingDegreeDayBands(portfolio, building);
    for (const [id, m] of metered) {
      const p = priced.get(id);
      if (p && m && m.peakKw !== null && p.metered) p.meteredDemandKw = m.peakKw;
    }
    const computed = new Map([...priced].map(([id, p]) => [id, p.computed]));
    const findings = runAudit({
      portfolio: { ...scoped, intervals: new Map([...scoped.intervals].map(([id, s]) => [id, cleaned.get(id) ?? s])) },
      priced: computed,
      metered,
      ...makeRepricer({ portfolio: scoped, priced: computed, price: priceBill, meteredIntervals: cleaned }),
      expectedUsage: expectedUsageFromBands(bands),
      expectedUsageForPeriod: expectedUsageForStretch(scoped, building),
    });
    const baselines = fitBuildingBaselines(portfolio, building, billsToLeaveOut(findings), bands);
    const intervalBaselines = fitBuildingIntervalBaselines(portfolio, building, masks);
    return { building, priced, findings, baselines, intervalBaselines, failure: null };
  } catch (error) {
    return { ...empty, failure: problemOrBug(error, onBug) };
  }
}

/** The building's interval series with flagged readings as NaN (`withFlaggedAsMissing`). */
function cleanedIntervals(portfolio: Portfolio<Tariff>, meters: readonly Meter[], masks: ReadonlyMap<string, Uint8Array>): Map<string, IntervalSeries> {
  const out = new Map<string, IntervalSeries>();
  for (const m of meters) {
    const series = portfolio.intervals.get(m.meterId);
    if (series) out.set(m.meterId, withFlaggedAsMissing(series, masks.get(m.meterId)));
  }
  return out;
}

function scopeToBuilding(portfolio: Portfolio<Tariff>, building: Building): Portfolio<Tariff> {
  const meters = portfolio.meters.filter((m) => m.buildingId === building.buildingId);
  const ids = new Set(meters.map((m) => m.meterId));
  const bills = portfolio.bills.filter((b) => ids.has(b.meterId));
  const billIds = new Set(bills.map((b) => b.billId));
  return {
    ...portfolio,
    buildings: [building],
    meters,
    bills,
    billLines: portfolio.billLines.filter((l) => billIds.has(l.billId)),
  };
}

/** The degree-day models' leave-one-out bands, by bill id (meters without a model fall back to the audit's interim rule). */
function expectedUsageFromBands(bands: ReadonlyMap<string, Pick<MeterBaseline, "expectedByBill">>): Map<string, { p50: number; low: number; high: number }> {
  const map = new Map<string, { p50: number; low: number; high: number }>();
  for (const b of bands.values()) for (const [billId, e] of b.expectedByBill) map.set(billId, e);
  return map;
}

/** Findings whose bill's usage is wrong or not the building's own, so it must not train a weather model. */
const USAGE_FINDINGS = new Set(["multiplier-suspect", "usage-vs-meter", "usage-outlier", "duplicate-bill", "period-overlap"]);

/** Bills the audit found wrong in their usage, with the reason, to leave out of the change-point fits. */
function billsToLeaveOut(findings: Finding[]): Map<string, string> {
  const out = new Map<string, string>();
  for (const f of findings) {
    if (f.severity === "info" || !USAGE_FINDINGS.has(f.check)) continue;
    for (const id of [f.billId, ...(f.relatedBillIds ?? [])]) if (id) out.set(id, `audit finding: ${f.check}`);
  }
  return out;
}

/** The demand window of a tariff's first demand charge (15 minutes when it has none). */
function demandWindowMinutes(tariff: Tariff | undefined): number {
  for (const version of tariff?.versions ?? []) {
    for (const charge of version.charges) if (charge.kind === "demand") return charge.windowMinutes;
  }
  return 15;
}

function moneyOf(disputes: Dispute[]): { count: number; total: number } {
  return { count: disputes.length, total: roundCents(disputes.reduce((s, d) => s + d.claimAmount, 0)) };
}

/** The dispute list of the whole portfolio, from every building's findings. */
function portfolioDisputes(portfolio: Portfolio<Tariff>, findings: Finding[], priced: Map<string, PricedBill>): Dispute[] {
  const metered = new Map<string, { usage: number | null; peakKw: number | null }>();
  for (const [id, p] of priced) if (p.metered) metered.set(id, { usage: p.meteredUsage ?? null, peakKw: p.meteredDemandKw ?? null });
  return buildDisputes({ findings, bills: portfolio.bills, meters: portfolio.meters, billLines: portfolio.billLines, metered });
}

function summaryText(s: BuildSummary, currency: string): string {
  const fmt = { format: (amount: number) => moneyText(amount, currency) };
  const notPriced = s.bills - s.billsPriced;
  const lines = [
    `Built ${s.buildings} building page(s) into ${s.outDir}`,
    `  ${s.billsCheckedExactly} of ${s.bills} bills checked exactly; ${s.billsEstimated} only estimated (a time-of-use or period-demand split that interval data does not pin down: not compared); ${notPriced} not re-priced`,
    `  bills to dispute: ${s.claims.count} claim(s), ${fmt.format(s.claims.total)}; billed too low or not billed: ${s.backBillRisks.count}, ${fmt.format(-s.backBillRisks.total)}`,
    `  findings: ${s.findings.error} error, ${s.findings.warning} warning, ${s.findings.info} info`,
  ];
  if (s.rowsRejected > 0) lines.push(`  ${s.rowsRejected} input row(s) rejected — see ${s.outDir}/data/ingest-report.json`);
  for (const f of s.buildingsFailed) lines.push(`  building ${f.buildingId} could not be analysed: ${f.reason}`);
  lines.push(`View it: open ${s.outDir}/index.html in a browser, or run 'ohmbook serve' on the portfolio folder to serve it and rebuild on every change.`);
  return lines.join("\n");
}
