/**
 * src/model/ols.ts as it was before its inputs were converted to one kind at the boundary
 * (commit 3dfa24c), kept only so that test/model/olsSameAsBefore.test.ts can show that the
 * current code gives the same numbers and errors bit for bit. Not for use outside that test.
 */
/**
 * Ordinary (and weighted) least squares with the usual inference statistics, solved by
 * Householder QR (see linalg.ts). Conventions follow R's lm() and statsmodels OLS/WLS:
 * - residual standard error s = sqrt(Σ wᵢ eᵢ² / (n − k)), k = number of columns incl. intercept;
 * - R² is centred (about the weighted mean of y) with an intercept, uncentred without one;
 * - adjusted R² = 1 − (1 − R²)(n − c)/(n − k), c = 1 with an intercept, 0 without.
 */
import { householderQr, isColumnMajor, qrSolve, qrUnscaledCovariance } from "../../../src/core/linalg.ts";
import type { ColumnMajorMatrix, Matrix } from "../../../src/core/linalg.ts";
import { compensatedSum } from "../../../src/model/stats.ts";
import { studentTQuantile, studentTTwoSidedP } from "../../../src/model/studentT.ts";
import { ModelInputError } from "../../../src/model/errors.ts";

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
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y[i])) throw new ModelInputError(`y[${i}] is not a finite number`);
    if (weights && !(weights[i] > 0 && Number.isFinite(weights[i]))) {
      throw new ModelInputError(`weight[${i}] must be positive and finite, got ${weights[i]}`);
    }
  }
  // Only read below: without an intercept the rows (or columns) are used as given.
  let design: Matrix | null = null;
  let cmDesign: ColumnMajorMatrix | null = null;
  let k: number;
  if (cm) {
    k = cm.cols + (intercept ? 1 : 0);
    if (intercept) {
      const data = new Float64Array(n * k);
      data.fill(1, 0, n);
      data.set(cm.data, n);
      cmDesign = { rows: n, cols: k, data };
    } else cmDesign = cm;
  } else {
    const rows = x as Matrix;
    design = intercept ? rows.map((row) => [1, ...row]) : rows;
    k = design.length === 0 ? (intercept ? 1 : 0) : design[0].length;
  }
  if (n <= k) throw new ModelInputError(`need more observations than coefficients (n=${n}, k=${k})`);
  const sqrtW = new Float64Array(n);
  for (let i = 0; i < n; i++) sqrtW[i] = weights ? Math.sqrt(weights[i]) : 1;
  // Unweighted, the weighted design is the design itself (v · 1 = v exactly).
  let wDesign: Matrix | ColumnMajorMatrix;
  if (cmDesign) {
    if (weights) {
      const data = new Float64Array(n * k);
      for (let j = 0; j < k; j++) for (let i = 0; i < n; i++) data[j * n + i] = cmDesign.data[j * n + i] * sqrtW[i];
      wDesign = { rows: n, cols: k, data };
    } else wDesign = cmDesign;
  } else {
    wDesign = weights
      ? design!.map((row, i) => {
          const out = new Array<number>(row.length);
          for (let j = 0; j < row.length; j++) out[j] = row[j] * sqrtW[i];
          return out;
        })
      : design!;
  }
  const wY = new Float64Array(n);
  for (let i = 0; i < n; i++) wY[i] = y[i] * sqrtW[i];

  const names = [...(intercept ? ["intercept"] : []), ...(options.columnNames ?? [])];
  const qr = householderQr(wDesign, names.length === k ? names : undefined);
  const beta = Array.from(qrSolve(qr, wY));
  const cov = qrUnscaledCovariance(qr);

  const fitted = new Float64Array(n);
  const resid = new Float64Array(n);
  const wSq = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let f = 0;
    if (cmDesign) for (let j = 0; j < k; j++) f += cmDesign.data[j * n + i] * beta[j];
    else for (let j = 0; j < k; j++) f += design![i][j] * beta[j];
    fitted[i] = f;
    resid[i] = y[i] - f;
    wSq[i] = (weights ? weights[i] : 1) * resid[i] * resid[i];
  }
  const sse = compensatedSum(wSq);
  const dfResidual = n - k;
  const s2 = sse / dfResidual;

  let tss: number;
  if (intercept) {
    const wSum = weights ? compensatedSum(weights) : n;
    const wy = new Float64Array(n);
    for (let i = 0; i < n; i++) wy[i] = (weights ? weights[i] : 1) * y[i];
    const yBar = compensatedSum(wy) / wSum;
    const dev = new Float64Array(n);
    for (let i = 0; i < n; i++) dev[i] = (weights ? weights[i] : 1) * (y[i] - yBar) ** 2;
    tss = compensatedSum(dev);
  } else {
    const sq = new Float64Array(n);
    for (let i = 0; i < n; i++) sq[i] = (weights ? weights[i] : 1) * y[i] * y[i];
    tss = compensatedSum(sq);
  }
  const r2 = tss === 0 ? Number.NaN : 1 - sse / tss;
  const adjR2 = 1 - ((1 - r2) * (n - (intercept ? 1 : 0))) / dfResidual;

  const se = beta.map((_, j) => Math.sqrt(s2 * cov[j][j]));
  const tValues = beta.map((b, j) => b / se[j]);
  const pValues = tValues.map((t) => (Number.isFinite(t) ? studentTTwoSidedP(t, dfResidual) : 0));
  const s = Math.sqrt(s2);

  const toRow = (xr: readonly number[]): number[] => {
    const row = intercept ? [1, ...xr] : [...xr];
    if (row.length !== k) throw new ModelInputError(`prediction row has ${xr.length} regressors, expected ${k - (intercept ? 1 : 0)}`);
    return row;
  };
  const predict = (xr: readonly number[]): number => {
    const row = toRow(xr);
    let f = 0;
    for (let j = 0; j < k; j++) f += row[j] * beta[j];
    return f;
  };
  const predictWithInterval = (xr: readonly number[], level: number, weight = 1): IntervalPrediction => {
    if (!(level > 0 && level < 1)) throw new ModelInputError(`interval level must be in (0, 1), got ${level}`);
    if (!(weight > 0)) throw new ModelInputError(`weight must be positive, got ${weight}`);
    const row = toRow(xr);
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
