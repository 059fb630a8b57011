/**
 * Time-series cross-validation with an expanding window: k validation blocks of fixed
 * length laid back to back so the last one ends at the last data; each fold trains on every
 * row before its block (never on the future) and is scored on the block.
 */
import { guideline14Stats } from "../stats.ts";
import type { Guideline14Stats } from "../stats.ts";
import { ModelInputError } from "../errors.ts";
import { HOUR_MS } from "./hourlyFeatures.ts";
import { selectFrameRows } from "./hourlyFrame.ts";
import type { HourlyFrame, HourlyModelSpec } from "./types.ts";

export interface TimeSeriesCvOptions {
  /** Number of folds. Default 4. */
  folds?: number;
  /** Length of each validation block, hours. Default 4 weeks (672). */
  validationHours?: number;
  /** A fold is skipped when it would train on fewer rows than this. Default 2 weeks (336). */
  minTrainRows?: number;
}

/** One fold's rows: frame indices [trainStart=0, trainEnd) and [validStart, validEnd). */
export interface FoldDefinition {
  fold: number;
  validStartMs: number;
  validEndMs: number;
  trainEnd: number;
  validStart: number;
  validEnd: number;
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

function lowerBound(a: Float64Array, v: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid]! < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Fold boundaries for rows sorted by `hourStartMs`. Block j (0 = oldest) covers
 * [end − (k − j)·L, end − (k − j − 1)·L) where end is one hour after the last row.
 * @throws ModelInputError on non-positive folds or validation length.
 * @example timeSeriesFolds(frame.hourStartMs, { folds: 4, validationHours: 672 }).length // 4
 */
export function timeSeriesFolds(hourStartMs: Float64Array, options: TimeSeriesCvOptions = {}): FoldDefinition[] {
  const k = options.folds ?? 4;
  const len = options.validationHours ?? 672;
  if (!(Number.isInteger(k) && k >= 1)) throw new ModelInputError(`folds must be a positive integer, got ${k}`);
  if (!(Number.isInteger(len) && len >= 1)) throw new ModelInputError(`validation length must be a positive whole number of hours, got ${len}`);
  const n = hourStartMs.length;
  if (n === 0) return [];
  const end = hourStartMs[n - 1]! + HOUR_MS;
  const out: FoldDefinition[] = [];
  for (let j = 0; j < k; j++) {
    const validStartMs = end - (k - j) * len * HOUR_MS;
    const validEndMs = validStartMs + len * HOUR_MS;
    const validStart = lowerBound(hourStartMs, validStartMs);
    out.push({ fold: j, validStartMs, validEndMs, trainEnd: validStart, validStart, validEnd: lowerBound(hourStartMs, validEndMs) });
  }
  return out;
}

/**
 * Cross-validate one model spec over the folds. A fit that throws ModelInputError marks its
 * fold as failed (with the message) instead of stopping the run.
 * @example crossValidate(frame, towtSpec(), { folds: 4, validationHours: 672 }).pooled?.cvRmsePct
 */
export function crossValidate(frame: HourlyFrame, spec: HourlyModelSpec, options: TimeSeriesCvOptions = {}): CvResult {
  const minTrain = options.minTrainRows ?? 336;
  const defs = timeSeriesFolds(frame.hourStartMs, options);
  const folds: FoldResult[] = [];
  const rows: number[] = [];
  const preds: number[] = [];
  let p = 0;
  for (const d of defs) {
    const nTrain = d.trainEnd;
    const nValid = d.validEnd - d.validStart;
    const base = { ...d, nTrain, nValid, stats: null, problem: null };
    if (nValid === 0) {
      folds.push({ ...base, problem: "no usable hours in the validation block" });
      continue;
    }
    if (nTrain < minTrain) {
      folds.push({ ...base, problem: `only ${nTrain} training hours before the block (need ${minTrain})` });
      continue;
    }
    try {
      const train = selectFrameRows(frame, range(0, d.trainEnd));
      const validIdx = range(d.validStart, d.validEnd);
      const valid = selectFrameRows(frame, validIdx);
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
  const actual = Float64Array.from(rows, (i) => frame.kwh[i]!);
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

function range(a: number, b: number): Int32Array {
  const out = new Int32Array(Math.max(0, b - a));
  for (let i = 0; i < out.length; i++) out[i] = a + i;
  return out;
}
