/**
 * Ordinary (and weighted) least squares with the usual inference statistics, solved by
 * Householder QR (see linalg.ts). Conventions follow R's lm() and statsmodels OLS/WLS:
 * - residual standard error s = sqrt(Σ wᵢ eᵢ² / (n − k)), k = number of columns incl. intercept;
 * - R² is centred (about the weighted mean of y) with an intercept, uncentred without one;
 * - adjusted R² = 1 − (1 − R²)(n − c)/(n − k), c = 1 with an intercept, 0 without.
 */
import { householderQr, isColumnMajor, qrSolve, qrUnscaledCovariance } from "../core/linalg.ts";
import type { ColumnMajorMatrix, Matrix } from "../core/linalg.ts";
import { compensatedSum } from "./stats.ts";
import { studentTQuantile, studentTTwoSidedP } from "./studentT.ts";
import { ModelInputError } from "./errors.ts";

export interface OlsOptions {
  /** Prepend a column of ones (default true). */
  intercept?: boolean;
  /** Observation weights (> 0), e.g. billing days; gives weighted least squares. */
  weights?: ArrayLike<number>;
  /** Names for the regressor columns (without the intercept), used in error messages. */
  columnNames?: readonly string[];
}

/** A point prediction with its interval. */
export interface IntervalPrediction {
  fit: number;
  lower: number;
  upper: number;
  /** Standard error of a new observation: s·sqrt(1/w₀ + x₀ᵀ(XᵀWX)⁻¹x₀). */
  sePrediction: number;
  /** Standard error of the fitted mean: s·sqrt(x₀ᵀ(XᵀWX)⁻¹x₀). */
  seMean: number;
}

export interface OlsFit {
  /** Coefficients; the intercept first when `hasIntercept`. */
  coefficients: number[];
  standardErrors: number[];
  tValues: number[];
  /** Two-sided p-values of the t statistics. */
  pValues: number[];
  residualStdError: number;
  rSquared: number;
  adjRSquared: number;
  n: number;
  /** Number of estimated coefficients (columns of the design, intercept included). */
  k: number;
  dfResidual: number;
  /** Σ wᵢ eᵢ² (plain SSE when unweighted). */
  sse: number;
  hasIntercept: boolean;
  fitted: Float64Array;
  residuals: Float64Array;
  /** (XᵀWX)⁻¹, unscaled; multiply by s² for the coefficient covariance. */
  unscaledCovariance: number[][];
  /** Prediction for one regressor row (without the intercept column). */
  predict(x: readonly number[]): number;
  /**
   * Prediction with a two-sided interval for a NEW observation at `x` (regressors without the
   * intercept), at confidence `level` (e.g. 0.8), using t(1 − α/2, n − k).
   * `weight` is the new observation's weight (default 1).
   * @example fit.predictWithInterval([55], 0.9)
   */
  predictWithInterval(x: readonly number[], level: number, weight?: number): IntervalPrediction;
}

/**
 * Fit y ≈ X β by (weighted) least squares.
 * @param x rows of regressors, without the intercept column; or the same columns stored by
 *   column in one array (large designs: no array per row; the same numbers come out).
 * @throws ModelInputError on mismatched lengths, non-positive weights, n ≤ k, or a rank-deficient design.
 * @example fitOls([[1],[2],[3]], [2,4,6.5]).coefficients // [intercept, slope]
 */
export function fitOls(x: Matrix | ColumnMajorMatrix, y: ArrayLike<number>, options: OlsOptions = {}): OlsFit {
  const intercept = options.intercept ?? true;
  const n = y.length;
  const cm = isColumnMajor(x) ? x : null;
  const nx = cm ? cm.rows : (x as Matrix).length;
  if (nx !== n) throw new ModelInputError(`regressors have ${nx} rows but y has ${n} values`);
  if (cm && cm.data.length !== cm.rows * cm.cols) throw new ModelInputError(`column-major data has ${cm.data.length} values, expected ${cm.rows * cm.cols}`);
  const weights = options.weights;
  if (weights && weights.length !== n) throw new ModelInputError(`weights have ${weights.length} values but y has ${n}`);
  checkValues(y, weights);
  // The fit itself always gets columns and typed arrays (the same numbers): V8 throws away a
  // function's optimized code when it meets a kind of array it has not seen before.
  const columns = cm ?? columnsOfRows(x as Matrix);
  if (columns === null) throwForRaggedRows(x as Matrix, intercept, weights);
  return fitColumns(columns, Float64Array.from(y), weights ? Float64Array.from(weights) : null, intercept, options.columnNames);
}

function checkValues(y: ArrayLike<number>, weights: ArrayLike<number> | undefined): void {
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) throw new ModelInputError(`y[${i}] is not a finite number`);
    if (weights && !(weights[i] > 0 && Number.isFinite(weights[i]))) {
      throw new ModelInputError(`weight[${i}] must be positive and finite, got ${weights[i]}`);
    }
  }
}

/** Rows stored by column (the same numbers); null when the rows differ in length. */
function columnsOfRows(rows: Matrix): ColumnMajorMatrix | null {
  const n = rows.length;
  const cols = n === 0 ? 0 : rows[0]!.length;
  const data = new Float64Array(n * cols);
  for (let i = 0; i < n; i++) {
    const row = rows[i]!;
    if (row.length !== cols) return null;
    for (let j = 0; j < cols; j++) data[j * n + i] = row[j]!;
  }
  return { rows: n, cols, data };
}

/** Throws the error a fit on ragged rows meets: too few rows, or householderQr's (as the rows come). */
function throwForRaggedRows(rows: Matrix, intercept: boolean, weights: ArrayLike<number> | undefined): never {
  const n = rows.length;
  const design = intercept ? rows.map((row) => [1, ...row]) : rows;
  const k = design[0]!.length;
  if (n <= k) throw new ModelInputError(`need more observations than coefficients (n=${n}, k=${k})`);
  const wDesign = weights ? design.map((row, i) => row.map((v) => v * Math.sqrt(weights[i]!))) : design;
  householderQr(wDesign);
  throw new Error("ragged rows passed the QR checks");
}

// The two helpers below hold branches that only some callers take (with or without an
// intercept, names or not): kept out of fitColumns, a branch it has not yet run does not
// deoptimize the whole fit.

/** Σ w(y − ȳ)² about the weighted mean with an intercept, Σ w·y² without one. */
function totalSumOfSquares(y: Float64Array, weights: Float64Array | null, intercept: boolean): number {
  const n = y.length;
  if (intercept) {
    const wSum = weights ? compensatedSum(weights) : n;
    const wy = new Float64Array(n);
    for (let i = 0; i < n; i++) wy[i] = (weights ? weights[i] : 1) * y[i];
    const yBar = compensatedSum(wy) / wSum;
    const dev = new Float64Array(n);
    for (let i = 0; i < n; i++) dev[i] = (weights ? weights[i] : 1) * (y[i] - yBar) ** 2;
    return compensatedSum(dev);
  }
  const sq = new Float64Array(n);
  for (let i = 0; i < n; i++) sq[i] = (weights ? weights[i] : 1) * y[i] * y[i];
  return compensatedSum(sq);
}

function coefficientNames(intercept: boolean, columnNames: readonly string[] | undefined): string[] {
  return [...(intercept ? ["intercept"] : []), ...(columnNames ?? [])];
}

/** fitOls on checked inputs: regressors by column (without the intercept), y and weights typed. */
function fitColumns(cm: ColumnMajorMatrix, y: Float64Array, weights: Float64Array | null, intercept: boolean, columnNames: readonly string[] | undefined): OlsFit {
  const n = y.length;
  // Only read below: without an intercept the columns are used as given.
  let cmDesign: ColumnMajorMatrix;
  const k = cm.cols + (intercept ? 1 : 0);
  // The arrays are made whether needed or not (empty when not): a `new` that V8 has not yet
  // seen run deoptimizes the whole fit when it first runs.
  const withOnes = new Float64Array(intercept ? n * k : 0);
  const weighted = new Float64Array(weights ? n * k : 0);
  if (intercept) {
    const data = withOnes;
    data.fill(1, 0, n);
    data.set(cm.data, n);
    cmDesign = { rows: n, cols: k, data };
  } else cmDesign = cm;
  if (n <= k) throw new ModelInputError(`need more observations than coefficients (n=${n}, k=${k})`);
  const sqrtW = new Float64Array(n);
  for (let i = 0; i < n; i++) sqrtW[i] = weights ? Math.sqrt(weights[i]) : 1;
  // Unweighted, the weighted design is the design itself (v · 1 = v exactly).
  let wDesign: ColumnMajorMatrix;
  if (weights) {
    const data = weighted;
    for (let j = 0; j < k; j++) for (let i = 0; i < n; i++) data[j * n + i] = cmDesign.data[j * n + i] * sqrtW[i];
    wDesign = { rows: n, cols: k, data };
  } else wDesign = cmDesign;
  const wY = new Float64Array(n);
  for (let i = 0; i < n; i++) wY[i] = y[i] * sqrtW[i];

  const names = coefficientNames(intercept, columnNames);
  const qr = householderQr(wDesign, names.length === k ? names : undefined);
  const beta = Array.from(qrSolve(qr, wY));
  const cov = qrUnscaledCovariance(qr);

  const fitted = new Float64Array(n);
  const resid = new Float64Array(n);
  const wSq = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let f = 0;
    for (let j = 0; j < k; j++) f += cmDesign.data[j * n + i] * beta[j];
    fitted[i] = f;
    resid[i] = y[i] - f;
    wSq[i] = (weights ? weights[i] : 1) * resid[i] * resid[i];
  }
  const sse = compensatedSum(wSq);
  const dfResidual = n - k;
  const s2 = sse / dfResidual;

  const tss = totalSumOfSquares(y, weights, intercept);
  const r2 = tss === 0 ? Number.NaN : 1 - sse / tss;
  const adjR2 = 1 - ((1 - r2) * (n - (intercept ? 1 : 0))) / dfResidual;

  // Plain loops rather than map callbacks, whose optimized code would be lost between fits.
  const se: number[] = [];
  const tValues: number[] = [];
  const pValues: number[] = [];
  for (let j = 0; j < k; j++) {
    se.push(Math.sqrt(s2 * cov[j][j]));
    tValues.push(beta[j] / se[j]);
    pValues.push(Number.isFinite(tValues[j]) ? studentTTwoSidedP(tValues[j], dfResidual) : 0);
  }
  const s = Math.sqrt(s2);

  // A bound module-level function, not a closure: V8 keeps its optimized code between fits.
  const predict = predictRow.bind(null, beta, intercept);
  const predictWithInterval = (xr: readonly number[], level: number, weight = 1): IntervalPrediction => {
    if (!(level > 0 && level < 1)) throw new ModelInputError(`interval level must be in (0, 1), got ${level}`);
    if (!(weight > 0)) throw new ModelInputError(`weight must be positive, got ${weight}`);
    const row = rowWithIntercept(xr, k, intercept);
    let quad = 0;
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) quad += row[i] * cov[i][j] * row[j];
    const fit = predict(xr);
    const seMean = s * Math.sqrt(quad);
    const sePrediction = s * Math.sqrt(1 / weight + quad);
    const tCrit = studentTQuantile(1 - (1 - level) / 2, dfResidual);
    return { fit, lower: fit - tCrit * sePrediction, upper: fit + tCrit * sePrediction, sePrediction, seMean };
  };

  return {
    coefficients: beta,
    standardErrors: se,
    tValues,
    pValues,
    residualStdError: s,
    rSquared: r2,
    adjRSquared: adjR2,
    n,
    k,
    dfResidual,
    sse,
    hasIntercept: intercept,
    fitted,
    residuals: resid,
    unscaledCovariance: cov,
    predict,
    predictWithInterval,
  };
}

/** A prediction row: the intercept's 1 (when fitted) before the regressors. */
function rowWithIntercept(xr: readonly number[], k: number, intercept: boolean): number[] {
  const row = intercept ? [1, ...xr] : [...xr];
  if (row.length !== k) throw new ModelInputError(`prediction row has ${xr.length} regressors, expected ${k - (intercept ? 1 : 0)}`);
  return row;
}

/** OlsFit.predict of the fit with coefficients `beta`. */
function predictRow(beta: readonly number[], intercept: boolean, xr: readonly number[]): number {
  const k = beta.length;
  const row = rowWithIntercept(xr, k, intercept);
  let f = 0;
  for (let j = 0; j < k; j++) f += row[j] * beta[j];
  return f;
}
