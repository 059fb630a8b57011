/**
 * leastSquaresInPlace of src/core/linalg.ts as it was before the CPU work of issue 17 (commit
 * daa4bc8), kept only so that test/core/leastSquaresSameAsBefore.test.ts can show that the current
 * code gives the same numbers bit for bit. Not for use outside that test.
 */
const RANK_TOLERANCE = 1e-10;

export function leastSquaresInPlace(a: Float64Array, y: Float64Array, m: number, k: number, coef?: Float64Array): number {
  const rDiag = new Float64Array(k);
  for (let c = 0; c < k; c++) {
    let colNorm2 = 0;
    for (let i = 0; i < m; i++) colNorm2 += a[c * m + i] ** 2;
    // For the first column both sums run over the same entries in the same order.
    let nrm2 = 0;
    if (c === 0) nrm2 = colNorm2;
    else for (let i = c; i < m; i++) nrm2 += a[c * m + i] ** 2;
    let nrm = Math.sqrt(nrm2);
    // colNorm2 is of the column after earlier reflections, whose norm they preserve.
    if (nrm === 0 || nrm <= RANK_TOLERANCE * Math.sqrt(colNorm2)) return Number.NaN;
    if (a[c * m + c] < 0) nrm = -nrm;
    for (let i = c; i < m; i++) a[c * m + i] /= nrm;
    a[c * m + c] += 1;
    for (let j = c + 1; j < k; j++) {
      let s = 0;
      for (let i = c; i < m; i++) s += a[c * m + i] * a[j * m + i];
      s = -s / a[c * m + c];
      for (let i = c; i < m; i++) a[j * m + i] += s * a[c * m + i];
    }
    let s = 0;
    for (let i = c; i < m; i++) s += a[c * m + i] * y[i];
    s = -s / a[c * m + c];
    for (let i = c; i < m; i++) y[i] += s * a[c * m + i];
    rDiag[c] = -nrm;
  }
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
