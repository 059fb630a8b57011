/**
 * One entry point for an interval meter's hourly baseline: build the hourly table, fit every
 * candidate model, cross-validate each on the same folds (spread over the last year; see
 * timeSeriesCv.ts for when they train expanding or blocked), search a
 * generalized-mean ensemble, choose (ensemble only when it beats the best single model by the
 * stated margin), and return predictions for any hours with a band from out-of-sample residuals.
 */
import type { IntervalSeries, WeatherSeries } from "../../domain/types.ts";
import { guideline14Stats } from "../stats.ts";
import type { Guideline14Stats } from "../stats.ts";
import { ModelInputError } from "../errors.ts";
import { hourGrid, hourlyFeaturesAt } from "./hourlyFeatures.ts";
import { hourlyFrame } from "./hourlyFrame.ts";
import type { HourlyFrameOptions } from "./hourlyFrame.ts";
import { towtSpec } from "./towt.ts";
import type { TowtOptions } from "./towt.ts";
import { towtMonthlySpec } from "./towtMonthly.ts";
import { gbdtSpec } from "./gbdtHourly.ts";
import type { GbdtHourlyOptions } from "./gbdtHourly.ts";
import { withLog1pTarget, withPerAreaTarget } from "./targetTransform.ts";
import { crossValidate, prepareFolds } from "./timeSeriesCv.ts";
import type { CvResult, PreparedFolds, TimeSeriesCvOptions } from "./timeSeriesCv.ts";
import { combinePredictions, searchEnsemble } from "./ensemble.ts";
import type { EnsembleChoice, EnsembleSearchOptions } from "./ensemble.ts";
import { pooledGbdtSpec } from "./pooled.ts";
import type { PoolMember } from "./pooled.ts";
import { residualBand } from "./residualBand.ts";
import type { ResidualBand } from "./residualBand.ts";
import type { FittedHourlyModel, HourlyAccounting, HourlyFrame, HourlyModelSpec } from "./types.ts";

export interface IntervalBaselineOptions {
  /** Feature options and meter multiplier for the hourly table. */
  frame?: HourlyFrameOptions;
  /**
   * Cross-validation for meters with enough history. Default 4 folds × 4 weeks spread over the
   * last year ("spread", scheme "auto"); options given here are merged over that default.
   */
  cv?: TimeSeriesCvOptions;
  towt?: TowtOptions;
  gbdt?: GbdtHourlyOptions;
  /**
   * Also try the month-segmented TOWT (towtMonthly.ts) when the meter is not short-history.
   * Default true: TOWT alone cannot learn seasonal schedules such as school terms.
   */
  tryTowtMonthly?: boolean;
  /** Also try GBDT on a log1p target (Duan-smeared back-transform). Default true. */
  tryLog1p?: boolean;
  /** Also try TOWT on energy per floor area (needs floorAreaM2). Default false: for OLS it is the same fit. */
  tryPerArea?: boolean;
  ensemble?: EnsembleSearchOptions;
  /** Central coverage of the prediction band. Default 0.8. */
  bandLevel?: number;
  /** Below this many weeks of used hours the meter counts as short-history. Default 8. */
  minHistoryWeeks?: number;
  /** Other meters' hourly tables for the pooled model of a short-history meter. */
  pool?: readonly PoolMember[];
  /** Clock for fit timings (ms); injected so tests can fix it. Default performance.now. */
  now?: () => number;
}

export interface IntervalBaselineInput {
  meterId: string;
  series: IntervalSeries;
  /** 1 = interval excluded by cleaning; null = nothing masked. */
  mask: Uint8Array | null;
  weather: WeatherSeries;
  zone: string;
  floorAreaM2: number | null;
  options?: IntervalBaselineOptions;
}

/** Statistics block in the models.json vocabulary (percent for cv_rmse and nmbe). */
export interface StatsBlock {
  cv_rmse: number;
  nmbe: number;
  r2: number;
  n: number;
  p: number;
}

export interface FoldStatsBlock extends Partial<StatsBlock> {
  fold: number;
  start: string;
  end: string;
  n_train: number;
  problem: string | null;
}

export interface ModelReport {
  kind: string;
  /** In-sample statistics of the model fitted on all hours; null when the fit failed. */
  train: StatsBlock | null;
  /** Statistics over all validation hours of the folds together; null when no fold scored. */
  cv: StatsBlock | null;
  folds: FoldStatsBlock[];
  /** Out-of-sample CV(RMSE) (%) with n in the denominator: the comparison number. */
  selectionCvRmsePct: number;
  /** Time of the fit on all hours (ms, from the injected clock). */
  fitMs: number;
  /** Time of the cross-validation fits (ms). */
  cvMs: number;
  problem: string | null;
}

export interface ChosenModel {
  /** A model kind, or "ensemble". */
  kind: string;
  ensemble: EnsembleChoice | null;
  /** For an ensemble: its gain over the best single model (%); for a single model: its lead over the runner-up (%). */
  marginPct: number;
  /** The model it was compared with (best single for an ensemble, runner-up for a single model). */
  versusKind: string | null;
  reason: string;
}

export interface HourlyPrediction {
  hourStartMs: Float64Array;
  kwh: Float64Array;
  lowerKwh: Float64Array;
  upperKwh: Float64Array;
  /** Hours with no temperature: kwh, lower and upper are NaN there. */
  missingWeatherHours: number;
}

export interface IntervalBaselineSummary {
  meter_id: string;
  resolution: "hourly";
  hours_used: number;
  hours_excluded: HourlyAccounting["excluded"];
  short_history: boolean;
  models: { kind: string; train: StatsBlock | null; cv: StatsBlock | null; folds: FoldStatsBlock[]; problem: string | null }[];
  chosen: {
    kind: string;
    members: { kind: string; weight: number }[] | null;
    exponent: number | null;
    margin_pct: number;
    versus_kind: string | null;
    reason: string;
    train: StatsBlock | null;
    cv: StatsBlock | null;
  };
  band_level: number;
}

export interface IntervalBaseline {
  meterId: string;
  accounting: HourlyAccounting;
  shortHistory: boolean;
  models: ModelReport[];
  chosen: ChosenModel;
  band: ResidualBand;
  /** Where the band's residuals came from: the CV blocks, or (no fold scored) the training fit. */
  bandSource: "cross-validation" | "training";
  /** Hourly use for the hours in [startMs, endMs) from the given weather, with the band. */
  predictHourly(weather: WeatherSeries, startMs: number, endMs: number): HourlyPrediction;
  summary: IntervalBaselineSummary;
}

function block(s: Guideline14Stats): StatsBlock {
  return { cv_rmse: s.cvRmsePct, nmbe: s.nmbePct, r2: s.rSquared, n: s.n, p: s.p };
}

function iso(ms: number): string {
  return new Date(ms).toISOString();
}

interface Candidate {
  spec: HourlyModelSpec;
  model: FittedHourlyModel | null;
  cv: CvResult | null;
  report: ModelReport;
}

/**
 * Fit, cross-validate, compare and choose an hourly baseline for one interval meter.
 * Candidates: TOWT, month-segmented TOWT (not for short histories), GBDT (with the day-of-year
 * feature), GBDT on log1p (default), TOWT per floor area (optional); for a meter
 * with less than `minHistoryWeeks` of usable hours and a non-empty `pool`, the pooled GBDT is
 * added and used (its own folds are too short to pick a model reliably).
 * @throws ModelInputError when the meter has no usable hours or no candidate could be fitted.
 * @example fitIntervalBaseline({ meterId, series, mask, weather, zone, floorAreaM2: 5000 }).summary.chosen.kind
 */
export function fitIntervalBaseline(input: IntervalBaselineInput): IntervalBaseline {
  const o = input.options ?? {};
  const now = o.now ?? (() => performance.now());
  const frame = hourlyFrame(input.series, input.mask, input.weather, input.zone, o.frame);
  const acc = frame.accounting;
  if (acc.hoursUsed === 0) throw new ModelInputError(`meter ${input.meterId}: no usable hours for an interval model (${JSON.stringify(acc.excluded)})`);
  const weeks = acc.hoursUsed / 168;
  const minWeeks = o.minHistoryWeeks ?? 8;
  const shortHistory = weeks < minWeeks;
  const usePool = shortHistory && (o.pool?.length ?? 0) > 0;
  // Short histories get shorter folds: 2 blocks of one week after at least one week of training.
  // Longer histories: blocks spread over the last year, so selection and band see every season;
  // folds train on the rest of the year when less than a year precedes them (see timeSeriesCv.ts).
  const cvOptions: TimeSeriesCvOptions = shortHistory
    ? { folds: 2, validationHours: 168, minTrainRows: 168, ...o.cv }
    : { placement: "spread", scheme: "auto", ...o.cv };

  const specs: HourlyModelSpec[] = [towtSpec(o.towt)];
  if ((o.tryTowtMonthly ?? true) && !shortHistory) specs.push(towtMonthlySpec(o.towt));
  specs.push(gbdtSpec(o.gbdt));
  if (o.tryLog1p ?? true) specs.push(withLog1pTarget(gbdtSpec(o.gbdt)));
  if (o.tryPerArea && input.floorAreaM2 && input.floorAreaM2 > 0) specs.push(withPerAreaTarget(towtSpec(o.towt), input.floorAreaM2));
  if (usePool) specs.push(pooledGbdtSpec(input.meterId, o.pool!, o.gbdt));

  // Every candidate is scored on the same fold tables, cut once.
  const folds = prepareFolds(frame, cvOptions);
  const candidates: Candidate[] = specs.map((spec) => fitCandidate(spec, frame, cvOptions, folds, now));
  const ok = candidates.filter((c) => c.model !== null);
  if (ok.length === 0) {
    throw new ModelInputError(`meter ${input.meterId}: no interval model could be fitted (${candidates.map((c) => `${c.spec.kind}: ${c.report.problem}`).join("; ")})`);
  }

  // Ensemble search on the validation rows every fitted candidate scored.
  const scored = ok.filter((c) => c.cv && c.cv.validationRows.length > 0 && Number.isFinite(c.cv.selectionCvRmsePct));
  const common = commonRows(scored.map((c) => c.cv!));
  let ensemble: EnsembleChoice | null = null;
  let memberPreds: Float64Array[] = [];
  if (scored.length >= 2 && common.length > 0) {
    memberPreds = scored.map((c) => pick(c.cv!, common));
    const actual = valuesAt(frame.kwh, common);
    ensemble = searchEnsemble(actual, memberPreds, scored.map((c) => c.spec.kind), o.ensemble);
  }

  // Choice.
  let chosen: ChosenModel;
  let members: Candidate[];
  let weights: number[];
  let exponent = 1;
  const ranked = [...scored].sort((a, b) => a.cv!.selectionCvRmsePct - b.cv!.selectionCvRmsePct);
  const pooled = usePool ? ok.find((c) => c.spec.kind === "pooled-gbdt") : undefined;
  if (pooled) {
    const best = ranked.find((c) => c !== pooled) ?? null;
    chosen = {
      kind: pooled.spec.kind,
      ensemble,
      marginPct: best && pooled.cv ? (100 * (best.cv!.selectionCvRmsePct - pooled.cv.selectionCvRmsePct)) / best.cv!.selectionCvRmsePct : Number.NaN,
      versusKind: best?.spec.kind ?? null,
      reason: `${weeks.toFixed(1)} weeks of usable history (< ${minWeeks}): pooled model across ${o.pool!.length + 1} meters`,
    };
    members = [pooled];
    weights = [1];
  } else if (ensemble?.used) {
    chosen = {
      kind: "ensemble",
      ensemble,
      marginPct: ensemble.gainPct,
      versusKind: ensemble.bestSingleKind,
      reason: `generalized mean (p = ${ensemble.exponent}) beat ${ensemble.bestSingleKind} on the folds by ${ensemble.gainPct.toFixed(1)} %`,
    };
    members = scored;
    weights = ensemble.weights;
    exponent = ensemble.exponent;
  } else if (ranked.length > 0) {
    const best = ranked[0]!;
    const second = ranked[1];
    chosen = {
      kind: best.spec.kind,
      ensemble,
      marginPct: second ? (100 * (second.cv!.selectionCvRmsePct - best.cv!.selectionCvRmsePct)) / second.cv!.selectionCvRmsePct : Number.NaN,
      versusKind: second?.spec.kind ?? null,
      reason: ensemble
        ? `lowest out-of-sample CV(RMSE); the best ensemble gained only ${ensemble.gainPct.toFixed(1)} % (needs ${o.ensemble?.minGainPct ?? 1} %)`
        : "lowest out-of-sample CV(RMSE)",
    };
    members = [best];
    weights = [1];
  } else {
    // No fold could be scored (very short history, no pool): fall back to TOWT or the first fit.
    const first = ok.find((c) => c.spec.kind === "towt") ?? ok[0]!;
    chosen = { kind: first.spec.kind, ensemble: null, marginPct: Number.NaN, versusKind: null, reason: "no cross-validation fold could be scored; first model that fitted" };
    members = [first];
    weights = [1];
  }
  const active = members.map((c, j) => ({ c, w: weights[j]! })).filter((m) => m.w > 0);
  const floorKwh = Math.abs(mean(frame.kwh)) * 1e-6;
  const combine = (preds: Float64Array[]): Float64Array =>
    preds.length === 1 ? preds[0]! : combinePredictions(preds, active.map((m) => m.w), exponent, floorKwh);

  // Band from out-of-sample residuals of the chosen combination.
  let band: ResidualBand;
  let bandSource: IntervalBaseline["bandSource"];
  const level = o.bandLevel ?? 0.8;
  const activeCv = active.map((m) => m.c.cv).filter((cv): cv is CvResult => cv !== null && cv.validationRows.length > 0);
  if (activeCv.length === active.length) {
    const rows = commonRows(activeCv);
    const pred = combine(activeCv.map((cv) => pick(cv, rows)));
    const resid = new Float64Array(rows.length);
    const hourOfDay = new Uint8Array(rows.length);
    for (let k = 0; k < rows.length; k++) {
      resid[k] = frame.kwh[rows[k]!]! - pred[k]!;
      hourOfDay[k] = frame.hourOfWeek[rows[k]!]! % 24;
    }
    band = residualBand(resid, hourOfDay, level);
    bandSource = "cross-validation";
  } else {
    const pred = combine(active.map((m) => fittedOn(m.c.model!, frame)));
    const resid = new Float64Array(frame.kwh.length);
    const hourOfDay = new Uint8Array(frame.kwh.length);
    for (let i = 0; i < resid.length; i++) {
      resid[i] = frame.kwh[i]! - pred[i]!;
      hourOfDay[i] = frame.hourOfWeek[i]! % 24;
    }
    band = residualBand(resid, hourOfDay, level);
    bandSource = "training";
  }

  // In-sample statistics of the chosen combination (for an ensemble p = Σ member p, capped below n).
  let chosenTrain: StatsBlock | null = null;
  let chosenCv: StatsBlock | null = null;
  if (active.length === 1) {
    chosenTrain = active[0]!.c.report.train;
    chosenCv = active[0]!.c.report.cv;
  } else {
    const pTotal = Math.min(active.reduce((s, m) => s + m.c.model!.parameterCount, 0), frame.kwh.length - 1);
    chosenTrain = safeBlock(frame.kwh, combine(active.map((m) => fittedOn(m.c.model!, frame))), pTotal);
    const rows = commonRows(activeCv);
    chosenCv = safeBlock(valuesAt(frame.kwh, rows), combine(activeCv.map((cv) => pick(cv, rows))), Math.min(pTotal, rows.length - 1));
  }

  const featureOptions = o.frame ?? {};
  const predictHourly = (weather: WeatherSeries, startMs: number, endMs: number): HourlyPrediction => {
    const grid = hourGrid(startMs, endMs);
    const { features } = hourlyFeaturesAt(weather, input.zone, grid, featureOptions);
    const preds = active.map((m) => m.c.model!.predict(features));
    const kwh = combine(preds);
    const lowerKwh = new Float64Array(grid.length);
    const upperKwh = new Float64Array(grid.length);
    let missing = 0;
    for (let i = 0; i < grid.length; i++) {
      if (!Number.isFinite(features.tempC[i]!)) {
        missing++;
        kwh[i] = lowerKwh[i] = upperKwh[i] = Number.NaN;
        continue;
      }
      const hod = features.hourOfWeek[i]! % 24;
      lowerKwh[i] = kwh[i]! + band.lowerKwh[hod]!;
      upperKwh[i] = kwh[i]! + band.upperKwh[hod]!;
    }
    return { hourStartMs: grid, kwh, lowerKwh, upperKwh, missingWeatherHours: missing };
  };

  const models = candidates.map((c) => c.report);
  const summary: IntervalBaselineSummary = {
    meter_id: input.meterId,
    resolution: "hourly",
    hours_used: acc.hoursUsed,
    hours_excluded: acc.excluded,
    short_history: shortHistory,
    models: models.map((m) => ({ kind: m.kind, train: m.train, cv: m.cv, folds: m.folds, problem: m.problem })),
    chosen: {
      kind: chosen.kind,
      members: chosen.kind === "ensemble" ? active.map((m) => ({ kind: m.c.spec.kind, weight: m.w })) : null,
      exponent: chosen.kind === "ensemble" ? exponent : null,
      margin_pct: chosen.marginPct,
      versus_kind: chosen.versusKind,
      reason: chosen.reason,
      train: chosenTrain,
      cv: chosenCv,
    },
    band_level: level,
  };
  return { meterId: input.meterId, accounting: acc, shortHistory, models, chosen, band, bandSource, predictHourly, summary };
}

/** A model's predictions for the frame it was fitted on (its own fitted values when it has them). */
function fittedOn(model: FittedHourlyModel, frame: HourlyFrame): Float64Array {
  return model.fitted && model.fitted.length === frame.kwh.length ? Float64Array.from(model.fitted) : model.predict(frame);
}

function fitCandidate(spec: HourlyModelSpec, frame: HourlyFrame, cvOptions: TimeSeriesCvOptions, folds: PreparedFolds, now: () => number): Candidate {
  const t0 = now();
  const report: ModelReport = { kind: spec.kind, train: null, cv: null, folds: [], selectionCvRmsePct: Number.NaN, fitMs: 0, cvMs: 0, problem: null };
  let model: FittedHourlyModel | null = null;
  let cv: CvResult | null = null;
  try {
    model = spec.fit(frame);
    report.train = safeBlock(frame.kwh, fittedOn(model, frame), model.parameterCount);
  } catch (e) {
    if (!(e instanceof ModelInputError)) throw e;
    report.problem = e.message;
  }
  report.fitMs = now() - t0;
  if (model) {
    const t1 = now();
    cv = crossValidate(frame, spec, cvOptions, folds);
    report.cvMs = now() - t1;
    report.cv = cv.pooled ? block(cv.pooled) : null;
    report.selectionCvRmsePct = cv.selectionCvRmsePct;
    report.folds = cv.folds.map((f) => ({
      fold: f.fold,
      start: iso(f.validStartMs),
      end: iso(f.validEndMs),
      n_train: f.nTrain,
      problem: f.problem,
      ...(f.stats ? block(f.stats) : {}),
    }));
  }
  return { spec, model, cv, report };
}

function safeBlock(y: ArrayLike<number>, yHat: ArrayLike<number>, p: number): StatsBlock | null {
  try {
    return block(guideline14Stats(y, yHat, p, "hourly"));
  } catch (e) {
    if (e instanceof ModelInputError) return null;
    throw e;
  }
}

function mean(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i]!;
  return a.length ? s / a.length : 0;
}

/** Frame rows scored by every CV result, ascending. */
function commonRows(cvs: readonly CvResult[]): Int32Array {
  if (cvs.length === 0) return new Int32Array(0);
  const counts = new Map<number, number>();
  for (const cv of cvs) for (const r of cv.validationRows) counts.set(r, (counts.get(r) ?? 0) + 1);
  const rows: number[] = [];
  for (const [r, c] of counts) if (c === cvs.length) rows.push(r);
  return Int32Array.from(rows).sort();
}

/** A CV result's predictions at the given frame rows (rows must all be scored by it). */
function pick(cv: CvResult, rows: Int32Array): Float64Array {
  const at = new Map<number, number>();
  for (let k = 0; k < cv.validationRows.length; k++) at.set(cv.validationRows[k]!, k);
  const out = new Float64Array(rows.length);
  for (let k = 0; k < rows.length; k++) out[k] = cv.validationPredicted[at.get(rows[k]!)!]!;
  return out;
}

/** values[rows[k]] for each k. Loops rather than callbacks here and above: a callback made per call would lose V8's optimized code between meters. */
function valuesAt(values: Float64Array, rows: Int32Array): Float64Array {
  const out = new Float64Array(rows.length);
  for (let k = 0; k < rows.length; k++) out[k] = values[rows[k]!]!;
  return out;
}

