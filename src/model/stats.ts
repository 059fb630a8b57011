/**
 * Numerically careful sums and the ASHRAE Guideline 14 goodness-of-fit statistics.
 *
 * Conventions (stated once, used everywhere):
 * - CV(RMSE) and NMBE divide by (n − p), where p is the number of model parameters,
 *   as in ASHRAE Guideline 14-2014. Other tools divide by n or n − 1; the methods page says which.
 * - NMBE = Σ(y − ŷ) / ((n − p)·ȳ): positive means the model UNDER-predicts.
 */
import { ModelInputError } from "./errors.ts";

/** Guideline 14 calibration limits, in percent. */
export const GUIDELINE14_LIMITS = {
  monthly: { cvRmsePct: 15, nmbeAbsPct: 5 },
  hourly: { cvRmsePct: 30, nmbeAbsPct: 10 },
} as const;

export type Guideline14Resolution = keyof typeof GUIDELINE14_LIMITS;

/**
 * Sum with Neumaier's compensation (an improved Kahan summation): the running error term
 * also captures the case where the addend is larger than the running sum.
 * Non-finite values propagate (NaN in → NaN out); callers mask missing values first.
 *
 * @example compensatedSum([1, 1e100, 1, -1e100]) // 2 (a naive loop gives 0)
 */
export function compensatedSum(values: ArrayLike<number>): number {
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const t = sum + v;
    if (Math.abs(sum) >= Math.abs(v)) compensation += sum - t + v;
    else compensation += v - t + sum;
    sum = t;
  }
  return sum + compensation;
}

/**
 * Arithmetic mean using {@link compensatedSum}.
 * @throws ModelInputError on an empty array.
 * @example mean([1, 2, 3, 4]) // 2.5
 */
export function mean(values: ArrayLike<number>): number {
  if (values.length === 0) throw new ModelInputError("mean of an empty array");
  return compensatedSum(values) / values.length;
}

function checkPair(y: ArrayLike<number>, yHat: ArrayLike<number>, p: number): void {
  if (y.length !== yHat.length) {
    throw new ModelInputError(`measured (${y.length}) and modelled (${yHat.length}) lengths differ`);
  }
  if (!Number.isInteger(p) || p < 0) throw new ModelInputError(`parameter count must be a non-negative integer, got ${p}`);
  if (y.length - p <= 0) {
    throw new ModelInputError(`need more points than parameters (n=${y.length}, p=${p})`);
  }
}

function residuals(y: ArrayLike<number>, yHat: ArrayLike<number>): Float64Array {
  const r = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) r[i] = y[i] - yHat[i];
  return r;
}

/** Sum of squared residuals Σ(y − ŷ)², compensated. */
export function sumSquaredErrors(y: ArrayLike<number>, yHat: ArrayLike<number>): number {
  if (y.length !== yHat.length) throw new ModelInputError("lengths differ");
  const sq = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) sq[i] = (y[i] - yHat[i]) ** 2;
  return compensatedSum(sq);
}

/**
 * Coefficient of variation of the RMSE, in percent (ASHRAE Guideline 14-2014):
 * CV(RMSE) = 100 · sqrt(Σ(y − ŷ)² / (n − p)) / ȳ.
 * @param p number of model parameters.
 * @throws ModelInputError when lengths differ, n ≤ p, or ȳ = 0.
 * @example cvRmsePct([100,110,120,130], [102,108,121,127], 2) // ≈ 2.6087
 */
export function cvRmsePct(y: ArrayLike<number>, yHat: ArrayLike<number>, p: number): number {
  checkPair(y, yHat, p);
  const yBar = mean(y);
  if (yBar === 0) throw new ModelInputError("CV(RMSE) undefined: mean of measured values is 0");
  return (100 * Math.sqrt(sumSquaredErrors(y, yHat) / (y.length - p))) / yBar;
}

/**
 * Normalized mean bias error, in percent (ASHRAE Guideline 14-2014):
 * NMBE = 100 · Σ(y − ŷ) / ((n − p) · ȳ). Positive = model under-predicts.
 * @throws ModelInputError when lengths differ, n ≤ p, or ȳ = 0.
 * @example nmbePct([100,110,120,130], [102,108,121,127], 2) // ≈ +0.8696
 */
export function nmbePct(y: ArrayLike<number>, yHat: ArrayLike<number>, p: number): number {
  checkPair(y, yHat, p);
  const yBar = mean(y);
  if (yBar === 0) throw new ModelInputError("NMBE undefined: mean of measured values is 0");
  return (100 * compensatedSum(residuals(y, yHat))) / ((y.length - p) * yBar);
}

/**
 * Coefficient of determination R² = 1 − SSE/SST, SST about the mean of y.
 * Returns NaN when y is constant (SST = 0): R² has no meaning there.
 * @example rSquared([1,2,3], [1,2,3]) // 1
 */
export function rSquared(y: ArrayLike<number>, yHat: ArrayLike<number>): number {
  if (y.length !== yHat.length) throw new ModelInputError("lengths differ");
  if (y.length === 0) throw new ModelInputError("R² of an empty array");
  const yBar = mean(y);
  const dev = new Float64Array(y.length);
  for (let i = 0; i < y.length; i++) dev[i] = (y[i] - yBar) ** 2;
  const sst = compensatedSum(dev);
  if (sst === 0) return Number.NaN;
  return 1 - sumSquaredErrors(y, yHat) / sst;
}

/** Guideline 14 statistics of one fit, and whether they fall within the limits. */
export interface Guideline14Stats {
  n: number;
  p: number;
  cvRmsePct: number;
  nmbePct: number;
  rSquared: number;
  /** sqrt(SSE / (n − p)), in the units of y. */
  rmse: number;
  passes: boolean;
}

/**
 * All Guideline 14 statistics at once, judged against the monthly or hourly limits.
 * @example guideline14Stats(y, yHat, 2, "monthly").passes
 */
export function guideline14Stats(
  y: ArrayLike<number>,
  yHat: ArrayLike<number>,
  p: number,
  resolution: Guideline14Resolution,
): Guideline14Stats {
  const cv = cvRmsePct(y, yHat, p);
  const nmbe = nmbePct(y, yHat, p);
  return {
    n: y.length,
    p,
    cvRmsePct: cv,
    nmbePct: nmbe,
    rSquared: rSquared(y, yHat),
    rmse: Math.sqrt(sumSquaredErrors(y, yHat) / (y.length - p)),
    passes: meetsGuideline14({ cvRmsePct: cv, nmbePct: nmbe }, resolution),
  };
}

/**
 * Whether CV(RMSE) and NMBE are within the Guideline 14 calibration limits for the data's
 * resolution (limits inclusive).
 * @example meetsGuideline14({ cvRmsePct: 15, nmbePct: -5 }, "monthly") // true
 */
export function meetsGuideline14(stats: { cvRmsePct: number; nmbePct: number }, resolution: Guideline14Resolution): boolean {
  const limits = GUIDELINE14_LIMITS[resolution];
  return stats.cvRmsePct <= limits.cvRmsePct && Math.abs(stats.nmbePct) <= limits.nmbeAbsPct;
}
