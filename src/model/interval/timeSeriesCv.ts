/**
 * Time-series cross-validation: k validation blocks of fixed length, scored out of sample.
 *
 * Where the blocks sit (`placement`):
 * - "end": back to back so the last one ends at the last data (the most recent weeks);
 * - "spread": centred in k equal parts of the last year of data, so the scores and the
 *   residual band see every season, not only the autumn before a December data end. No block
 *   touches the window's edges: there a model with a calendar feature would have to
 *   extrapolate to dates it never saw, which a year-ahead prediction does not ask of it.
 *
 * What each fold trains on (`scheme`):
 * - "expanding": every row before its block (never the future);
 * - "blocked": every row outside the block and a gap of `gapHours` either side (hv-block
 *   cross-validation, Racine 2000, J. Econometrics 99(1); for regressions on exogenous inputs
 *   such as weather and calendar, Bergmeir & Benítez 2012, Information Sciences 191, found
 *   blocked folds sound for time series). With one year of history this is the only way a
 *   fold sees the rest of the calendar, as the year-ahead model does;
 * - "auto": "expanding" when at least 364 days of data precede the first block (each block's
 *   dates were then seen a year earlier), else "blocked".
 */
import { guideline14Stats } from "../stats.ts";
import type { Guideline14Stats } from "../stats.ts";
import { ModelInputError } from "../errors.ts";
import { HOUR_MS } from "./hourlyFeatures.ts";
import { selectFrameRows } from "./hourlyFrame.ts";
import type { HourlyFrame, HourlyModelSpec } from "./types.ts";
import { lowerBound } from "../../core/sorted.ts";

export interface TimeSeriesCvOptions {
  /** Number of folds. Default 4. */
  folds?: number;
  /** Length of each validation block, hours. Default 4 weeks (672). */
  validationHours?: number;
  /** A fold is skipped when it would train on fewer rows than this. Default 2 weeks (336). */
  minTrainRows?: number;
  /** Where the blocks sit (see the module comment). Default "end". */
  placement?: "end" | "spread";
  /** What each fold trains on (see the module comment). Default "expanding". */
  scheme?: "expanding" | "blocked" | "auto";
  /** Blocked folds: hours left out of training on each side of the block. Default 24. */
  gapHours?: number;
}

/**
 * One fold's rows: training is frame indices [0, trainEnd) and [trainResume, n); validation is
 * [validStart, validEnd). For an expanding fold trainResume = n (nothing after the block).
 */
export interface FoldDefinition {
  fold: number;
  validStartMs: number;
  validEndMs: number;
  trainEnd: number;
  trainResume: number;
  validStart: number;
  validEnd: number;
  scheme: "expanding" | "blocked";
}

export interface FoldResult extends FoldDefinition {
  nTrain: number;
  nValid: number;
  /** Guideline 14 statistics of the validation block with the model's p; null when the fold failed. */
  stats: Guideline14Stats | null;
  /** Why the fold was skipped or failed (too little training data, fit error, n ≤ p). */
  problem: string | null;
}

export interface CvResult {
  kind: string;
  folds: FoldResult[];
  /** Model parameter count (of the last successful fold's model). */
  p: number;
  /** Frame indices of all scored validation rows, in time order, and the model's predictions there. */
  validationRows: Int32Array;
  validationPredicted: Float64Array;
  /** Guideline 14 statistics over all scored validation rows together (with p); null if none. */
  pooled: Guideline14Stats | null;
  /**
   * Out-of-sample CV(RMSE) over all scored rows with n in the denominator (p = 0): the number
   * models and ensembles are compared by, since p means different things for different kinds.
   */
  selectionCvRmsePct: number;
}


const YEAR_HOURS = 364 * 24;

/**
 * Fold boundaries for rows sorted by `hourStartMs`, with end = one hour after the last row and
 * L = validationHours. "end": block j (0 = oldest) covers [end − (k − j)·L, end − (k − j − 1)·L).
 * "spread": the window W = max(k·L, min(364 days, data span)) ending at `end`; block j is
 * centred in the j-th of k equal parts: it starts at end − W + round((j + ½)·W/k − L/2) hours.
 * @throws ModelInputError on non-positive folds, validation length or gap.
 * @example timeSeriesFolds(frame.hourStartMs, { folds: 4, validationHours: 672 }).length // 4
 */
export function timeSeriesFolds(hourStartMs: Float64Array, options: TimeSeriesCvOptions = {}): FoldDefinition[] {
  const k = options.folds ?? 4;
  const len = options.validationHours ?? 672;
  const gap = options.gapHours ?? 24;
  if (!(Number.isInteger(k) && k >= 1)) throw new ModelInputError(`folds must be a positive integer, got ${k}`);
  if (!(Number.isInteger(len) && len >= 1)) throw new ModelInputError(`validation length must be a positive whole number of hours, got ${len}`);
  if (!(Number.isInteger(gap) && gap >= 0)) throw new ModelInputError(`gap must be a whole number of hours ≥ 0, got ${gap}`);
  const n = hourStartMs.length;
  if (n === 0) return [];
  const first = hourStartMs[0]!;
  const end = hourStartMs[n - 1]! + HOUR_MS;
  const starts: number[] = [];
  if ((options.placement ?? "end") === "spread") {
    const spanHours = Math.round((end - first) / HOUR_MS);
    const w = Math.max(k * len, Math.min(YEAR_HOURS, spanHours));
    for (let j = 0; j < k; j++) starts.push(end - (w - Math.round(((j + 0.5) * w) / k - len / 2)) * HOUR_MS);
  } else {
    for (let j = 0; j < k; j++) starts.push(end - (k - j) * len * HOUR_MS);
  }
  const wanted = options.scheme ?? "expanding";
  const scheme: FoldDefinition["scheme"] = wanted === "auto" ? (starts[0]! - first >= YEAR_HOURS * HOUR_MS ? "expanding" : "blocked") : wanted;
  return starts.map((validStartMs, j) => {
    const validEndMs = validStartMs + len * HOUR_MS;
    const validStart = lowerBound(hourStartMs, validStartMs);
    const validEnd = lowerBound(hourStartMs, validEndMs);
    const blocked = scheme === "blocked";
    return {
      fold: j,
      validStartMs,
      validEndMs,
      trainEnd: blocked ? lowerBound(hourStartMs, validStartMs - gap * HOUR_MS) : validStart,
      trainResume: blocked ? lowerBound(hourStartMs, validEndMs + gap * HOUR_MS) : n,
      validStart,
      validEnd,
      scheme,
    };
  });
}

/** One fold's tables, cut from the frame once and shared by every model cross-validated on it. */
export interface PreparedFold {
  definition: FoldDefinition;
  nTrain: number;
  nValid: number;
  /** Why the fold is skipped (empty block, too little training data); null when it runs. */
  skip: string | null;
  /** Frame indices of the validation rows. */
  validIdx: Int32Array;
  train: HourlyFrame | null;
  valid: HourlyFrame | null;
}

/** The folds of one frame under one set of options (see {@link prepareFolds}). */
export interface PreparedFolds {
  frame: HourlyFrame;
  folds: PreparedFold[];
}

/**
 * Cut the frame into its folds' training and validation tables once, so several models can be
 * cross-validated on the same tables (and a model that recognises a table it has seen — the
 * trees' binned columns — need not rebuild what depends on the features alone).
 * @throws ModelInputError as {@link timeSeriesFolds}.
 * @example crossValidate(frame, gbdtSpec(), options, prepareFolds(frame, options))
 */
export function prepareFolds(frame: HourlyFrame, options: TimeSeriesCvOptions = {}): PreparedFolds {
  const minTrain = options.minTrainRows ?? 336;
  // a loop, not a map callback: V8 would recompile the callback (with selectFrameRows inlined) for every meter
  const folds: PreparedFold[] = [];
  for (const d of timeSeriesFolds(frame.hourStartMs, options)) {
    const nTrain = d.trainEnd + (frame.kwh.length - d.trainResume);
    const nValid = d.validEnd - d.validStart;
    const validIdx = range(d.validStart, d.validEnd);
    const out: PreparedFold = { definition: d, nTrain, nValid, skip: null, validIdx, train: null, valid: null };
    if (nValid === 0) out.skip = "no usable hours in the validation block";
    else if (nTrain < minTrain) out.skip = `only ${nTrain} training hours ${d.scheme === "expanding" ? "before" : "outside"} the block (need ${minTrain})`;
    else {
      const trainIdx = d.trainResume < frame.kwh.length ? concat(range(0, d.trainEnd), range(d.trainResume, frame.kwh.length)) : range(0, d.trainEnd);
      out.train = selectFrameRows(frame, trainIdx);
      out.valid = selectFrameRows(frame, validIdx);
    }
    folds.push(out);
  }
  return { frame, folds };
}

/**
 * Cross-validate one model spec over the folds (see {@link timeSeriesFolds}). A fit that throws ModelInputError marks its
 * fold as failed (with the message) instead of stopping the run.
 * @param prepared the frame's folds from {@link prepareFolds} with the same options (built here when absent).
 * @example crossValidate(frame, towtSpec(), { folds: 4, validationHours: 672 }).pooled?.cvRmsePct
 */
export function crossValidate(frame: HourlyFrame, spec: HourlyModelSpec, options: TimeSeriesCvOptions = {}, prepared?: PreparedFolds): CvResult {
  if (prepared && prepared.frame !== frame) throw new ModelInputError("prepared folds belong to another frame");
  const { folds: cut } = prepared ?? prepareFolds(frame, options);
  const folds: FoldResult[] = [];
  const rows: number[] = [];
  const preds: number[] = [];
  let p = 0;
  for (const { definition: d, nTrain, nValid, skip, validIdx, train, valid } of cut) {
    const base = { ...d, nTrain, nValid, stats: null, problem: null };
    if (skip !== null || !train || !valid) {
      folds.push({ ...base, problem: skip });
      continue;
    }
    try {
      const model = spec.fit(train);
      const yHat = model.predict(valid);
      p = model.parameterCount;
      // Guideline 14 divides by n − p; a block with n ≤ p has no such statistic (its rows still
      // count in the pooled statistics below).
      if (nValid > p) folds.push({ ...base, stats: guideline14Stats(valid.kwh, yHat, p, "hourly") });
      else folds.push({ ...base, problem: `validation block has ${nValid} hours, not more than p = ${p}` });
      for (let i = 0; i < validIdx.length; i++) {
        rows.push(validIdx[i]!);
        preds.push(yHat[i]!);
      }
    } catch (e) {
      if (!(e instanceof ModelInputError)) throw e;
      folds.push({ ...base, problem: e.message });
    }
  }
  const validationRows = Int32Array.from(rows);
  const validationPredicted = Float64Array.from(preds);
  const actual = valuesAt(frame.kwh, rows);
  let pooled: Guideline14Stats | null = null;
  let selectionCvRmsePct = Number.NaN;
  if (rows.length > p && rows.length > 0) {
    try {
      pooled = guideline14Stats(actual, validationPredicted, p, "hourly");
      selectionCvRmsePct = guideline14Stats(actual, validationPredicted, 0, "hourly").cvRmsePct;
    } catch (e) {
      if (!(e instanceof ModelInputError)) throw e;
    }
  }
  return { kind: spec.kind, folds, p, validationRows, validationPredicted, pooled, selectionCvRmsePct };
}

/** values[rows[k]] for each k (a loop, not a per-call callback, so V8 keeps its optimized code between calls). */
function valuesAt(values: Float64Array, rows: readonly number[]): Float64Array {
  const out = new Float64Array(rows.length);
  for (let k = 0; k < rows.length; k++) out[k] = values[rows[k]!]!;
  return out;
}

function range(a: number, b: number): Int32Array {
  const out = new Int32Array(Math.max(0, b - a));
  for (let i = 0; i < out.length; i++) out[i] = a + i;
  return out;
}

function concat(a: Int32Array, b: Int32Array): Int32Array {
  const out = new Int32Array(a.length + b.length);
  out.set(a);
  out.set(b, a.length);
  return out;
}
