/**
 * The ensemble search as it was before its scorer closure became a class (commit 3dfa24c,
 * src/model/interval/ensemble.ts), kept only so that test/model/interval/ensembleSameAsBefore.test.ts
 * can show that the current code gives the same choice bit for bit. Not for use outside that test.
 */
/**
 * Ensemble of hourly models by a generalized weighted mean ŷ = (Σ wᵢ ŷᵢ^p)^(1/p), with the
 * weights (a simplex grid) and the exponent chosen on the cross-validation folds' predictions.
 * The ensemble is used only when it beats the best single model on those folds by at least
 * `minGainPct` (relative): the grid contains every single model, so without a margin it could
 * "win" by noise-fitting alone.
 */
import { ModelInputError } from "../../../../src/model/errors.ts";
import { GEOMETRIC_EPS, generalizedWeightedMean } from "../../../../src/model/interval/generalizedMean.ts";

export interface EnsembleSearchOptions {
  /** Exponents tried. Default [−1, 0, 0.5, 1, 2] (harmonic, geometric, …, quadratic). */
  exponents?: readonly number[];
  /** Weight grid step; weights are multiples of it summing to 1. Default 0.1. */
  weightStep?: number;
  /** Minimum relative CV(RMSE) gain over the best single model, percent. Default 1. */
  minGainPct?: number;
}

export interface EnsembleChoice {
  kinds: string[];
  weights: number[];
  exponent: number;
  /** Out-of-sample CV(RMSE), % (n in the denominator) of the ensemble on the folds. */
  cvRmsePct: number;
  bestSingleKind: string;
  bestSingleCvRmsePct: number;
  /** (best single − ensemble) / best single, percent; positive = the ensemble is better. */
  gainPct: number;
  /** Whether the ensemble beat the best single model by at least minGainPct. */
  used: boolean;
}

/**
 * Weight vectors on the simplex with the given step, e.g. m = 2, step 0.5 → [1,0], [0.5,0.5], [0,1].
 * @example simplexGrid(2, 0.5).length // 3
 */
export function simplexGrid(m: number, step: number): number[][] {
  const parts = Math.round(1 / step);
  if (!(parts >= 1 && Math.abs(parts * step - 1) < 1e-9)) throw new ModelInputError(`weight step must divide 1, got ${step}`);
  const out: number[][] = [];
  const rec = (prefix: number[], left: number): void => {
    if (prefix.length === m - 1) {
      out.push([...prefix, left].map((k) => k / parts));
      return;
    }
    for (let k = left; k >= 0; k--) rec([...prefix, k], left - k);
  };
  if (m >= 1) rec([], parts);
  return out;
}

/**
 * Combine rows of member predictions with one weight vector and exponent. Predictions at or
 * below `floor` are raised to it first (power means with p ≤ 0 need positive values); a row
 * where any member is NaN gives NaN.
 */
export function combinePredictions(members: readonly ArrayLike<number>[], weights: readonly number[], exponent: number, floor: number): Float64Array {
  const n = members[0]?.length ?? 0;
  const out = new Float64Array(n);
  const v = new Float64Array(members.length);
  for (let i = 0; i < n; i++) {
    let missing = false;
    for (let j = 0; j < members.length; j++) {
      const x = members[j]![i]!;
      if (Number.isNaN(x)) missing = true;
      v[j] = exponent === 1 ? x : Math.max(x, floor);
    }
    // a row some member cannot predict (no weather) has no ensemble value either
    out[i] = missing ? Number.NaN : generalizedWeightedMean(v, weights, exponent);
  }
  return out;
}

function cvRmseN(actual: ArrayLike<number>, pred: ArrayLike<number>, mean: number): number {
  let s = 0;
  for (let i = 0; i < actual.length; i++) s += (actual[i]! - pred[i]!) ** 2;
  return (100 * Math.sqrt(s / actual.length)) / mean;
}

/**
 * CV(RMSE) (n in the denominator) of the power mean with exponent p for any weight vector: the
 * same value as cvRmseN(actual, combinePredictions(members, w, p, floor), mean), with each
 * member's x^p (or ln x) computed once instead of once per weight vector. The sums run in the
 * same order as generalizedWeightedMean's, so the numbers are identical.
 * @throws ModelInputError when p is not finite (as generalizedWeightedMean would).
 */
function powerMeanScorer(actual: ArrayLike<number>, members: readonly ArrayLike<number>[], p: number, floor: number, mean: number): (w: readonly number[]) => number {
  if (!Number.isFinite(p)) throw new ModelInputError(`exponent must be finite, got ${p}`);
  const m = members.length;
  const n = actual.length;
  const geometric = p !== 1 && Math.abs(p) < GEOMETRIC_EPS;
  // row-major n × m of each member's value as the mean uses it
  const t = new Float64Array(n * m);
  const missing = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < m; j++) {
      const x = members[j]![i]!;
      if (Number.isNaN(x)) missing[i] = 1;
      const v = p === 1 ? x : Math.max(x, floor);
      t[i * m + j] = p === 1 ? v : geometric ? Math.log(v) : v ** p;
    }
  }
  return (w) => {
    let wSum = 0;
    for (let j = 0; j < m; j++) {
      if (!(w[j]! >= 0)) throw new ModelInputError(`weights must be ≥ 0, got ${w[j]}`);
      wSum += w[j]!;
    }
    if (!(wSum > 0)) throw new ModelInputError("weights must not all be 0");
    let sse = 0;
    for (let i = 0; i < n; i++) {
      let y: number;
      if (missing[i]) y = Number.NaN;
      else {
        let s = 0;
        const off = i * m;
        if (p === 1) {
          for (let j = 0; j < m; j++) s += w[j]! * t[off + j]!;
          y = s / wSum;
        } else {
          for (let j = 0; j < m; j++) if (w[j]! > 0) s += w[j]! * t[off + j]!;
          y = geometric ? Math.exp(s / wSum) : (s / wSum) ** (1 / p);
        }
      }
      sse += (actual[i]! - y) ** 2;
    }
    return (100 * Math.sqrt(sse / n)) / mean;
  };
}

/**
 * Grid search of weights and exponent on aligned fold predictions.
 * @param actual the measured values of the validation rows.
 * @param members each model's predictions on the same rows.
 * @throws ModelInputError with no members, misaligned lengths, or a zero mean.
 * @example searchEnsemble(actual, [towtPred, gbdtPred], ["towt", "gbdt"]).used
 */
export function searchEnsemble(
  actual: ArrayLike<number>,
  members: readonly ArrayLike<number>[],
  kinds: readonly string[],
  options: EnsembleSearchOptions = {},
): EnsembleChoice {
  const m = members.length;
  if (m === 0 || kinds.length !== m) throw new ModelInputError("ensemble search needs at least one member and a kind for each");
  for (const p of members) if (p.length !== actual.length) throw new ModelInputError("member predictions and actual values differ in length");
  let mean = 0;
  for (let i = 0; i < actual.length; i++) mean += actual[i]!;
  mean /= actual.length;
  if (!(mean !== 0 && Number.isFinite(mean))) throw new ModelInputError("CV(RMSE) undefined: mean of the validation values is 0");
  // floor for power means: a tiny share of the mean keeps logs finite without moving real values
  const floor = Math.abs(mean) * 1e-6;
  let bestSingle = 0;
  const single = members.map((p) => cvRmseN(actual, p, mean));
  single.forEach((v, j) => {
    if (v < single[bestSingle]!) bestSingle = j;
  });
  let best: { weights: number[]; exponent: number; cv: number } = {
    weights: members.map((_, j) => (j === bestSingle ? 1 : 0)),
    exponent: 1,
    cv: single[bestSingle]!,
  };
  const exponents = options.exponents ?? [-1, 0, 0.5, 1, 2];
  const grid = simplexGrid(m, options.weightStep ?? 0.1).filter((w) => w.filter((x) => x > 0).length >= 2); // single models are scored above
  const scorers = exponents.map((e) => (grid.length > 0 ? powerMeanScorer(actual, members, e, floor, mean) : null));
  for (const w of grid) {
    exponents.forEach((e, k) => {
      const cv = scorers[k]!(w);
      if (cv < best.cv) best = { weights: w, exponent: e, cv };
    });
  }
  // an exact single model (CV(RMSE) = 0) cannot be beaten: gain 0 rather than 0/0
  const gainPct = single[bestSingle]! > 0 ? (100 * (single[bestSingle]! - best.cv)) / single[bestSingle]! : 0;
  const used = best.weights.filter((x) => x > 0).length >= 2 && gainPct >= (options.minGainPct ?? 1);
  return {
    kinds: [...kinds],
    weights: best.weights,
    exponent: best.exponent,
    cvRmsePct: best.cv,
    bestSingleKind: kinds[bestSingle]!,
    bestSingleCvRmsePct: single[bestSingle]!,
    gainPct,
    used,
  };
}
