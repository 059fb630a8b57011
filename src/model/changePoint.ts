/**
 * Monthly (bill-level) change-point models of average daily use against mean period
 * temperature, after Kissock, Haberl & Claridge (2003), ASHRAE RP-1050 (the Inverse
 * Modeling Toolkit), as also given in ASHRAE Handbook — Fundamentals:
 *
 *   1P:  Y = β₁                                   (weather-independent fallback)
 *   2P:  Y = β₁ + β₂·X
 *   3PC: Y = β₁ + β₂·(X − β₃)⁺                     cooling, β₂ > 0
 *   3PH: Y = β₁ + β₂·(X − β₃)⁻                     heating, β₂ < 0
 *   4P:  Y = β₁ + β₂·(X − β₄)⁻ + β₃·(X − β₄)⁺
 *   5P:  Y = β₁ + β₂·(X − β₄)⁻ + β₃·(X − β₅)⁺      β₂ < 0 < β₃, β₄ < β₅
 *
 * with (x)⁺ = max(x, 0), (x)⁻ = min(x, 0). Temperature may be in °F or °C; breakpoints come
 * out in the same unit. Breakpoints are found by a coarse grid (uniform steps plus every
 * observed temperature) and then successively finer grids around the best point, minimising
 * the (weighted) sum of squared errors; the slopes and intercept come from least squares with
 * the breakpoints held fixed.
 *
 * Degrees of freedom: p counts breakpoints as parameters (3PH has p = 3), so Guideline 14
 * statistics, the RMSE and the prediction interval all use n − p. Coefficient t values come
 * from the least-squares fit with breakpoints fixed (df = n − k, k = non-breakpoint
 * coefficients), as the Inverse Modeling Toolkit reports them.
 */
import { fitOls } from "./ols.ts";
import type { IntervalPrediction, OlsFit } from "./ols.ts";
import { householderQr, qrSolve } from "./linalg.ts";
import { guideline14Stats, mean } from "./stats.ts";
import type { Guideline14Stats } from "./stats.ts";
import { studentTQuantile } from "./studentT.ts";
import { ModelInputError } from "./errors.ts";

export type ChangePointKind = "1P" | "2P" | "3PC" | "3PH" | "4P" | "5P";

export const CHANGE_POINT_KINDS: readonly ChangePointKind[] = ["1P", "2P", "3PC", "3PH", "4P", "5P"];

/** One billing period: mean temperature over the period and average use per day. */
export interface ChangePointPoint {
  /** Mean period temperature (°F or °C; be consistent). */
  temp: number;
  /** Average use per day over the period (kWh/day, therm/day, ...). */
  usePerDay: number;
  /** Billing days; used as the weight when `weightByDays` is on. */
  days?: number;
}

/** Number of parameters p of each form, breakpoints included. */
export const CHANGE_POINT_PARAMETER_COUNT: Record<ChangePointKind, number> = {
  "1P": 1,
  "2P": 2,
  "3PC": 3,
  "3PH": 3,
  "4P": 4,
  "5P": 5,
};

const BREAKPOINT_COUNT: Record<ChangePointKind, number> = { "1P": 0, "2P": 0, "3PC": 1, "3PH": 1, "4P": 1, "5P": 2 };

export interface ChangePointFitOptions {
  /** Weight each period by its billing days (weighted least squares). Default false. */
  weightByDays?: boolean;
  /** Minimum points strictly below the lower and strictly above the upper breakpoint. Default 3. */
  minPointsPerSegment?: number;
  /** Steps of the coarse uniform breakpoint grid (observed temperatures are added). Default 20. */
  coarseSteps?: number;
  /** Guideline 14 limits to judge against. Default "monthly". */
  resolution?: "monthly" | "hourly";
}

/** One slope coefficient with its least-squares inference (breakpoints fixed). */
export interface SlopeTerm {
  /** Kissock's index: 2 for β₂, 3 for β₃. */
  beta: 2 | 3;
  role: "linear" | "heating" | "cooling" | "left" | "right";
  value: number;
  standardError: number;
  tValue: number;
}

export interface ChangePointFit {
  kind: ChangePointKind;
  /** β₁…β₅ in Kissock's numbering (index 0 = β₁); length = p. */
  beta: number[];
  /** Breakpoints in ascending order (0, 1 or 2 of them), temperature units. */
  breakpoints: number[];
  slopes: SlopeTerm[];
  /** p, breakpoints included. */
  parameterCount: number;
  /** Guideline 14 statistics of per-day use (unweighted), with p = parameterCount. */
  stats: Guideline14Stats;
  /** sqrt(Σ wᵢeᵢ² / (n − p)). Equals stats.rmse when unweighted. */
  rmse: number;
  /** The least-squares fit with breakpoints fixed (its df is n − k, not n − p). */
  ols: OlsFit;
  predict(temp: number): number;
  /**
   * Prediction interval for a new period's use per day at `temp` (Kissock et al. 2003 form,
   * generalised to the fixed-breakpoint design):
   *   ŷ ± t(1 − α/2, n − p) · RMSE · sqrt(1/w₀ + x₀ᵀ(XᵀWX)⁻¹x₀),
   * which for 2P unweighted is t·RMSE·sqrt(1 + 1/n + (X₀ − X̄)²/Σ(X − X̄)²).
   * `days` is the new period's weight when fitted with weightByDays (default: mean of training days).
   */
  predictWithInterval(temp: number, level: number, days?: number): IntervalPrediction;
}

function designRow(kind: ChangePointKind, t: number, bps: readonly number[]): number[] {
  switch (kind) {
    case "1P":
      return [];
    case "2P":
      return [t];
    case "3PC":
      return [Math.max(t - bps[0], 0)];
    case "3PH":
      return [Math.min(t - bps[0], 0)];
    case "4P":
      return [Math.min(t - bps[0], 0), Math.max(t - bps[0], 0)];
    case "5P":
      return [Math.min(t - bps[0], 0), Math.max(t - bps[1], 0)];
  }
}

function checkPoints(points: readonly ChangePointPoint[], weightByDays: boolean): void {
  points.forEach((pt, i) => {
    if (!Number.isFinite(pt.temp)) throw new ModelInputError(`point ${i}: temperature is not a finite number`);
    if (!Number.isFinite(pt.usePerDay)) throw new ModelInputError(`point ${i}: use per day is not a finite number`);
    if (weightByDays && !(pt.days !== undefined && pt.days > 0)) {
      throw new ModelInputError(`point ${i}: billing days must be positive when weighting by days`);
    }
  });
}

function segmentCountsOk(kind: ChangePointKind, temps: readonly number[], bps: readonly number[], minPts: number): boolean {
  if (BREAKPOINT_COUNT[kind] === 0) return true;
  const lo = bps[0];
  const hi = bps[bps.length - 1];
  if (bps.length === 2 && !(lo < hi)) return false;
  let below = 0;
  let above = 0;
  for (const t of temps) {
    if (t < lo) below++;
    if (t > hi) above++;
  }
  return below >= minPts && above >= minPts;
}

/**
 * Fit one change-point form with its breakpoints given (no search).
 * @throws ModelInputError on bad points, wrong breakpoint count, too few points, or a singular design.
 * @example fitChangePointAt(points, "3PH", [55])
 */
export function fitChangePointAt(
  points: readonly ChangePointPoint[],
  kind: ChangePointKind,
  breakpoints: readonly number[],
  options: ChangePointFitOptions = {},
): ChangePointFit {
  const weightByDays = options.weightByDays ?? false;
  checkPoints(points, weightByDays);
  if (breakpoints.length !== BREAKPOINT_COUNT[kind]) {
    throw new ModelInputError(`${kind} needs ${BREAKPOINT_COUNT[kind]} breakpoint(s), got ${breakpoints.length}`);
  }
  const bps = [...breakpoints];
  if (bps.length === 2 && !(bps[0] < bps[1])) throw new ModelInputError(`5P breakpoints must increase, got ${bps.join(", ")}`);
  const p = CHANGE_POINT_PARAMETER_COUNT[kind];
  const n = points.length;
  if (n <= p) throw new ModelInputError(`${kind} needs more than ${p} points, got ${n}`);
  const x = points.map((pt) => designRow(kind, pt.temp, bps));
  const y = points.map((pt) => pt.usePerDay);
  const weights = weightByDays ? points.map((pt) => pt.days as number) : undefined;
  const ols = fitOls(x, y, { weights, columnNames: kind === "4P" || kind === "5P" ? ["left slope", "right slope"] : ["slope"] });

  const c = ols.coefficients;
  const beta = [...c, ...bps];
  const slopes: SlopeTerm[] = [];
  const roles: Record<ChangePointKind, SlopeTerm["role"][]> = {
    "1P": [],
    "2P": ["linear"],
    "3PC": ["cooling"],
    "3PH": ["heating"],
    "4P": ["left", "right"],
    "5P": ["heating", "cooling"],
  };
  roles[kind].forEach((role, idx) => {
    const j = idx + 1;
    slopes.push({ beta: (idx + 2) as 2 | 3, role, value: c[j], standardError: ols.standardErrors[j], tValue: ols.tValues[j] });
  });

  const dfModel = n - p;
  const rmse = Math.sqrt(ols.sse / dfModel);
  const stats = guideline14Stats(y, ols.fitted, p, options.resolution ?? "monthly");
  const meanDays = weights ? mean(weights) : 1;
  const predict = (temp: number): number => ols.predict(designRow(kind, temp, bps));
  const predictWithInterval = (temp: number, level: number, days?: number): IntervalPrediction => {
    if (!(level > 0 && level < 1)) throw new ModelInputError(`interval level must be in (0, 1), got ${level}`);
    const w0 = weights ? (days ?? meanDays) : 1;
    if (!(w0 > 0)) throw new ModelInputError(`billing days must be positive, got ${days}`);
    const base = ols.predictWithInterval(designRow(kind, temp, bps), 0.5, w0);
    // Rescale from the OLS residual SE (df n − k) to the model RMSE (df n − p).
    const scale = ols.residualStdError === 0 ? 0 : rmse / ols.residualStdError;
    const sePrediction = base.sePrediction * scale;
    const seMean = base.seMean * scale;
    const tCrit = studentTQuantile(1 - (1 - level) / 2, dfModel);
    return { fit: base.fit, lower: base.fit - tCrit * sePrediction, upper: base.fit + tCrit * sePrediction, sePrediction, seMean };
  };
  return { kind, beta, breakpoints: bps, slopes, parameterCount: p, stats, rmse, ols, predict, predictWithInterval };
}

/** Weighted SSE at fixed breakpoints, or Infinity when the design is singular. */
function sseAt(kind: ChangePointKind, temps: readonly number[], y: Float64Array, sqrtW: Float64Array, bps: readonly number[]): number {
  const rows = temps.map((t, i) => [1, ...designRow(kind, t, bps)].map((v) => v * sqrtW[i]));
  const wy = y.map((v, i) => v * sqrtW[i]);
  try {
    const qr = householderQr(rows);
    const b = qrSolve(qr, wy);
    let sse = 0;
    for (let i = 0; i < rows.length; i++) {
      let f = 0;
      for (let j = 0; j < b.length; j++) f += rows[i][j] * b[j];
      sse += (wy[i] - f) ** 2;
    }
    return sse;
  } catch (e) {
    if (e instanceof ModelInputError) return Number.POSITIVE_INFINITY;
    throw e;
  }
}

function linspace(lo: number, hi: number, steps: number): number[] {
  if (steps <= 0 || hi === lo) return [lo];
  return Array.from({ length: steps + 1 }, (_, i) => lo + ((hi - lo) * i) / steps);
}

/**
 * Fit one change-point form, searching the breakpoint(s) by coarse-then-fine grids.
 * @throws ModelInputError when there are too few points for the form or no admissible breakpoint.
 * @example fitChangePoint(points, "3PH").breakpoints // [55]
 */
export function fitChangePoint(
  points: readonly ChangePointPoint[],
  kind: ChangePointKind,
  options: ChangePointFitOptions = {},
): ChangePointFit {
  const nb = BREAKPOINT_COUNT[kind];
  if (nb === 0) return fitChangePointAt(points, kind, [], options);
  const weightByDays = options.weightByDays ?? false;
  checkPoints(points, weightByDays);
  const minPts = options.minPointsPerSegment ?? 3;
  const steps = options.coarseSteps ?? 20;
  const temps = points.map((pt) => pt.temp);
  const y = Float64Array.from(points, (pt) => pt.usePerDay);
  const sqrtW = Float64Array.from(points, (pt) => (weightByDays ? Math.sqrt(pt.days as number) : 1));
  const sorted = [...temps].sort((a, b) => a - b);
  const n = sorted.length;
  if (n < 2 * minPts || n <= CHANGE_POINT_PARAMETER_COUNT[kind]) {
    throw new ModelInputError(`${kind} needs at least ${Math.max(2 * minPts, CHANGE_POINT_PARAMETER_COUNT[kind] + 1)} points, got ${n}`);
  }
  const lo = sorted[Math.max(minPts - 1, 0)];
  const hi = sorted[n - minPts];
  const coarse = [...new Set([...linspace(lo, hi, steps), ...sorted.filter((t) => t >= lo && t <= hi)])].sort((a, b) => a - b);
  let step = (hi - lo) / steps;
  const ok = (bps: number[]): boolean => segmentCountsOk(kind, temps, bps, minPts);
  let best: number[] | null = null;
  let bestSse = Number.POSITIVE_INFINITY;
  const consider = (bps: number[]): void => {
    if (!ok(bps)) return;
    const sse = sseAt(kind, temps, y, sqrtW, bps);
    if (sse < bestSse) {
      bestSse = sse;
      best = bps;
    }
  };
  if (nb === 1) {
    for (const b of coarse) consider([b]);
  } else {
    for (let i = 0; i < coarse.length; i++) for (let j = i + 1; j < coarse.length; j++) consider([coarse[i], coarse[j]]);
  }
  if (best === null) throw new ModelInputError(`${kind}: no breakpoint leaves ${minPts} points on each side`);
  // Refine: successively finer grids around the best point; each pass shrinks the step tenfold (1D) or fivefold (2D).
  const passes = nb === 1 ? 5 : 6;
  for (let pass = 0; pass < passes; pass++) {
    const centre: number[] = best;
    if (nb === 1) {
      for (const b of linspace(centre[0] - step, centre[0] + step, 20)) consider([b]);
      step /= 10;
    } else {
      const g1 = linspace(centre[0] - step, centre[0] + step, 10);
      const g2 = linspace(centre[1] - step, centre[1] + step, 10);
      for (const a of g1) for (const b of g2) if (a < b) consider([a, b]);
      step /= 5;
    }
  }
  return fitChangePointAt(points, kind, best, options);
}

export interface ChangePointSelectionOptions extends ChangePointFitOptions {
  /** Forms to try. Default all of CHANGE_POINT_KINDS. */
  candidates?: readonly ChangePointKind[];
  /** Minimum |t| on every slope. Default 2. */
  minAbsT?: number;
}

export interface ChangePointCandidate {
  kind: ChangePointKind;
  /** Absent when the form could not be fitted (see reasons). */
  fit?: ChangePointFit;
  accepted: boolean;
  /** Why the form was rejected (empty when accepted). */
  reasons: string[];
}

export interface ChangePointSelection {
  /** The accepted form with the lowest CV(RMSE) (ties → fewer parameters); null if none passed. */
  chosen: ChangePointFit | null;
  tried: ChangePointCandidate[];
}

function shapeReasons(fit: ChangePointFit, minAbsT: number): string[] {
  const reasons: string[] = [];
  const [s1, s2] = fit.slopes;
  const sign = (cond: boolean, msg: string): void => {
    if (!cond) reasons.push(msg);
  };
  switch (fit.kind) {
    case "3PH":
      sign(s1.value < 0, `heating slope ${s1.value.toPrecision(4)} is not negative`);
      break;
    case "3PC":
      sign(s1.value > 0, `cooling slope ${s1.value.toPrecision(4)} is not positive`);
      break;
    case "4P":
      sign(s1.value < s2.value, `left slope ${s1.value.toPrecision(4)} is not below right slope ${s2.value.toPrecision(4)} (use must not fall faster as it warms past the breakpoint)`);
      break;
    case "5P":
      sign(s1.value < 0, `heating slope ${s1.value.toPrecision(4)} is not negative`);
      sign(s2.value > 0, `cooling slope ${s2.value.toPrecision(4)} is not positive`);
      break;
    default:
      break;
  }
  for (const s of fit.slopes) {
    if (!(Math.abs(s.tValue) >= minAbsT)) reasons.push(`|t| of β${s.beta} (${s.role}) is ${Math.abs(s.tValue).toFixed(2)} < ${minAbsT}`);
  }
  return reasons;
}

/**
 * Fit every candidate form and choose one by statistics and physical shape:
 * heating slopes negative, cooling slopes positive, 4P convex, |t| ≥ minAbsT on every slope,
 * at least minPointsPerSegment points beyond each breakpoint (enforced by the search).
 * Among accepted forms the lowest CV(RMSE) wins (it already charges for parameters through
 * n − p); ties within 1e-9 go to the form with fewer parameters.
 * @example selectChangePointModel(points, { weightByDays: true }).chosen?.kind // "3PH"
 */
export function selectChangePointModel(
  points: readonly ChangePointPoint[],
  options: ChangePointSelectionOptions = {},
): ChangePointSelection {
  const minAbsT = options.minAbsT ?? 2;
  const tried: ChangePointCandidate[] = [];
  for (const kind of options.candidates ?? CHANGE_POINT_KINDS) {
    let fit: ChangePointFit;
    try {
      fit = fitChangePoint(points, kind, options);
    } catch (e) {
      if (e instanceof ModelInputError) {
        tried.push({ kind, accepted: false, reasons: [e.message] });
        continue;
      }
      throw e;
    }
    const reasons = shapeReasons(fit, minAbsT);
    if (!Number.isFinite(fit.stats.cvRmsePct)) reasons.push("CV(RMSE) is not finite");
    tried.push({ kind, fit, accepted: reasons.length === 0, reasons });
  }
  let chosen: ChangePointFit | null = null;
  for (const c of tried) {
    if (!c.accepted || !c.fit) continue;
    if (
      chosen === null ||
      c.fit.stats.cvRmsePct < chosen.stats.cvRmsePct - 1e-9 ||
      (Math.abs(c.fit.stats.cvRmsePct - chosen.stats.cvRmsePct) <= 1e-9 && c.fit.parameterCount < chosen.parameterCount)
    ) {
      chosen = c.fit;
    }
  }
  return { chosen, tried };
}
