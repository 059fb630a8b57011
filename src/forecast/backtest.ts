/**
 * Rolling-origin backtests: the forecast made at each past cut date, scored against the bills
 * that followed. They choose the weather basis, calibrate the band and give the track record.
 *
 * Origins. Cut dates are the as-of date minus 12, 24, 36 … months, as far back as some meter
 * still has 12 months of bills before the cut. At each cut the portfolio is truncated
 * (bills ending after it, weather and interval readings after it are not used; baselines are
 * refitted, portfolioInputs.ts) and the next 12 calendar months are forecast.
 *
 * Which meters count. A meter takes part in the backtests only with at least 24 months of bills
 * up to the as-of date (12 to fit, 12 to compare; `monthsOfBills`), and at a cut only with 12
 * months of bills before it. Months compared: forecast months the bills cover completely that also have
 * a naive value, so the model and the naive forecast are scored on the same months.
 *
 * Forecasts scored. For each meter, month and noise factor c: the usage scenarios
 * (usageScenarios.ts, same seed for every c) give per-month usage P10, P50, P90; each of the three
 * paths is priced month by month through the tariff (ratchets follow the path). For a month whose
 * cost never falls as usage rises (blocks, demand, ratchets, percent taxes, minimum bills with
 * non-negative rates) the priced path is the cost quantile. Model = the P50 path; band = P10…P90.
 * Naive = same calendar month last year (trackRecord.ts), from bills known at the cut.
 *
 * Weather basis. Each candidate (weatherBasis.ts) sets the typical year at every origin; the one
 * with the smallest mean absolute meter annual cost error, averaged over origins, is chosen
 * (ties: the smaller pooled monthly CV(RMSE), then the candidate order).
 *
 * Calendar-month adjustment. At the chosen basis, the adjustments of residual.ts (none, the
 * history's average departure per calendar month, last year's departure) are scored the same
 * way; the smallest sum of mean absolute annual error and CV(RMSE) wins (ties: none first).
 *
 * Calibration. For the chosen basis and adjustment, factor c of CALIBRATION_GRID scales the model's prediction
 * noise; the factor whose pooled share of meter-months inside P10–P90 is nearest 80 % is chosen.
 * The coverage reported for an origin uses the factor chosen on the OTHER origins (out of
 * sample); with a single origin there is nothing to calibrate on, so it uses the model's own
 * band (c = 1) and is marked uncalibrated. The factor for the forecast itself is chosen on every
 * origin.
 *
 * Actual costs are the bills as they should have been (correctedBills.ts) when the caller passes
 * a portfolio whose bills carry the audit's corrections.
 */
import type { Bill, Portfolio } from "../domain/types.ts";
import type { Tariff } from "../tariff/index.ts";
import { meterPricingContexts, meterScenarioSetup, DEFAULT_SCENARIOS, type MeterForecastInput } from "./forecastMeter.ts";
import { buildingForecastInputs, type AnalysedPricing } from "./portfolioInputs.ts";
import { priceForecastMonth } from "./priceMonth.ts";
import { bandOf, p50Of } from "./quantiles.ts";
import { monthColumn } from "./scenarioMatrix.ts";
import type { ScenarioNoise, ScenarioSetup } from "./usageScenarios.ts";
import { actualMonthlyCost, naiveFromKnown } from "./trackRecord.ts";
import { WEATHER_BASES, typicalForBasis, type WeatherBasisId } from "./weatherBasis.ts";
import { MONTH_ADJUSTMENTS, type MonthAdjustment } from "./residual.ts";
import { addMonthsIso, monthsAfter } from "../core/time/index.ts";
import { expectedProblem } from "../core/errors.ts";
import { noMemo, type Memo } from "../core/memo.ts";
import { garbageBudget } from "../core/collectGarbage.ts";
import { contentHash } from "../core/contentHash.ts";

/** Noise factors tried. */
export const CALIBRATION_GRID: readonly number[] = [0.5, 0.75, 1, 1.25, 1.5, 1.75, 2, 2.5, 3, 4, 5];
export const TARGET_COVERAGE = 0.8;
/** Months of bills a meter needs for a track record (12 to fit, 12 to compare). */
export const MIN_TRACK_RECORD_MONTHS = 24;
/** Months of bills before a cut for the meter to be forecast from it. */
export const MIN_FIT_MONTHS = 12;
/** Most origins looked at (the oldest are dropped first). */
const MAX_ORIGINS = 10;

/** One meter at one origin: the months compared and what each forecast said. */
export interface BacktestMeter {
  meterId: string;
  buildingId: string;
  /** Months of bills before the cut (`monthsOfBills`). */
  historyMonths: number;
  months: string[];
  actual: number[];
  naive: number[];
  /** Priced usage-P50 path per basis tried (factor 1). */
  p50ByBasis: Partial<Record<WeatherBasisId, number[]>>;
  /** Priced usage-P10 and P90 paths at the chosen basis, per factor of the grid. */
  bandByFactor: { lo: number[]; hi: number[]; mid: number[] }[];
}

export interface Accuracy {
  /** Meter-months compared. */
  meterMonths: number;
  actualTotal: number;
  forecastTotal: number;
  /** 100 · (Σ forecast − Σ actual) / Σ actual over the meter-months. */
  annualErrorPct: number;
  /** Mean over meters of |annual cost error| (each meter over its months). */
  meanAbsMeterAnnualErrorPct: number;
  /** 100 · sqrt(mean over meter-months of (actual − forecast)²) / mean actual. */
  cvRmsePct: number;
}

export interface OriginSummary {
  cut: string;
  /** Shortest and longest history (months of bills before the cut) of the meters compared. */
  historyMonths: { min: number; max: number };
  meters: number;
  model: Accuracy | null;
  naive: Accuracy | null;
  /** Share of meter-months inside P10–P90 with the factor chosen on the other origins (or 1). */
  coverage: number | null;
  /** The factor that coverage used, and whether it was calibrated on other origins. */
  factor: number;
  calibrated: boolean;
  /** Coverage of the model's own band (factor 1). */
  coverageOwnBand: number | null;
}

export interface BasisScore {
  basis: WeatherBasisId;
  /** Bases that gave exactly the same forecasts (e.g. recent-15 with only 10 years of history), folded into this one. */
  sameAs: WeatherBasisId[];
  /** Mean over origins of the mean absolute meter annual cost error (%). */
  meanAbsAnnualErrorPct: number;
  /** Mean over origins of the pooled monthly CV(RMSE) (%). */
  cvRmsePct: number;
  /** Per origin: the pooled annual error (%). */
  byOrigin: { cut: string; annualErrorPct: number; meanAbsMeterAnnualErrorPct: number; cvRmsePct: number }[];
}

export interface AdjustmentScore {
  adjustment: MonthAdjustment;
  meanAbsAnnualErrorPct: number;
  cvRmsePct: number;
  byOrigin: BasisScore["byOrigin"];
}

export interface RollingBacktest {
  origins: string[];
  /** Calendar-month adjustments scored at the chosen basis (best first: smallest annual + CV error), and the one used. */
  adjustments: AdjustmentScore[];
  adjustment: MonthAdjustment;
  meters: BacktestMeter[][];
  /** Bases scored, best first; empty when no origin could be scored. */
  bases: BasisScore[];
  basis: WeatherBasisId | null;
  basisReason: string;
  /** Factor for the forecast (chosen on every origin); 1 when no origin could be scored. */
  factor: number;
  calibrated: boolean;
  coverageByFactor: { factor: number; coverage: number; meterMonths: number }[];
  summaries: OriginSummary[];
  /** Pooled over origins: the same figures as each summary. */
  overall: { model: Accuracy | null; naive: Accuracy | null; coverage: number | null; coverageOwnBand: number | null };
  /** Months of bills up to the as-of date, per meter (`monthsOfBills`). */
  monthsOfBills: Map<string, number>;
}

export interface BacktestOptions {
  asOf: string;
  scenarios?: number;
  seed?: number;
  grid?: readonly number[];
  /** Bases to try; default every basis. */
  bases?: readonly WeatherBasisId[];
  /**
   * Each meter's priced paths at an origin are a pure function of its forecast input, its
   * judged months and the basis, adjustment and grid: a build with a cache keeps them here, so
   * a rebuild prices only the meters whose inputs changed. Default: none.
   */
  memo?: Memo;
  /** The analysis's pricing, for the ratchet history (ForecastRunOptions.analysed). */
  analysed?: AnalysedPricing;
}

/**
 * Months of bills known at `asOf`: days billed (a re-issued period counted once, overlaps once
 * per calendar month at most its days) / (365.25 / 12), rounded. A year of monthly bills is 12.
 * @example twelve monthly bills covering 2024 → 12
 */
export function monthsOfBills(bills: readonly Bill[], asOf: string): number {
  let days = 0;
  for (const m of actualMonthlyCost(bills, asOf).values()) days += Math.min(m.days, m.coveredDays);
  return Math.round(days / (365.25 / 12));
}

/** Cut dates: as-of − 12k months, newest first (see the module comment). */
export function rollingOrigins(bills: readonly Bill[], asOf: string): string[] {
  const byMeter = new Map<string, Bill[]>();
  for (const b of bills) byMeter.set(b.meterId, [...(byMeter.get(b.meterId) ?? []), b]);
  const out: string[] = [];
  for (let k = 1; k <= MAX_ORIGINS; k++) {
    const cut = addMonthsIso(asOf, -12 * k);
    if (![...byMeter.values()].some((bs) => monthsOfBills(bs, cut) >= MIN_FIT_MONTHS)) break;
    out.push(cut);
  }
  return out;
}

/** Priced cost of each month along one usage path (ratchets see the path's own earlier months). */
function pricePath(input: MeterForecastInput, contexts: ReturnType<typeof meterPricingContexts>, usage: readonly number[]): number[] {
  const previous = [...(input.previousBillingDemandsKw ?? [])];
  return usage.map((u, k) => {
    const priced = priceForecastMonth(contexts[k]!, u, previous);
    if (priced.billingDemandKw !== null) previous.push(priced.billingDemandKw);
    return priced.cost;
  });
}

/**
 * The meter's scenarios at one origin with the input's basis and adjustment, for any factor.
 * `drawn` holds the meter's draws at this origin: the first setup makes them, later ones (other
 * bases, adjustments) reuse them — the same numbers as drawing anew.
 */
function setupOf(input: MeterForecastInput, drawn: { noise?: ScenarioNoise }): ScenarioSetup | null {
  const months = monthsAfter(input.asOf, input.months);
  const setup = meterScenarioSetup(input, months, Math.max(1, Math.floor(input.scenarios ?? DEFAULT_SCENARIOS)), drawn.noise);
  if (setup) drawn.noise = setup.noise;
  return setup;
}

/** Usage P10/P50/P90 per forecast month at factor c. */
function usageQuantiles(setup: ScenarioSetup | null, factor: number): { lo: number[]; mid: number[]; hi: number[] } | null {
  if (!setup) return null;
  const usage = setup.at(factor);
  const bands = Array.from({ length: usage.months }, (_, k) => bandOf(monthColumn(usage, k)));
  return { lo: bands.map((b) => b.p10), mid: bands.map((b) => b.p50), hi: bands.map((b) => b.p90) };
}

/** Usage P50 per forecast month at factor c (`usageQuantiles(…).mid`, without the P10 and P90 nobody reads). */
function usageMedians(setup: ScenarioSetup | null, factor: number): number[] | null {
  if (!setup) return null;
  const usage = setup.at(factor);
  return Array.from({ length: usage.months }, (_, k) => p50Of(monthColumn(usage, k)));
}

/** The input with the typical year of `basis` (unchanged when the basis is not available for it). */
function withBasis(input: MeterForecastInput, basis: WeatherBasisId): MeterForecastInput {
  if (!input.fit) return input;
  const typical = typicalForBasis(basis, input.weatherYears, input.normalsMonthlyTemp ?? null);
  return typical ? { ...input, typicalMonthlyTemp: typical } : input;
}

/**
 * Whether two typical years are the same numbers (Object.is per month, so −0 and NaN count as
 * themselves): `withBasis` changes nothing else, so the same typical year is the same input.
 */
function sameTypical(a: readonly number[] | null, b: readonly number[] | null): boolean {
  if (a === b) return true;
  if (a === null || b === null || a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

/**
 * Accuracy over meter-months (see `Accuracy`); null when nothing was compared.
 * @example accuracyOf([{ actual: [100, 100], forecast: [110, 90] }]) // annual 0 %, CV(RMSE) 10 %
 */
export function accuracyOf(rows: readonly { actual: readonly number[]; forecast: readonly number[] }[]): Accuracy | null {
  const used = rows.filter((r) => r.actual.length > 0);
  const a = used.flatMap((r) => [...r.actual]);
  const f = used.flatMap((r) => [...r.forecast]);
  const actualTotal = a.reduce((s, x) => s + x, 0);
  if (a.length === 0 || !(actualTotal > 0)) return null;
  const forecastTotal = f.reduce((s, x) => s + x, 0);
  let ss = 0;
  for (let i = 0; i < a.length; i++) ss += (a[i]! - f[i]!) ** 2;
  const perMeter = used
    .map((r) => ({ at: r.actual.reduce((s, x) => s + x, 0), ft: r.forecast.reduce((s, x) => s + x, 0) }))
    .filter((r) => r.at > 0)
    .map((r) => Math.abs((100 * (r.ft - r.at)) / r.at));
  return {
    meterMonths: a.length,
    actualTotal,
    forecastTotal,
    annualErrorPct: (100 * (forecastTotal - actualTotal)) / actualTotal,
    meanAbsMeterAnnualErrorPct: perMeter.length > 0 ? perMeter.reduce((s, x) => s + x, 0) / perMeter.length : NaN,
    cvRmsePct: (100 * Math.sqrt(ss / a.length)) / (actualTotal / a.length),
  };
}

function coverageOf(meters: readonly BacktestMeter[], factorIndex: number): { inside: number; count: number } {
  let inside = 0;
  let count = 0;
  for (const m of meters) {
    const band = m.bandByFactor[factorIndex];
    if (!band) continue;
    m.actual.forEach((a, k) => {
      count++;
      if (a >= band.lo[k]! && a <= band.hi[k]!) inside++;
    });
  }
  return { inside, count };
}

/** Index of the grid factor whose pooled coverage over `meters` is nearest the target (ties: smaller factor); null when no month. */
function chooseFactor(meters: readonly BacktestMeter[], grid: readonly number[]): number | null {
  let best: number | null = null;
  let bestGap = Infinity;
  grid.forEach((_, i) => {
    const { inside, count } = coverageOf(meters, i);
    if (count === 0) return;
    const gap = Math.abs(inside / count - TARGET_COVERAGE);
    if (gap < bestGap - 1e-12) {
      bestGap = gap;
      best = i;
    }
  });
  return best;
}

/**
 * Runs the rolling-origin backtests of a portfolio (see the module comment).
 * @example rollingBacktest(portfolio, { asOf: "2025-12-31" }).basis // e.g. "recent-10"
 */
export function rollingBacktest(portfolio: Portfolio<Tariff>, options: BacktestOptions): RollingBacktest {
  const grid = options.grid ?? CALIBRATION_GRID;
  const bases = options.bases ?? WEATHER_BASES;
  const billsByMeter = new Map<string, Bill[]>();
  for (const b of portfolio.bills) billsByMeter.set(b.meterId, [...(billsByMeter.get(b.meterId) ?? []), b]);
  const monthsByMeter = new Map(portfolio.meters.map((m) => [m.meterId, monthsOfBills(billsByMeter.get(m.meterId) ?? [], options.asOf)]));
  const eligible = portfolio.bills.filter((b) => (monthsByMeter.get(b.meterId) ?? 0) >= MIN_TRACK_RECORD_MONTHS);
  const origins = rollingOrigins(eligible, options.asOf);
  const oneIndex = grid.indexOf(1);
  const memo = options.memo ?? noMemo;
  // The memo's key of a row: its input's content hash, taken once (not at all without a memo).
  const keyOf = (r: { input: MeterForecastInput; key?: string; meter: BacktestMeter }) => ({ input: (r.key ??= memo === noMemo ? "" : contentHash(r.input)), keep: keepOf(r.meter) });

  // What each meter's bills actually cost by month does not depend on the origin: once per meter.
  const actualByMeter = new Map<string, ReturnType<typeof actualMonthlyCost>>();
  const actualOf = (id: string, bills: readonly Bill[]) => {
    let a = actualByMeter.get(id);
    if (!a) actualByMeter.set(id, (a = actualMonthlyCost(bills, options.asOf)));
    return a;
  };

  // Inputs per origin (refitted on the truncated data), and the months each meter is judged on.
  // Each row's scenarios are made and dropped many times over; V8 let that garbage reach twice
  // the live heap (the forecast stage's peak): collected as it piles up.
  const budget = garbageBudget();
  const perOrigin = origins.map((cut) => {
    const inputs = portfolio.buildings.flatMap((b) => {
      budget.check();
      return buildingForecastInputs(portfolio, b, { asOf: cut, months: 12, scenarios: options.scenarios, seed: options.seed, memo: options.memo, analysed: options.analysed });
    });
    const rows: { input: MeterForecastInput; meter: BacktestMeter; contexts: ReturnType<typeof meterPricingContexts>; drawn: { noise?: ScenarioNoise }; key?: string }[] = [];
    for (const input of inputs) {
      const id = input.meter.meterId;
      const bills = billsByMeter.get(id) ?? [];
      if ((monthsByMeter.get(id) ?? 0) < MIN_TRACK_RECORD_MONTHS || !input.tariff || input.tariff.versions.length === 0) continue;
      const historyMonths = monthsOfBills(bills, cut);
      if (historyMonths < MIN_FIT_MONTHS) continue;
      const forecastMonths = monthsAfter(cut, 12);
      const actual = actualOf(id, bills);
      const keep: number[] = [];
      let known: ReturnType<typeof actualMonthlyCost> | undefined;
      const meter: BacktestMeter = { meterId: id, buildingId: input.meter.buildingId, historyMonths, months: [], actual: [], naive: [], p50ByBasis: {}, bandByFactor: [] };
      forecastMonths.forEach((m, k) => {
        const a = actual.get(m.month);
        if (!a || !a.complete) return;
        const naive = naiveFromKnown((known ??= actualMonthlyCost(bills, cut)), m.month, a.days);
        if (naive === null) return;
        keep.push(k);
        meter.months.push(m.month);
        meter.actual.push(a.cost);
        meter.naive.push(naive);
      });
      if (keep.length === 0) continue;
      let contexts: ReturnType<typeof meterPricingContexts>;
      try {
        contexts = meterPricingContexts(input, input.tariff, forecastMonths);
      } catch (error) {
        expectedProblem(error);
        continue;
      }
      rows.push({ input, meter: Object.assign(meter, { keep }), contexts, drawn: {} });
    }
    return rows;
  });
  const pick = (xs: number[], keep: number[]): number[] => keep.map((k) => xs[k]!);
  const keepOf = (m: BacktestMeter): number[] => (m as BacktestMeter & { keep: number[] }).keep;

  // Weather basis: the P50 path of every candidate at the model's own noise.
  for (const rows of perOrigin) {
    for (const r of rows) {
      budget.check();
      r.meter.p50ByBasis = memo("backtest-basis-paths", { ...keyOf(r), bases }, () => {
        const paths: BacktestMeter["p50ByBasis"] = {};
        // Bases often give the very same typical year (every window covers the whole history, or
        // no normals and no fit): the input is then the same, so is its path; priced once.
        const done: { typical: readonly number[] | null; path: number[] | undefined }[] = [];
        for (const basis of bases) {
          const input = withBasis(r.input, basis);
          const twin = done.find((d) => sameTypical(d.typical, input.typicalMonthlyTemp));
          if (twin) {
            if (twin.path) paths[basis] = [...twin.path];
            continue;
          }
          let path: number[] | undefined;
          try {
            const mid = usageMedians(setupOf(input, r.drawn), 1);
            if (mid) path = pick(pricePath(r.input, r.contexts, mid), keepOf(r.meter));
          } catch (error) {
            expectedProblem(error); // a month the tariff cannot price leaves this basis out for the meter
          }
          if (path) paths[basis] = path;
          done.push({ typical: input.typicalMonthlyTemp, path });
        }
        return paths;
      });
    }
  }
  const scores: BasisScore[] = [];
  for (const basis of bases) {
    const byOrigin: BasisScore["byOrigin"] = [];
    let complete = true;
    perOrigin.forEach((rows, o) => {
      const scored = rows.filter((r) => r.meter.p50ByBasis[basis]);
      if (scored.length < rows.length) complete = false;
      const acc = accuracyOf(scored.map((r) => ({ actual: r.meter.actual, forecast: r.meter.p50ByBasis[basis]! })));
      if (acc) byOrigin.push({ cut: origins[o]!, annualErrorPct: acc.annualErrorPct, meanAbsMeterAnnualErrorPct: acc.meanAbsMeterAnnualErrorPct, cvRmsePct: acc.cvRmsePct });
    });
    // A basis some meters could not be priced with is not comparable.
    if (!complete || byOrigin.length === 0) continue;
    const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
    const same = (a: BasisScore["byOrigin"], b: BasisScore["byOrigin"]) => a.length === b.length && a.every((x, i) => JSON.stringify(x) === JSON.stringify(b[i]));
    const twin = scores.find((t) => same(t.byOrigin, byOrigin) && perOrigin.every((rows) => rows.every((r) => r.meter.p50ByBasis[t.basis]?.join() === r.meter.p50ByBasis[basis]?.join())));
    if (twin) {
      twin.sameAs.push(basis);
      continue;
    }
    scores.push({ basis, sameAs: [], byOrigin, meanAbsAnnualErrorPct: mean(byOrigin.map((b) => b.meanAbsMeterAnnualErrorPct)), cvRmsePct: mean(byOrigin.map((b) => b.cvRmsePct)) });
  }
  // Identical forecasts (a basis that equals another) keep the earlier candidate.
  const ranked = [...scores].sort((a, b) => a.meanAbsAnnualErrorPct - b.meanAbsAnnualErrorPct || a.cvRmsePct - b.cvRmsePct || bases.indexOf(a.basis) - bases.indexOf(b.basis));
  const basis = ranked[0]?.basis ?? null;
  const basisReason = basis === null
    ? "no backtest could be scored (no meter has 24 months of bills): the typical year is the normals file when there is one, otherwise the history's average"
    : ranked.length === 1
      ? `the only basis the data allows; backtested over ${origins.length} rolling origin(s)`
      : `smallest mean absolute meter annual cost error over ${origins.length} rolling origin(s): ${ranked[0]!.meanAbsAnnualErrorPct.toFixed(1)} % against ${ranked.slice(1).map((s) => `${s.meanAbsAnnualErrorPct.toFixed(1)} % (${s.basis})`).join(", ")}`;
  const folded = ranked[0]?.sameAs.length ? ` (${ranked[0]!.sameAs.join(", ")} gave the same forecast: the history is too short to tell them apart)` : "";

  // Calendar-month adjustment at the chosen basis, scored the same way.
  const adjustmentScores: AdjustmentScore[] = [];
  for (const adjustment of MONTH_ADJUSTMENTS) {
    const byOrigin: BasisScore["byOrigin"] = [];
    perOrigin.forEach((rows, o) => {
      const paths = rows.map((r) => {
        budget.check();
        if (adjustment === "none") return basis ? r.meter.p50ByBasis[basis] ?? null : null;
        return memo("backtest-adjusted-path", { ...keyOf(r), basis, adjustment }, () => {
          try {
            const mid = usageMedians(setupOf({ ...(basis ? withBasis(r.input, basis) : r.input), adjustment }, r.drawn), 1);
            return mid ? pick(pricePath(r.input, r.contexts, mid), keepOf(r.meter)) : null;
          } catch (error) {
            expectedProblem(error);
            return null;
          }
        });
      });
      const acc = accuracyOf(rows.flatMap((r, i) => (paths[i] ? [{ actual: r.meter.actual, forecast: paths[i]! }] : [])));
      if (acc) byOrigin.push({ cut: origins[o]!, annualErrorPct: acc.annualErrorPct, meanAbsMeterAnnualErrorPct: acc.meanAbsMeterAnnualErrorPct, cvRmsePct: acc.cvRmsePct });
    });
    if (byOrigin.length === 0) continue;
    const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
    adjustmentScores.push({ adjustment, byOrigin, meanAbsAnnualErrorPct: mean(byOrigin.map((b) => b.meanAbsMeterAnnualErrorPct)), cvRmsePct: mean(byOrigin.map((b) => b.cvRmsePct)) });
  }
  // Ranked on the sum of the two errors: the adjustment is about the shape of the year (CV) as much as its total.
  const adjustmentsRanked = [...adjustmentScores].sort((a, b) => a.meanAbsAnnualErrorPct + a.cvRmsePct - (b.meanAbsAnnualErrorPct + b.cvRmsePct) || MONTH_ADJUSTMENTS.indexOf(a.adjustment) - MONTH_ADJUSTMENTS.indexOf(b.adjustment));
  const adjustment: MonthAdjustment = adjustmentsRanked[0]?.adjustment ?? "none";

  // Band: priced P10/P90 paths at the chosen basis and adjustment for every factor.
  for (const rows of perOrigin) {
    for (const r of rows) {
      budget.check();
      r.meter.bandByFactor = memo("backtest-bands", { ...keyOf(r), basis, adjustment, grid }, () => {
        const input = { ...(basis ? withBasis(r.input, basis) : r.input), adjustment };
        const bands: BacktestMeter["bandByFactor"] = [];
        let setup: ScenarioSetup | null | undefined;
        for (const c of grid) {
          try {
            setup ??= setupOf(input, r.drawn);
            const q = usageQuantiles(setup, c);
            if (!q) break;
            bands.push({
              lo: pick(pricePath(input, r.contexts, q.lo), keepOf(r.meter)),
              hi: pick(pricePath(input, r.contexts, q.hi), keepOf(r.meter)),
              mid: pick(pricePath(input, r.contexts, q.mid), keepOf(r.meter)),
            });
          } catch (error) {
            expectedProblem(error);
            return [];
          }
        }
        return bands;
      });
    }
  }
  const meters = perOrigin.map((rows) => rows.map((r) => r.meter).filter((m) => m.bandByFactor.length === grid.length));
  const all = meters.flat();
  const coverageByFactor = grid.map((factor, i) => {
    const { inside, count } = coverageOf(all, i);
    return { factor, coverage: count > 0 ? inside / count : NaN, meterMonths: count };
  });
  const chosenAll = chooseFactor(all, grid);
  const summaries: OriginSummary[] = meters.map((ms, o) => {
    const others = meters.filter((_, j) => j !== o).flat();
    const loo = others.length > 0 ? chooseFactor(others, grid) : null;
    const fi = loo ?? oneIndex;
    const cov = coverageOf(ms, fi);
    const own = coverageOf(ms, oneIndex);
    const hist = ms.map((m) => m.historyMonths);
    return {
      cut: origins[o]!,
      historyMonths: { min: hist.length ? Math.min(...hist) : 0, max: hist.length ? Math.max(...hist) : 0 },
      meters: ms.length,
      model: accuracyOf(ms.map((m) => ({ actual: m.actual, forecast: m.bandByFactor[fi]!.mid }))),
      naive: accuracyOf(ms.map((m) => ({ actual: m.actual, forecast: m.naive }))),
      coverage: cov.count > 0 ? cov.inside / cov.count : null,
      factor: grid[fi]!,
      calibrated: loo !== null,
      coverageOwnBand: own.count > 0 ? own.inside / own.count : null,
    };
  });
  const pooled = (pickBand: (o: number) => number) => {
    let inside = 0;
    let count = 0;
    meters.forEach((ms, o) => {
      const c = coverageOf(ms, pickBand(o));
      inside += c.inside;
      count += c.count;
    });
    return count > 0 ? inside / count : null;
  };
  const factorIndexOf = (o: number) => grid.indexOf(summaries[o]!.factor);
  return {
    origins,
    meters,
    bases: ranked,
    basis,
    basisReason: basisReason + folded,
    adjustments: adjustmentsRanked,
    adjustment,
    factor: chosenAll === null ? 1 : grid[chosenAll]!,
    calibrated: chosenAll !== null,
    coverageByFactor,
    summaries,
    overall: {
      model: accuracyOf(meters.flatMap((ms, o) => ms.map((m) => ({ actual: m.actual, forecast: m.bandByFactor[factorIndexOf(o)]!.mid })))),
      naive: accuracyOf(all.map((m) => ({ actual: m.actual, forecast: m.naive }))),
      coverage: pooled(factorIndexOf),
      coverageOwnBand: pooled(() => oneIndex),
    },
    monthsOfBills: monthsByMeter,
  };
}
