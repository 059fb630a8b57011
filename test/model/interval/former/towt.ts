/**
 * TOWT as it was before its fit and prediction closures became classes (commit 3dfa24c,
 * src/model/interval/towt.ts), kept only so that test/model/interval/towtSameAsBefore.test.ts
 * can show that the current code gives the same numbers bit for bit. Not for use outside that test.
 */
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
import { fitOls } from "../../../../src/model/ols.ts";
import type { OlsFit } from "../../../../src/model/ols.ts";
import { temperatureComponents } from "../../../../src/clean/index.ts";
import { ModelInputError } from "../../../../src/model/errors.ts";
import type { FittedHourlyModel, HourlyFeatures, HourlyModelSpec } from "../../../../src/model/interval/types.ts";
import { fToC } from "../../../../src/core/units.ts";

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
    const thin = counts.findIndex((c) => c < minPoints);
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
  const row = new Float64Array(c);
  for (let i = 0; i < n; i++) {
    writeComponents(data.tempC[i]!, knots, row, 0);
    for (let j = 0; j < c; j++) x.data[j * n + i] = row[j]!;
  }
  const w = data.weights;
  const fit = fitOls(x, data.kwh, w ? { weights: w } : {});
  // With weights, the share of positive residuals is a weighted share.
  const pos = new Float64Array(168);
  const all = new Float64Array(168);
  for (let i = 0; i < data.kwh.length; i++) {
    const h = data.hourOfWeek[i]!;
    const wi = w ? w[i]! : 1;
    all[h]! += wi;
    if (fit.residuals[i]! > 0) pos[h]! += wi;
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
  const knotsC = options.knotsC ?? DEFAULT_TOWT_KNOTS_C;
  const minPoints = options.minPointsPerSegment ?? 20;
  const threshold = options.occupancyThreshold ?? 0.65;
  const n = data.kwh.length;
  if (n === 0) throw new ModelInputError("TOWT needs training rows, got none");
  let occupied: Uint8Array;
  if (options.occupancy) {
    if (options.occupancy.length !== 168) throw new ModelInputError(`occupancy needs 168 entries, got ${options.occupancy.length}`);
    occupied = Uint8Array.from(options.occupancy, (v) => (v ? 1 : 0));
  } else {
    occupied = occupancyFromResiduals(data, knotsC, minPoints, threshold);
  }
  const seen = new Int16Array(168).fill(-1);
  const hoursSeen: number[] = [];
  for (let i = 0; i < n; i++) {
    const h = data.hourOfWeek[i]!;
    if (seen[h] === -1) {
      seen[h] = 0;
      hoursSeen.push(h);
    }
  }
  hoursSeen.sort((a, b) => a - b);
  hoursSeen.forEach((h, j) => (seen[h] = j));
  const occTemps: number[] = [];
  const unoccTemps: number[] = [];
  let holidayOccRows = 0;
  for (let i = 0; i < n; i++) {
    const occ = occupied[data.hourOfWeek[i]!]!;
    (occ ? occTemps : unoccTemps).push(data.tempC[i]!);
    if (occ && data.holiday[i]) holidayOccRows++;
  }
  const knotsOcc = occTemps.length ? selectKnots(occTemps, knotsC, minPoints) : [];
  const knotsUnocc = unoccTemps.length ? selectKnots(unoccTemps, knotsC, minPoints) : [];
  const nOcc = occTemps.length ? knotsOcc.length + 1 : 0;
  const nUnocc = unoccTemps.length ? knotsUnocc.length + 1 : 0;
  const useHoliday = (options.holidayTerm ?? true) && holidayOccRows >= MIN_HOLIDAY_ROWS && holidayOccRows < occTemps.length;
  const nHow = hoursSeen.length;
  const k = nHow + nOcc + nUnocc + (useHoliday ? 1 : 0);
  const columnNames = [
    ...hoursSeen.map((h) => `how${h}`),
    ...Array.from({ length: nOcc }, (_, j) => `tempOcc${j}`),
    ...Array.from({ length: nUnocc }, (_, j) => `tempUnocc${j}`),
    ...(useHoliday ? ["holidayOccupied"] : []),
  ];
  const row = (h: number, hol: number, t: number, howCol: number): number[] => {
    const r = new Array<number>(k).fill(0);
    if (howCol >= 0) r[howCol] = 1;
    if (occupied[h]) {
      const c = components(t, knotsOcc);
      for (let j = 0; j < nOcc; j++) r[nHow + j] = c[j]!;
      if (useHoliday && hol) r[k - 1] = 1;
    } else if (nUnocc > 0) {
      const c = components(t, knotsUnocc);
      for (let j = 0; j < nUnocc; j++) r[nHow + nOcc + j] = c[j]!;
    }
    return r;
  };
  // The temperature and holiday columns of one row (all but the hour-of-week indicators), written
  // into out[off … off + k − nHow) with zeros where they do not apply; the same values as `row`.
  const m = k - nHow;
  if (knotsOcc.length) components(0, knotsOcc);
  if (knotsUnocc.length) components(0, knotsUnocc);
  const writeTail = (h: number, hol: number, t: number, out: Float64Array, off: number): void => {
    for (let j = 0; j < m; j++) out[off + j] = 0;
    if (occupied[h]) {
      if (nOcc > 0) writeComponents(t, knotsOcc, out, off);
      if (useHoliday && hol) out[off + m - 1] = 1;
    } else if (nUnocc > 0) {
      writeComponents(t, knotsUnocc, out, off + nOcc);
    }
  };
  if (n <= k) throw new ModelInputError(`TOWT needs more hours than coefficients (n=${n}, k=${k})`);
  const solver = options.solver ?? "within";
  let ols: OlsFit;
  let beta: number[];
  let residualStdError: number;
  let standardErrors: number[];
  if (solver === "full") {
    const x = Array.from({ length: n }, (_, i) => row(data.hourOfWeek[i]!, data.holiday[i]!, data.tempC[i]!, seen[data.hourOfWeek[i]!]!));
    ols = fitOls(x, data.kwh, { intercept: false, columnNames, ...(data.weights ? { weights: data.weights } : {}) });
    beta = ols.coefficients;
    residualStdError = ols.residualStdError;
    standardErrors = ols.standardErrors;
  } else {
    // Frisch–Waugh–Lovell: with one indicator per hour of week, regressing on the indicators is
    // subtracting each hour-of-week group's mean. Fit the other columns on the demeaned data,
    // then each indicator is its group's mean of y − Xβ. Same β and residuals as the full
    // design, at the cost of a 13-column instead of a 180-column factorization.
    // row-major n × m, one row's columns side by side
    const xr = new Float64Array(n * m);
    for (let i = 0; i < n; i++) writeTail(data.hourOfWeek[i]!, data.holiday[i]!, data.tempC[i]!, xr, i * m);
    const groupN = new Float64Array(nHow);
    const groupY = new Float64Array(nHow);
    const groupX = new Float64Array(nHow * m);
    // Weighted least squares: the same identity holds with weighted group means.
    const w = data.weights;
    for (let i = 0; i < n; i++) {
      const g = seen[data.hourOfWeek[i]!]!;
      const wi = w ? w[i]! : 1;
      groupN[g]! += wi;
      groupY[g]! += wi * data.kwh[i]!;
      for (let j = 0; j < m; j++) groupX[g * m + j]! += wi * xr[i * m + j]!;
    }
    for (let g = 0; g < nHow; g++) {
      groupY[g]! /= groupN[g]!;
      for (let j = 0; j < m; j++) groupX[g * m + j]! /= groupN[g]!;
    }
    const yd = new Float64Array(n);
    // demeaned columns, stored by column (no array per row)
    const xd = { rows: n, cols: m, data: new Float64Array(n * m) };
    for (let i = 0; i < n; i++) {
      const g = seen[data.hourOfWeek[i]!]!;
      yd[i] = data.kwh[i]! - groupY[g]!;
      for (let j = 0; j < m; j++) xd.data[j * n + i] = xr[i * m + j]! - groupX[g * m + j]!;
    }
    const tail = columnNames.slice(nHow);
    // m ≥ 1: every row is in one mode, and each mode with rows has at least one temperature column
    ols = fitOls(xd, yd, { intercept: false, columnNames: tail, ...(w ? { weights: w } : {}) });
    const bTail = ols.coefficients;
    const alpha = Array.from({ length: nHow }, (_, g) => groupY[g]! - bTail.reduce((acc, b, j) => acc + b * groupX[g * m + j]!, 0));
    beta = [...alpha, ...bTail];
    residualStdError = Math.sqrt(ols.sse / (n - k));
    // (X̃ᵀX̃)⁻¹ of the demeaned columns is the matching block of the full (XᵀX)⁻¹ (FWL), so only the
    // residual variance needs the full design's degrees of freedom. Indicator SEs are not computed.
    standardErrors = [...new Array<number>(nHow).fill(Number.NaN), ...bTail.map((_, j) => residualStdError * Math.sqrt(ols.unscaledCovariance[j]![j]!))];
  }
  // Hours of week never seen in training borrow the mean indicator of their mode (or of all hours).
  const fallback = new Float64Array(2);
  for (const mode of [0, 1]) {
    const hs = hoursSeen.filter((h) => occupied[h] === mode);
    const src = hs.length ? hs : hoursSeen;
    fallback[mode] = src.reduce((s, h) => s + beta[seen[h]!]!, 0) / src.length;
  }
  /** The prediction for row i of f; `tail` is scratch space of m entries. */
  const valueAt = (f: HourlyFeatures, i: number, tail: Float64Array): number => {
    const h = f.hourOfWeek[i]!;
    if (!Number.isFinite(f.tempC[i]!)) return Number.NaN; // no temperature, no prediction (callers count these hours)
    writeTail(h, f.holiday[i]!, f.tempC[i]!, tail, 0);
    let s = seen[h]! >= 0 ? beta[seen[h]!]! : fallback[occupied[h]!]!;
    for (let j = 0; j < m; j++) s += tail[j]! * beta[nHow + j]!;
    return s;
  };
  const predict = (f: HourlyFeatures): Float64Array => {
    const out = new Float64Array(f.tempC.length);
    const tail = new Float64Array(m);
    for (let i = 0; i < out.length; i++) out[i] = valueAt(f, i, tail);
    return out;
  };
  const predictRows = (f: HourlyFeatures, rows: ArrayLike<number>, out: Float64Array): void => {
    const tail = new Float64Array(m);
    for (let r = 0; r < rows.length; r++) out[rows[r]!] = valueAt(f, rows[r]!, tail);
  };
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
    predict,
    predictRows,
  };
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
