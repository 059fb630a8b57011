/**
 * Householder QR least squares for small dense problems (a handful of columns, up to a
 * few thousand rows). QR works on X directly, so its accuracy depends on cond(X), not
 * cond(X)² as the normal equations would; that matters for temperature regressors that
 * are far from zero (e.g. 30–80 °F next to an intercept column).
 */
import { ModelInputError } from "./errors.ts";

/** A dense matrix as an array of rows. */
export type Matrix = readonly (readonly number[])[];

/**
 * A dense matrix stored by columns in one array: entry (i, j) at data[j·rows + i]. Large
 * designs built this way cost no array per row.
 */
export interface ColumnMajorMatrix {
  rows: number;
  cols: number;
  data: Float64Array;
}

/** Whether a matrix is stored by columns (else it is an array of rows). */
export function isColumnMajor(x: Matrix | ColumnMajorMatrix): x is ColumnMajorMatrix {
  return !Array.isArray(x);
}

/** The factorization X = QR, kept in the compact Householder form (after JAMA / LINPACK). */
export interface QrFactorization {
  rows: number;
  cols: number;
  /** Column-major m×n: Householder vectors below the diagonal, R above it. */
  qr: Float64Array;
  /** Diagonal of R. */
  rDiag: Float64Array;
}

/** Below this |R_jj| / ‖column j‖ a column is treated as a linear combination of earlier ones. */
const RANK_TOLERANCE = 1e-10;

/**
 * Householder QR of an m×n matrix with m ≥ n.
 * @throws ModelInputError when m < n, when rows are ragged or non-finite, or when a column is
 *   (numerically) a linear combination of earlier columns: which column is named in the message.
 */
export function householderQr(x: Matrix | ColumnMajorMatrix, columnNames?: readonly string[]): QrFactorization {
  const cm = isColumnMajor(x) ? x : null;
  const rowsX = cm ? null : (x as Matrix);
  const m = cm ? cm.rows : rowsX!.length;
  const n = cm ? cm.cols : m === 0 ? 0 : rowsX![0].length;
  if (m < n || n === 0) throw new ModelInputError(`need at least as many rows as columns (rows=${m}, columns=${n})`);
  if (cm && cm.data.length !== m * n) throw new ModelInputError(`column-major data has ${cm.data.length} values, expected ${m * n}`);
  const qr = cm ? Float64Array.from(cm.data) : new Float64Array(m * n);
  if (rowsX) copyRows(rowsX, qr, m, n);
  else checkColumns(qr, m, n);
  return factorInPlace(qr, m, n, columnNames);
}

// The checks of householderQr for each kind of input, apart from the factorization: V8 then
// optimizes the factorization for one kind of input instead of deoptimizing it for the other.

/** A design entry householderQr accepts: finite and far from overflow (see factorInPlace). */
function checkEntry(v: number, i: number, j: number): void {
  if (!Number.isFinite(v) || Math.abs(v) > 1e150) throw new ModelInputError(`non-finite or huge value at row ${i}, column ${j}`);
}

/** Copies rows into column-major `qr`, checking them row by row. */
function copyRows(rows: Matrix, qr: Float64Array, m: number, n: number): void {
  for (let i = 0; i < m; i++) {
    const row = rows[i]!;
    if (row.length !== n) throw new ModelInputError(`row ${i} has ${row.length} values, expected ${n}`);
    for (let j = 0; j < n; j++) {
      const v = row[j]!;
      checkEntry(v, i, j);
      qr[j * m + i] = v;
    }
  }
}

/** Checks column-major values row by row (the order copyRows meets them in). */
function checkColumns(qr: Float64Array, m: number, n: number): void {
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < n; j++) {
      checkEntry(qr[j * m + i], i, j);
    }
  }
}

/** The Householder QR of householderQr on its checked column-major copy. */
function factorInPlace(qr: Float64Array, m: number, n: number, columnNames: readonly string[] | undefined): QrFactorization {
  const colNorm = new Float64Array(n);
  // Plain sums of squares: Math.hypot is slow in V8, and meter and weather magnitudes are far
  // from overflow (|v| < 1e150).
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += qr[j * m + i] ** 2;
    colNorm[j] = Math.sqrt(s);
  }
  const rDiag = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let nrm2 = 0;
    for (let i = k; i < m; i++) nrm2 += qr[k * m + i] ** 2;
    let nrm = Math.sqrt(nrm2);
    if (nrm === 0 || nrm <= RANK_TOLERANCE * colNorm[k]) {
      const name = columnNames?.[k] ?? `column ${k}`;
      throw new ModelInputError(`design matrix is rank-deficient: ${name} is constant or a combination of earlier columns`);
    }
    if (qr[k * m + k] < 0) nrm = -nrm;
    for (let i = k; i < m; i++) qr[k * m + i] /= nrm;
    qr[k * m + k] += 1;
    for (let j = k + 1; j < n; j++) {
      let s = 0;
      for (let i = k; i < m; i++) s += qr[k * m + i] * qr[j * m + i];
      s = -s / qr[k * m + k];
      for (let i = k; i < m; i++) qr[j * m + i] += s * qr[k * m + i];
    }
    rDiag[k] = -nrm;
  }
  return { rows: m, cols: n, qr, rDiag };
}

/** Least-squares solution of X b ≈ y from a QR factorization of X. */
export function qrSolve(f: QrFactorization, y: ArrayLike<number>): Float64Array {
  const { rows: m, cols: n, qr, rDiag } = f;
  if (y.length !== m) throw new ModelInputError(`right-hand side has ${y.length} values, expected ${m}`);
  const b = Float64Array.from(y as ArrayLike<number>);
  // Apply Qᵀ to y.
  for (let k = 0; k < n; k++) {
    let s = 0;
    for (let i = k; i < m; i++) s += qr[k * m + i] * b[i];
    s = -s / qr[k * m + k];
    for (let i = k; i < m; i++) b[i] += s * qr[k * m + i];
  }
  // Back-substitute R b = Qᵀy.
  const out = new Float64Array(n);
  for (let k = n - 1; k >= 0; k--) {
    let s = b[k];
    for (let j = k + 1; j < n; j++) s -= qr[j * m + k] * out[j];
    out[k] = s / rDiag[k];
  }
  return out;
}

// Module-level helpers rather than closures made per call: V8 keeps their optimized code.

/** Entry (i, j), i ≤ j, of R. */
function rEntry(f: QrFactorization, i: number, j: number): number {
  return i === j ? f.rDiag[i] : f.qr[j * f.rows + i];
}

/** An n×n array of rows of zeros. */
function zeroRows(n: number): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < n; i++) out.push(new Array<number>(n).fill(0));
  return out;
}

/** (XᵀX)⁻¹ = R⁻¹R⁻ᵀ from a QR factorization, as an n×n array of rows. */
export function qrUnscaledCovariance(f: QrFactorization): number[][] {
  const n = f.cols;
  // Invert the upper-triangular R column by column.
  const rInv = zeroRows(n);
  for (let j = 0; j < n; j++) {
    rInv[j][j] = 1 / rEntry(f, j, j);
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += rEntry(f, i, k) * rInv[k][j];
      rInv[i][j] = -s / rEntry(f, i, i);
    }
  }
  const cov = zeroRows(n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let s = 0;
      for (let k = Math.max(i, j); k < n; k++) s += rInv[i][k] * rInv[j][k];
      cov[i][j] = s;
      cov[j][i] = s;
    }
  }
  return cov;
}

/**
 * Least squares in place, for tight loops (breakpoint searches): `a` is an m×k column-major
 * matrix and `y` a vector, both overwritten. Same Householder method and rank test as
 * householderQr. Returns the residual sum of squares, or NaN when the matrix is
 * rank-deficient; writes the coefficients into `coef` when given.
 */
export function leastSquaresInPlace(a: Float64Array, y: Float64Array, m: number, k: number, coef?: Float64Array): number {
  return leastSquaresFrom(a, y, m, k, 0, new Float64Array(k), coef);
}

/**
 * {@link leastSquaresInPlace} from column `from` on: columns 0 … from − 1 of `a` already hold
 * their Householder vectors (as the steps leave them) with their R diagonal in rDiag, and the
 * later columns and y have had those reflections applied, in column order (see
 * {@link householderStep} and {@link applyReflection}). The same numbers as solving from 0.
 */
export function leastSquaresFrom(a: Float64Array, y: Float64Array, m: number, k: number, from: number, rDiag: Float64Array, coef?: Float64Array): number {
  for (let c = from; c < k; c++) if (!householderStep(a, y, m, k, c, rDiag)) return Number.NaN;
  let sse = 0;
  for (let i = k; i < m; i++) sse += y[i] * y[i];
  if (coef) {
    for (let c = k - 1; c >= 0; c--) {
      let s = y[c];
      for (let j = c + 1; j < k; j++) s -= a[j * m + c] * coef[j];
      coef[c] = s / rDiag[c];
    }
  }
  return sse;
}

/**
 * Step c of {@link leastSquaresInPlace}: the reflection that zeroes column c below the
 * diagonal, applied to columns c + 1 … k − 1 and to y; column c keeps its Householder vector.
 * Returns false when column c is (numerically) a combination of the earlier ones.
 */
export function householderStep(a: Float64Array, y: Float64Array, m: number, k: number, c: number, rDiag: Float64Array): boolean {
  // Both sums in one pass, each adding its entries in row order: the column's (i ≥ 0) and the
  // part from the diagonal down (i ≥ c); for the first column they are the same sum.
  let colNorm2 = 0;
  for (let i = 0; i < c; i++) colNorm2 += a[c * m + i] ** 2;
  let nrm2 = 0;
  for (let i = c; i < m; i++) {
    const sq = a[c * m + i] ** 2;
    colNorm2 += sq;
    nrm2 += sq;
  }
  let nrm = Math.sqrt(nrm2);
  // colNorm2 is of the column after earlier reflections, whose norm they preserve.
  if (nrm === 0 || nrm <= RANK_TOLERANCE * Math.sqrt(colNorm2)) return false;
  if (a[c * m + c] < 0) nrm = -nrm;
  for (let i = c; i < m; i++) a[c * m + i] /= nrm;
  a[c * m + c] += 1;
  for (let j = c + 1; j < k; j++) applyReflection(a, m, c, a, j * m);
  applyReflection(a, m, c, y, 0);
  rDiag[c] = -nrm;
  return true;
}

/**
 * Apply the reflection of step c (its vector in column c of `a`) to the m entries of x from
 * `off` on: the update {@link householderStep} makes to each later column and to y.
 */
export function applyReflection(a: Float64Array, m: number, c: number, x: Float64Array, off: number): void {
  let s = 0;
  for (let i = c; i < m; i++) s += a[c * m + i] * x[off + i];
  s = -s / a[c * m + c];
  for (let i = c; i < m; i++) x[off + i] += s * a[c * m + i];
}
