/**
 * Student's t distribution: CDF and quantile, for prediction intervals and coefficient
 * p-values. simple-statistics 7 has no t quantile, so it is implemented here.
 *
 * Method: the t CDF through the regularized incomplete beta function,
 *   P(T ≤ t) = 1 − ½·I_{ν/(ν+t²)}(ν/2, ½) for t ≥ 0,
 * with I evaluated by its continued fraction (modified Lentz; Numerical Recipes §6.4);
 * the quantile by a safeguarded Newton iteration on that CDF.
 */
import { ModelInputError } from "./errors.ts";

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0 (Lanczos approximation, g = 7; relative error ≈ 1e-15). */
function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const z = x - 1;
  let a = LANCZOS[0];
  const t = z + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i] / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  // Converges in O(sqrt(max(a, b))) steps; hourly fits can have ν in the tens of thousands.
  const maxIterations = 10000 + 10 * Math.ceil(Math.sqrt(Math.max(a, b)));
  for (let m = 1; m <= maxIterations; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) return h;
  }
  return h;
}

/**
 * Regularized incomplete beta function I_x(a, b) for 0 ≤ x ≤ 1, a, b > 0.
 * @example regularizedIncompleteBeta(0.5, 2, 2) // 0.5
 */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (!(a > 0) || !(b > 0)) throw new ModelInputError(`incomplete beta needs a, b > 0 (a=${a}, b=${b})`);
  if (!(x >= 0 && x <= 1)) throw new ModelInputError(`incomplete beta needs 0 ≤ x ≤ 1, got ${x}`);
  if (x === 0 || x === 1) return x;
  const lnFront = logGamma(a + b) - logGamma(a) - logGamma(b) + a * Math.log(x) + b * Math.log1p(-x);
  const front = Math.exp(lnFront);
  // Use the symmetry I_x(a,b) = 1 − I_{1−x}(b,a) where the fraction converges faster.
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(x, a, b)) / a;
  return 1 - (front * betaContinuedFraction(1 - x, b, a)) / b;
}

function checkDf(df: number): void {
  if (!(df > 0) || !Number.isFinite(df)) throw new ModelInputError(`degrees of freedom must be positive and finite, got ${df}`);
}

/**
 * Cumulative distribution P(T ≤ t) of Student's t with `df` degrees of freedom.
 * @example studentTCdf(2.228138851986, 10) // ≈ 0.975
 */
export function studentTCdf(t: number, df: number): number {
  checkDf(df);
  if (Number.isNaN(t)) return Number.NaN;
  if (t === Infinity) return 1;
  if (t === -Infinity) return 0;
  const tail = 0.5 * regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5);
  return t >= 0 ? 1 - tail : tail;
}

/** Two-sided p-value P(|T| ≥ |t|). Computed from the tail directly, so tiny p-values keep precision. */
export function studentTTwoSidedP(t: number, df: number): number {
  checkDf(df);
  if (Number.isNaN(t)) return Number.NaN;
  if (!Number.isFinite(t)) return 0;
  return regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5);
}

function studentTDensity(t: number, df: number): number {
  const lnC = logGamma((df + 1) / 2) - logGamma(df / 2) - 0.5 * Math.log(df * Math.PI);
  return Math.exp(lnC - ((df + 1) / 2) * Math.log1p((t * t) / df));
}

/** Upper-tail probability Q(t) = P(T > t) for t ≥ 0, without cancellation. */
function upperTail(t: number, df: number): number {
  return 0.5 * regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5);
}

/**
 * Quantile (inverse CDF) of Student's t: the t with P(T ≤ t) = p.
 * Accurate to about 1e-12 relative for 1e-12 < p < 1 − 1e-12 and df ≥ 1.
 * @throws ModelInputError when p is outside (0, 1) or df ≤ 0.
 * @example studentTQuantile(0.975, 10) // ≈ 2.228138851986 (R: qt(0.975, 10))
 */
export function studentTQuantile(p: number, df: number): number {
  checkDf(df);
  if (!(p > 0 && p < 1)) throw new ModelInputError(`quantile probability must be in (0, 1), got ${p}`);
  if (p === 0.5) return 0;
  // Prediction intervals ask for the same few (p, df) thousands of times (a forecast scenario
  // setup per weather year and month): the root is found once per pair and kept.
  const key = `${p}|${df}`;
  let t = quantiles.get(key);
  if (t === undefined) {
    if (quantiles.size >= 4096) quantiles.clear(); // a bound, not an eviction policy
    quantiles.set(key, (t = solveQuantile(p, df)));
  }
  return t;
}

const quantiles = new Map<string, number>();

/** The Newton/bisection root of studentTQuantile (p ≠ 0.5). */
function solveQuantile(p: number, df: number): number {
  // Solve Q(t) = q on t ≥ 0 by symmetry; q is the smaller tail.
  const q = p > 0.5 ? 1 - p : p;
  let lo = 0;
  let hi = 1;
  while (upperTail(hi, df) > q) {
    lo = hi;
    hi *= 2;
    if (hi > 1e300) break;
  }
  let t = 0.5 * (lo + hi);
  for (let iter = 0; iter < 200; iter++) {
    const f = upperTail(t, df) - q; // decreasing in t
    if (f === 0) break;
    if (f > 0) lo = t;
    else hi = t;
    const step = f / studentTDensity(t, df);
    let next = t + step;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - t) <= 1e-15 * Math.max(1, Math.abs(next))) {
      t = next;
      break;
    }
    t = next;
  }
  return p > 0.5 ? t : -t;
}
