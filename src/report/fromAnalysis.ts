/**
 * Maps the pipeline's results onto the report stage's input (src/report/input.ts): plain data,
 * nothing computed here that a page shows without a source in the pipeline.
 */
import { contentDigestOf, contentHash, withContentDigest } from "../core/contentHash.ts";
import { groupBy } from "../core/groupBy.ts";
import type { Dispute } from "../disputes/index.ts";
import type { InputIssue } from "../core/issues.ts";
import type { Bill, Portfolio } from "../domain/types.ts";
import type { Finding } from "../audit/index.ts";
import type { AccuracySummary, BuildingForecast, ForecastBundle, MeterForecast, TrackRecord } from "../forecast/index.ts";
import { actualMonthlyCost, buildingCostBand, buildingMonthlyCostBands, MIN_TRACK_RECORD_MONTHS, MONTH_ADJUSTMENT_LABEL, WEATHER_BASIS_LABEL, type WeatherBasisId } from "../forecast/index.ts";
import type { WeatherGap } from "../domain/types.ts";
import type { MonthTotal } from "../ingest/index.ts";
import type { ReportAccuracy, ReportBaseline, ReportBuildingForecast, ReportForecastMethod, ReportInput, ReportMeterQuality, ReportModelSummary } from "./index.ts";
import type { MeterBaseline } from "../model/index.ts";
import type { MeterQuality } from "../clean/index.ts";
import type { PricedBill } from "../tariff/index.ts";
import { shiftMonth } from "../core/time/index.ts";
import type { Building } from "../domain/types.ts";
import type { IntervalBaselineSummary } from "../model/index.ts";

/**
 * A meter's hourly model as kept after the analysis: its summary, which every later stage reads
 * (the fitted models stay in the worker thread that fitted them).
 */
export interface HourlyModelOutcome {
  meterId: string;
  baseline: { summary: IntervalBaselineSummary } | null;
  problem: string | null;
}

/** Everything computed for one building; a building that fails carries only `failure`. */
export interface BuildingResults {
  building: Building;
  priced: ReadonlyMap<string, PricedBill>;
  findings: Finding[];
  baselines: MeterBaseline[];
  /** Hourly models of the building's interval meters (TOWT, gradient-boosted trees, ensembles). */
  intervalBaselines: HourlyModelOutcome[];
  failure: string | null;
}

const CURVE_SAMPLES = 60;

export interface ReportInputParts {
  portfolio: Portfolio;
  priced: ReadonlyMap<string, PricedBill>;
  monthlyMetered: Map<string, MonthTotal[]>;
  issues: InputIssue[];
  buildDate: string;
  buildDateKind?: "built" | "data";
  findings: Finding[];
  disputes: Dispute[];
  results: BuildingResults[];
  quality: MeterQuality[];
  weatherGaps: WeatherGap[];
  forecast: ForecastBundle | null;
}

export function toReportInput(parts: ReportInputParts): ReportInput {
  const { portfolio, results, forecast } = parts;
  const unitOf = new Map(portfolio.meters.map((m) => [m.meterId, m.unit]));
  const baselines = results.flatMap((r) => r.baselines);
  return {
    portfolio: parts.portfolio,
    priced: parts.priced,
    monthlyMetered: parts.monthlyMetered,
    issues: parts.issues,
    buildDate: parts.buildDate,
    buildDateKind: parts.buildDateKind,
    rejectedRowsByBuilding: undefined,
    heatContentByMeter: heatContentByMeter(portfolio),
    findings: parts.findings,
    disputes: parts.disputes,
    models: modelSummaries(results),
    baselines: baselines.map((b) => digestedLike(b, "report baseline", reportBaseline(b, unitOf.get(b.meterId) ?? ""), unitOf.get(b.meterId) ?? "")),
    quality: parts.quality.map(reportQuality),
    weatherDetections: parts.weatherGaps.map((g) => ({ stationId: g.stationId, startMs: g.startMs, endMs: g.endMs, hours: g.hours, action: g.action })),
    forecast: forecast?.forecast.rows.map((r) => ({
      buildingId: r.building_id,
      meterId: r.meter_id,
      month: r.month,
      usageP50: r.usage_p50,
      costP10: r.cost_p10,
      costP50: r.cost_p50,
      costP90: r.cost_p90,
    })),
    trackRecord: forecast?.trackRecord.meters.flatMap((m) =>
      m.model && m.model.coverage !== null
        ? [{
            meterId: m.meterId,
            annualCostErrorPct: m.model.annualErrorPct,
            monthlyCvRmsePct: m.model.cvRmsePct,
            coverage: m.model.coverage,
            naiveAnnualCostErrorPct: m.naive?.annualErrorPct ?? Number.NaN,
          }]
        : [],
    ).filter((t) => Number.isFinite(t.naiveAnnualCostErrorPct)),
    forecastTotals: forecast?.forecast.buildings.flatMap((b) => (b.costNext12m ? [{ buildingId: b.buildingId, ...b.costNext12m }] : [])),
    portfolioForecast: forecast?.forecast.costNext12m ?? undefined,
    buildingForecasts: forecast ? forecast.forecast.buildings.map((b) => buildingForecastDetail(b, portfolio.bills, forecast.forecast.asOf, forecast.trackRecord)) : undefined,
    // A bundle from an older caller may lack the backtests: the method block is then left out.
    forecastMethod: forecast?.backtest ? forecastMethod(forecast, portfolio) : undefined,
    trackRecordNotes: forecast?.trackRecord.meters.flatMap((m) => (m.note ? [{ meterId: m.meterId, buildingId: m.buildingId, note: m.note }] : [])),
    portfolioTrackRecord: forecast ? { model: accuracy(forecast.trackRecord.overall.model), naive: accuracy(forecast.trackRecord.overall.naive) } : undefined,
  };
}

/**
 * How the forecast was made, for the pages: the basis chosen by the rolling-origin backtests and
 * why, every basis scored, each origin's model-vs-naive figures and out-of-sample coverage, and
 * the meters whose band is uncalibrated.
 */
export function forecastMethod(bundle: ForecastBundle, portfolio: Portfolio): ReportForecastMethod {
  const bt = bundle.backtest;
  const label = (b: WeatherBasisId) => WEATHER_BASIS_LABEL[b];
  return {
    basisLabel: bt.basis ? label(bt.basis) : "each meter's typical year (the normals file when there is one, otherwise the history's average)",
    basisReason: bt.basisReason,
    adjustmentLabel: MONTH_ADJUSTMENT_LABEL[bt.adjustment],
    adjustments: bt.adjustments.map((a) => ({ label: MONTH_ADJUSTMENT_LABEL[a.adjustment], meanAbsAnnualErrorPct: a.meanAbsAnnualErrorPct, cvRmsePct: a.cvRmsePct, chosen: a.adjustment === bt.adjustment })),
    bases: bt.bases.map((b) => ({ label: label(b.basis) + (b.sameAs.length ? ` (same as ${b.sameAs.map(label).join("; ")})` : ""), meanAbsAnnualErrorPct: b.meanAbsAnnualErrorPct, cvRmsePct: b.cvRmsePct, chosen: b.basis === bt.basis })),
    origins: bt.summaries.map((o) => ({
      cut: o.cut,
      meters: o.meters,
      historyMonths: o.historyMonths,
      modelAnnualErrorPct: o.model?.annualErrorPct ?? null,
      naiveAnnualErrorPct: o.naive?.annualErrorPct ?? null,
      modelCvRmsePct: o.model?.cvRmsePct ?? null,
      naiveCvRmsePct: o.naive?.cvRmsePct ?? null,
      coverage: o.coverage,
      factor: o.factor,
      calibrated: o.calibrated,
    })),
    factor: bt.factor,
    calibrated: bt.calibrated,
    coverage: bt.overall.coverage,
    uncalibratedMeters: portfolio.meters
      .filter((m) => !bt.calibrated || (bt.monthsOfBills.get(m.meterId) ?? 0) < MIN_TRACK_RECORD_MONTHS)
      .map((m) => ({ meterId: m.meterId, buildingId: m.buildingId, months: bt.monthsOfBills.get(m.meterId) ?? 0 })),
    correctedBills: bundle.corrections.size,
  };
}

/**
 * Therm per ccf of each meter's tariff, when the tariff states one (the same lookup as
 * portfolio.json, so pages and JSON convert gas alike). The tariff type is not known here.
 */
function heatContentByMeter(portfolio: Portfolio): Map<string, number> {
  const out = new Map<string, number>();
  for (const m of portfolio.meters) {
    const tariff = portfolio.tariffs.get(m.tariffId) as { heatContentThermPerCcf?: unknown } | undefined;
    const h = tariff?.heatContentThermPerCcf;
    if (typeof h === "number" && h > 0) out.set(m.meterId, h);
  }
  return out;
}

/** Longest horizon the budget totals cover (a year). */
const BUDGET_MONTHS = 12;

/**
 * One building's forecast for its page: the building's monthly bands (scenario sums, from the
 * forecast stage), last year's billed cost of the same calendar months, per-commodity monthly
 * P50 and 12-month band (scenario sums over that commodity's meters: `buildingMonthlyCostBands`
 * and `buildingCostBand`), the change drivers and the backtest.
 * @example buildingForecastDetail(b, bills, "2025-12-31", record).byCommodity[0].total // { p10, p50, p90 } of the first 12 months
 */
export function buildingForecastDetail(b: BuildingForecast, bills: readonly Bill[], asOf: string, record: TrackRecord | null): ReportBuildingForecast {
  const priced = b.meters.filter((m) => m.error === null && m.scenarioCosts.scenarios > 0);
  const months = b.monthly.map((m) => m.month);
  const lastYear = lastYearCosts(priced, bills, asOf, months);
  const commodities = [...new Set(priced.map((m) => m.commodity))].sort(commodityOrder);
  const tr = record?.buildings.find((x) => x.buildingId === b.buildingId);
  const d = b.drivers;
  return {
    buildingId: b.buildingId,
    monthly: b.monthly.map((m, k) => ({ month: m.month, ...m.cost, lastYearMonth: shiftMonth(m.month, -12), lastYearCost: lastYear[k]! })),
    totalMonths: Math.min(BUDGET_MONTHS, months.length),
    byCommodity: commodities.map((c) => {
      const group = priced.filter((m) => m.commodity === c);
      return {
        commodity: c,
        monthly: buildingMonthlyCostBands(group).map((m) => ({ month: m.month, p50: m.cost.p50 })),
        total: buildingCostBand(group, BUDGET_MONTHS),
      };
    }),
    drivers:
      d.months.length > 0
        ? {
            months: d.months, lastYearCost: d.lastYearCost, lastYearBilledCost: d.lastYearBilledCost, billingErrors: d.billingErrors,
            forecastCost: d.forecastCost, change: d.change, weather: d.weather, rates: d.rates, usageTrend: d.usageTrend,
          }
        : null,
    trackRecord: tr && (tr.model || tr.naive) ? { model: accuracy(tr.model), naive: accuracy(tr.naive) } : null,
  };
}

/**
 * Billed cost of the same calendar month a year before each forecast month, summed over the
 * priced meters (bills known at as-of, spread by days). Null for a month that any of those
 * meters' bills do not cover completely: a partial sum would read as a drop in cost.
 */
function lastYearCosts(priced: readonly MeterForecast[], bills: readonly Bill[], asOf: string, months: readonly string[]): (number | null)[] {
  if (priced.length === 0) return months.map(() => null);
  const byMeter = billsByMeterOf(bills);
  const perMeter = priced.map((m) => actualMonthlyCost(byMeter.get(m.meterId) ?? [], asOf));
  return months.map((month) => {
    const last = shiftMonth(month, -12);
    let sum = 0;
    for (const costs of perMeter) {
      const c = costs.get(last);
      if (!c || !c.complete) return null;
      sum += c.cost;
    }
    return sum;
  });
}

/**
 * Bills grouped by meter in file order, once per bill list (every building asks; filtering the
 * whole list for each meter grew with meters × bills). Keyed by the list, which no stage changes.
 */
const byMeterOfBills = new WeakMap<readonly Bill[], Map<string, Bill[]>>();
function billsByMeterOf(bills: readonly Bill[]): Map<string, Bill[]> {
  let byMeter = byMeterOfBills.get(bills);
  if (!byMeter) byMeterOfBills.set(bills, (byMeter = groupBy(bills, (b) => b.meterId)));
  return byMeter;
}

function commodityOrder(a: string, b: string): number {
  const order = ["electricity", "gas", "water"];
  return order.indexOf(a) - order.indexOf(b);
}

function accuracy(a: AccuracySummary | null): ReportAccuracy | null {
  return a ? { months: a.months, annualErrorPct: a.annualErrorPct, cvRmsePct: a.cvRmsePct, coverage: a.coverage } : null;
}

/** One row per model a page lists: the change-point model (normalization), the degree-day model (outlier band), the hourly model. */
function modelSummaries(results: BuildingResults[]): ReportModelSummary[] {
  const rows: ReportModelSummary[] = [];
  for (const r of results) {
    for (const b of r.baselines) {
      rows.push({ ...b.summary, kind: b.fit ? `${b.fit.kind} change-point (normalization)` : "none" });
      const dd = b.degreeDay?.fit;
      if (dd) {
        rows.push({
          meterId: b.meterId,
          kind: `degree-day ${dd.form} (outlier band)`,
          cvRmsePct: dd.stats.cvRmsePct,
          nmbePct: dd.stats.nmbePct,
          r2: dd.stats.rSquared,
          n: dd.stats.n,
        });
      }
    }
    for (const outcome of r.intervalBaselines) {
      const chosen = outcome.baseline?.summary.chosen;
      if (!chosen?.cv) continue;
      rows.push({
        meterId: outcome.meterId,
        kind: `hourly ${chosen.kind}${chosen.members ? ` of ${chosen.members.map((m) => m.kind).join(" + ")}` : ""} (cross-validated)`,
        cvRmsePct: chosen.cv.cv_rmse,
        nmbePct: chosen.cv.nmbe,
        r2: chosen.cv.r2,
        n: chosen.cv.n,
      });
    }
  }
  return rows;
}

/**
 * `made` (what `kind` made of `from` and `extra`, a pure function of them) with a content digest
 * made from `from`'s, when `from` has one (core/contentHash.ts withContentDigest): a page key
 * then hashes it as cheaply as the analysis result it was made from.
 */
function digestedLike<T extends object>(from: object, kind: string, made: T, extra: unknown): T {
  const digest = contentDigestOf(from);
  return digest === undefined ? made : withContentDigest(made, contentHash([kind, digest, extra]));
}

function reportBaseline(b: MeterBaseline, unit: string): ReportBaseline {
  const temps = b.scatter.map((p) => p.temp);
  const lo = Math.min(...temps);
  const hi = Math.max(...temps);
  const fit = b.fit;
  const curve =
    fit && temps.length > 0 && hi > lo
      ? Array.from({ length: CURVE_SAMPLES + 1 }, (_, i) => {
          const temp = lo + ((hi - lo) * i) / CURVE_SAMPLES;
          return { temp, usePerDay: fit.predict(temp) };
        })
      : [];
  return {
    meterId: b.meterId,
    kind: fit?.kind ?? "none",
    tempUnit: b.tempUnit,
    unit,
    points: b.scatter,
    curve,
    stats: fit ? { cvRmsePct: fit.stats.cvRmsePct, nmbePct: fit.stats.nmbePct, r2: fit.stats.rSquared, n: fit.stats.n, p: fit.parameterCount } : null,
    meetsGuideline14: b.meetsGuideline14,
    normalizedAnnual: b.normalizedAnnual,
    typicalSource: b.typicalSource,
    tried: b.tried.map((t) => ({ kind: t.kind, accepted: t.accepted, reasons: t.reasons, cvRmsePct: t.cvRmsePct, nmbePct: t.nmbePct, r2: t.r2 })),
    perBill: b.perBill.map((p) => {
      const band = b.expectedByBill.get(p.billId);
      return { ...p, ...(band ? { bandLow: band.low, bandHigh: band.high } : {}) };
    }),
  };
}

function reportQuality(q: MeterQuality): ReportMeterQuality {
  return {
    meterId: q.meterId,
    buildingId: q.buildingId,
    intervalMinutes: q.intervalMinutes,
    detections: q.detections.map((d) => ({ kind: d.kind, startMs: d.startMs, endMs: d.endMs, intervals: d.intervals, action: d.action, detail: d.detail })),
    mask: q.mask,
    alignment: q.alignment
      ? {
          suggestedOffsetHours: q.alignment.suggestedOffsetHours,
          appliedOffsetHours: q.appliedOffsetHours,
          strong: q.alignment.strong,
          note: q.alignment.evidence.note,
          scores: q.alignment.evidence.scores,
        }
      : null,
  };
}
