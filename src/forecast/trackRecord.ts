/**
 * Track record: the forecast made as of one year before the last data, against what the bills
 * then cost.
 *
 * - Backtest as-of = as-of − 12 months. Bills ending after it (+1 day), weather and interval
 *   readings after it are not used; the baseline is refitted (portfolioInputs.ts).
 * - Actual monthly cost: billed totals (bills up to the real as-of) spread over calendar months
 *   by days; a re-issued statement with the same period counts once. Only forecast months the
 *   bills cover completely are compared.
 * - Naive forecast ("same month last year"): the cost per day of the same calendar month a year
 *   earlier, from the bills known at the backtest as-of, × the month's days (a month at least
 *   half covered by those bills is enough; otherwise that month has no naive value).
 * - Model annual forecast: the median over scenarios of the scenario's cost summed over the
 *   compared months (not the sum of monthly medians).
 * Metrics: accuracy.ts. Naive metrics are computed over the compared months that have a naive
 * value; the month counts are reported with them.
 */
import type { Bill, Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { forecastMeter, type MeterForecast, type MeterForecastInput } from "./forecastMeter.ts";
import { billsKnownAt, buildingForecastInputs } from "./portfolioInputs.ts";
import { spreadBillsByMonth } from "./months.ts";
import { annualErrorPct, coverageShare, forecastCvRmsePct } from "./accuracy.ts";
import { bandOf, type Band } from "./quantiles.ts";
import { valueAt } from "./scenarioMatrix.ts";
import { MIN_TRACK_RECORD_MONTHS, type RollingBacktest } from "./backtest.ts";
import { addMonthsIso, shiftMonth } from "../core/time/index.ts";

export interface MonthComparison {
  month: string;
  actualCost: number;
  forecastCost: Band;
  naiveCost: number | null;
  inside: boolean;
}

export interface AccuracySummary {
  /** Months compared. */
  months: number;
  forecastTotal: number;
  actualTotal: number;
  annualErrorPct: number;
  cvRmsePct: number;
  /** Share (0–1) of months inside P10–P90; null for the naive forecast (it has no band). */
  coverage: number | null;
}

export interface MeterTrackRecord {
  meterId: string;
  buildingId: string;
  comparisons: MonthComparison[];
  model: AccuracySummary | null;
  naive: AccuracySummary | null;
  /** Why there is no comparison (no forecast, no complete actual month), else null. */
  note: string | null;
}

export interface TrackRecord {
  /** The real as-of and the backtest's (12 months earlier). */
  asOf: string;
  backtestAsOf: string;
  /** Noise factor of the band shown (chosen on the other origins; 1 = the model's own). */
  calibration: number;
  /** False when the band shown is the model's own (no other origin to calibrate on). */
  calibrated: boolean;
  meters: MeterTrackRecord[];
  buildings: { buildingId: string; model: AccuracySummary | null; naive: AccuracySummary | null }[];
  overall: { model: AccuracySummary | null; naive: AccuracySummary | null; meanAbsAnnualErrorPct: { model: number | null; naive: number | null } };
}

/** Billed cost per calendar month (bills spread by days), of the bills known at `asOf`. */
export function actualMonthlyCost(bills: readonly Bill[], asOf: string): Map<string, { cost: number; complete: boolean; coveredDays: number; days: number }> {
  const out = new Map<string, { cost: number; complete: boolean; coveredDays: number; days: number }>();
  for (const [month, s] of spreadBillsByMonth(billsKnownAt(bills, asOf), (b) => b.total)) {
    out.set(month, { cost: s.amount, complete: s.coveredDays >= s.days, coveredDays: s.coveredDays, days: s.days });
  }
  return out;
}

/**
 * Naive cost of `month`: same month a year earlier, per day × days, from bills known at
 * `knownAsOf` (null when under half of that month is covered).
 * @example a year-earlier January billed 3,100 over its 31 days → 3,100 for this January
 */
export function naiveSameMonthLastYear(bills: readonly Bill[], knownAsOf: string, month: string, days: number): number | null {
  return naiveFromKnown(actualMonthlyCost(bills, knownAsOf), month, days);
}

/** `naiveSameMonthLastYear` from the monthly costs known at the cut (actualMonthlyCost), for callers asking for many months. */
export function naiveFromKnown(known: ReturnType<typeof actualMonthlyCost>, month: string, days: number): number | null {
  const prior = known.get(shiftMonth(month, -12));
  if (!prior || prior.coveredDays < 0.5 * prior.days) return null;
  return (prior.cost / prior.coveredDays) * days;
}

/** Compares one meter's backtest forecast with its actual bills (see the module comment). */
export function compareWithActuals(forecast: MeterForecast, allBills: readonly Bill[], asOf: string, backtestAsOf: string): MeterTrackRecord {
  const base = { meterId: forecast.meterId, buildingId: forecast.buildingId, comparisons: [], model: null, naive: null };
  if (forecast.error !== null) return { ...base, note: `no forecast: ${forecast.error}` };
  const actual = actualMonthlyCost(allBills, asOf);
  const comparisons: MonthComparison[] = [];
  const indices: number[] = [];
  forecast.months.forEach((m, k) => {
    const a = actual.get(m.month);
    if (!a || !a.complete) return;
    const days = a.days;
    const naive = naiveSameMonthLastYear(allBills, backtestAsOf, m.month, days);
    comparisons.push({ month: m.month, actualCost: a.cost, forecastCost: m.cost, naiveCost: naive, inside: a.cost >= m.cost.p10 && a.cost <= m.cost.p90 });
    indices.push(k);
  });
  if (comparisons.length === 0) return { ...base, note: "no forecast month is completely covered by later bills" };
  const costs = forecast.scenarioCosts;
  const scenarioSums = new Float64Array(costs.scenarios);
  for (let s = 0; s < costs.scenarios; s++) scenarioSums[s] = indices.reduce((sum, k) => sum + valueAt(costs, s, k), 0);
  const model = summarize(
    comparisons.map((c) => c.actualCost),
    comparisons.map((c) => c.forecastCost.p50),
    bandOf(scenarioSums).p50,
    comparisons.map((c) => c.forecastCost),
  );
  const withNaive = comparisons.filter((c) => c.naiveCost !== null);
  const naive = withNaive.length > 0
    ? summarize(withNaive.map((c) => c.actualCost), withNaive.map((c) => c.naiveCost!), withNaive.reduce((s, c) => s + c.naiveCost!, 0), null)
    : null;
  return { ...base, comparisons, model, naive, note: null };
}

function summarize(actual: number[], forecast: number[], forecastTotal: number, bands: Band[] | null): AccuracySummary | null {
  const actualTotal = actual.reduce((a, b) => a + b, 0);
  if (!(actualTotal > 0)) return null;
  return {
    months: actual.length,
    forecastTotal,
    actualTotal,
    annualErrorPct: annualErrorPct(forecastTotal, actualTotal),
    cvRmsePct: forecastCvRmsePct(actual, forecast),
    coverage: bands ? coverageShare(actual, bands) : null,
  };
}

/**
 * Pools several meters' comparisons: totals are summed (the model's per-meter medians are
 * added, the building's own scenario sum is not recomputed), CV(RMSE) is over the months every
 * meter compared (summed per month), coverage is the share of all meter-months inside.
 */
export function pooledAccuracy(records: readonly MeterTrackRecord[], which: "model" | "naive"): AccuracySummary | null {
  const usable = records.filter((r) => r[which] !== null);
  if (usable.length === 0) return null;
  const actualTotal = usable.reduce((s, r) => s + r[which]!.actualTotal, 0);
  const forecastTotal = usable.reduce((s, r) => s + r[which]!.forecastTotal, 0);
  const common = usable
    .map((r) => new Set(r.comparisons.filter((c) => which === "model" || c.naiveCost !== null).map((c) => c.month)))
    .reduce((a, b) => new Set([...a].filter((m) => b.has(m))));
  const months = [...common].sort();
  const a = months.map((m) => usable.reduce((s, r) => s + r.comparisons.find((c) => c.month === m)!.actualCost, 0));
  const f = months.map((m) =>
    usable.reduce((s, r) => {
      const c = r.comparisons.find((x) => x.month === m)!;
      return s + (which === "model" ? c.forecastCost.p50 : c.naiveCost!);
    }, 0),
  );
  const all = usable.flatMap((r) => r.comparisons);
  return {
    months: months.length,
    forecastTotal,
    actualTotal,
    annualErrorPct: annualErrorPct(forecastTotal, actualTotal),
    cvRmsePct: months.length > 0 ? forecastCvRmsePct(a, f) : NaN,
    coverage: which === "model" ? all.filter((c) => c.inside).length / all.length : null,
  };
}

export interface TrackRecordOptions {
  /** The real as-of (last day of data). */
  asOf: string;
  /** Months compared (12). */
  months?: number;
  scenarios?: number;
  seed?: number;
  calibration?: number;
}

/** The backtest as-of: one year before `asOf`. @example backtestAsOf("2025-12-31") // "2024-12-31" */
export function backtestAsOf(asOf: string): string {
  return addMonthsIso(asOf, -12);
}

/** Every meter's forecast inputs as of the backtest date. */
export function backtestInputs(portfolio: Portfolio<Tariff>, options: TrackRecordOptions): MeterForecastInput[] {
  const asOf = backtestAsOf(options.asOf);
  return portfolio.buildings.flatMap((b) =>
    buildingForecastInputs(portfolio, b, { asOf, months: options.months ?? 12, scenarios: options.scenarios, seed: options.seed, calibration: options.calibration }),
  );
}

/**
 * The track record of the whole portfolio (see the module comment); `inputs` may be passed to
 * reuse backtest inputs already built (e.g. by calibrateNoise).
 * @example trackRecord(portfolio, { asOf: "2025-12-31" }).overall.model?.annualErrorPct
 */
export function trackRecord(portfolio: Portfolio<Tariff>, options: TrackRecordOptions, inputs = backtestInputs(portfolio, options)): TrackRecord {
  const bt = backtestAsOf(options.asOf);
  const calibration = options.calibration ?? 1;
  const meters = inputs.map((input) => {
    const forecast = forecastMeter({ ...input, calibration });
    return compareWithActuals(forecast, portfolio.bills.filter((b) => b.meterId === input.meter.meterId), options.asOf, bt);
  });
  const { buildings, meanAbs } = rollUp(portfolio, meters);
  return {
    asOf: options.asOf,
    backtestAsOf: bt,
    calibration,
    calibrated: calibration !== 1,
    meters,
    buildings,
    overall: { model: pooledAccuracy(meters, "model"), naive: pooledAccuracy(meters, "naive"), meanAbsAnnualErrorPct: { model: meanAbs("model"), naive: meanAbs("naive") } },
  };
}

/** Per-building pooled accuracy and the mean absolute annual error over meters, model or naive. */
function rollUp(portfolio: Portfolio<Tariff>, meters: MeterTrackRecord[]) {
  const buildings = portfolio.buildings.map((b) => {
    const own = meters.filter((m) => m.buildingId === b.buildingId);
    return { buildingId: b.buildingId, model: pooledAccuracy(own, "model"), naive: pooledAccuracy(own, "naive") };
  });
  const meanAbs = (which: "model" | "naive"): number | null => {
    const xs = meters.map((m) => m[which]?.annualErrorPct).filter((x): x is number => x !== undefined);
    return xs.length > 0 ? xs.reduce((s, x) => s + Math.abs(x), 0) / xs.length : null;
  };
  return { buildings, meanAbs };
}

/**
 * The track record the page shows: the latest rolling origin (one year before as-of), each
 * meter's months with the band at the factor chosen on the OTHER origins (out of sample; the
 * model's own band when there is no other origin), the model P50 and the naive forecast on the
 * same months. Meters with under 24 months of bills get the note "not enough history for a
 * track record (N months)".
 * @example trackRecordFromBacktest(portfolio, rollingBacktest(portfolio, { asOf }), asOf).overall.model?.coverage
 */
export function trackRecordFromBacktest(portfolio: Portfolio<Tariff>, bt: RollingBacktest, asOf: string): TrackRecord {
  const summary = bt.summaries[0];
  const factorIndex = summary ? bt.coverageByFactor.findIndex((c) => c.factor === summary.factor) : -1;
  const latest = new Map((bt.meters[0] ?? []).map((m) => [m.meterId, m]));
  const meters: MeterTrackRecord[] = portfolio.meters.map((meter) => {
    const base = { meterId: meter.meterId, buildingId: meter.buildingId, comparisons: [] as MonthComparison[], model: null, naive: null };
    const months = bt.monthsOfBills.get(meter.meterId) ?? 0;
    if (months < MIN_TRACK_RECORD_MONTHS) return { ...base, note: `not enough history for a track record (${months} months)` };
    const m = latest.get(meter.meterId);
    const band = m?.bandByFactor[factorIndex];
    if (!m || !band) return { ...base, note: "no month of the past year could be compared (no tariff, or no complete month with a bill a year earlier)" };
    const comparisons: MonthComparison[] = m.months.map((month, k) => ({
      month,
      actualCost: m.actual[k]!,
      forecastCost: { p10: band.lo[k]!, p50: band.mid[k]!, p90: band.hi[k]! },
      naiveCost: m.naive[k]!,
      inside: m.actual[k]! >= band.lo[k]! && m.actual[k]! <= band.hi[k]!,
    }));
    const model = summarize(m.actual, band.mid, band.mid.reduce((s, x) => s + x, 0), comparisons.map((c) => c.forecastCost));
    const naive = summarize(m.actual, m.naive, m.naive.reduce((s, x) => s + x, 0), null);
    return { ...base, comparisons, model, naive, note: null };
  });
  const { buildings, meanAbs } = rollUp(portfolio, meters);
  return {
    asOf,
    backtestAsOf: summary?.cut ?? backtestAsOf(asOf),
    calibration: summary?.factor ?? 1,
    calibrated: summary?.calibrated ?? false,
    meters,
    buildings,
    overall: { model: pooledAccuracy(meters, "model"), naive: pooledAccuracy(meters, "naive"), meanAbsAnnualErrorPct: { model: meanAbs("model"), naive: meanAbs("naive") } },
  };
}
