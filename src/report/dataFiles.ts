/**
 * The machine-readable files every build publishes under OUT/data/ (contract: outputs.md),
 * as text keyed by file name. Pure: the site writer does the writing.
 */
import { billCheckState, type BillCheckState } from "../tariff/index.ts";
import { disputesCsv, disputesJson, type Dispute } from "../disputes/index.ts";
import type { Bill, Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { DEFAULT_HEAT_CONTENT_THERM_PER_CCF } from "../core/units.ts";
import type { Finding } from "../audit/index.ts";
import { findingsToCsvText, toFindingsJson, billsRecomputedRows } from "../audit/index.ts";
import { detectionsToRows, DATA_QUALITY_COLUMNS, type DataQualityRow } from "../clean/index.ts";
import type { Detection } from "../clean/index.ts";
import type { MonthTotal } from "../ingest/index.ts";
import type { WeatherGap } from "../domain/types.ts";
import { toCsv } from "../core/csv.ts";
import type { BuildingResults, HourlyModelOutcome } from "./fromAnalysis.ts";
import type { PricedBill } from "../tariff/index.ts";
import type { MeterBaseline } from "../model/index.ts";
import type { MeterQuality } from "../clean/index.ts";
import type { MeteredViews } from "../audit/index.ts";
import type { ForecastBundle, ForecastRow, Band } from "../forecast/index.ts";
import { weatherGapDetections } from "../clean/index.ts";
import { buildingUsageLast12m, effectiveAsOf, KWH_PER_REPORT_UNIT, REPORT_UNIT, siteKwhLast12m } from "./usageSummary.ts";
import { unitFactor } from "../tariff/index.ts";
import { kwhPerM2ToKbtuPerFt2 } from "./energy.ts";
import { moneyCell, roundCents } from "../core/money.ts";
import { groupBy } from "../core/groupBy.ts";
import { garbageBudget } from "../core/collectGarbage.ts";

export interface OutputsInput {
  portfolio: Portfolio<Tariff>;
  results: BuildingResults[];
  findings: Finding[];
  /** Claims and back-billing risks (src/disputes), in page order. */
  disputes: Dispute[];
  priced: ReadonlyMap<string, PricedBill>;
  monthlyMetered: Map<string, MonthTotal[]>;
  weatherGaps: WeatherGap[];
  quality: MeterQuality[];
  /** Raw and cleaned metered usage per bill id (interval meters only); the audit compares the cleaned sum and shows the raw one beside it. */
  meteredViews: Map<string, MeteredViews>;
  /** Null when no forecast could be made (no as-of date, or the forecast failed). */
  forecast: ForecastBundle | null;
}

const json = (value: unknown): string => `${JSON.stringify(value, null, 2)}\n`;
const round = (x: number | null, digits: number): number | null => (x === null || !Number.isFinite(x) ? null : Number(x.toFixed(digits)));

/**
 * Every data file, name → text: the portfolio-wide files of outputs.md, and the same tables cut
 * per building under `buildings/<building_id>/` for the building pages' downloads.
 */
export function buildDataFiles(input: OutputsInput): Record<string, string> {
  return Object.fromEntries(dataFileEntries(input));
}

/**
 * The data files of buildDataFiles one at a time, in the same order, so a writer can put each on
 * disk and let it go: a thousand-building portfolio has about a hundred megabytes of them.
 */
export function* dataFileEntries(input: OutputsInput): Generator<[name: string, text: string]> {
  const { portfolio, findings } = input;
  const buildingOfMeter = new Map(portfolio.meters.map((m) => [m.meterId, m.buildingId]));
  const qualityRows = dataQualityRows(input);
  const billContext = billsRecomputedContext(input);
  const billsOf = groupBy(portfolio.bills, (b) => buildingOfMeter.get(b.meterId));
  yield ["portfolio.json", json(portfolioJson(input, billsOf))];
  yield ["findings.json", json(toFindingsJson(findings))];
  yield ["findings.csv", findingsToCsvText(findings)];
  yield ["disputes.csv", disputesCsv(input.disputes)];
  yield ["disputes.json", json(disputesJson(input.disputes))];
  // Its slices' rows outlive young-generation collections, and V8 let the old generation fill
  // with them (a 460 MB rise at 1,000 buildings, the site stage's peak): collected as they pile up.
  const budget = garbageBudget();
  yield ["bills-recomputed.csv", csvInSlices(portfolio.bills, (slice) => {
    budget.check();
    return billsRecomputedCsv(billContext, slice, buildingOfMeter);
  })];
  yield ["ingest-report.json", json({ files: portfolio.report.files })];
  yield ["data-quality.csv", toCsv(DATA_QUALITY_COLUMNS, qualityRows)];
  yield ["alignment.json", json(alignmentJson(input.quality))];
  yield ["models.json", json(modelsJson(input.results))];
  if (input.forecast) yield ["forecast.csv", toCsv(FORECAST_COLUMNS, input.forecast.forecast.rows.map(roundForecastRow))];
  // Each table is cut by building in one pass over its rows (not one pass per building: a
  // thousand-building portfolio has about a hundred thousand bills).
  const findingsOf = groupBy(findings, (f) => f.buildingId);
  const disputesOf = groupBy(input.disputes, (d) => d.buildingId);
  const qualityOf = groupBy(qualityRows, (row) => row.building_id);
  const forecastOf = groupBy(input.forecast?.forecast.rows ?? [], (row) => row.building_id);
  for (const r of input.results) {
    const id = r.building.buildingId;
    const folder = `buildings/${id}/`;
    yield [`${folder}findings.csv`, findingsToCsvText(findingsOf.get(id) ?? [])];
    yield [`${folder}disputes.csv`, disputesCsv(disputesOf.get(id) ?? [])];
    yield [`${folder}bills-recomputed.csv`, billsRecomputedCsv(billContext, billsOf.get(id) ?? [], buildingOfMeter)];
    yield [`${folder}data-quality.csv`, toCsv(DATA_QUALITY_COLUMNS, qualityOf.get(id) ?? [])];
    yield [`${folder}models.json`, json(modelsJson([r]))];
    if (input.forecast) yield [`${folder}forecast.csv`, toCsv(FORECAST_COLUMNS, (forecastOf.get(id) ?? []).map(roundForecastRow))];
  }
}

/** Rows per slice of a large CSV: the rows of one slice are made, written out and let go together. */
const CSV_SLICE_ROWS = 5_000;

/**
 * The CSV `csvOf` makes of `items`, made a slice of rows at a time: the same text (each slice's
 * header dropped but the first's), without a hundred thousand rows' intermediate objects alive
 * at once (they made a 450 MB peak at 1,000 buildings). `csvOf` must write each row from its
 * item alone, with "\n" line ends.
 */
export function csvInSlices<T>(items: readonly T[], csvOf: (slice: T[]) => string, size = CSV_SLICE_ROWS): string {
  if (items.length <= size) return csvOf([...items]);
  let text = "";
  for (let i = 0; i < items.length; i += size) {
    const part = csvOf(items.slice(i, i + size));
    text += i === 0 ? part : part.slice(part.indexOf("\n") + 1);
  }
  return text;
}

const FORECAST_COLUMNS = ["building_id", "meter_id", "month", "usage_p50", "cost_p10", "cost_p50", "cost_p90"] as const;

function roundForecastRow(row: ForecastRow): ForecastRow {
  return { ...row, usage_p50: Number(row.usage_p50.toFixed(3)), cost_p10: roundCents(row.cost_p10), cost_p50: roundCents(row.cost_p50), cost_p90: roundCents(row.cost_p90) };
}

/** What bills-recomputed.csv reads of a bill's pricing (not its lines: `priced` may be on disk, see pricedShelf.ts). */
interface PricingFacts {
  computed: { total: number; exact: boolean } | null;
  metered: { total: number; exact: boolean } | null;
  state: BillCheckState;
  error: string | null;
}

/** What every cut of bills-recomputed.csv reads, gathered once. */
interface BillsRecomputedContext {
  input: OutputsInput;
  facts: Map<string, PricingFacts>;
  claimOf: Map<string, { id: string; amount: number }>;
}

function billsRecomputedContext(input: OutputsInput): BillsRecomputedContext {
  // One pass over every bill's pricing, keeping only what the rows show.
  const facts = new Map<string, PricingFacts>();
  for (const [id, p] of input.priced) {
    facts.set(id, {
      computed: p.computed ? { total: p.computed.total, exact: p.computed.exact } : null,
      metered: p.metered ? { total: p.metered.total, exact: p.metered.exact } : null,
      state: billCheckState(p),
      error: p.error,
    });
  }
  const claimOf = new Map<string, { id: string; amount: number }>();
  for (const d of input.disputes) for (const b of d.bills) if (b.billId) claimOf.set(b.billId, { id: d.disputeId, amount: b.claimAmount });
  return { input, facts, claimOf };
}

function billsRecomputedCsv(context: BillsRecomputedContext, bills: Bill[], buildingOfMeter: Map<string, string>): string {
  const { input, facts, claimOf } = context;
  const billed = new Map(bills.map((b) => [b.billId, b.total]));
  const rows = billsRecomputedRows(bills, (id) => buildingOfMeter.get(id) ?? "", { get: (id) => facts.get(id)?.computed }).map((row) => {
    const metered = input.meteredViews.get(row.bill_id);
    const p = facts.get(row.bill_id);
    const state = p?.state ?? billCheckState(undefined);
    const onMeter = p?.metered ?? null;
    const claim = claimOf.get(row.bill_id);
    return {
      ...row,
      // a bill that was not compared has no difference (its estimate is still given)
      difference: state === "exact" ? row.difference : "",
      check_state: state,
      metered_computed_total: onMeter ? moneyCell(onMeter.total) : "",
      metered_difference: onMeter && onMeter.exact ? moneyCell((billed.get(row.bill_id) ?? 0) - onMeter.total) : "",
      dispute_id: claim?.id ?? "",
      claim_amount: claim ? moneyCell(claim.amount) : "",
      not_priced_reason: p?.error ?? "",
      metered_usage_raw: metered ? round(metered.raw, 3) : null,
      metered_usage_cleaned: metered ? round(metered.cleaned, 3) : null,
      flagged_intervals: metered?.flaggedIntervals ?? null,
    };
  });
  const columns = [
    "building_id", "meter_id", "bill_id", "period_start", "period_end", "billed_total", "computed_total", "difference", "exact",
    "check_state", "metered_computed_total", "metered_difference", "dispute_id", "claim_amount", "not_priced_reason", "metered_usage_raw", "metered_usage_cleaned", "flagged_intervals",
  ] as const;
  return toCsv(columns, rows);
}

/** Meter detections and weather gaps as data-quality.csv rows (a weather gap once per building using the station). */
function dataQualityRows(input: OutputsInput): DataQualityRow[] {
  const detections: Detection[] = [...input.quality.flatMap((q) => q.detections), ...weatherGapDetections(input.weatherGaps)];
  const buildingOfMeter = new Map(input.portfolio.meters.map((m) => [m.meterId, m.buildingId]));
  const buildingsOfStation = (stationId: string) => input.portfolio.buildings.filter((b) => b.weatherStation === stationId).map((b) => b.buildingId);
  return detectionsToRows(detections, (id) => buildingOfMeter.get(id) ?? "", buildingsOfStation);
}

function alignmentJson(quality: MeterQuality[]) {
  return quality.map((q) => ({
    meter_id: q.meterId,
    suggested_offset_hours: q.alignment?.suggestedOffsetHours ?? null,
    applied_offset_hours: q.appliedOffsetHours,
    applied_because: q.appliedBecause,
    strong: q.alignment?.strong ?? false,
    evidence: q.alignment ? q.alignment.evidence : { note: q.alignmentSkipped },
  }));
}

/** models.json: per meter, the bill-level models (both families) and, for interval meters, the hourly models. */
function modelsJson(results: BuildingResults[]) {
  return results.flatMap((r) => r.baselines.map((b) => ({
    ...billLevelModels(b),
    hourly: hourlyModels(r.intervalBaselines.find((x) => x.meterId === b.meterId)),
  })));
}

function hourlyModels(outcome: HourlyModelOutcome | undefined) {
  if (!outcome) return null;
  if (!outcome.baseline) return { problem: outcome.problem };
  return outcome.baseline.summary;
}

function billLevelModels(b: MeterBaseline) {
  return ({
    meter_id: b.meterId,
    building_id: b.buildingId,
    level: "bill",
    x: `mean outdoor temperature over the billing period (°${b.tempUnit})`,
    y: "use per day (meter unit)",
    n: b.points.length,
    excluded: b.excluded,
    tried: b.tried.map((t) => ({
      kind: t.kind,
      accepted: t.accepted,
      reasons: t.reasons,
      training: { cv_rmse: round(t.cvRmsePct, 4), nmbe: round(t.nmbePct, 4), r2: round(t.r2, 6), n: t.n, p: t.p },
    })),
    chosen: b.fit
      ? {
          kind: b.fit.kind,
          coefficients: b.fit.beta,
          breakpoints: b.fit.breakpoints,
          cv_rmse: round(b.fit.stats.cvRmsePct, 4),
          nmbe: round(b.fit.stats.nmbePct, 4),
          r2: round(b.fit.stats.rSquared, 6),
          n: b.points.length,
          p: b.fit.parameterCount,
          meets_guideline_14: b.meetsGuideline14,
        }
      : null,
    normalized_annual: round(b.normalizedAnnual, 3),
    typical_year_source: b.typicalSource,
    used_for: "weather normalization and weather-adjusted comparisons",
    degree_day: b.degreeDay
      ? {
          used_for: "the usage-outlier band (leave-one-out residuals)",
          x: `heating/cooling degree-days per day at searched bases (°${b.tempUnit}), integrated from hourly temperatures`,
          tried: b.degreeDay.tried.map((t) => ({
            kind: t.kind,
            accepted: t.accepted,
            reasons: t.reasons,
            training: { cv_rmse: round(t.cvRmsePct, 4), nmbe: round(t.nmbePct, 4), r2: round(t.r2, 6), p: t.p },
          })),
          chosen: {
            kind: b.degreeDay.fit.form,
            heating_base: b.degreeDay.fit.heatingBase,
            cooling_base: b.degreeDay.fit.coolingBase,
            intercept: b.degreeDay.fit.intercept,
            slopes: b.degreeDay.fit.slopes.map((sl) => sl.value),
            cv_rmse: round(b.degreeDay.fit.stats.cvRmsePct, 4),
            nmbe: round(b.degreeDay.fit.stats.nmbePct, 4),
            r2: round(b.degreeDay.fit.stats.rSquared, 6),
            n: b.degreeDay.fit.stats.n,
            p: b.degreeDay.fit.parameterCount,
          },
          refitted_out: b.degreeDay.rejected,
        }
      : null,
  });
}

function bandJson(band: Band | null) {
  return band ? { p10: round(band.p10, 2), p50: round(band.p50, 2), p90: round(band.p90, 2) } : null;
}

function accuracyJson(a: { months: number; forecastTotal: number; actualTotal: number; annualErrorPct: number; cvRmsePct: number; coverage: number | null } | null) {
  return a
    ? { months: a.months, forecast_total: round(a.forecastTotal, 2), actual_total: round(a.actualTotal, 2), annual_error_pct: round(a.annualErrorPct, 3), cv_rmse_pct: round(a.cvRmsePct, 3), coverage: round(a.coverage, 4) }
    : null;
}

function originAccuracyJson(a: { meterMonths: number; actualTotal: number; forecastTotal: number; annualErrorPct: number; meanAbsMeterAnnualErrorPct: number; cvRmsePct: number } | null) {
  return a
    ? { meter_months: a.meterMonths, actual_total: round(a.actualTotal, 2), forecast_total: round(a.forecastTotal, 2), annual_error_pct: round(a.annualErrorPct, 3), mean_abs_meter_annual_error_pct: round(a.meanAbsMeterAnnualErrorPct, 3), cv_rmse_pct: round(a.cvRmsePct, 3) }
    : null;
}

/** portfolio.json; `billsOf`: the portfolio's bills by building id. */
function portfolioJson(input: OutputsInput, billsOf: ReadonlyMap<string, Bill[]>) {
  const { portfolio, results } = input;
  const asOf = effectiveAsOf(portfolio);
  const heatContent = (tariffId: string) => portfolio.tariffs.get(tariffId)?.heatContentThermPerCcf ?? DEFAULT_HEAT_CONTENT_THERM_PER_CCF;
  const fc = input.forecast;
  const forecastOf = new Map((fc?.forecast.buildings ?? []).map((f) => [f.buildingId, f]));
  return {
    name: portfolio.settings.name,
    currency: portfolio.settings.currency,
    as_of: asOf,
    forecast: fc
      ? {
          months: portfolio.settings.forecastMonths,
          cost_next_12m: bandJson(fc.forecast.costNext12m),
          escalation: portfolio.settings.escalation,
          escalation_stated: portfolio.settings.escalationStated,
          noise_calibration: fc.calibration.factor,
          noise_calibrated: fc.calibration.calibrated ?? null,
          weather_basis: fc.backtest?.basis ?? null,
          weather_basis_reason: fc.backtest?.basisReason ?? null,
          month_adjustment: fc.backtest?.adjustment ?? null,
          corrected_bills_used: fc.corrections?.size ?? 0,
          backtests: fc.backtest && {
            bases: fc.backtest.bases.map((b) => ({ basis: b.basis, same_as: b.sameAs, mean_abs_annual_error_pct: round(b.meanAbsAnnualErrorPct, 3), cv_rmse_pct: round(b.cvRmsePct, 3) })),
            month_adjustments: fc.backtest.adjustments.map((a) => ({ adjustment: a.adjustment, mean_abs_annual_error_pct: round(a.meanAbsAnnualErrorPct, 3), cv_rmse_pct: round(a.cvRmsePct, 3) })),
            origins: fc.backtest.summaries.map((o) => ({
              cut: o.cut,
              meters: o.meters,
              history_months: o.historyMonths,
              model: originAccuracyJson(o.model),
              naive_same_month_last_year: originAccuracyJson(o.naive),
              coverage_p10_p90: round(o.coverage, 4),
              coverage_factor: o.factor,
              coverage_calibrated_on_other_origins: o.calibrated,
              coverage_model_own_band: round(o.coverageOwnBand, 4),
            })),
            overall: {
              model: originAccuracyJson(fc.backtest.overall.model),
              naive_same_month_last_year: originAccuracyJson(fc.backtest.overall.naive),
              coverage_p10_p90: round(fc.backtest.overall.coverage, 4),
            },
          },
          track_record: {
            backtest_as_of: fc.trackRecord.backtestAsOf,
            model: accuracyJson(fc.trackRecord.overall.model),
            naive_same_month_last_year: accuracyJson(fc.trackRecord.overall.naive),
            mean_abs_annual_error_pct: fc.trackRecord.overall.meanAbsAnnualErrorPct,
          },
        }
      : null,
    buildings: results.map((r) => {
      const b = r.building;
      const meters = portfolio.meters.filter((m) => m.buildingId === b.buildingId);
      const usage = asOf ? buildingUsageLast12m(b, meters, billsOf.get(b.buildingId) ?? [], asOf, (m) => heatContent(m.tariffId)) : [];
      const commodities: Record<string, unknown> = {};
      for (const u of usage) {
        const own = r.baselines.filter((x) => meters.find((m) => m.meterId === x.meterId)?.commodity === u.commodity);
        // Normalized use adds up only when every meter of the commodity has a model.
        let normalized: number | null = own.length > 0 ? 0 : null;
        for (const x of own) {
          const meter = meters.find((m) => m.meterId === x.meterId)!;
          const f = unitFactor(u.commodity, meter.unit, REPORT_UNIT[u.commodity], heatContent(meter.tariffId));
          normalized = normalized === null || x.normalizedAnnual === null || f === null ? null : normalized + x.normalizedAnnual * f;
        }
        const kwhPer = KWH_PER_REPORT_UNIT[u.commodity];
        const single = own.length === 1 ? own[0]! : null;
        commodities[u.commodity] = {
          actual_last_12m: round(u.actualLast12m, 3),
          actual_coverage: round(u.coverage, 4),
          normalized_annual: round(normalized, 3),
          unit: u.unit,
          eui_kwh_m2: kwhPer !== null && u.actualLast12m !== null ? round((u.actualLast12m * kwhPer) / b.floorAreaM2, 3) : null,
          eui_kbtu_ft2: kwhPer !== null && u.actualLast12m !== null ? round(kwhPerM2ToKbtuPerFt2((u.actualLast12m * kwhPer) / b.floorAreaM2), 3) : null,
          model: single?.fit
            ? {
                kind: single.fit.kind,
                cv_rmse: round(single.fit.stats.cvRmsePct, 4),
                nmbe: round(single.fit.stats.nmbePct, 4),
                r2: round(single.fit.stats.rSquared, 6),
                n: single.points.length,
              }
            : own.length > 1
              ? { kind: "per-meter", meters: own.map((x) => ({ meter_id: x.meterId, kind: x.fit?.kind ?? null, cv_rmse: round(x.fit?.stats.cvRmsePct ?? null, 4), nmbe: round(x.fit?.stats.nmbePct ?? null, 4), r2: round(x.fit?.stats.rSquared ?? null, 6), n: x.points.length })) }
              : null,
        };
      }
      const count = (s: string) => r.findings.filter((f) => f.severity === s).length;
      // Site energy: electricity kWh + gas therms × 29.3071 kWh/therm (EIA therm, NIST Btu).
      const siteKwh = siteKwhLast12m(usage);
      return {
        building_id: b.buildingId,
        name: b.name,
        floor_area_m2: b.floorAreaM2,
        ...commodities,
        site_eui_kwh_m2: siteKwh === null ? null : round(siteKwh / b.floorAreaM2, 3),
        site_eui_kbtu_ft2: siteKwh === null ? null : round(kwhPerM2ToKbtuPerFt2(siteKwh / b.floorAreaM2), 3),
        forecast_cost_next_12m: bandJson(forecastOf.get(b.buildingId)?.costNext12m ?? null),
        findings_count: { error: count("error"), warning: count("warning"), info: count("info") },
        analysis_error: r.failure,
      };
    }),
  };
}
