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
 *   5P:  Y = β₁ + β₂·(X − β₄)⁻ + β₃·(X − β₅)⁺      β₂ < 0 < β₃, β₄ ≤ β₅
 *
 * with (x)⁺ = max(x, 0), (x)⁻ = min(x, 0). The published 5P has β₄ < β₅; β₄ = β₅ (no dead
 * band) is allowed here because otherwise the best 5P can be a limit that no admissible pair
 * reaches; such a fit has the 4P's shape with one more parameter, so it loses to the 4P. Temperature may be in °F or °C; breakpoints come
 * out in the same unit. Breakpoints minimise the (weighted) sum of squared errors; instead of
 * a coarse-then-fine grid, which can stop in the wrong valley, each interval between observed
 * temperatures is solved exactly (Hudson 1966; see fitChangePoint). The slopes and intercept
 * come from least squares with the breakpoints held fixed.
 *
 * Degrees of freedom: p counts breakpoints as parameters (3PH has p = 3), so Guideline 14
 * statistics, the RMSE and the prediction interval all use n − p. Coefficient t values come
 * from the least-squares fit with breakpoints fixed (df = n − k, k = non-breakpoint
 * coefficients); they ignore the uncertainty of the breakpoint search and so are optimistic.
 */
import { fitOls } from "./ols.ts";
import type { IntervalPrediction, OlsFit } from "./ols.ts";
import { applyReflection, householderStep, leastSquaresFrom, leastSquaresInPlace } from "../core/linalg.ts";
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
  /**
   * Minimum points at or below the lower breakpoint and at or above the upper one. Default 3.
   * A point exactly at a breakpoint lies on both segments, so it counts on both sides.
   */
  minPointsPerSegment?: number;
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
  for (let i = 0; i < points.length; i++) {
    const pt = points[i]!;
    if (!Number.isFinite(pt.temp)) throw new ModelInputError(`point ${i}: temperature is not a finite number`);
    if (!Number.isFinite(pt.usePerDay)) throw new ModelInputError(`point ${i}: use per day is not a finite number`);
    if (weightByDays && !(pt.days !== undefined && pt.days > 0)) {
      throw new ModelInputError(`point ${i}: billing days must be positive when weighting by days`);
    }
  }
}

function segmentCountsOk(kind: ChangePointKind, temps: readonly number[], bps: readonly number[], minPts: number): boolean {
  if (BREAKPOINT_COUNT[kind] === 0) return true;
  const lo = bps[0];
  const hi = bps[bps.length - 1];
  if (bps.length === 2 && !(lo <= hi)) return false;
  let below = 0;
  let above = 0;
  for (const t of temps) {
    if (t <= lo) below++;
    if (t >= hi) above++;
  }
  return below >= minPts && above >= minPts;
}

const SLOPE_ROLES: Record<ChangePointKind, readonly SlopeTerm["role"][]> = {
  "1P": [],
  "2P": ["linear"],
  "3PC": ["cooling"],
  "3PH": ["heating"],
  "4P": ["left", "right"],
  "5P": ["heating", "cooling"],
};

/** ChangePointFit.predict of a fit at breakpoints `bps`. */
function predictAt(ols: OlsFit, kind: ChangePointKind, bps: readonly number[], temp: number): number {
  return ols.predict(designRow(kind, temp, bps));
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
  if (bps.length === 2 && !(bps[0] <= bps[1])) throw new ModelInputError(`5P breakpoints must not decrease, got ${bps.join(", ")}`);
  const p = CHANGE_POINT_PARAMETER_COUNT[kind];
  const n = points.length;
  if (n <= p) throw new ModelInputError(`${kind} needs more than ${p} points, got ${n}`);
  // Plain loops rather than map callbacks, whose optimized code would be lost between fits.
  const x: number[][] = [];
  // y typed, as the interval models give theirs to the statistics below (one kind of array).
  const y = new Float64Array(points.length);
  const weights: number[] | undefined = weightByDays ? [] : undefined;
  for (let i = 0; i < points.length; i++) {
    const pt = points[i]!;
    x.push(designRow(kind, pt.temp, bps));
    y[i] = pt.usePerDay;
    if (weights) weights.push(pt.days as number);
  }
  const ols = fitOls(x, y, { weights, columnNames: kind === "4P" || kind === "5P" ? ["left slope", "right slope"] : ["slope"] });

  const c = ols.coefficients;
  const beta = [...c, ...bps];
  const slopes: SlopeTerm[] = [];
  const roles = SLOPE_ROLES[kind];
  for (let idx = 0; idx < roles.length; idx++) {
    const j = idx + 1;
    slopes.push({ beta: (idx + 2) as 2 | 3, role: roles[idx]!, value: c[j], standardError: ols.standardErrors[j], tValue: ols.tValues[j] });
  }

  const dfModel = n - p;
  const rmse = Math.sqrt(ols.sse / dfModel);
  const stats = guideline14Stats(y, ols.fitted, p, options.resolution ?? "monthly");
  const meanDays = weights ? mean(weights) : 1;
  // A bound module-level function, not a closure: V8 keeps its optimized code between fits.
  const predict = predictAt.bind(null, ols, kind, bps);
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

/**
 * A column of a search design, as a function of temperature t, described by data (an operation
 * and a breakpoint b) rather than a closure: the searches fill thousands of designs per meter,
 * and a loop over one known operation runs far faster than a call per cell through a call site
 * that sees every kind of closure. Each operation is the expression the closures computed.
 */
interface Column {
  op: ColumnOp;
  b: number;
}

type ColumnOp =
  | "one" // 1
  | "t" // t
  | "below" // min(t − b, 0)
  | "above" // max(t − b, 0)
  | "atOrAbove" // t ≥ b ? 1 : 0
  | "atOrBelow" // t ≤ b ? 1 : 0
  | "tAtOrAbove" // t · (t ≥ b ? 1 : 0)
  | "tAtOrBelow"; // t · (t ≤ b ? 1 : 0)

const ONE: Column = { op: "one", b: 0 };
const T: Column = { op: "t", b: 0 };
const belowCol = (b: number): Column => ({ op: "below", b });
const aboveCol = (b: number): Column => ({ op: "above", b });

/** Writes w[i] · column(t[i]) for every row into out[off …]. */
function fillColumn(col: Column, temps: readonly number[], sqrtW: Float64Array, out: Float64Array, off: number): void {
  const m = temps.length;
  const b = col.b;
  switch (col.op) {
    case "one":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * 1;
      break;
    case "t":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * temps[i];
      break;
    case "below":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * Math.min(temps[i] - b, 0);
      break;
    case "above":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * Math.max(temps[i] - b, 0);
      break;
    case "atOrAbove":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * (temps[i] >= b ? 1 : 0);
      break;
    case "atOrBelow":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * (temps[i] <= b ? 1 : 0);
      break;
    case "tAtOrAbove":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * (temps[i] * (temps[i] >= b ? 1 : 0));
      break;
    case "tAtOrBelow":
      for (let i = 0; i < m; i++) out[off + i] = sqrtW[i] * (temps[i] * (temps[i] <= b ? 1 : 0));
      break;
  }
}

/** The factorization state after the leading column(s) of a search design (SearchWorkspace). */
interface PrefixState {
  /** The column's Householder vector. */
  vector: Float64Array;
  rDiag: number;
  /** The weighted response after this column's reflection (and the earlier ones'). */
  rhs: Float64Array;
}

/**
 * Workspace for the breakpoint searches: fits small weighted least-squares problems in
 * preallocated arrays (thousands of fits per meter, so no allocation per fit).
 *
 * Every design starts with the constant column, and many share their second column (4P's
 * temperature column, a 5P breakpoint held fixed while the other is solved): Householder QR
 * works column by column, and a column's reflection depends on it and the columns before it
 * only, so the state after those leading columns is kept and each fit starts from it,
 * applying the kept reflections to its own columns (the same operations in the same order as
 * a fit from scratch, so the same numbers).
 */
class SearchWorkspace {
  private readonly a: Float64Array;
  private readonly rhs: Float64Array;
  private readonly rDiag = new Float64Array(6);
  readonly coef = new Float64Array(6);
  /** State after the constant column; null until the first fit, false when it is singular. */
  private one: PrefixState | null | false = null;
  /** States after [constant, column], by the column's operation and breakpoint. */
  private readonly second = new Map<ColumnOp, Map<number, PrefixState>>();
  private secondCount = 0;
  constructor(
    private readonly temps: readonly number[],
    private readonly y: Float64Array,
    private readonly sqrtW: Float64Array,
  ) {
    this.a = new Float64Array(temps.length * 6);
    this.rhs = new Float64Array(temps.length);
  }
  /** Weighted SSE of y on the given columns (NaN when singular); coefficients in `coef`. */
  fit(columns: readonly Column[]): number {
    const m = this.temps.length;
    const k = columns.length;
    if (k === 0 || columns[0]!.op !== "one") {
      for (let c = 0; c < k; c++) fillColumn(columns[c]!, this.temps, this.sqrtW, this.a, c * m);
      for (let i = 0; i < m; i++) this.rhs[i] = this.sqrtW[i]! * this.y[i]!;
      return leastSquaresInPlace(this.a, this.rhs, m, k, this.coef);
    }
    const one = this.oneState();
    if (one === false) return Number.NaN;
    const { a, rhs, rDiag } = this;
    a.set(one.vector, 0);
    rDiag[0] = one.rDiag;
    // The second column's state pays for its keeping when at least two columns follow it.
    const col1 = k >= 4 ? columns[1]! : null;
    const kept = col1 && !Object.is(col1.b, -0) ? this.second.get(col1.op)?.get(col1.b) : undefined;
    if (kept) {
      a.set(kept.vector, m);
      rDiag[1] = kept.rDiag;
      rhs.set(kept.rhs);
      for (let c = 2; c < k; c++) {
        fillColumn(columns[c]!, this.temps, this.sqrtW, a, c * m);
        applyReflection(a, m, 0, a, c * m);
        applyReflection(a, m, 1, a, c * m);
      }
      return leastSquaresFrom(a, rhs, m, k, 2, rDiag, this.coef);
    }
    rhs.set(one.rhs);
    for (let c = 1; c < k; c++) {
      fillColumn(columns[c]!, this.temps, this.sqrtW, a, c * m);
      applyReflection(a, m, 0, a, c * m);
    }
    if (col1 && !Object.is(col1.b, -0)) {
      if (!householderStep(a, rhs, m, k, 1, rDiag)) return Number.NaN;
      let byB = this.second.get(col1.op);
      if (!byB) this.second.set(col1.op, (byB = new Map()));
      if (this.secondCount >= 4096) {
        // a bound, not an eviction policy
        for (const map of this.second.values()) map.clear();
        this.secondCount = 0;
      }
      byB.set(col1.b, { vector: a.slice(m, 2 * m), rDiag: rDiag[1]!, rhs: rhs.slice() });
      this.secondCount++;
      return leastSquaresFrom(a, rhs, m, k, 2, rDiag, this.coef);
    }
    return leastSquaresFrom(a, rhs, m, k, 1, rDiag, this.coef);
  }
  /** The state after the constant column (the first step of every fit). */
  private oneState(): PrefixState | false {
    if (this.one !== null) return this.one;
    const m = this.temps.length;
    const a = new Float64Array(m);
    const rhs = new Float64Array(m);
    const rDiag = new Float64Array(1);
    fillColumn(ONE, this.temps, this.sqrtW, a, 0);
    for (let i = 0; i < m; i++) rhs[i] = this.sqrtW[i]! * this.y[i]!;
    this.one = householderStep(a, rhs, m, 1, 0, rDiag) ? { vector: a, rDiag: rDiag[0]!, rhs } : false;
    return this.one;
  }
  /** Weighted SSE of a change-point form at fixed breakpoints; Infinity when singular. */
  sseAt(kind: ChangePointKind, bps: readonly number[]): number {
    const sse = this.fit([ONE, ...hingeColumns(kind, bps)]);
    return Number.isNaN(sse) ? Number.POSITIVE_INFINITY : sse;
  }
}

function hingeColumns(kind: ChangePointKind, bps: readonly number[]): Column[] {
  switch (kind) {
    case "1P":
      return [];
    case "2P":
      return [T];
    case "3PC":
      return [aboveCol(bps[0])];
    case "3PH":
      return [belowCol(bps[0])];
    case "4P":
      return [belowCol(bps[0]), aboveCol(bps[0])];
    case "5P":
      return [belowCol(bps[0]), aboveCol(bps[1])];
  }
}

/**
 * Candidate breakpoints for one hinge in the closed interval [k0, k1] between two consecutive
 * observed temperatures (Hudson 1966, JASA 61). Inside the interval the set of points on the
 * hinge's active side is fixed and the hinge column is x·a − b·a, so least squares on the
 * fixed columns plus x·a and a, unconstrained, gives c_xa and c_a, and b* = −c_a/c_xa meets
 * the continuity constraint: when b* lies inside, it is the best breakpoint of the interval;
 * otherwise the best is an end. The midpoint is added for degenerate intervals (e.g. all
 * active points at one temperature), where SSE is flat inside but differs at the ends.
 * @param activeAbove true for a (x − b)⁺ hinge, false for (x − b)⁻.
 */
function intervalCandidates(ws: SearchWorkspace, k0: number, k1: number, fixed: readonly Column[], activeAbove: boolean): number[] {
  const out = [k0, k1, (k0 + k1) / 2];
  const a: Column = activeAbove ? { op: "atOrAbove", b: k1 } : { op: "atOrBelow", b: k0 };
  const ta: Column = activeAbove ? { op: "tAtOrAbove", b: k1 } : { op: "tAtOrBelow", b: k0 };
  const sse = ws.fit([...fixed, ta, a]);
  if (!Number.isNaN(sse)) {
    const k = fixed.length;
    const b = -ws.coef[k + 1] / ws.coef[k];
    if (Number.isFinite(b) && b > k0 && b < k1) out.push(b);
  }
  return out;
}

/**
 * Fit one change-point form, searching its breakpoint(s) for the least (weighted) SSE.
 *
 * One breakpoint (3PC, 3PH, 4P): every interval between consecutive observed temperatures is
 * solved exactly (see intervalCandidates), so the search is exhaustive.
 * Two breakpoints (5P): the optimum lies either where both hinges are at their stationary
 * points (solved for every pair of intervals), or with one breakpoint at an observed
 * temperature and the other solved exactly (every knot × every interval), or at an interior
 * point that is neither; the last case is covered by exact coordinate descent from the best
 * few pairs. A property test compares the result with a fine two-dimensional scan.
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
  const n = points.length;
  const temps: number[] = [];
  const y = new Float64Array(n);
  const sqrtW = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const pt = points[i]!;
    temps.push(pt.temp);
    y[i] = pt.usePerDay;
    sqrtW[i] = weightByDays ? Math.sqrt(pt.days as number) : 1;
  }
  if (n < 2 * minPts || n <= CHANGE_POINT_PARAMETER_COUNT[kind]) {
    throw new ModelInputError(`${kind} needs at least ${Math.max(2 * minPts, CHANGE_POINT_PARAMETER_COUNT[kind] + 1)} points, got ${n}`);
  }
  const ws = new SearchWorkspace(temps, y, sqrtW);
  const knots = [...new Set(temps)].sort(ascending);
  const search = new BreakpointSearch(ws, kind, temps, knots, minPts);
  if (nb === 1) search.oneBreakpoint();
  else search.twoBreakpoints();
  if (search.best === null) throw new ModelInputError(`${kind}: no breakpoint leaves ${minPts} points on each side`);
  return fitChangePointAt(points, kind, search.best, options);
}

function ascending(a: number, b: number): number {
  return a - b;
}

function byPairSse(p: { sse: number }, q: { sse: number }): number {
  return p.sse - q.sse;
}

/** Index of the first interval [knots[i], knots[i + 1]] that holds `v`, or −1. */
function intervalIndexOf(knots: readonly number[], v: number): number {
  for (let idx = 0; idx < knots.length; idx++) {
    if (idx + 1 < knots.length && v >= knots[idx] && v <= knots[idx + 1]) return idx;
  }
  return -1;
}

/**
 * The breakpoint search of one fitChangePoint call (see there). Its steps are methods rather
 * than closures made per call, so V8 keeps their optimized code from one meter to the next.
 */
class BreakpointSearch {
  /** The breakpoints with the least SSE seen so far (null until an admissible one). */
  best: number[] | null = null;
  private bestSse = Number.POSITIVE_INFINITY;
  // The searches meet the same breakpoints many times (an interval's upper knot is the next
  // one's lower knot; the 5P passes revisit pairs): each one's SSE is a function of the
  // breakpoints alone, so it is solved once. A repeat cannot change `best` (its SSE is not
  // below the best seen, which counted it). −0 is left out: a Map key does not tell it from 0.
  private readonly seen = new Map<number, number | Map<number, number>>();
  constructor(
    private readonly ws: SearchWorkspace,
    private readonly kind: ChangePointKind,
    private readonly temps: readonly number[],
    private readonly knots: readonly number[],
    private readonly minPts: number,
  ) {}

  /** 3PC, 3PH, 4P: every interval between consecutive knots, solved exactly. */
  oneBreakpoint(): void {
    const { knots, minPts } = this;
    const fixed: Column[] = this.kind === "4P" ? [ONE, T] : [ONE];
    const activeAbove = this.kind !== "3PH";
    for (let i = 0; i + 1 < knots.length; i++) {
      if (this.below(knots[i + 1]) < minPts || this.above(knots[i]) < minPts) continue;
      for (const b of intervalCandidates(this.ws, knots[i], knots[i + 1], fixed, activeAbove)) this.consider([b]);
    }
  }

  /** 5P: Y = β₁ + β₂(X − b₁)⁻ + β₃(X − b₂)⁺. */
  twoBreakpoints(): void {
    const { knots, minPts, ws } = this;
    // Intervals where each breakpoint can lie (closure admissible on its own side).
    const lowIdx: number[] = [];
    const highIdx: number[] = [];
    for (let i = 0; i + 1 < knots.length; i++) {
      if (this.below(knots[i + 1]) >= minPts) lowIdx.push(i);
      if (this.above(knots[i]) >= minPts) highIdx.push(i);
    }
    // (1) Both hinges stationary, per pair of intervals.
    const pairScores: { i: number; j: number; sse: number }[] = [];
    for (const i of lowIdx) {
      for (const j of highIdx) {
        if (j < i) continue;
        const [a0, a1, c0, c1] = [knots[i], knots[i + 1], knots[j], knots[j + 1]];
        const l: Column = { op: "atOrBelow", b: a0 };
        const r: Column = { op: "atOrAbove", b: c1 };
        const sse = ws.fit([ONE, { op: "tAtOrBelow", b: a0 }, l, { op: "tAtOrAbove", b: c1 }, r]);
        if (!Number.isNaN(sse)) {
          const b1 = -ws.coef[2] / ws.coef[1];
          const b2 = -ws.coef[4] / ws.coef[3];
          if (b1 > a0 && b1 < a1 && b2 > c0 && b2 < c1 && b1 <= b2) this.consider([b1, b2]);
        }
        pairScores.push({ i, j, sse: this.consider(this.pairStart(i, j)) });
      }
    }
    // (2) One breakpoint at an observed temperature, the other solved exactly.
    for (const e of knots) {
      for (const j of highIdx) if (knots[j + 1] > e) this.solveOne(1, e, j);
      for (const i of lowIdx) if (knots[i] < e) this.solveOne(0, e, i);
    }
    // (3) Exact coordinate descent inside the most promising pairs.
    pairScores.sort(byPairSse);
    const starts: { i: number; j: number; bps: number[] }[] = [];
    for (const p of pairScores.slice(0, 8)) starts.push({ i: p.i, j: p.j, bps: this.pairStart(p.i, p.j) });
    const bb = this.best;
    if (bb !== null) {
      const i = Math.max(0, intervalIndexOf(knots, bb[0]));
      const j = Math.max(0, intervalIndexOf(knots, bb[1]));
      starts.push({ i, j, bps: bb });
    }
    for (const s of starts) {
      let cur = s.bps;
      for (let round = 0; round < 6 && cur[0] <= cur[1]; round++) {
        const n1 = this.solveOne(0, cur[1], s.i);
        if (n1 === null) break;
        const n2 = this.solveOne(1, n1.bps[0], s.j);
        if (n2 === null || (n2.bps[0] === cur[0] && n2.bps[1] === cur[1])) break;
        cur = n2.bps;
      }
    }
  }

  /** Points at or below `b`. */
  private below(b: number): number {
    let count = 0;
    for (const t of this.temps) if (t <= b) count++;
    return count;
  }

  /** Points at or above `b`. */
  private above(b: number): number {
    let count = 0;
    for (const t of this.temps) if (t >= b) count++;
    return count;
  }

  private ok(bps: number[]): boolean {
    return segmentCountsOk(this.kind, this.temps, bps, this.minPts);
  }

  /** SSE at `bps`, solved once per distinct breakpoints (Infinity when inadmissible). */
  private solved(bps: number[]): number {
    for (const b of bps) if (Object.is(b, -0)) return this.ok(bps) ? this.ws.sseAt(this.kind, bps) : Number.POSITIVE_INFINITY;
    const [b0, b1] = bps as [number, number?];
    let byB1: Map<number, number> | undefined;
    if (b1 === undefined) {
      const known = this.seen.get(b0) as number | undefined;
      if (known !== undefined) return known;
    } else {
      byB1 = this.seen.get(b0) as Map<number, number> | undefined;
      if (!byB1) this.seen.set(b0, (byB1 = new Map()));
      const known = byB1.get(b1);
      if (known !== undefined) return known;
    }
    const sse = this.ok(bps) ? this.ws.sseAt(this.kind, bps) : Number.POSITIVE_INFINITY;
    if (byB1) byB1.set(b1!, sse);
    else this.seen.set(b0, sse);
    return sse;
  }

  /** SSE at `bps` (Infinity when inadmissible); remembers the best seen. */
  private consider(bps: number[]): number {
    const sse = this.solved(bps);
    if (sse < this.bestSse) {
      this.bestSse = sse;
      this.best = bps;
    }
    return sse;
  }

  /** Best of the exact candidates for one breakpoint with the other fixed. */
  private solveOne(which: 0 | 1, other: number, i: number): { bps: number[]; sse: number } | null {
    const knots = this.knots;
    const fixed: Column[] = which === 1 ? [ONE, belowCol(other)] : [ONE, aboveCol(other)];
    let arg: { bps: number[]; sse: number } | null = null;
    const cands = intervalCandidates(this.ws, knots[i], knots[i + 1], fixed, which === 1);
    // When both breakpoints share an interval, also try the middle of the part left free.
    if (which === 1 && other > knots[i] && other < knots[i + 1]) cands.push((other + knots[i + 1]) / 2);
    if (which === 0 && other > knots[i] && other < knots[i + 1]) cands.push((knots[i] + other) / 2);
    for (const b of cands) {
      const bps = which === 1 ? [other, b] : [b, other];
      const sse = this.consider(bps);
      if (Number.isFinite(sse) && (arg === null || sse < arg.sse)) arg = { bps, sse };
    }
    return arg;
  }

  /** A starting point inside a pair of intervals: the midpoints, or the thirds of a shared interval. */
  private pairStart(i: number, j: number): number[] {
    const knots = this.knots;
    const [a0, a1, c0, c1] = [knots[i], knots[i + 1], knots[j], knots[j + 1]];
    return i === j ? [a0 + (a1 - a0) / 3, a0 + (2 * (a1 - a0)) / 3] : [(a0 + a1) / 2, (c0 + c1) / 2];
  }
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
  switch (fit.kind) {
    case "3PH":
      if (!(s1.value < 0)) reasons.push(`heating slope ${s1.value.toPrecision(4)} is not negative`);
      break;
    case "3PC":
      if (!(s1.value > 0)) reasons.push(`cooling slope ${s1.value.toPrecision(4)} is not positive`);
      break;
    case "4P":
      if (!(s1.value < s2.value)) reasons.push(`left slope ${s1.value.toPrecision(4)} is not below right slope ${s2.value.toPrecision(4)} (use must not fall faster as it warms past the breakpoint)`);
      break;
    case "5P":
      if (!(s1.value < 0)) reasons.push(`heating slope ${s1.value.toPrecision(4)} is not negative`);
      if (!(s2.value > 0)) reasons.push(`cooling slope ${s2.value.toPrecision(4)} is not positive`);
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
