/**
 * Savitzky–Golay smoothing and differentiation (Savitzky & Golay 1964, Anal. Chem. 36(8),
 * with the corrections of Steinier, Termonia & Deltour 1972): fit a polynomial of order k by
 * least squares to each window of 2m + 1 equally spaced samples and take its value (or its
 * d-th derivative) at a point of the window. The fit is linear in the samples, so it reduces
 * to fixed weights per window position.
 */
import { householderQr, qrUnscaledCovariance } from "../core/linalg.ts";
import { CleanInputError } from "./errors.ts";

export interface SavgolOptions {
  /** Derivative order (0 = smoothing). Default 0. */
  deriv?: number;
  /** Sample spacing, for derivatives in units per spacing unit (e.g. 1 for per hour). Default 1. */
  delta?: number;
  /** Window index at which to evaluate (0 … window − 1). Default the centre. */
  pos?: number;
}

function factorial(n: number): number {
  let f = 1;
  for (let i = 2; i <= n; i++) f *= i;
  return f;
}

function checkWindow(window: number, order: number, deriv: number): void {
  if (!Number.isInteger(window) || window < 1 || window % 2 === 0) {
    throw new CleanInputError(`Savitzky–Golay window must be a positive odd integer, got ${window}`);
  }
  if (!Number.isInteger(order) || order < 0 || order >= window) {
    throw new CleanInputError(`polynomial order must be an integer in 0 … window − 1 (${window - 1}), got ${order}`);
  }
  if (!Number.isInteger(deriv) || deriv < 0) throw new CleanInputError(`derivative order must be a non-negative integer, got ${deriv}`);
}

/**
 * Weights w₀ … w_{window−1} such that Σ wⱼ·y[i − m + j] is the fitted polynomial's
 * d-th derivative at window position `pos` (the centre unless given). Weights are in
 * window order ("dot" order: same as scipy.signal.savgol_coeffs(..., use="dot")).
 * A derivative order above the polynomial order gives all zeros.
 * @throws CleanInputError on an even window, order ≥ window, or pos outside the window.
 * @example savgolCoefficients(5, 2)           // [−3, 12, 17, 12, −3] / 35
 * @example savgolCoefficients(5, 2, { deriv: 1 }) // [−2, −1, 0, 1, 2] / 10
 */
export function savgolCoefficients(window: number, order: number, options: SavgolOptions = {}): Float64Array {
  const deriv = options.deriv ?? 0;
  const delta = options.delta ?? 1;
  checkWindow(window, order, deriv);
  if (!(delta > 0)) throw new CleanInputError(`sample spacing must be positive, got ${delta}`);
  const half = (window - 1) / 2;
  const pos = options.pos ?? half;
  if (!Number.isInteger(pos) || pos < 0 || pos >= window) throw new CleanInputError(`position must be an integer in 0 … ${window - 1}, got ${pos}`);
  const out = new Float64Array(window);
  if (deriv > order) return out;
  // Offsets scaled to about [−1, 1] keep the Vandermonde columns of similar size.
  const scale = Math.max(half, 1);
  const a = Array.from({ length: window }, (_, i) => {
    const u = (i - pos) / scale;
    return Array.from({ length: order + 1 }, (_, j) => u ** j);
  });
  const cov = qrUnscaledCovariance(householderQr(a));
  const factor = factorial(deriv) / (scale * delta) ** deriv;
  for (let i = 0; i < window; i++) {
    let s = 0;
    for (let j = 0; j <= order; j++) s += cov[deriv][j] * a[i][j];
    out[i] = s * factor;
  }
  return out;
}

/**
 * Savitzky–Golay filter of a regularly sampled series.
 *
 * Edges: like scipy.signal.savgol_filter's default mode "interp", the first and last
 * (window − 1)/2 outputs come from the polynomial fitted to the first (last) full window,
 * evaluated at their own positions, so the output has the input's length and no padding is
 * invented. NaN inputs are not filled: every output whose window touches one is NaN
 * (fill gaps first, e.g. with the weather gap interpolation).
 * @throws CleanInputError when the series is shorter than the window, or on bad window/order.
 * @example savgolFilter(tempC, 7, 2)            // smoothed temperature
 * @example savgolFilter(tempC, 7, 2, 1)         // °C per hour for hourly data
 */
export function savgolFilter(values: ArrayLike<number>, window: number, order: number, deriv = 0, delta = 1): Float64Array {
  checkWindow(window, order, deriv);
  const n = values.length;
  if (n < window) throw new CleanInputError(`series of ${n} values is shorter than the Savitzky–Golay window ${window}`);
  const half = (window - 1) / 2;
  const out = new Float64Array(n);
  const centre = savgolCoefficients(window, order, { deriv, delta });
  const apply = (w: Float64Array, start: number): number => {
    let s = 0;
    for (let j = 0; j < window; j++) s += w[j] * values[start + j];
    return s;
  };
  for (let i = half; i < n - half; i++) out[i] = apply(centre, i - half);
  for (let i = 0; i < half; i++) {
    out[i] = apply(savgolCoefficients(window, order, { deriv, delta, pos: i }), 0);
    const k = window - half + i; // position within the last window
    out[n - half + i] = apply(savgolCoefficients(window, order, { deriv, delta, pos: k }), n - window);
  }
  return out;
}
