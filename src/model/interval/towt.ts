/**
 * Time-of-week-and-temperature regression (TOWT; Mathieu, Price, Kiliccote & Piette 2011,
 * "Quantifying changes in building electricity use, with application to demand response",
 * IEEE Trans. Smart Grid 2(3)): hourly energy = α(hour of week) + piecewise-linear function
 * of outdoor temperature, with separate temperature slopes for occupied and unoccupied hours
 * of the week. Fitted by ordinary least squares (../ols.ts), by default in the equivalent
 * "within" form (hour-of-week means removed first), see {@link TowtOptions.solver}.
 *
 * Occupancy (as the method describes): fit energy on temperature alone (intercept +
 * piecewise-linear components); an hour of the week is "occupied" when more than
 * `occupancyThreshold` of its residuals are positive, i.e. the building uses more at that hour
 * than temperature explains. Default 0.65, the value in LBNL's open-source RMV2.0
 * implementation of the method.
 */
import { fitOls } from "../ols.ts";
import type { OlsFit } from "../ols.ts";
import { temperatureComponents } from "../../clean/index.ts";
import { ModelInputError } from "../errors.ts";
import type { FittedHourlyModel, HourlyFeatures, HourlyModelSpec } from "./types.ts";
import { fToC } from "../../core/units.ts";

/** The published knots 40, 50, 60, 70, 80 °F converted exactly to °C. */
export const DEFAULT_TOWT_KNOTS_C: readonly number[] = [40, 50, 60, 70, 80].map(fToC);

export interface TowtOptions {
  /** Knots of the piecewise-linear temperature term, °C, increasing. Default {@link DEFAULT_TOWT_KNOTS_C}. */
  knotsC?: readonly number[];
  /** A knot is dropped while a temperature segment of a mode holds fewer points than this. Default 20. */
  minPointsPerSegment?: number;
  /** Share of positive temperature-only residuals above which an hour of week is occupied. Default 0.65. */
  occupancyThreshold?: number;
  /** Fixed occupancy by hour of week (168 entries of 0/1) instead of the residual rule. */
  occupancy?: ArrayLike<number>;
  /** Add one coefficient for occupied hours on holidays (when at least 8 such rows exist). Default true. */
  holidayTerm?: boolean;
  /**
   * "within" (default): remove hour-of-week means first (Frisch–Waugh–Lovell), then fitOls on
   * the few remaining columns: same coefficients, ~20× faster on a year. "full": fitOls on the
   * whole 180-column design (all standard errors).
   */
  solver?: "full" | "within";
}

/** Training input of TOWT: the columns it uses. */
export interface TowtData {
  hourOfWeek: ArrayLike<number>;
  holiday: ArrayLike<number>;
  tempC: ArrayLike<number>;
  kwh: ArrayLike<number>;
  /** Row weights (> 0) for weighted least squares, e.g. of a month-segmented fit; absent = all 1. */
  weights?: ArrayLike<number>;
}

export interface TowtModel extends FittedHourlyModel {
  readonly kind: "towt";
  /** 1 = occupied, per hour of week 0 … 167. */
  occupied: Uint8Array;
  /** Knots kept after the per-mode data check. */
  knotsOccupiedC: number[];
  knotsUnoccupiedC: number[];
  /** Names of the design columns, in coefficient order (no intercept). */
  columnNames: string[];
  /** Coefficients in `columnNames` order. */
  coefficients: number[];
  /** Standard errors in the same order (NaN for the hour-of-week indicators with the "within" solver). */
  standardErrors: number[];
  /** s = sqrt(SSE / (n − k)) with k all TOWT coefficients. */
  residualStdError: number;
  dfResidual: number;
  solver: "full" | "within";
  /**
   * The least-squares fit actually solved: the whole design ("full"), or the temperature and
   * holiday columns after removing hour-of-week means ("within"; its residuals are the model's).
   */
  ols: OlsFit;
  /** {@link predict} for the given rows of `features` only, written into out at those rows. */
  predictRows(features: HourlyFeatures, rows: ArrayLike<number>, out: Float64Array): void;
}

const MIN_HOLIDAY_ROWS = 8;

/**
 * Knots kept for a set of temperatures: while some segment (t < k₀, kⱼ₋₁ ≤ t < kⱼ, t ≥ k_last)
 * holds fewer than `minPoints` values, drop the knot on that segment's left (the first knot for
 * the first segment), merging it with its neighbour. Without this the design would have a
 * constant (collinear) component.
 * @example selectKnots([1, 2, 3, 30], [10, 20], 1) // [20] (nothing in 10 … 20, so 10 goes)
 */
export function selectKnots(temps: ArrayLike<number>, knots: readonly number[], minPoints: number): number[] {
  const ks = [...knots];
  for (;;) {
    if (ks.length === 0) return ks;
    const counts = new Array<number>(ks.length + 1).fill(0);
    for (let i = 0; i < temps.length; i++) {
      let s = 0;
      while (s < ks.length && temps[i]! >= ks[s]!) s++;
      counts[s]!++;
    }
    let thin = -1;
    for (let s = 0; s < counts.length && thin < 0; s++) if (counts[s]! < minPoints) thin = s;
    if (thin < 0) return ks;
    ks.splice(thin === 0 ? 0 : thin - 1, 1);
  }
}

function components(t: number, knots: number[]): number[] {
  return knots.length === 0 ? [t] : temperatureComponents(t, knots);
}

/**
 * The same numbers as {@link components}, written into out[off …] without allocating (fits and
 * predictions call this for every hour). The knots are checked once by the caller, through
 * `components`; a non-finite temperature goes through `components` too, for its error.
 */
function writeComponents(t: number, knots: readonly number[], out: Float64Array, off: number): void {
  const nk = knots.length;
  if (nk === 0) {
    out[off] = t;
    return;
  }
  if (!Number.isFinite(t)) components(t, knots as number[]);
  out[off] = Math.min(t, knots[0]!);
  for (let j = 1; j < nk; j++) out[off + j] = Math.min(Math.max(t - knots[j - 1]!, 0), knots[j]! - knots[j - 1]!);
  out[off + nk] = Math.max(t - knots[nk - 1]!, 0);
}

/**
 * Occupancy by hour of week from a temperature-only fit (see the module comment).
 * Hours of week with no data are unoccupied.
 * @example occupancyFromResiduals(data, DEFAULT_TOWT_KNOTS_C, 20, 0.65)[9] // 1 for a 9 am weekday office hour
 */
export function occupancyFromResiduals(data: TowtData, knotsC: readonly number[], minPoints: number, threshold: number): Uint8Array {
  const knots = selectKnots(data.tempC, knotsC, minPoints);
  // the temperature components by column (the intercept is fitOls's)
  const n = data.kwh.length;
  const c = knots.length === 0 ? 1 : knots.length + 1;
  if (knots.length) components(0, knots);
  const x = { rows: n, cols: c, data: new Float64Array(n * c) };
  // the loops are functions of their own, each optimized by V8 with complete feedback
  temperatureDesign(data.tempC, knots, n, c, x.data);
  const w = data.weights;
  const fit = fitOls(x, data.kwh, w ? { weights: w } : {});
  return occupancyFromShares(data.hourOfWeek, fit.residuals, w ?? null, data.kwh.length, threshold);
}

/** Temperature components of rows 0 … n − 1, stored by column (c columns). */
function temperatureDesign(tempC: ArrayLike<number>, knots: number[], n: number, c: number, out: Float64Array): void {
  const row = new Float64Array(c);
  for (let i = 0; i < n; i++) {
    writeComponents(tempC[i]!, knots, row, 0);
    for (let j = 0; j < c; j++) out[j * n + i] = row[j]!;
  }
}

/** 1 for each hour of week whose (weighted) share of positive residuals exceeds the threshold. */
function occupancyFromShares(hourOfWeek: ArrayLike<number>, residuals: ArrayLike<number>, w: ArrayLike<number> | null, n: number, threshold: number): Uint8Array {
  // With weights, the share of positive residuals is a weighted share.
  const pos = new Float64Array(168);
  const all = new Float64Array(168);
  for (let i = 0; i < n; i++) {
    const h = hourOfWeek[i]!;
    const wi = w ? w[i]! : 1;
    all[h]! += wi;
    if (residuals[i]! > 0) pos[h]! += wi;
  }
  const occ = new Uint8Array(168);
  for (let h = 0; h < 168; h++) occ[h] = all[h]! > 0 && pos[h]! / all[h]! > threshold ? 1 : 0;
  return occ;
}

/**
 * Fit TOWT. Design (no separate intercept): one indicator per hour of week seen in training,
 * piecewise-linear temperature components for occupied rows and for unoccupied rows (each mode
 * with its own knots, see {@link selectKnots}; a mode with no rows has no columns), and an
 * optional holiday×occupied term.
 * @throws ModelInputError when there are fewer rows than coefficients or the design is singular.
 * @example fitTowt(frame).predict(frame) // fitted hourly kWh
 */
export function fitTowt(data: TowtData, options: TowtOptions = {}): TowtModel {
  // One object shape for the fit whatever table the columns come in (a frame, a fold's table, a
  // month's segment): V8 then keeps fitTowtColumns' optimized code instead of discarding it at
  // each new shape.
  const columns: TowtData = { hourOfWeek: data.hourOfWeek, holiday: data.holiday, tempC: data.tempC, kwh: data.kwh, weights: data.weights };
  return fitTowtColumns(columns, options);
}

// fitTowtColumns keeps only the steps; each long loop is a module-level function of its own, so
// V8 optimizes each with complete feedback (a big function optimized inside its first loop is
// discarded when it reaches the later ones, and compiled again).
function fitTowtColumns(data: TowtData, options: TowtOptions): TowtModel {
  const knotsC = options.knotsC ?? DEFAULT_TOWT_KNOTS_C;
  const minPoints = options.minPointsPerSegment ?? 20;
  const threshold = options.occupancyThreshold ?? 0.65;
  const { hourOfWeek, holiday, tempC, kwh } = data;
  const n = kwh.length;
  if (n === 0) throw new ModelInputError("TOWT needs training rows, got none");
  const occupied = options.occupancy ? fixedOccupancy(options.occupancy) : occupancyFromResiduals(data, knotsC, minPoints, threshold);
  // hours of week seen, ascending, and each one's indicator column (−1 = not seen)
  const seen = new Int16Array(168).fill(-1);
  const hoursSeen = indexHoursSeen(hourOfWeek, n, seen);
  const nOccRows = occupiedRowCount(occupied, hourOfWeek, n);
  const occTemps = new Float64Array(nOccRows);
  const unoccTemps = new Float64Array(n - nOccRows);
  const holidayOccRows = splitTempsByMode(occupied, hourOfWeek, holiday, tempC, n, occTemps, unoccTemps);
  const knotsOcc = occTemps.length ? selectKnots(occTemps, knotsC, minPoints) : [];
  const knotsUnocc = unoccTemps.length ? selectKnots(unoccTemps, knotsC, minPoints) : [];
  const nOcc = occTemps.length ? knotsOcc.length + 1 : 0;
  const nUnocc = unoccTemps.length ? knotsUnocc.length + 1 : 0;
  const useHoliday = (options.holidayTerm ?? true) && holidayOccRows >= MIN_HOLIDAY_ROWS && holidayOccRows < occTemps.length;
  const nHow = hoursSeen.length;
  const k = nHow + nOcc + nUnocc + (useHoliday ? 1 : 0);
  const columnNames = towtColumnNames(hoursSeen, nOcc, nUnocc, useHoliday);
  // The temperature and holiday columns of one row (all but the hour-of-week indicators).
  const m = k - nHow;
  if (knotsOcc.length) components(0, knotsOcc);
  if (knotsUnocc.length) components(0, knotsUnocc);
  const tail = new TowtTail(occupied, knotsOcc, knotsUnocc, nOcc, nUnocc, useHoliday, m);
  if (n <= k) throw new ModelInputError(`TOWT needs more hours than coefficients (n=${n}, k=${k})`);
  const solver = options.solver ?? "within";
  const sol =
    solver === "full"
      ? solveFull(data, tail, seen, nHow, k, columnNames)
      : solveWithin(data, tail, seen, nHow, m, k, columnNames);
  const { ols, beta, residualStdError, standardErrors } = sol;
  const fallback = unseenHourFallback(hoursSeen, occupied, seen, beta);
  const predictor = new TowtPredictor(tail, seen, Float64Array.from(beta), fallback, nHow);
  return {
    kind: "towt",
    parameterCount: k,
    occupied,
    knotsOccupiedC: knotsOcc,
    knotsUnoccupiedC: knotsUnocc,
    columnNames,
    coefficients: beta,
    standardErrors,
    residualStdError,
    dfResidual: n - k,
    solver,
    ols,
    predict: (f) => predictor.predict(f),
    predictRows: (f, rows, out) => predictor.predictRows(f, rows, out),
  };
}

/** A given occupancy (168 entries) as 0/1. */
function fixedOccupancy(occupancy: ArrayLike<number>): Uint8Array {
  if (occupancy.length !== 168) throw new ModelInputError(`occupancy needs 168 entries, got ${occupancy.length}`);
  const occupied = new Uint8Array(168);
  for (let h = 0; h < 168; h++) occupied[h] = occupancy[h] ? 1 : 0;
  return occupied;
}

/** Hours of week present in rows 0 … n − 1, ascending; `seen` (all −1) gets each one's index among them. */
function indexHoursSeen(hourOfWeek: ArrayLike<number>, n: number, seen: Int16Array): number[] {
  for (let i = 0; i < n; i++) seen[hourOfWeek[i]!] = 0;
  const hoursSeen: number[] = [];
  for (let h = 0; h < 168; h++) {
    if (seen[h] === 0) {
      seen[h] = hoursSeen.length;
      hoursSeen.push(h);
    }
  }
  return hoursSeen;
}

/** Number of rows 0 … n − 1 in occupied hours of week. */
function occupiedRowCount(occupied: Uint8Array, hourOfWeek: ArrayLike<number>, n: number): number {
  let count = 0;
  for (let i = 0; i < n; i++) if (occupied[hourOfWeek[i]!]) count++;
  return count;
}

/**
 * Temperatures of occupied and of unoccupied rows, in row order, into arrays of the right
 * lengths (typed arrays: one element kind whatever the temperatures); returns the number of
 * occupied holiday rows.
 */
function splitTempsByMode(
  occupied: Uint8Array,
  hourOfWeek: ArrayLike<number>,
  holiday: ArrayLike<number>,
  tempC: ArrayLike<number>,
  n: number,
  occTemps: Float64Array,
  unoccTemps: Float64Array,
): number {
  let holidayOccRows = 0;
  let o = 0;
  let u = 0;
  for (let i = 0; i < n; i++) {
    const occ = occupied[hourOfWeek[i]!]!;
    if (occ) occTemps[o++] = tempC[i]!;
    else unoccTemps[u++] = tempC[i]!;
    if (occ && holiday[i]) holidayOccRows++;
  }
  return holidayOccRows;
}

/** Names of the design columns, in coefficient order. */
function towtColumnNames(hoursSeen: readonly number[], nOcc: number, nUnocc: number, useHoliday: boolean): string[] {
  // (loops, not callbacks made per fit)
  const columnNames: string[] = [];
  for (const h of hoursSeen) columnNames.push(`how${h}`);
  for (let j = 0; j < nOcc; j++) columnNames.push(`tempOcc${j}`);
  for (let j = 0; j < nUnocc; j++) columnNames.push(`tempUnocc${j}`);
  if (useHoliday) columnNames.push("holidayOccupied");
  return columnNames;
}

/** The least-squares solution of a TOWT design, as fitTowtColumns uses it. */
interface TowtSolution {
  ols: OlsFit;
  beta: number[];
  residualStdError: number;
  standardErrors: number[];
}

/** One row of the full design: the hour-of-week indicator (none at −1), then the tail's columns. */
function fullDesignRow(tail: TowtTail, k: number, nHow: number, howCol: number, h: number, hol: number, t: number, scratch: Float64Array): number[] {
  const r = new Array<number>(k).fill(0);
  if (howCol >= 0) r[howCol] = 1;
  tail.write(h, hol, t, scratch, 0);
  for (let j = 0; j < tail.m; j++) r[nHow + j] = scratch[j]!;
  return r;
}

/** fitOls on the whole design ("full" solver). */
function solveFull(data: TowtData, tail: TowtTail, seen: Int16Array, nHow: number, k: number, columnNames: string[]): TowtSolution {
  const { hourOfWeek, holiday, tempC, kwh } = data;
  const n = kwh.length;
  const scratch = new Float64Array(tail.m);
  const x: number[][] = [];
  for (let i = 0; i < n; i++) x.push(fullDesignRow(tail, k, nHow, seen[hourOfWeek[i]!]!, hourOfWeek[i]!, holiday[i]!, tempC[i]!, scratch));
  const ols = fitOls(x, kwh, { intercept: false, columnNames, ...(data.weights ? { weights: data.weights } : {}) });
  return { ols, beta: ols.coefficients, residualStdError: ols.residualStdError, standardErrors: ols.standardErrors };
}

/**
 * Frisch–Waugh–Lovell: with one indicator per hour of week, regressing on the indicators is
 * subtracting each hour-of-week group's mean. Fit the other columns on the demeaned data,
 * then each indicator is its group's mean of y − Xβ. Same β and residuals as the full
 * design, at the cost of a 13-column instead of a 180-column factorization.
 */
function solveWithin(data: TowtData, tail: TowtTail, seen: Int16Array, nHow: number, m: number, k: number, columnNames: string[]): TowtSolution {
  const { hourOfWeek, holiday, tempC, kwh } = data;
  const n = kwh.length;
  // row-major n × m, one row's columns side by side
  const xr = new Float64Array(n * m);
  writeTailRows(tail, hourOfWeek, holiday, tempC, n, xr);
  const groupN = new Float64Array(nHow);
  const groupY = new Float64Array(nHow);
  const groupX = new Float64Array(nHow * m);
  // Weighted least squares: the same identity holds with weighted group means.
  const w = data.weights;
  groupMeans(seen, hourOfWeek, kwh, w ?? null, xr, n, m, nHow, groupN, groupY, groupX);
  const yd = new Float64Array(n);
  // demeaned columns, stored by column (no array per row)
  const xd = { rows: n, cols: m, data: new Float64Array(n * m) };
  demean(seen, hourOfWeek, kwh, xr, groupY, groupX, n, m, yd, xd.data);
  // m ≥ 1: every row is in one mode, and each mode with rows has at least one temperature column
  const ols = fitOls(xd, yd, { intercept: false, columnNames: columnNames.slice(nHow), ...(w ? { weights: w } : {}) });
  // the tail coefficients as doubles (fitOls's arrays may come in several element kinds)
  const bTail = Float64Array.from(ols.coefficients);
  const beta = withinCoefficients(bTail, groupY, groupX, nHow, m);
  const residualStdError = Math.sqrt(ols.sse / (n - k));
  // (X̃ᵀX̃)⁻¹ of the demeaned columns is the matching block of the full (XᵀX)⁻¹ (FWL), so only the
  // residual variance needs the full design's degrees of freedom. Indicator SEs are not computed.
  const standardErrors = new Array<number>(nHow).fill(Number.NaN);
  for (let j = 0; j < bTail.length; j++) standardErrors.push(residualStdError * Math.sqrt(ols.unscaledCovariance[j]![j]!));
  return { ols, beta, residualStdError, standardErrors };
}

/** The tail columns of rows 0 … n − 1, row-major into xr. */
function writeTailRows(tail: TowtTail, hourOfWeek: ArrayLike<number>, holiday: ArrayLike<number>, tempC: ArrayLike<number>, n: number, xr: Float64Array): void {
  const m = tail.m;
  for (let i = 0; i < n; i++) tail.write(hourOfWeek[i]!, holiday[i]!, tempC[i]!, xr, i * m);
}

/** (Weighted) means of y and of each tail column per hour-of-week group. */
function groupMeans(
  seen: Int16Array,
  hourOfWeek: ArrayLike<number>,
  kwh: ArrayLike<number>,
  w: ArrayLike<number> | null,
  xr: Float64Array,
  n: number,
  m: number,
  nHow: number,
  groupN: Float64Array,
  groupY: Float64Array,
  groupX: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const g = seen[hourOfWeek[i]!]!;
    const wi = w ? w[i]! : 1;
    groupN[g]! += wi;
    groupY[g]! += wi * kwh[i]!;
    for (let j = 0; j < m; j++) groupX[g * m + j]! += wi * xr[i * m + j]!;
  }
  // (nHow passed in, not read as groupN.length: V8 may optimize this function inside the first
  // loop, before the second loop's property read has any feedback)
  for (let g = 0; g < nHow; g++) {
    groupY[g]! /= groupN[g]!;
    for (let j = 0; j < m; j++) groupX[g * m + j]! /= groupN[g]!;
  }
}

/** y and the tail columns minus their group means (columns stored by column in xd). */
function demean(
  seen: Int16Array,
  hourOfWeek: ArrayLike<number>,
  kwh: ArrayLike<number>,
  xr: Float64Array,
  groupY: Float64Array,
  groupX: Float64Array,
  n: number,
  m: number,
  yd: Float64Array,
  xd: Float64Array,
): void {
  for (let i = 0; i < n; i++) {
    const g = seen[hourOfWeek[i]!]!;
    yd[i] = kwh[i]! - groupY[g]!;
    for (let j = 0; j < m; j++) xd[j * n + i] = xr[i * m + j]! - groupX[g * m + j]!;
  }
}

/** All coefficients: each indicator (its group's mean of y − Xβ), then the tail's. */
function withinCoefficients(bTail: Float64Array, groupY: Float64Array, groupX: Float64Array, nHow: number, m: number): number[] {
  const beta: number[] = [];
  for (let g = 0; g < nHow; g++) {
    let fitted = 0;
    for (let j = 0; j < bTail.length; j++) fitted = fitted + bTail[j]! * groupX[g * m + j]!;
    beta.push(groupY[g]! - fitted);
  }
  for (let j = 0; j < bTail.length; j++) beta.push(bTail[j]!);
  return beta;
}

/** Hours of week never seen in training borrow the mean indicator of their mode (or of all hours). */
function unseenHourFallback(hoursSeen: readonly number[], occupied: Uint8Array, seen: Int16Array, beta: readonly number[]): Float64Array {
  const fallback = new Float64Array(2);
  for (let mode = 0; mode <= 1; mode++) {
    let count = 0;
    for (const h of hoursSeen) if (occupied[h] === mode) count++;
    const all = count === 0;
    let s = 0;
    for (const h of hoursSeen) if (all || occupied[h] === mode) s = s + beta[seen[h]!]!;
    fallback[mode] = s / (all ? hoursSeen.length : count);
  }
  return fallback;
}

/**
 * The temperature and holiday columns of a TOWT design row (all but the hour-of-week
 * indicators). A class rather than closures made per fit, so V8 keeps the optimized code of
 * `write` (called for every row of every fit and prediction) from one fit to the next.
 */
class TowtTail {
  constructor(
    /** 1 = occupied, per hour of week. */
    readonly occupied: Uint8Array,
    private readonly knotsOcc: readonly number[],
    private readonly knotsUnocc: readonly number[],
    private readonly nOcc: number,
    private readonly nUnocc: number,
    private readonly useHoliday: boolean,
    /** Number of columns. */
    readonly m: number,
  ) {}

  /** The row's columns written into out[off … off + m), zeros where they do not apply. */
  write(h: number, hol: number, t: number, out: Float64Array, off: number): void {
    const m = this.m;
    for (let j = 0; j < m; j++) out[off + j] = 0;
    if (this.occupied[h]) {
      if (this.nOcc > 0) writeComponents(t, this.knotsOcc, out, off);
      if (this.useHoliday && hol) out[off + m - 1] = 1;
    } else if (this.nUnocc > 0) {
      writeComponents(t, this.knotsUnocc, out, off + this.nOcc);
    }
  }
}

/** A fitted TOWT's predictions (a class for the same reason as {@link TowtTail}). */
class TowtPredictor {
  constructor(
    private readonly tail: TowtTail,
    /** Coefficient index of each hour of week's indicator, −1 when not seen in training. */
    private readonly seen: Int16Array,
    /** All coefficients: the nHow indicators, then the tail's. */
    private readonly beta: Float64Array,
    /** Indicator of an unseen hour of week, by occupancy mode (0, 1). */
    private readonly fallback: Float64Array,
    private readonly nHow: number,
  ) {}

  /** The prediction for row i of f; `scratch` has room for the tail's m columns. */
  private valueAt(f: HourlyFeatures, i: number, scratch: Float64Array): number {
    const h = f.hourOfWeek[i]!;
    if (!Number.isFinite(f.tempC[i]!)) return Number.NaN; // no temperature, no prediction (callers count these hours)
    const { tail, seen, beta, nHow } = this;
    tail.write(h, f.holiday[i]!, f.tempC[i]!, scratch, 0);
    let s = seen[h]! >= 0 ? beta[seen[h]!]! : this.fallback[tail.occupied[h]!]!;
    for (let j = 0; j < tail.m; j++) s += scratch[j]! * beta[nHow + j]!;
    return s;
  }

  predict(f: HourlyFeatures): Float64Array {
    const out = new Float64Array(f.tempC.length);
    const scratch = new Float64Array(this.tail.m);
    for (let i = 0; i < out.length; i++) out[i] = this.valueAt(f, i, scratch);
    return out;
  }

  predictRows(f: HourlyFeatures, rows: ArrayLike<number>, out: Float64Array): void {
    const scratch = new Float64Array(this.tail.m);
    for (let r = 0; r < rows.length; r++) out[rows[r]!] = this.valueAt(f, rows[r]!, scratch);
  }
}

/** Fits per training table (keyed by its temperature array), by options. */
const fittedByTable = new WeakMap<ArrayLike<number>, { source: TowtData; byOptions: Map<string, TowtModel> }>();

/**
 * {@link fitTowt} on an unweighted training table, fitted once per table and options: the
 * month-segmented TOWT needs the same all-hours fit as the TOWT candidate on each table
 * (towtMonthly.ts). The table is recognised by its arrays (the same objects, not copies).
 * @example fitTowtOnTable(frame) === fitTowtOnTable(frame) // true
 */
export function fitTowtOnTable(data: TowtData, options: TowtOptions = {}): TowtModel {
  if (data.weights) return fitTowt(data, options);
  let entry = fittedByTable.get(data.tempC);
  const s = entry?.source;
  if (!entry || s!.hourOfWeek !== data.hourOfWeek || s!.holiday !== data.holiday || s!.kwh !== data.kwh) {
    entry = { source: { hourOfWeek: data.hourOfWeek, holiday: data.holiday, tempC: data.tempC, kwh: data.kwh }, byOptions: new Map() };
    fittedByTable.set(data.tempC, entry);
  }
  const key = JSON.stringify({ ...options, knotsC: options.knotsC, occupancy: options.occupancy ? Array.from(options.occupancy) : undefined });
  let model = entry.byOptions.get(key);
  if (!model) {
    model = fitTowt(data, options);
    entry.byOptions.set(key, model);
  }
  return model;
}

/**
 * TOWT as a model spec for cross-validation and the baseline entry point.
 * @example towtSpec().fit(frame).kind // "towt"
 */
export function towtSpec(options: TowtOptions = {}): HourlyModelSpec {
  return { kind: "towt", fit: (train) => fitTowtOnTable(train, options) };
}
